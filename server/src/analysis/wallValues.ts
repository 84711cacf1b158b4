/**
 * A state that does not vanish at a hard wall, split into the straight line through its two wall
 * values and the rest, which vanishes at both walls: how much of the state the line is, and the
 * (finite) energy of the rest, so a packet that barely touches a wall still gets an energy.
 */
import type { Eigenbasis } from '../physics/types';
import type { GridValues } from '../expr/types';
import { gridEnergy, type Expanded } from './expand';

/** What the straight line through the wall values accounts for. */
export interface WallLine {
  /** ||l||^2 / ||psi||^2 for l(x) = psi(a) (b - x) / L + psi(b) (x - a) / L. */
  weight: number;
  /** Energy mean and spread of psi - l, normalised (null where not finite). */
  mean: number | null;
  spread: number | null;
}

/**
 * The line l through (a, psi(a)) and (b, psi(b)) and the energy of psi - l on the expansion's grid.
 * ||l||^2 = L/3 (|psi(a)|^2 + |psi(b)|^2 + Re(psi(a) conj psi(b))) (derived: integrate the square of
 * a linear function over [a, b]). psi - l has the same second derivative as psi and the slope
 * psi' - (psi(b) - psi(a)) / L, so its <H> and <H^2> come from the grid as for any state (expand.ts).
 */
export function wallLine(basis: Eigenbasis, ex: Expanded, psiA: [number, number], psiB: [number, number]): WallLine {
  const [a, b] = basis.walls!;
  const L = b - a;
  const [ar, ai] = psiA;
  const [br, bi] = psiB;
  const lineNorm = (L / 3) * (ar * ar + ai * ai + br * br + bi * bi + ar * br + ai * bi);
  const weight = ex.norm > 0 ? lineNorm / ex.norm : NaN;
  const v = ex.values;
  const n = ex.q.x.length;
  const rest: GridValues = {
    re: new Float64Array(n),
    im: new Float64Array(n),
    d1re: new Float64Array(n),
    d1im: new Float64Array(n),
    d2re: v.d2re!,
    d2im: v.d2im!,
  };
  const sr = (br - ar) / L;
  const si = (bi - ai) / L;
  let norm = 0;
  for (let j = 0; j < n; j++) {
    const x = ex.q.x[j]!;
    const u = (x - a) / L;
    rest.re[j] = v.re[j]! - (ar * (1 - u) + br * u);
    rest.im[j] = v.im[j]! - (ai * (1 - u) + bi * u);
    rest.d1re![j] = v.d1re![j]! - sr;
    rest.d1im![j] = v.d1im![j]! - si;
    norm += ex.q.w[j]! * (rest.re[j]! ** 2 + rest.im[j]! ** 2);
  }
  if (!(norm > 0)) return { weight, mean: null, spread: null };
  const g = gridEnergy(basis, ex.q, rest, norm);
  const spread = Math.sqrt(Math.max(0, g.meanSquare - g.mean * g.mean));
  return { weight, mean: Number.isFinite(g.mean) ? g.mean : null, spread: Number.isFinite(spread) ? spread : null };
}
