/**
 * The infinite square well (particle in a box) on [a, b].
 */
import { sineLadder } from './sines';
import type { Eigenbasis } from './types';
import { charge } from './budget';

/**
 * The energy eigenbasis of the infinite square well on [a, b] for a particle of mass `mass`
 * (hbar = 1): levels n = 1 ... count with
 * E_n = n^2 pi^2 / (2 m L^2) and phi_n(x) = sqrt(2/L) sin(n pi (x - a) / L) for a <= x <= b, 0 outside,
 * L = b - a (Griffiths, Introduction to Quantum Mechanics, infinite square well section (from memory)).
 * `table` fills exact derivatives phi_n' = sqrt(2/L) (n pi/L) cos(n pi (x-a)/L) and
 * phi_n'' = -(n pi/L)^2 phi_n (zero outside the walls); `weightedSums` accumulates the same values into
 * projection sums without a table. The centre of symmetry is (a + b)/2.
 * Invalid input (b <= a, mass <= 0, not finite) yields a basis with count 0 instead of throwing.
 */
export function boxBasis(a: number, b: number, mass: number, count: number): Eigenbasis {
  const valid = Number.isFinite(a) && Number.isFinite(b) && b > a && Number.isFinite(mass) && mass > 0;
  const n = valid ? Math.max(0, Math.floor(count)) : 0;
  const L = b - a;
  const energies = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const q = ((k + 1) * Math.PI) / L;
    energies[k] = (q * q) / (2 * mass);
  }
  const amp = valid ? Math.sqrt(2 / L) : 0;
  // Scratch for sin(m theta), cos(m theta) at one point, shared by every call (one thread, no reentry).
  const S = new Float64Array(n + 1);
  const C = new Float64Array(n + 1);
  return {
    kind: 'box',
    count: n,
    firstLabel: 1,
    energies,
    mass,
    center: valid ? 0.5 * (a + b) : null,
    walls: valid ? [a, b] : null,
    support: [a, b],
    breakpoints: [],
    potential: (x: number) => (x >= a && x <= b ? 0 : Infinity),
    table(xs, levels, out, d1, d2, from = 0) {
      const nx = xs.length;
      const lv = Math.min(levels, n);
      const k0 = Math.max(0, Math.floor(from));
      // One level is one sine; a run of levels comes from the rotation ladder.
      const single = lv - k0 === 1;
      for (let j = 0; j < nx; j++) {
        const x = xs[j];
        const inside = x >= a && x <= b;
        if (inside && !single) sineLadder((Math.PI * (x - a)) / L, lv, S, C);
        for (let k = k0; k < lv; k++) {
          const m = k + 1;
          const idx = (k - k0) * nx + j;
          if (!inside) {
            out[idx] = 0;
            if (d1) d1[idx] = 0;
            if (d2) d2[idx] = 0;
            continue;
          }
          const s = single ? Math.sin((m * Math.PI * (x - a)) / L) : S[m];
          const q = (m * Math.PI) / L;
          out[idx] = amp * s;
          // The cosine only feeds the first derivative: a lone level asked without it skips it.
          if (d1) d1[idx] = amp * q * (single ? Math.cos((m * Math.PI * (x - a)) / L) : C[m]);
          if (d2) d2[idx] = -q * q * amp * s;
        }
      }
    },
    weightedSums(xs, wRe, wIm, levels, outRe, outIm, budget) {
      // The same rotation as `table`, accumulated straight into the sums: no table is written or read.
      const lv = Math.min(levels, n);
      for (let j = 0; j < xs.length; j++) {
        // The ladder's rotation and the two sums: about 8 flops a level.
        charge(budget, 8 * lv);
        const x = xs[j];
        if (!(x >= a && x <= b) || (wRe[j] === 0 && (!wIm || wIm[j] === 0))) continue;
        sineLadder((Math.PI * (x - a)) / L, lv, S, C);
        const wr = amp * wRe[j];
        const wi = wIm ? amp * wIm[j] : 0;
        for (let k = 0; k < lv; k++) {
          outRe[k] += S[k + 1] * wr;
          outIm[k] += S[k + 1] * wi;
        }
      }
    },
    matrixElements: (levels) => boxMatrixElements(a, L, Math.max(0, Math.min(levels, n))),
  };
}

/**
 * X and D of the first K box levels in closed form. With u = x - a, for labels m != n of opposite parity
 * (m + n odd) <m|u|n> = -8 L m n / (pi^2 (m^2 - n^2)^2) and integral phi_m phi_n' = 4 m n / (L (m^2 - n^2));
 * both vanish for m + n even, and <n|x|n> = a + L/2 (the sine integrals done by parts; Griffiths,
 * Introduction to Quantum Mechanics, infinite square well problems (from memory)).
 */
function boxMatrixElements(a: number, L: number, K: number): { x: Float64Array; d: Float64Array } {
  const x = new Float64Array(K * K);
  const d = new Float64Array(K * K);
  for (let j = 0; j < K; j++) {
    const m = j + 1;
    x[j * K + j] = a + 0.5 * L;
    for (let k = 0; k < K; k++) {
      const q = k + 1;
      if ((m + q) % 2 === 0) continue;
      const diff = m * m - q * q;
      x[j * K + k] = (-8 * L * m * q) / (Math.PI * Math.PI * diff * diff);
      d[j * K + k] = (4 * m * q) / (L * diff);
    }
  }
  return { x, d };
}
