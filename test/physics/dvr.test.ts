import { describe, it, expect } from 'vitest';
import { sineDvrGrid, sineDvrSolve, sineSeriesTable, sineSeriesWeightedSums } from '../../server/src/physics/dvr';

describe('sine DVR', () => {
  it('V = 0 gives the box levels k^2 pi^2/(2 m L^2) exactly at any size', () => {
    // Griffiths, Introduction to Quantum Mechanics, infinite square well section (from memory).
    for (const N of [8, 33, 100]) {
      const s = sineDvrSolve(new Float64Array(N - 1), -1, 2, 0.7, 5);
      s.energies.forEach((e, k) => {
        const ref = ((k + 1) ** 2 * Math.PI ** 2) / (2 * 0.7 * 9);
        expect(Math.abs(e - ref) / ref).toBeLessThan(1e-13);
      });
    }
  });

  it('the symmetric split reproduces the full solve (invariant)', () => {
    const N = 120;
    const xs = sineDvrGrid(-5, 5, N);
    const v = xs.map((x) => x ** 4 - 3 * x * x);
    const full = sineDvrSolve(v, -5, 5, 1, 12);
    const split = sineDvrSolve(v, -5, 5, 1, 12, { symmetric: true });
    full.energies.forEach((e, k) => expect(Math.abs(split.energies[k] - e)).toBeLessThan(1e-10 * Math.max(1, Math.abs(e))));
    // Parities alternate: even, odd, even, ... (node theorem; common practice).
    split.parity.forEach((p, k) => expect(p).toBe(k % 2 === 0 ? 1 : 2));
  });

  it('the wall-slope correction lifts the order from 4 to 6 when V\'(wall) != 0 (measured)', () => {
    // Airy zeros, Abramowitz & Stegun, Table 10.13: wall at 0, V = x, m = 1, E_1 = 2.338107410459767 / 2^(1/3).
    const E1 = 2.338107410459767 * Math.cbrt(0.5);
    const err = (N: number, corrected: boolean) => {
      const xs = sineDvrGrid(0, 20, N);
      const s = sineDvrSolve(xs.map((x) => x), 0, 20, 1, 1, corrected ? { wallSlopes: [1, 1] } : {});
      return Math.abs(s.energies[0] - E1);
    };
    const plain = Math.log2(err(100, false) / err(200, false));
    const fixed = Math.log2(err(100, true) / err(200, true));
    expect(plain).toBeGreaterThan(3.8);
    expect(plain).toBeLessThan(4.2);
    expect(fixed).toBeGreaterThan(5.8);
    expect(err(400, true)).toBeLessThan(1e-9 * E1);
  });

  it('weighted sums equal the table contracted with the weights (invariant), and noise terms are dropped', () => {
    const xs = sineDvrGrid(-8, 8, 90);
    const s = sineDvrSolve(xs.map((x) => x * x + 0.3 * x), -8, 8, 1, 6);
    // The low levels are resolved well below the top of the series, so their tails are cut.
    expect(s.terms[0]).toBeLessThan(89);
    const pts = Float64Array.from({ length: 301 }, (_, i) => -8.2 + (16.4 * i) / 300);
    const wr = pts.map((x) => Math.cos(x));
    const wi = pts.map((x) => Math.sin(2 * x));
    const t = new Float64Array(6 * pts.length);
    sineSeriesTable(s, pts, 6, t);
    const re = new Float64Array(6);
    const im = new Float64Array(6);
    sineSeriesWeightedSums(s, pts, wr, wi, 6, re, im);
    for (let j = 0; j < 6; j++) {
      let sr = 0;
      let si = 0;
      for (let i = 0; i < pts.length; i++) {
        sr += wr[i] * t[j * pts.length + i];
        si += wi[i] * t[j * pts.length + i];
      }
      expect(Math.abs(re[j] - sr)).toBeLessThan(1e-11);
      expect(Math.abs(im[j] - si)).toBeLessThan(1e-11);
    }
  });

  it('table derivatives match central differences of the series', () => {
    const N = 64;
    const xs = sineDvrGrid(0, 3, N);
    const s = sineDvrSolve(xs.map((x) => 4 * Math.sin(2 * x)), 0, 3, 1, 4);
    const x = Float64Array.of(0.3, 1.234, 2.9);
    const f = new Float64Array(4 * 3);
    const d1 = new Float64Array(12);
    const d2 = new Float64Array(12);
    sineSeriesTable(s, x, 4, f, d1, d2);
    const h = 1e-4;
    const fp = new Float64Array(12);
    const fm = new Float64Array(12);
    sineSeriesTable(s, x.map((y) => y + h), 4, fp);
    sineSeriesTable(s, x.map((y) => y - h), 4, fm);
    for (let i = 0; i < 12; i++) {
      expect(Math.abs((fp[i] - fm[i]) / (2 * h) - d1[i])).toBeLessThan(1e-6);
      expect(Math.abs((fp[i] - 2 * f[i] + fm[i]) / (h * h) - d2[i])).toBeLessThan(1e-3);
    }
    // Zero outside the walls.
    const out = new Float64Array(4 * 2);
    sineSeriesTable(s, Float64Array.of(-0.1, 3.1), 4, out);
    expect(Array.from(out).every((y) => y === 0)).toBe(true);
  });
});

describe('sine-series matrix elements', () => {
  it('x and d/dx between oscillator levels follow the ladder operators', async () => {
    // x = (a + a^+) / sqrt(2 m w) and d/dx = sqrt(m w / 2) (a - a^+) with hbar = 1 (ladder operators;
    // Griffiths, Introduction to Quantum Mechanics, section 2.3, from memory): |<n|x|n+1>| = sqrt((n + 1) / (2 m w)),
    // |<n|d/dx|n+1>| = sqrt(m w (n + 1) / 2), and both vanish between levels of the same parity.
    const { sineSeriesMatrixElements } = await import('../../server/src/physics/dvr');
    const m = 0.8;
    const w = 1.3;
    const N = 160;
    const xs = sineDvrGrid(-9, 9, N);
    const s = sineDvrSolve(xs.map((x) => 0.5 * m * w * w * x * x), -9, 9, m, 12, { symmetric: true });
    const K = 10;
    const { x, d } = sineSeriesMatrixElements(s, K);
    for (let n = 0; n + 1 < K; n++) {
      expect(Math.abs(Math.abs(x[n * K + n + 1]) - Math.sqrt((n + 1) / (2 * m * w)))).toBeLessThan(1e-10);
      expect(Math.abs(Math.abs(d[n * K + n + 1]) - Math.sqrt((m * w * (n + 1)) / 2))).toBeLessThan(1e-10);
      // Antisymmetry of d/dx between real levels (integration by parts with walls) and symmetry of x.
      expect(Math.abs(d[n * K + n + 1] + d[(n + 1) * K + n])).toBeLessThan(1e-10);
      expect(Math.abs(x[n * K + n + 1] - x[(n + 1) * K + n])).toBeLessThan(1e-12);
      if (n + 2 < K) {
        expect(Math.abs(x[n * K + n + 2])).toBeLessThan(1e-12);
        expect(Math.abs(d[n * K + n + 2])).toBeLessThan(1e-12);
      }
    }
    // <n|x|n> = 0 for the symmetric well (the centre of [-9, 9]).
    for (let n = 0; n < K; n++) expect(Math.abs(x[n * K + n])).toBeLessThan(1e-12);
  });
});
