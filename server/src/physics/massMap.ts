/**
 * The mass coordinate xi(x) = integral_a^x m(t) dt of a position-dependent mass, on Gauss–Legendre
 * panels that end on every jump and kink of m (and of V), so m is smooth on each panel. On a panel the
 * values of xi at its nodes are the integrals of the degree-19 interpolant of m through its 20 nodes
 * (the spectral integration matrix of the Legendre nodes), so xi is one polynomial of degree 20 there,
 * which the barycentric formula through the 20 nodes and both ends reproduces at any x (Berrut &
 * Trefethen, SIAM Review 46, 501 (2004), from memory). Its error is that of the 20-point rule on m,
 * rounding for a smooth m on panels of a few per wavelength.
 */
import { gaussLegendre } from './quadrature';

/** Nodes per panel. */
export const MAP_ORDER = 20;

/** The reference panel [-1, 1]: nodes, weights, the integration matrix and the barycentric weights. */
interface Reference {
  t: Float64Array;
  w: Float64Array;
  /** S[i * ORDER + j] = integral_{-1}^{t_i} l_j(s) ds, l_j the Lagrange polynomials of the nodes. */
  S: Float64Array;
  /** The interpolation points -1, t_0..t_{n-1}, 1 and their barycentric weights. */
  bt: Float64Array;
  bw: Float64Array;
}

let REF: Reference | null = null;

function reference(): Reference {
  if (REF) return REF;
  const n = MAP_ORDER;
  const g = gaussLegendre(n);
  const t = g.x;
  const lagrange = (j: number, s: number): number => {
    let p = 1;
    for (let k = 0; k < n; k++) if (k !== j) p *= (s - t[k]!) / (t[j]! - t[k]!);
    return p;
  };
  const S = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const half = 0.5 * (t[i]! + 1);
    // The n-point rule on [-1, t_i] integrates the degree n - 1 polynomial l_j exactly.
    for (let k = 0; k < n; k++) {
      const s = -1 + half * (g.x[k]! + 1);
      const wk = half * g.w[k]!;
      for (let j = 0; j < n; j++) S[i * n + j] += wk * lagrange(j, s);
    }
  }
  const bt = new Float64Array(n + 2);
  bt[0] = -1;
  bt.set(t, 1);
  bt[n + 1] = 1;
  const bw = new Float64Array(n + 2);
  for (let j = 0; j < n + 2; j++) {
    let p = 1;
    for (let k = 0; k < n + 2; k++) if (k !== j) p *= bt[j]! - bt[k]!;
    bw[j] = 1 / p;
  }
  REF = { t, w: g.w, S, bt, bw };
  return REF;
}

/** The mass coordinate on a panel arrangement of [a, b]. */
export interface MassMap {
  a: number;
  b: number;
  /** Panel ends, ascending (panels + 1 of them). */
  ends: Float64Array;
  /** Quadrature nodes and weights, MAP_ORDER per panel in panel order. */
  x: Float64Array;
  w: Float64Array;
  /** m and xi at the nodes; xi at the panel ends. */
  m: Float64Array;
  xi: Float64Array;
  xiEnds: Float64Array;
  /** xi(b), the length of the interval in the mass coordinate. */
  total: number;
  /** Smallest and largest m at the nodes. */
  mMin: number;
  mMax: number;
}

/**
 * Panels over [a, b] cut at every point of `cuts`, `panels` in all (each piece at least one, in
 * proportion to its length, or, given a `pilot` map of the same mass, to its length in xi, with ends
 * at equal steps of the pilot's xi, so every panel spans about X / panels of the mass coordinate), with
 * m and xi at every node. Null when m is not positive and finite at some node (the caller has checked
 * the profile before; this guards the solver).
 */
