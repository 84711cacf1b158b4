/**
 * The oscillator's fused projection sums, four nodes at a time: the recurrence of `hermiteWeightedSums`
 * (hermite.ts) run for four nodes side by side, so each level's factors and sums are loaded once for
 * four nodes and the four recurrences (each a chain of dependent multiplications) overlap in the
 * processor. Each node's recurrence, rescaling and weights are exactly those of `hermiteWeightedSums`,
 * and every sum adds the nodes in the same order (outRe[k] + t_0 + t_1 + t_2 + t_3, left to right), so
 * the sums are bit for bit the same; a real state (no imaginary weights) skips the imaginary sums.
 */
import { gaussianSplit, recurrenceFactors, scaled, hermiteWeightedSums, PI_M14, TWO64 } from './hermite';

const TWOM64 = 1 / TWO64;

/**
 * outRe[k] += sum_j psi_k(xi_j) wRe[j] and outIm[k] += sum_j psi_k(xi_j) wIm[j] (wIm may be null), k <
 * levels, as `hermiteWeightedSums` gives them. Nodes whose weights are both zero are skipped; `onNode`
 * is called once per node summed (the caller's budget charge), before its block is summed.
 */
export function hermiteSums(
  xi: Float64Array,
  wRe: Float64Array,
  wIm: Float64Array | null,
  levels: number,
  outRe: Float64Array,
  outIm: Float64Array,
  onNode?: (levels: number) => void,
): void {
  if (levels < 1) return;
  const nodes: number[] = [];
  let complex = false;
  for (let j = 0; j < xi.length; j++) {
    const wi = wIm ? wIm[j]! : 0;
    if (wi !== 0) complex = true;
    if (wRe[j]! !== 0 || wi !== 0) nodes.push(j);
  }
  let p = 0;
  for (; p + 4 <= nodes.length; p += 4) {
    for (let i = 0; i < 4; i++) onNode?.(levels);
    const [j0, j1, j2, j3] = [nodes[p]!, nodes[p + 1]!, nodes[p + 2]!, nodes[p + 3]!];
    block4(xi, wRe, complex ? wIm : null, j0, j1, j2, j3, levels, outRe, complex ? outIm : null);
  }
  // The last nodes one at a time, still in order (the reference kernel on one node each).
  for (; p < nodes.length; p++) {
    const j = nodes[p]!;
    hermiteWeightedSums(xi.subarray(j, j + 1), wRe.subarray(j, j + 1), wIm ? wIm.subarray(j, j + 1) : null, levels, outRe, outIm, onNode);
  }
}

/**
 * Four nodes' recurrences side by side (nodes j0..j3 in order); outIm null for a real state (its sums
 * are not touched). Plain scalars only, so the optimising compiler gets a small, monomorphic loop.
 */
function block4(xi: Float64Array, wRe: Float64Array, wIm: Float64Array | null, j0: number, j1: number, j2: number, j3: number, levels: number, outRe: Float64Array, outIm: Float64Array | null): void {
  const { a, b } = recurrenceFactors(levels);
  const x0 = xi[j0]!;
  const x1 = xi[j1]!;
  const x2 = xi[j2]!;
  const x3 = xi[j3]!;
  const g0 = gaussianSplit(x0);
  const g1 = gaussianSplit(x1);
  const g2 = gaussianSplit(x2);
  const g3 = gaussianSplit(x3);
  let e0 = g0.q;
  let e1 = g1.q;
  let e2 = g2.q;
  let e3 = g3.q;
  let m0 = PI_M14 * g0.base;
  let m1 = PI_M14 * g1.base;
  let m2 = PI_M14 * g2.base;
  let m3 = PI_M14 * g3.base;
  let p0 = 0;
  let p1 = 0;
  let p2 = 0;
  let p3 = 0;
  let r0 = scaled(wRe[j0]!, e0);
  let r1 = scaled(wRe[j1]!, e1);
  let r2 = scaled(wRe[j2]!, e2);
  let r3 = scaled(wRe[j3]!, e3);
  let i0 = wIm ? scaled(wIm[j0]!, e0) : 0;
  let i1 = wIm ? scaled(wIm[j1]!, e1) : 0;
  let i2 = wIm ? scaled(wIm[j2]!, e2) : 0;
  let i3 = wIm ? scaled(wIm[j3]!, e3) : 0;
  outRe[0] = outRe[0]! + m0 * r0 + m1 * r1 + m2 * r2 + m3 * r3;
  if (outIm) outIm[0] = outIm[0]! + m0 * i0 + m1 * i1 + m2 * i2 + m3 * i3;
  for (let k = 1; k < levels; k++) {
    const ak = a[k]!;
    const bk = b[k]!;
    const n0 = ak * x0 * m0 - bk * p0;
    const n1 = ak * x1 * m1 - bk * p1;
    const n2 = ak * x2 * m2 - bk * p2;
    const n3 = ak * x3 * m3 - bk * p3;
    p0 = m0;
    p1 = m1;
    p2 = m2;
    p3 = m3;
    m0 = n0;
    m1 = n1;
    m2 = n2;
    m3 = n3;
    // Rescaling, rare (about once every 44 levels where the functions grow): as the reference does it.
    if (Math.abs(m0) > TWO64) {
      m0 *= TWOM64;
      p0 *= TWOM64;
      e0 += 64;
      r0 = scaled(wRe[j0]!, e0);
      i0 = wIm ? scaled(wIm[j0]!, e0) : 0;
    }
    if (Math.abs(m1) > TWO64) {
      m1 *= TWOM64;
      p1 *= TWOM64;
      e1 += 64;
      r1 = scaled(wRe[j1]!, e1);
      i1 = wIm ? scaled(wIm[j1]!, e1) : 0;
    }
    if (Math.abs(m2) > TWO64) {
      m2 *= TWOM64;
      p2 *= TWOM64;
      e2 += 64;
      r2 = scaled(wRe[j2]!, e2);
      i2 = wIm ? scaled(wIm[j2]!, e2) : 0;
    }
    if (Math.abs(m3) > TWO64) {
      m3 *= TWOM64;
      p3 *= TWOM64;
      e3 += 64;
      r3 = scaled(wRe[j3]!, e3);
      i3 = wIm ? scaled(wIm[j3]!, e3) : 0;
    }
    outRe[k] = outRe[k]! + m0 * r0 + m1 * r1 + m2 * r2 + m3 * r3;
    if (outIm) outIm[k] = outIm[k]! + m0 * i0 + m1 * i1 + m2 * i2 + m3 * i3;
  }
}
