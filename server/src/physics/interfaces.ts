/**
 * Interfaces: points inside [a, b] where a coefficient of the Hamiltonian jumps (a step of V today; a
 * jump of the mass later). A sine series cannot put a grid point on an arbitrary jump, but its matrix
 * elements need no grid of their own: they are integrals, and an integral over panels that end on
 * every jump is exact to the rule's accuracy however the coefficient jumps there. This module builds
 * that arrangement once (panels with an edge on each jump) and the one integral the sine basis needs,
 * the cosine moments C(q) = (1/L) integral_a^b f(x) cos(q pi (x - a)/L) dx of a piecewise smooth f.
 *
 * For the potential, V_kl = <s_k|V|s_l> = C(k - l) - C(k + l) with s_k = sqrt(2/L) sin(k pi (x - a)/L)
 * (product-to-sum identity). For a position-dependent mass, <s_k'|1/(2m)|s_l'> is the same pair of
 * moments of 1/m with a plus sign, times k l (pi/L)^2: the same arrangement serves both.
 */
import type { Quadrature } from './types';
import { compositeGaussLegendre } from './quadrature';
import { sineLadder } from './sines';

/** Gauss–Legendre points per panel of the interface arrangement. */
const ORDER = 20;
/**
 * Panels per shortest wavelength 2 L / qMax of the highest moment. The remainder of the n-point
 * Gauss–Legendre rule on a panel of length l is l^(2n+1) (n!)^4 / ((2n+1) ((2n)!)^3) f^(2n)
 * (Abramowitz & Stegun 25.4.30, from memory); for cos(w x) over one wavelength (w l = 2 pi) and n = 20
 * that is below 1e-39 l (derived), so one panel per wavelength carries the moments of a smooth f to
 * rounding.
 */
const PANELS_PER_WAVELENGTH = 1;

/** A panel arrangement of [a, b] with an edge on every jump. */
export interface InterfaceGrid extends Quadrature {
  a: number;
  b: number;
  /** The jumps strictly inside (a, b), ascending, each a panel edge. */
  jumps: number[];
}

/**
 * Composite Gauss–Legendre panels over [a, b], cut at every jump, fine enough for the cosine moments up
 * to q = qMax (see {@link cosineMoments}). No node lies on a jump, so each value of f is one-sided.
 */
export function interfaceGrid(a: number, b: number, jumps: number[], qMax: number): InterfaceGrid {
  const inside = jumps.filter((x) => x > a && x < b).sort((p, q) => p - q);
  const panels = Math.max(4, Math.ceil((PANELS_PER_WAVELENGTH * Math.max(1, qMax)) / 2));
  const rule = compositeGaussLegendre(a, b, { breakpoints: inside, panels, order: ORDER });
  return { ...rule, a, b, jumps: inside };
}

/**
 * The cosine moments C(q) = (1/L) sum_i w_i f_i cos(q pi (x_i - a)/L), q = 0 .. count - 1, of values f_i
 * of a piecewise smooth f at the nodes of `grid` (the composite rule's integral of
 * (1/L) f(x) cos(q pi (x - a)/L); cos(q theta) from `sineLadder`). Cost: nodes x count.
 */
export function cosineMoments(grid: InterfaceGrid, f: Float64Array, count: number): Float64Array {
  const L = grid.b - grid.a;
  const C = new Float64Array(count);
  if (count === 0) return C;
  const top = count - 1;
  const s = new Float64Array(top + 1);
  const c = new Float64Array(top + 1);
  for (let i = 0; i < grid.x.length; i++) {
    const wf = (grid.w[i] * f[i]) / L;
    if (wf === 0) continue;
    C[0] += wf;
    if (top === 0) continue;
    sineLadder((Math.PI * (grid.x[i] - grid.a)) / L, top, s, c);
    for (let q = 1; q <= top; q++) C[q] += wf * c[q];
  }
  return C;
}

/** Work of {@link cosineMoments} on a grid for `count` moments, in multiply-adds (for budgets). */
export function cosineMomentsWork(grid: InterfaceGrid, count: number): number {
  return grid.x.length * count;
}