export function buildMassMap(mass: (xs: Float64Array) => Float64Array, a: number, b: number, cuts: number[], panels: number, pilot?: MassMap): MassMap | null {
  const ref = reference();
  const n = MAP_ORDER;
  const edges = [a];
  for (const c of [...cuts].sort((p, q) => p - q)) if (c > edges[edges.length - 1]! && c < b) edges.push(c);
  edges.push(b);
  const ends: number[] = [a];
  const xiEdges = pilot ? xiAt(pilot, Float64Array.from(edges)) : Float64Array.from(edges, (x) => x - a);
  const span = pilot ? pilot.total : b - a;
  for (let s = 0; s + 1 < edges.length; s++) {
    const lo = edges[s]!;
    const hi = edges[s + 1]!;
    const k = Math.max(1, Math.ceil(panels * ((xiEdges[s + 1]! - xiEdges[s]!) / span) - 1e-12));
    for (let j = 1; j <= k; j++) {
      if (j === k) ends.push(hi);
      else if (!pilot) ends.push(lo + (hi - lo) * (j / k));
      else ends.push(invertXi(pilot, xiEdges[s]! + (xiEdges[s + 1]! - xiEdges[s]!) * (j / k), lo, hi));
    }
  }
  const P = ends.length - 1;
  const x = new Float64Array(P * n);
  const w = new Float64Array(P * n);
  for (let p = 0; p < P; p++) {
    const mid = 0.5 * (ends[p]! + ends[p + 1]!);
    const h = 0.5 * (ends[p + 1]! - ends[p]!);
    for (let i = 0; i < n; i++) {
      x[p * n + i] = mid + h * ref.t[i]!;
      w[p * n + i] = h * ref.w[i]!;
    }
  }
  const m = mass(x);
  let mMin = Infinity;
  let mMax = 0;
  for (let i = 0; i < m.length; i++) {
    const v = m[i]!;
    if (!(v > 0 && Number.isFinite(v))) return null;
    if (v < mMin) mMin = v;
    if (v > mMax) mMax = v;
  }
  const xi = new Float64Array(P * n);
  const xiEnds = new Float64Array(P + 1);
  for (let p = 0; p < P; p++) {
    const h = 0.5 * (ends[p + 1]! - ends[p]!);
    let whole = 0;
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += ref.S[i * n + j]! * m[p * n + j]!;
      xi[p * n + i] = xiEnds[p]! + h * s;
      whole += ref.w[i]! * m[p * n + i]!;
    }
    xiEnds[p + 1] = xiEnds[p]! + h * whole;
  }
  return { a, b, ends: Float64Array.from(ends), x, w, m, xi, xiEnds, total: xiEnds[P]!, mMin, mMax };
}

/** The x in [lo, hi] where the map's xi equals `target` (xi increases strictly), by 60 bisections. */
function invertXi(map: MassMap, target: number, lo: number, hi: number): number {
  const one = new Float64Array(1);
  for (let it = 0; it < 60 && hi - lo > 1e-15 * Math.max(Math.abs(lo), Math.abs(hi)); it++) {
    one[0] = 0.5 * (lo + hi);
    if (xiAt(map, one)[0]! < target) lo = one[0];
    else hi = one[0];
  }
  return 0.5 * (lo + hi);
}

/** xi at every x of xs (clamped to [a, b]), by the barycentric formula on the panel holding x. */
export function xiAt(map: MassMap, xs: Float64Array): Float64Array {
  const ref = reference();
  const n = MAP_ORDER;
  const P = map.ends.length - 1;
  const out = new Float64Array(xs.length);
  const f = new Float64Array(n + 2);
  for (let j = 0; j < xs.length; j++) {
    const x = xs[j]!;
    if (!(x > map.a)) {
      out[j] = 0;
      continue;
    }
    if (!(x < map.b)) {
      out[j] = map.total;
      continue;
    }
    // The panel p with ends[p] <= x < ends[p + 1].
    let lo = 0;
    let hi = P;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (map.ends[mid]! <= x) lo = mid;
      else hi = mid;
    }
    const p = lo;
    const h = 0.5 * (map.ends[p + 1]! - map.ends[p]!);
    const t = (x - 0.5 * (map.ends[p]! + map.ends[p + 1]!)) / h;
    f[0] = map.xiEnds[p]!;
    for (let i = 0; i < n; i++) f[i + 1] = map.xi[p * n + i]!;
    f[n + 1] = map.xiEnds[p + 1]!;
    let num = 0;
    let den = 0;
    let exact = -1;
    for (let i = 0; i < n + 2; i++) {
      const d = t - ref.bt[i]!;
      if (d === 0) {
        exact = i;
        break;
      }
      const c = ref.bw[i]! / d;
      num += c * f[i]!;
      den += c;
    }
    out[j] = exact >= 0 ? f[exact]! : num / den;
  }
  return out;
}
