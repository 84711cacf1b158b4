/**
 * The energy spread without the cancellation of sqrt(<H^2> - <H>^2), which keeps only half the digits
 * (an exact eigenstate came out at 1e-7 instead of 0): Delta H = ||(H - <H>) psi|| / ||psi||, the
 * integral of |-psi''/(2m) + (V - <H>) psi|^2 on the grid (a standard identity, common practice). The
 * level sum sum |c_n|^2 (E_n - <E>)^2 was measured too and is worse: the highest levels' round-off
 * weights (1e-30) times E_n^2 leave about 1e-11 for a box level.
 */
import type { Eigenbasis, Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';

/** ||(H - mean) psi||^2 / norm on the grid. */
export function gridVariance(basis: Eigenbasis, q: Quadrature, v: GridValues, norm: number, mean: number): number {
  const m = basis.mass;
  const pot = basis.potentials ? basis.potentials(q.x) : null;
  let s = 0;
  for (let j = 0; j < q.x.length; j++) {
    let V = pot ? pot[j]! : basis.potential(q.x[j]!);
    if (!Number.isFinite(V)) V = 0;
    const hr = -v.d2re![j]! / (2 * m) + (V - mean) * v.re[j]!;
    const hi = -v.d2im![j]! / (2 * m) + (V - mean) * v.im[j]!;
    s += q.w[j]! * (hr * hr + hi * hi);
  }
  return s / norm;
}
