/**
 * When a Gaussian packet's closed form proves the sine transform's premise, so the transform needs no
 * check between its samples (boxTransform.ts). The packet psi = A exp(-(x - x0)^2 / (4 s^2) + i k x),
 * A = (2 pi s^2)^(-1/4), has box coefficients c(q) = sqrt(2/L) (F(q) - O_a(q) - O_b(q)) (derived in this
 * comment): the integral over the line less the two tails beyond the walls.
 *   - F, the Gaussian Fourier integral: |F(q)| <= A 2 s sqrt(pi) exp(-(q - |k|)^2 s^2) for q >= |k|
 *     (common practice).
 *   - O at a wall at distance d, by parts: psi(w)/q + psi'(w)/q^2 + a rest below the integral of |psi''|
 *     beyond the wall over q^2. The transform removes the wall values' 1/q exactly (the kernels), leaving
 *     at most |psi'(w)|/q^2 + |psi''|'s tail over q^2 per alias; with l = |k| + d / (2 s^2) + 2 / s,
 *     |psi^(j)| <= l^j |psi| beyond the wall (psi' = (-u / (2 s^2) + i k) psi, psi'' adds 1/(2 s^2)), and
 *     the tail of |psi| is at most A exp(-d^2 / (4 s^2)) 2 s^2 / d: so O's part per alias is at most
 *     A exp(-d^2 / (4 s^2)) (l + l^2 2 s^2 / d) / q^2.
 * A level n <= K of a transform of N intervals carries aliases at q_j = (2jN -+ n) pi / L >= (2N - K) pi / L,
 * two for each j; their sum over j is at most 2 (1 + 1/(2 - K/N)) times the first's for terms falling as
 * q^-2 (the integral test). `packetAliasBound` is that sum: it bounds the error of every level kept, and
 * when it is small no content above the samples can hide behind a level.
 */

/** A Gaussian packet's centre, width s and momentum k, in the state's own (internal) units. */
export interface PacketSpec {
  center: number;
  width: number;
  momentum: number;
}

/**
 * A bound on the sum of the aliases of every one of the first `levels` box coefficients of the packet as
 * written, in a transform of N intervals on `walls` (see the module comment); Infinity when the bound
 * does not apply (the packet outside the walls, momentum at or above the first alias).
 */
export function packetAliasBound(p: PacketSpec, walls: [number, number], levels: number, N: number): number {
  const [a, b] = walls;
  const L = b - a;
  const s = p.width;
  const k = Math.abs(p.momentum);
  if (!(s > 0 && Number.isFinite(s) && Number.isFinite(k) && L > 0 && p.center > a && p.center < b)) return Infinity;
  const q = ((2 * N - levels) * Math.PI) / L;
  if (!(q > k)) return Infinity;
  const A = Math.pow(2 * Math.PI * s * s, -0.25);
  let one = A * 2 * s * Math.sqrt(Math.PI) * Math.exp(-((q - k) ** 2) * s * s);
  for (const d of [p.center - a, b - p.center]) {
    const l = k + d / (2 * s * s) + 2 / s;
    one += (A * Math.exp(-(d * d) / (4 * s * s)) * (l + (l * l * 2 * s * s) / d)) / (q * q);
  }
  const bound = Math.sqrt(2 / L) * one * 2 * (1 + 1 / (2 - levels / N));
  return Number.isFinite(bound) ? bound : Infinity;
}
