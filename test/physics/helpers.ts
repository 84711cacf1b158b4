/**
 * Shared helpers of the physics tests: the one orthonormality check every basis and eigensolver test
 * uses. Orthonormality <u_i|u_k> = delta_ik is an invariant of any eigenbasis of a self-adjoint operator
 * (common practice), so the expected values need no outside source.
 */
import type { Eigenbasis, Quadrature } from '../../server/src/physics/types';

/** Index pairs (i, k) with k <= i < count: every overlap once. */
export function lowerPairs(count: number): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < count; i++) for (let k = 0; k <= i; k++) out.push([i, k]);
  return out;
}

/**
 * Largest |sum_j w_j u_i[j] u_k[j] - delta_ik| over `pairs`, for vectors stored one after another in
 * `rows` (vector i at i * length ... (i + 1) * length - 1). Without weights it is the plain dot product.
 */
export function orthonormalityError(rows: Float64Array, length: number, weights: ArrayLike<number> | null, pairs: Iterable<readonly [number, number]>): number {
  let worst = 0;
  for (const [i, k] of pairs) {
    let s = 0;
    for (let j = 0; j < length; j++) s += (weights === null ? 1 : weights[j]!) * rows[i * length + j]! * rows[k * length + j]!;
    worst = Math.max(worst, Math.abs(s - (i === k ? 1 : 0)));
  }
  return worst;
}

/**
 * Largest deviation of <phi_i|phi_k> from delta_ik for the first `levels` eigenfunctions of `basis`,
 * integrated with `rule` (its nodes and weights), over `pairs` (default: every pair).
 */
export function basisOrthonormalityError(basis: Pick<Eigenbasis, 'table'>, rule: Quadrature, levels: number, pairs: Iterable<readonly [number, number]> = lowerPairs(levels)): number {
  const n = rule.x.length;
  const t = new Float64Array(levels * n);
  basis.table(rule.x, levels, t);
  return orthonormalityError(t, n, rule.w, pairs);
}
