/**
 * The oscillator's trapezoid path (analysis/lineTrapezoid.ts): its stated error bounds the true error of
 * every coefficient against Glauber's coherent-state coefficients, it costs about one projection on the
 * nodes where the state lives (counted work, never timed), and expandState falls back to quadrature when
 * a component of the state aliases alike onto both nested grids.
 */
import { describe, expect, it } from 'vitest';
import { lineTrapezoid } from '../../server/src/analysis/lineTrapezoid';
import { expandState, findWindow, maxWaveNumber } from '../../server/src/analysis/expand';
import { gaussianState, type StateFunction } from '../../server/src/analysis/systems';
import { oscillatorBasis } from '../../server/src/physics/oscillator';
import { createBudget } from '../../server/src/physics/budget';

/**
 * c_n = e^{i x0 p0 / 2} e^{-|a|^2/2} a^n / sqrt(n!), a = (x0 + i p0) / sqrt 2, for the packet
 * pi^{-1/4} exp(-(x - x0)^2 / 2 + i p0 x) in the oscillator with m = omega = hbar = 1 (Glauber, Phys.
 * Rev. 131, 2766 (1963); the packet is e^{i x0 p0 / 2} times the coherent state |a>, whose position form
 * carries the phase e^{-i x0 p0 / 2}, from memory), by the product c_n = c_{n-1} a / sqrt(n).
 */
function coherent(count: number, x0: number, p0: number): { re: Float64Array; im: Float64Array } {
  const re = new Float64Array(count);
  const im = new Float64Array(count);
  const ar = x0 / Math.SQRT2;
  const ai = p0 / Math.SQRT2;
  const mag = Math.exp(-0.5 * (ar * ar + ai * ai));
  let cr = mag * Math.cos(0.5 * x0 * p0);
  let ci = mag * Math.sin(0.5 * x0 * p0);
  for (let n = 0; n < count; n++) {
    if (n > 0) {
      const s = 1 / Math.sqrt(n);
      [cr, ci] = [(cr * ar - ci * ai) * s, (cr * ai + ci * ar) * s];
    }
    re[n] = cr;
    im[n] = ci;
  }
  return { re, im };
}

const NEG = 1e-14;

