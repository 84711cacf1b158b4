/**
 * What the solver learns about V(x) from samples before any solve (potential.ts): its range, mirror
 * symmetry, jumps (located by bisection), the slopes at the walls and the first grid size.
 */
import type { PotentialFn, PotentialNote } from './potential';

/** A jump of V located by bisection, with the one-sided values. */
export interface Jump {
  x: number;
  left: number;
  right: number;
}

/** The samples' findings. */
export interface PotentialScan {
  /** Interior sample points a + j L/M, j = 1..M-1, and V there. */
  sx: Float64Array;
  sv: Float64Array;
  /** Sample spacing L/M. */
  hs: number;
  vmin: number;
  /** Largest finite sample. */
  vmaxFinite: number;
  /** max(|vmin|, |vmaxFinite|). */
  vscale: number;
  /** Some samples are +Infinity (they act as walls). */
  clamped: boolean;
  symmetric: boolean;
  jumps: Jump[];
  /** V'(a), V'(b) for the Euler–Maclaurin wall term (dvr.ts), when both are finite and no jump is at a wall. */
  slopes: [number, number] | undefined;
}

/** V on xs, or null when it throws or returns the wrong length. */
export function evalV(V: PotentialFn, xs: Float64Array): Float64Array | null {
  try {
    const out = V(xs);
    if (!out || out.length !== xs.length) return null;
    return out instanceof Float64Array ? out : Float64Array.from(out as ArrayLike<number>);
  } catch {
    return null;
  }
}

/** Samples V on `samples` intervals of [a, b] and reads off range, symmetry, jumps and wall slopes; a note when V is bad. */
export function scanPotential(V: PotentialFn, a: number, b: number, samples: number, symmetryTolerance: number): PotentialScan | PotentialNote {
  const L = b - a;
  // Samples: interior points a + j L/M, mirror pairs j <-> M - j.
  const M = Math.max(64, Math.floor(samples));
  const hs = L / M;
  const sx = new Float64Array(M - 1);
  for (let j = 1; j < M; j++) sx[j - 1] = a + j * hs;
  const sv = evalV(V, sx);
  if (!sv) return { kind: 'evaluation', message: 'The potential could not be evaluated on the grid.' };
  let vmin = Infinity;
  let vmaxFinite = -Infinity;
  let clamped = false;
  for (let j = 0; j < sv.length; j++) {
    const y = sv[j];
    if (Number.isNaN(y) || y === -Infinity) {
      return { kind: 'evaluation', message: `The potential is ${Number.isNaN(y) ? 'NaN' : '-Infinity'} at x = ${sx[j]}.`, at: sx[j] };
    }
    if (y === Infinity) {
      clamped = true;
      continue;
    }
    if (y < vmin) vmin = y;
    if (y > vmaxFinite) vmaxFinite = y;
  }
  if (!Number.isFinite(vmin)) return { kind: 'evaluation', message: 'The potential is +Infinity everywhere inside the walls.' };
  const vscale = Math.max(Math.abs(vmin), Math.abs(vmaxFinite));
  const symmetric = mirrorSymmetric(sv, symmetryTolerance * Math.max(vscale, Number.MIN_VALUE));
  const jumps = findJumps(V, sx, sv, vscale);
  // Slopes at the walls for the Euler–Maclaurin correction, unless a jump sits right at a wall.
  let slopes: [number, number] | undefined;
  const nearWall = jumps.some((jp) => jp.x - a < 1e-3 * L || b - jp.x < 1e-3 * L);
  const sa = nearWall ? null : wallSlope(V, a, 1, L);
  const sb = nearWall ? null : wallSlope(V, b, -1, L);
  if (sa !== null && sb !== null) slopes = symmetric ? [sa, -sa] : [sa, sb];
  return { sx, sv, hs, vmin, vmaxFinite, vscale, clamped, symmetric, jumps, slopes };
}

/** Mirror test V(a + b - x) = V(x) on the samples, to `tol` absolute. */
function mirrorSymmetric(sv: Float64Array, tol: number): boolean {
  for (let j = 0; j < sv.length; j++) {
    const p = sv[j];
    const q = sv[sv.length - 1 - j];
    if (p === q) continue;
    if (!(Math.abs(p - q) <= tol)) return false;
  }
  return true;
}

/** Jumps: a sample difference far above both neighbours, located by bisection (at most 64). */
function findJumps(V: PotentialFn, sx: Float64Array, sv: Float64Array, vscale: number): Jump[] {
  const jumps: Jump[] = [];
  for (let j = 0; j + 1 < sv.length && jumps.length < 64; j++) {
    const dj = sampleStep(sv, j);
    if (!(dj > 1e-10 * vscale)) continue;
    const nb = Math.max(sampleStep(sv, j - 1), sampleStep(sv, j + 1), sampleStep(sv, j - 2), sampleStep(sv, j + 2));
    if (dj <= 20 * nb) continue;
    jumps.push(bisectJump(V, sx[j], sx[j + 1], sv[j], sv[j + 1]));
  }
  return jumps;
}

