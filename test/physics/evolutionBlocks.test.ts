import { describe, it, expect } from 'vitest';
import { evolve, matrixElements } from '../../server/src/physics/evolution';
import { blockSize, triangleForms, DENSE_BLOCK } from '../../server/src/physics/evolutionForms';
import { createBudget } from '../../server/src/physics/budget';
import { potentialBasis } from '../../server/src/physics/potential';

// An asymmetric trap (no parity, so X and D are dense) with 24 levels, evolved over 21 times: 21 is not
// a multiple of the block of 8, so the last block is partial and holds an odd number of times. The times
// are equally spaced, so the phases are rotated step by step (evolutionPhases.ts); `long` spans several
// exact recomputations (every 64 steps) and `uneven` gets a cosine and sine at every time.
const K = 24;
const basis = potentialBasis((xs) => xs.map((x) => 0.5 * x * x + 0.4 * x + 0.02 * x * x * x * x), -9, 9, 1, K).basis;
const cRe = Float64Array.from({ length: K }, (_, k) => Math.exp(-0.5 * ((k - 6) / 3) ** 2));
const cIm = Float64Array.from({ length: K }, (_, k) => 0.3 * Math.sin(k + 0.5));
const times = Float64Array.from({ length: 21 }, (_, j) => 0.37 * j);
const long = Float64Array.from({ length: 200 }, (_, j) => 0.37 * j);
const uneven = Float64Array.from({ length: 21 }, (_, j) => 0.37 * j + 0.01 * j * j);
const xs = Float64Array.from({ length: 13 }, (_, j) => -4 + (8 * j) / 12);

/**
 * The plain double sums, independent of the blocked code: with a_k = c_k e^{-i E_k t},
 * <x> W = sum_jk X_jk (ar_j ar_k + ai_j ai_k) and <p> W = Re sum_jk conj(a_j) (-i D_jk) a_k
 * = sum_jk D_jk (ar_j ai_k - ai_j ar_k), |psi(x)|^2 W = |sum_k a_k phi_k(x)|^2 (derived in this comment).
 */
function direct(t: number, X: Float64Array, D: Float64Array, table: Float64Array) {
  const ar = new Float64Array(K);
  const ai = new Float64Array(K);
  let W = 0;
  for (let k = 0; k < K; k++) {
    const c = Math.cos(basis.energies[k] * t);
    const s = -Math.sin(basis.energies[k] * t);
    ar[k] = cRe[k] * c - cIm[k] * s;
    ai[k] = cRe[k] * s + cIm[k] * c;
    W += cRe[k] ** 2 + cIm[k] ** 2;
  }
  let x = 0;
  let p = 0;
  for (let j = 0; j < K; j++) {
    for (let k = 0; k < K; k++) {
      x += X[j * K + k] * (ar[j] * ar[k] + ai[j] * ai[k]);
      p += D[j * K + k] * (ar[j] * ai[k] - ai[j] * ar[k]);
    }
  }
  const dens = xs.map((_, i) => {
    let re = 0;
    let im = 0;
    for (let k = 0; k < K; k++) {
      re += ar[k] * table[k * xs.length + i];
      im += ai[k] * table[k * xs.length + i];
    }
    return (re * re + im * im) / W;
  });
  return { x: x / W, p: p / W, dens };
}

describe('evolution in blocks of times', () => {
  const me = matrixElements(basis, K);
  const table = new Float64Array(K * xs.length);
  basis.table(xs, K, table);

  it('the dense case is blocked (8 times a block), with and without a density', () => {
    const forms = triangleForms(me, K);
    expect(forms.kind).toBe('dense');
    expect(blockSize(forms, false)).toBe(DENSE_BLOCK);
    expect(blockSize(forms, true)).toBe(DENSE_BLOCK);
  });

  it('<x>, <p> and |psi|^2 equal the plain double sums to rounding, the partial last block included', () => {
    const r = evolve(basis, cRe, cIm, times, { density: xs, weightCutoff: 0 });
    expect(r.complete).toBe(true);
    expect(r.density!.length).toBe(times.length);
    times.forEach((t, j) => {
      const ref = direct(t, me.x, me.d, table);
      expect(Math.abs(r.meanX[j] - ref.x)).toBeLessThan(1e-13);
      expect(Math.abs(r.meanP[j] - ref.p)).toBeLessThan(1e-13);
      ref.dens.forEach((v, i) => expect(Math.abs(r.density![j][i] - v)).toBeLessThan(1e-13));
    });
    // Not trivially small: the packet moves.
    expect(Math.max(...r.meanX) - Math.min(...r.meanX)).toBeGreaterThan(0.1);
  });

  it('rotated phases over 200 steps and exact ones at uneven times match the plain sums to rounding', () => {
    // Either way the phase E t is rounded to about eps E t (5e-13 at E = 33, t = 74 here), so the bound
    // grows with t (derived in this comment); a wrong rotation step misses by orders of magnitude more.
    const eMax = basis.energies[K - 1];
    for (const ts of [long, uneven]) {
      const r = evolve(basis, cRe, cIm, ts, { weightCutoff: 0 });
      ts.forEach((t, j) => {
        const ref = direct(t, me.x, me.d, table);
        const bound = 1e-13 + 8 * Number.EPSILON * eMax * t;
        expect(Math.abs(r.meanX[j] - ref.x)).toBeLessThan(bound);
        expect(Math.abs(r.meanP[j] - ref.p)).toBeLessThan(bound);
      });
    }
  });

  it('a budget stops between blocks: whole blocks are kept, equal to the full run', () => {
    let polls = 0;
    const r = evolve(basis, cRe, cIm, times, { density: xs, weightCutoff: 0, budget: createBudget({ cancelled: () => ++polls > 2 }) });
    const full = evolve(basis, cRe, cIm, times, { density: xs, weightCutoff: 0 });
    expect(r.stopped).toBe('cancelled');
    expect(r.meanX.length % DENSE_BLOCK).toBe(0);
    expect(r.meanX.length).toBeGreaterThan(0);
    expect(r.meanX.length).toBeLessThan(times.length);
    expect(r.density!.length).toBe(r.meanX.length);
    expect(Array.from(r.meanP)).toEqual(Array.from(full.meanP.subarray(0, r.meanP.length)));
    expect(Array.from(r.density![r.density!.length - 1])).toEqual(Array.from(full.density![r.density!.length - 1]));
  });
});