describe('the whole-line trapezoid with its nested half grid', () => {
  it("bounds the true error of 1,000 coefficients of the coherent state d = 30 (Glauber's closed form)", () => {
    const basis = oscillatorBasis(1, 0, 1, 1000);
    const state = gaussianState(30, Math.SQRT1_2, 0);
    const window = findWindow(state, basis)!;
    const budget = createBudget();
    const r = lineTrapezoid(state, basis, 1000, window, maxWaveNumber(basis, 1000, window), { maxNodes: 1 << 18, negligible: NEG, budget })!;
    expect(r).not.toBeNull();
    // N pi >= 1.3 k W with k = sqrt(1999) and W the window's width (about 102): N = 2,048 (derived in this comment).
    expect(r.intervals).toBe(2048);
    const ref = coherent(1000, 30, 0);
    const s = 1 / Math.sqrt(r.norm);
    for (let n = 0; n < 1000; n++) {
      // The closed form's own rounding: about sqrt(n) eps relative.
      const err = Math.hypot(r.re[n]! * s - ref.re[n]!, r.im[n]! * s - ref.im[n]!);
      expect(r.error[n]! * s + 4e-16 * Math.sqrt(n + 1) * Math.abs(ref.re[n]!)).toBeGreaterThanOrEqual(err);
      expect(r.error[n]! * s).toBeLessThanOrEqual(1e-12);
      expect(err).toBeLessThan(1e-14);
    }
    // One projection on the nodes where the state lives, 8 counted operations a level and node: the
    // state holds all but 1e-28 of its norm within about 8.7 of x = 30, about 350 nodes at h = W / 2048
    // (derived in this comment), against 730 + 560 nodes of the two Gauss-Legendre grids it replaces.
    expect(budget.work.ops).toBeLessThan(8 * 1000 * 400 + 3 * 2049);
  });

  it('bounds the error of a moving packet (complex coefficients)', () => {
    const basis = oscillatorBasis(1, 0, 1, 120);
    const state = gaussianState(3, Math.SQRT1_2, 4);
    const window = findWindow(state, basis)!;
    const ex = expandState(state, basis, 120, window, { maxGridPoints: 1 << 18, budget: createBudget() });
    // The expansion took the trapezoid's coefficients (its check on the Gauss-Legendre grid passed).
    const line = lineTrapezoid(state, basis, 120, window, maxWaveNumber(basis, 120, window), { maxNodes: 1 << 18, negligible: NEG, budget: createBudget() })!;
    expect(Array.from(ex.re)).toEqual(Array.from(line.re));
    const ref = coherent(120, 3, 4);
    const s = 1 / Math.sqrt(ex.norm);
    let worst = 0;
    for (let n = 0; n < 120; n++) {
      const err = Math.hypot(ex.re[n]! * s - ref.re[n]!, ex.im[n]! * s - ref.im[n]!);
      expect(ex.error[n]! * s + 1e-16).toBeGreaterThanOrEqual(err);
      worst = Math.max(worst, err);
    }
    expect(worst).toBeLessThan(1e-14);
  });

  it('a packet faster than the basis doubles the grid until the estimate settles, and stays bounded', () => {
    // 200 levels (k = sqrt(399) = 20) of a packet with momentum 15: the spectrum of phi_n psi reaches about
    // 20 + 15 + 8.6 (the Gaussian's to 1e-16) = 44, beyond 2 pi / (2h) = 1.3 k = 26 where the first half grid
    // aliases, so the first grid does not settle, and the next (pi / h = 52) does (derived in this comment).
    const basis = oscillatorBasis(1, 0, 1, 200);
    const state = gaussianState(0, Math.SQRT1_2, 15);
    const window = findWindow(state, basis)!;
    const k = maxWaveNumber(basis, 200, window);
    const r = lineTrapezoid(state, basis, 200, window, k, { maxNodes: 1 << 18, negligible: NEG, budget: createBudget() })!;
    let first = 64;
    while (first * Math.PI < 1.3 * k * (window[1] - window[0])) first *= 2;
    expect(r.intervals).toBeGreaterThan(first);
    const ex = expandState(state, basis, 200, window, { maxGridPoints: 1 << 18, budget: createBudget() });
    const ref = coherent(200, 0, 15);
    const s = 1 / Math.sqrt(ex.norm);
    for (let n = 0; n < 200; n++) {
      const err = Math.hypot(ex.re[n]! * s - ref.re[n]!, ex.im[n]! * s - ref.im[n]!);
      expect(ex.error[n]! * s + 1e-16).toBeGreaterThanOrEqual(err);
      expect(err).toBeLessThan(1e-13);
    }
  });

  it('a component that aliases alike onto both nested grids is caught by the quadrature on other nodes', () => {
    // The packet at d = 3 plus 1e-6 of it times cos(K (x - a)), K = 2 pi / h of the fine grid: at every
    // node of both nested grids the cosine is 1, so the trapezoid sees (1 + 1e-6) psi and both grids agree.
    // Its true share of every coefficient is below e^{-K^2 / 4} (the Gaussian's Fourier transform at K;
    // from memory), nothing at this K, so the true c_n are the packet's.
    const basis = oscillatorBasis(1, 0, 1, 40);
    const packet = gaussianState(3, Math.SQRT1_2, 0);
    const window = findWindow(packet, basis)!;
    const bare = lineTrapezoid(packet, basis, 40, window, maxWaveNumber(basis, 40, window), { maxNodes: 1 << 18, negligible: NEG, budget: createBudget() })!;
    const h = (window[1] - window[0]) / bare.intervals;
    const K = (2 * Math.PI) / h;
    const eps = 1e-6;
    const state: StateFunction = {
      ...packet,
      evaluate(xs, order) {
        const v = packet.evaluate(xs, order);
        xs.forEach((x, j) => {
          const c = Math.cos(K * (x - window[0]));
          const sn = Math.sin(K * (x - window[0]));
          const [r, dr, d2r] = [v.re[j]!, v.d1re?.[j] ?? 0, v.d2re?.[j] ?? 0];
          v.re[j] = r * (1 + eps * c);
          if (v.d1re) v.d1re[j] = dr * (1 + eps * c) - eps * K * sn * r;
          if (v.d2re) v.d2re[j] = d2r * (1 + eps * c) - 2 * eps * K * sn * dr - eps * K * K * c * r;
        });
        return v;
      },
    };
    const fooled = lineTrapezoid(state, basis, 40, window, maxWaveNumber(basis, 40, window), { maxNodes: 1 << 18, negligible: NEG, budget: createBudget() })!;
    expect(fooled.intervals).toBe(bare.intervals);
    const ref = coherent(40, 3, 0);
    expect(Math.abs(fooled.re[0]! - ref.re[0]!)).toBeGreaterThan(1e-8);
    const ex = expandState(state, basis, 40, window, { maxGridPoints: 1 << 18, budget: createBudget() });
    const s = 1 / Math.sqrt(ex.norm);
    // The norm carries the cosine's own share (eps^2 / 2 of it), so compare with that normalisation.
    const scale = 1 / Math.sqrt(1 + (eps * eps) / 2);
    for (let n = 0; n < 40; n++) expect(Math.abs(ex.re[n]! * s - ref.re[n]! * scale)).toBeLessThan(1e-12);
  });
});
