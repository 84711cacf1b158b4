/**
 * The harmonic oscillator V = m omega^2 (x - c)^2 / 2, hbar = 1.
 */
import type { Eigenbasis } from './types';
import { hermiteFunctionTable } from './hermite';
import { hermiteSums } from './hermiteSums';
import { charge } from './budget';

/** Weight of a level allowed beyond `support`: erfc(X)/2 < 1e-16 needs X > 5.9 for n = 0, less above. */
const SUPPORT_MARGIN = 6.5;

/**
 * The energy eigenbasis of the harmonic oscillator V = m omega^2 (x - c)^2 / 2 (hbar = 1): levels
 * n = 0 ... count - 1 with E_n = omega (n + 1/2) and
 * phi_n(x) = l^{-1/2} psi_n((x - c)/l), l = sqrt(hbar/(m omega)),
 * psi_n the normalised physicists' Hermite functions (positive for large positive x, the FORMAT.md
 * convention) (Sakurai, Modern Quantum Mechanics, harmonic oscillator section (from memory)).
 * `table` gives exact derivatives from the ladder relation psi_n' = sqrt(2n) psi_{n-1} - xi psi_n
 * and the oscillator equation psi_n'' = (xi^2 - 2n - 1) psi_n, each with the chain-rule factor 1/l.
 * `support` is c +- l (sqrt(2 count - 1) + 6.5): the outermost turning point plus a margin beyond
 * which every level holds under 1e-16 of its weight. Invalid input yields count 0 (never throws).
 */
export function oscillatorBasis(omega: number, center: number, mass: number, count: number): Eigenbasis {
  const valid = omega > 0 && mass > 0 && Number.isFinite(omega * mass) && Number.isFinite(center);
  const n = valid ? Math.max(0, Math.floor(count)) : 0;
  const len = valid ? 1 / Math.sqrt(mass * omega) : 1;
  const energies = new Float64Array(n);
  for (let k = 0; k < n; k++) energies[k] = omega * (k + 0.5);
  const reach = len * (Math.sqrt(Math.max(1, 2 * n - 1)) + SUPPORT_MARGIN);
  const f0 = 1 / Math.sqrt(len);
  const f1 = f0 / len;
  const f2 = f1 / len;
  return {
    kind: 'oscillator',
    count: n,
    firstLabel: 0,
    energies,
    mass,
    center: valid ? center : null,
    walls: null,
    support: valid ? [center - reach, center + reach] : [0, 0],
    breakpoints: [],
    potential: (x: number) => 0.5 * mass * omega * omega * (x - center) * (x - center),
    table(xs, levels, out, d1, d2, from = 0) {
      const lv = Math.min(levels, n);
      const k0 = Math.max(0, Math.floor(from));
      const nx = xs.length;
      const xi = new Float64Array(nx);
      for (let j = 0; j < nx; j++) xi[j] = (xs[j] - center) / len;
      hermiteFunctionTable(xi, lv, out, d1, d2, k0);
      const total = Math.max(0, lv - k0) * nx;
      for (let i = 0; i < total; i++) {
        out[i] *= f0;
        if (d1) d1[i] *= f1;
        if (d2) d2[i] *= f2;
      }
    },
    weightedSums(xs, wRe, wIm, levels, outRe, outIm, budget) {
      // The recurrence accumulated straight into the sums (no table), four nodes at a time: about 6 flops a level and node.
      const lv = Math.min(levels, n);
      const xi = new Float64Array(xs.length);
      for (let j = 0; j < xs.length; j++) xi[j] = (xs[j]! - center) / len;
      const sr = new Float64Array(lv);
      const si = new Float64Array(lv);
      hermiteSums(xi, wRe, wIm, lv, sr, si, (k) => charge(budget, 8 * k));
      for (let k = 0; k < lv; k++) {
        outRe[k]! += f0 * sr[k]!;
        outIm[k]! += f0 * si[k]!;
      }
    },
    matrixElements(levels) {
      // Ladder operators: x - c = l (a + a^+)/sqrt 2 and d/dx = (a - a^+)/(sqrt 2 l), so
      // <n-1|x|n> = <n|x|n-1> = l sqrt(n/2), <n|x|n> = c, <n-1|d/dx|n> = sqrt(n/2)/l = -<n|d/dx|n-1>
      // (Sakurai, Modern Quantum Mechanics, harmonic oscillator section (from memory)).
      const K = Math.max(0, Math.min(levels, n));
      const x = new Float64Array(K * K);
      const d = new Float64Array(K * K);
      for (let k = 0; k < K; k++) {
        x[k * K + k] = center;
        if (k === 0) continue;
        const r = Math.sqrt(k / 2);
        x[(k - 1) * K + k] = len * r;
        x[k * K + k - 1] = len * r;
        d[(k - 1) * K + k] = r / len;
        d[k * K + k - 1] = -r / len;
      }
      return { x, d };
    },
  };
}