/**
 * |sv[j + 1] - sv[j]|, 0 outside the samples or where it is not finite. A module function, not a closure
 * made per call: the compiler's inlined call of a closure stops matching at the next solve.
 */
function sampleStep(sv: Float64Array, j: number): number {
  if (j < 0 || j + 1 >= sv.length) return 0;
  const d = Math.abs(sv[j + 1] - sv[j]);
  return Number.isFinite(d) ? d : 0;
}

/** Narrows [lo, hi] around the jump to rounding, keeping the one-sided values. */
function bisectJump(V: PotentialFn, lo: number, hi: number, vlo: number, vhi: number): Jump {
  for (let it = 0; it < 60; it++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    const r = evalV(V, Float64Array.of(mid));
    const vm = r ? r[0] : NaN;
    if (!Number.isFinite(vm)) break;
    if (Math.abs(vm - vlo) <= Math.abs(vm - vhi)) {
      lo = mid;
      vlo = vm;
    } else {
      hi = mid;
      vhi = vm;
    }
  }
  return { x: 0.5 * (lo + hi), left: vlo, right: vhi };
}

/**
 * V'(x0) from one side: the derivative at x0 of the cubic through V(x0 + dir j delta), j = 1..4,
 * delta = 1e-4 L (Lagrange interpolation; common practice). Null when V is not finite there.
 */
function wallSlope(V: PotentialFn, x0: number, dir: 1 | -1, L: number): number | null {
  const delta = 1e-4 * L;
  const xs = Float64Array.from([1, 2, 3, 4], (j) => x0 + dir * j * delta);
  const f = evalV(V, xs);
  if (!f || !f.every(Number.isFinite)) return null;
  // Weights L_j'(0) of the Lagrange basis on the nodes t = 1, 2, 3, 4.
  let d = 0;
  for (let j = 1; j <= 4; j++) {
    let lj0 = 1;
    let sum = 0;
    for (let m = 1; m <= 4; m++) {
      if (m === j) continue;
      lj0 *= -m / (j - m);
      sum += 1 / -m;
    }
    d += f[j - 1] * lj0 * sum;
  }
  return (dir * d) / delta;
}

/**
 * Finds the energy E_K of level K by the WKB count with hard walls,
 * n(E) = (1/pi) integral sqrt(2 m (E - V)_+) dx = K (Bohr-Sommerfeld; exact for the box), by bisection.
 * Used only to size the first grid, so a rough value is enough.
 */
function wkbEnergy(vs: Float64Array, h: number, mass: number, K: number, vmin: number, L: number, settled: (lo: number, hi: number) => boolean): number {
  const count = (E: number): number => (wkbSum(vs, mass, E) * h) / Math.PI;
  let lo = vmin;
  let hi = vmin + (Math.PI * Math.PI * K * K) / (2 * mass * L * L);
  for (let i = 0; i < 200 && count(hi) < K; i++) hi = vmin + 2 * (hi - vmin);
  for (let i = 0; i < 60 && !settled(lo, hi); i++) {
    const mid = 0.5 * (lo + hi);
    if (count(mid) < K) lo = mid;
    else hi = mid;
  }
  return hi;
}

/**
 * sum_j sqrt(2 m (E - V_j)_+) over the samples (`wkbEnergy`'s n(E) without its factor h / pi). A module
 * function ending with its loop: the optimised code entered in the middle of the loop (on-stack
 * replacement) was thrown away at every call when arithmetic it had no feedback for followed the loop
 * in a closure made per call (nine deoptimisations per first grid, node --trace-deopt).
 */
function wkbSum(vs: Float64Array, mass: number, E: number): number {
  let s = 0;
  for (let j = 0; j < vs.length; j++) if (E > vs[j]) s += Math.sqrt(2 * mass * (E - vs[j]));
  return s;
}

/**
 * The first grid: `pointsPerWavelength` points per shortest local wavelength 2 pi / sqrt(2 m (E_K - V_min))
 * at the WKB estimate of E_K, plus 16, at least `minPoints` and K + 8; below the cap by one growth step
 * so that every level gets a two-size uncertainty. A function of V, K and the options only.
 */
export function firstGridSize(
  scan: PotentialScan,
  L: number,
  mass: number,
  K: number,
  o: { pointsPerWavelength: number; minPoints: number; growth: number },
  cap: number,
): number {
  const vs = scan.sv.map((y) => (y === Infinity ? scan.vmaxFinite + 1e300 : y));
  const gridFor = (E: number): number => Math.ceil((o.pointsPerWavelength * L * Math.sqrt(2 * mass * Math.max(E - scan.vmin, 0))) / (2 * Math.PI)) + 16;
  // The bisection stops once both ends of its bracket give the same grid: the size is monotone in E,
  // so it is the one the bracket's final upper end would give.
  const EK = wkbEnergy(vs, scan.hs, mass, K, scan.vmin, L, (lo, hi) => gridFor(lo) === gridFor(hi));
  let N = gridFor(EK);
  N = Math.max(N, Math.floor(o.minPoints), K + 8);
  if (N >= cap) N = Math.max(8, Math.floor(cap / o.growth));
  return N;
}
