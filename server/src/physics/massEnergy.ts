/**
 * The energy of a state on a quadrature grid when the mass depends on the position (a basis with
 * `masses`): the kinetic term of H = -(1/2) d/dx (1/m(x)) d/dx + V (hbar = 1) in its symmetric form.
 */
import type { Eigenbasis, Quadrature } from './types';
import type { GridValues } from '../expr/types';

/**
 * <H> = integral |psi'|^2 / (2 m(x)) + V |psi|^2 dx (the weak form, valid for any state of finite
 * energy) and <H^2> = integral |H psi|^2 with H psi = -(1/2) (psi''/m - m' psi'/m^2) + V psi, divided by
 * the norm. Where the mass jumps (`massJumps`), H psi of a state whose psi'/m is not continuous there holds
 * a delta function, so <H^2> is reported as NaN (the spread is then not finite; the eigenstates of the
 * same system, the only exceptions, have kinks that already make the caller drop the spread). m' comes from
 * central differences of `masses` at +- 1e-6 of the grid's extent (its error, about 1e-12 relative for a
 * smooth profile, is far below what a spread is read to).
 */
export function massGridEnergy(basis: Eigenbasis, q: Quadrature, v: GridValues, norm: number): { mean: number; meanSquare: number } {
  const n = q.x.length;
  const m = basis.masses!(q.x);
  const jumps = (basis.massJumps ?? []).length > 0;
  let dm: Float64Array | null = null;
  if (!jumps && n > 0) {
    const h = 1e-6 * Math.max(q.x[n - 1]! - q.x[0]!, Number.MIN_VALUE);
    const up = basis.masses!(q.x.map((x) => x + h));
    const down = basis.masses!(q.x.map((x) => x - h));
    dm = up.map((u, j) => (u - down[j]!) / (2 * h));
  }
  const pot = basis.potentials ? basis.potentials(q.x) : null;
  let t = 0;
  let h2 = 0;
  for (let j = 0; j < n; j++) {
    let V = pot ? pot[j]! : basis.potential(q.x[j]!);
    if (!Number.isFinite(V)) V = 0;
    const w = q.w[j]!;
    const mj = m[j]!;
    const r = v.re[j]!;
    const i = v.im[j]!;
    t += w * ((v.d1re![j]! ** 2 + v.d1im![j]! ** 2) / (2 * mj) + V * (r * r + i * i));
    if (dm === null) continue;
    const g = dm[j]! / (mj * mj);
    const hr = -0.5 * (v.d2re![j]! / mj - g * v.d1re![j]!) + V * r;
    const hi = -0.5 * (v.d2im![j]! / mj - g * v.d1im![j]!) + V * i;
    h2 += w * (hr * hr + hi * hi);
  }
  return { mean: t / norm, meanSquare: dm === null ? NaN : h2 / norm };
}
