/**
 * The finite square well: V = 0 for |x - c| < a, V = V0 outside (a = width / 2), hbar = 1, with the
 * particle's mass m_w inside and, optionally, a different mass m_b outside (BenDaniel & Duke, Phys. Rev.
 * 152, 683 (1966): psi and psi'/m continuous at the edges).
 */
import type { Eigenbasis } from './types';

/** Options of {@link wellBasis}. */
export interface WellOptions {
  /** Keep at most this many of the lowest bound states (default 100000). */
  maxLevels?: number;
  /**
   * The mass outside the well, m_b (default: `mass`, the one inside). With m_b != m_w the levels solve
   * the BenDaniel–Duke phase equations (see {@link wellBasis}).
   */
  barrierMass?: number;
}

/** Weight of every level allowed outside `support` (FORMAT.md / types.ts contract). */
const SUPPORT_TAIL = 1e-16;

/**
 * The dimensionless well strength z0 = a sqrt(2 m V0) / hbar, a = width / 2 (Griffiths, Introduction
 * to Quantum Mechanics, finite square well section (from memory)). NaN for invalid input.
 */
export function wellStrength(depth: number, width: number, mass: number): number {
  if (!(depth > 0 && width > 0 && mass > 0) || !Number.isFinite(depth * width * mass)) return NaN;
  return 0.5 * width * Math.sqrt(2 * mass * depth);
}

/**
 * Number of bound states of the finite square well, ceil(2 z0 / pi) (at least 1 for any depth > 0)
 * (Griffiths, Introduction to Quantum Mechanics, finite square well section (from memory)).
 * 0 for invalid input.
 */
export function wellBoundCount(depth: number, width: number, mass: number): number {
  const z0 = wellStrength(depth, width, mass);
  if (!(z0 > 0)) return 0;
  return Math.max(1, Math.ceil((2 * z0) / Math.PI));
}

/**
 * Root of level j (1-based) of the well equations, as the pair (cos u, sin u). With z = k a inside and
 * u the angle with z = z0 cos u, kappa a = z0 sin u, both the even condition tan z = sqrt(z0^2/z^2 - 1)
 * and the odd one -cot z = sqrt(z0^2/z^2 - 1) become the phase equation
 *   h(u) = z0 cos u - u - (j - 1) pi / 2 = 0,   u in [0, pi/2],
 * (z - (j-1) pi/2 = arccos(z/z0) on the level's own interval ((j-1) pi/2, j pi/2)). h decreases
 * strictly, h(0) = z0 - (j-1) pi/2 > 0 for a bound level and h(pi/2) < 0, so the bracket always
 * holds one root, found by safeguarded Newton. Working in u keeps kappa accurate at the top of the well
 * (z -> z0) and for very shallow wells (u -> 0). A root above pi/4 is found in the complement
 * w = pi/2 - u instead, g(w) = z0 sin w + w - pi/2 - (j - 1) pi/2 = 0 (increasing): in a deep well the
 * low levels have u within 1/z0 of pi/2, where cos u computed from u keeps only eps/(pi/2 - u) of
 * relative precision (z0 = 1e9: k to 1e-7, and levels 2e-7 from orthogonal), while sin w keeps all of it.
 * `rho` is sqrt(m_w/m_b) for a barrier mass m_b (phase term atan2(rho sin u, cos u) in place of u, the
 * BenDaniel–Duke matching); 1 for one mass. Returns cos u and sin u.
 */
function levelAngle(z0: number, j: number, rho = 1): { cos: number; sin: number } {
  const shift = ((j - 1) * Math.PI) / 2;
  const quarter = Math.PI / 4;
  // The phase term u (rho = 1) or atan2(rho sin u, cos u) of a barrier mass (rho = sqrt(m_w/m_b)), in
  // either angle; rho = 1 keeps u itself, bit for bit.
  const phaseU = (t: number) => (rho === 1 ? t : Math.atan2(rho * Math.sin(t), Math.cos(t)));
  const phaseW = (t: number) => (rho === 1 ? 2 * quarter - t : 2 * quarter - Math.atan2(Math.sin(t), rho * Math.cos(t)));
  const slope = (s: number, c: number) => (rho === 1 ? 1 : rho / (c * c + rho * rho * s * s));
  // h(pi/4) <= 0: the root lies in [0, pi/4], solve for u; else for w = pi/2 - u in [0, pi/4).
  const inU = z0 * Math.SQRT1_2 - phaseU(quarter) - shift <= 0;
  const f = inU ? (t: number) => z0 * Math.cos(t) - phaseU(t) - shift : (t: number) => -(z0 * Math.sin(t) - phaseW(t) - shift);
  const df = inU ? (t: number) => -z0 * Math.sin(t) - slope(Math.sin(t), Math.cos(t)) : (t: number) => -(z0 * Math.cos(t) + slope(Math.cos(t), Math.sin(t)));
  const guess = inU ? Math.acos(Math.min(1, (shift + quarter) / z0)) : Math.asin(Math.min(Math.SQRT1_2, (shift + 2 * quarter) / (z0 + 1)));
  let lo = 0;
  let hi = quarter;
  let t = Math.min(hi, Math.max(lo, guess));
  for (let it = 0; it < 200; it++) {
    const h = f(t);
    if (h > 0) lo = t;
    else hi = t;
    let next = t - h / df(t);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - t) <= 4e-16 * Math.max(1e-300, Math.abs(t)) || hi - lo <= 1e-300) {
      t = next;
      break;
    }
    t = next;
  }
  return inU ? { cos: Math.cos(t), sin: Math.sin(t) } : { cos: Math.sin(t), sin: Math.cos(t) };
}

/** The finite well's basis, with what only this system has. */
export interface WellBasis extends Eigenbasis {
  /** The strength z0 = a sqrt(2 m V0). */
  z0: number;
  /**
   * Binding energies V0 - E_n = kappa_n^2 / (2m), to full relative precision even where E_n
   * rounds to V0 (a level just below the top, or any level of a very shallow well).
   */
  binding: Float64Array;
}

/** Per-level constants of an eigenfunction. */
interface WellLevel {
  k: number;
  kappa: number;
  even: boolean;
  /** Amplitude inside: A cos(k (x-c)) (even) or A sin(k (x-c)) (odd), sign fixed by the convention. */
  amp: number;
  /** Value at the right edge x = c + a (left edge value is edge * (even ? 1 : -1)). */
  edge: number;
}

/**
 * The bound-state eigenbasis of the finite square well V = 0 for |x - c| < a, V = depth outside,
 * a = width / 2, for a particle of mass `mass` (hbar = 1), or of mass `mass` inside and
 * `options.barrierMass` outside. Levels n = 1 ... min(ceil(2 z0/pi), maxLevels), alternately even and
 * odd about c, energies E_n = z_n^2 / (2 m a^2) with 0 < E_n < depth, z_n the roots of
 * tan z = sqrt(z0^2/z^2 - 1) (even) and -cot z = sqrt(z0^2/z^2 - 1) (odd)
 * (Griffiths, Introduction to Quantum Mechanics, finite square well section (from memory)); with a
 * barrier mass, of (k/m_w) tan(k a) = kappa/m_b and -(k/m_w) cot(k a) = kappa/m_b (BenDaniel & Duke,
 * Phys. Rev. 152, 683 (1966); see `levelAngle`).
 * Eigenfunctions: A cos(k s) or A sin(k s) inside (s = x - c, k = z/a) and the matching value times
 * e^{-kappa (|s| - a)} outside (kappa^2 = 2 m_b (depth - E)), continuous in value and in slope over mass
 * (phi'/m), with A^2 [a +- sin(2 k a)/(2k) + (cos or sin)^2(k a)/kappa] = 1 (analytic normalisation in
 * the plain inner product, in which the levels are orthonormal whatever the masses: the kinetic operator
 * -(1/2) d/dx (1/m) d/dx is symmetric in it) and the sign making phi positive in the left tail (FORMAT.md
 * convention). `support` holds all but 1e-16 of every level's weight; `breakpoints` are the two edges,
 * where phi'' (and, with two masses, phi') jumps. `binding` holds V0 - E_n accurately (energies are kept
 * strictly below V0 even where that difference is under rounding). With two masses the basis has
 * `masses`. Invalid input yields a basis with count 0 (never throws).
 */
export function wellBasis(depth: number, width: number, center: number, mass: number, options: WellOptions = {}): WellBasis {
  const mb = options.barrierMass ?? mass;
  const z0 = wellStrength(depth, width, mass);
  const w0 = mb === mass ? z0 : wellStrength(depth, width, mb);
  const valid = z0 > 0 && w0 > 0 && Number.isFinite(center);
  const rho = mb === mass ? 1 : Math.sqrt(mass / mb);
  const bound = valid ? wellBoundCount(depth, width, mass) : 0;
  const n = Math.min(bound, Math.max(0, Math.floor(options.maxLevels ?? 100000)));
  const a = 0.5 * width;
  const c = center;
  const energies = new Float64Array(n);
  const binding = new Float64Array(n);
  const levels: WellLevel[] = [];
  let reach = 0;
  for (let i = 0; i < n; i++) {
    const j = i + 1;
    const u = levelAngle(z0, j, rho);
    const z = z0 * u.cos;
    const k = z / a;
    const kappa = (w0 * u.sin) / a;
    const even = j % 2 === 1;
    binding[i] = (kappa * kappa) / (2 * mb);
    // Near the top V0 - binding is the accurate form; keep E strictly below V0 even when the
    // difference is below the rounding of V0 (the contract 0 < E < V0).
    let E = binding[i] < 0.5 * depth ? depth - binding[i] : (k * k) / (2 * mass);
    if (E >= depth) E = depth * (1 - Number.EPSILON);
    energies[i] = E;
    // cos z (even) or sin z (odd) at the edge, from z = phase + (j - 1) pi/2: +-cos(phase), with
    // cos(phase) = cos u / sqrt(cos^2 u + rho^2 sin^2 u) (cos u itself for one mass), whose relative
    // precision survives where cos z computed from z (near a zero of it in a deep well) loses it.
    const cosPhase = rho === 1 ? u.cos : u.cos / Math.hypot(u.cos, rho * u.sin);
    const level = wellLevel(z, k, kappa, a, even, (Math.floor(i / 2) % 2 === 0 ? 1 : -1) * cosPhase);
    levels.push(level);
    // Tail weight beyond distance d outside one edge: edge^2 e^{-2 kappa d} / (2 kappa).
    const d = Math.log(Math.max(1, (level.edge * level.edge) / (2 * kappa * 0.5 * SUPPORT_TAIL))) / (2 * kappa);
    if (d > reach) reach = d;
  }
  const basis: WellBasis = {
    kind: 'well',
    z0: valid ? z0 : NaN,
    binding,
    count: n,
    firstLabel: 1,
    energies,
    mass,
    center: valid ? c : null,
    walls: null,
    support: valid ? [c - a - reach, c + a + reach] : [0, 0],
    breakpoints: valid ? [c - a, c + a] : [],
    potential: (x: number) => (Math.abs(x - c) < a ? 0 : depth),
    table: (xs, want, out, d1, d2, from = 0) => wellTable(levels, c, a, xs, Math.min(want, n), out, d1, d2, from),
  };
  if (mb !== mass && valid) {
    basis.masses = (xs) => xs.map((x) => (Math.abs(x - c) < a ? mass : mb));
    basis.massJumps = [c - a, c + a];
  }
  return basis;
}

/**
 * One level's constants from its z = k a and kappa: the amplitude A from
 * A^2 [a +- sin(2z)/(2k) + (cos z or sin z)^2/kappa] = 1, signed so the left tail is positive.
 */
function wellLevel(z: number, k: number, kappa: number, a: number, even: boolean, edgeTrig: number): WellLevel {
  const sz = Math.sin(z);
  const cz = Math.cos(z);
  // sin(2z)/(2k) = sz cz a / z, written so it stays accurate as z -> 0.
  const inner = even ? a + (sz * cz * a) / Math.max(z, 1e-300) : a - (sz * cz * a) / Math.max(z, 1e-300);
  const norm = inner + (edgeTrig * edgeTrig) / kappa;
  let amp = 1 / Math.sqrt(norm);
  // Left-tail value is amp * cos z (even) or -amp * sin z (odd); make it positive.
  const leftSign = even ? Math.sign(edgeTrig) : -Math.sign(edgeTrig);
  if (leftSign < 0) amp = -amp;
  return { k, kappa, even, amp, edge: amp * edgeTrig };
}

/**
 * Fills out[(i - from) nx + j] with phi_i(xs[j]) (and the exact derivatives) for from <= i < lv: cos or
 * sin inside the well |s| <= a (s = x - c), the matching exponential tail outside (see `wellBasis`).
 */
function wellTable(
  levels: WellLevel[],
  c: number,
  a: number,
  xs: Float64Array,
  lv: number,
  out: Float64Array,
  d1: Float64Array | undefined,
  d2: Float64Array | undefined,
  from: number,
): void {
  const nx = xs.length;
  const k0 = Math.max(0, Math.floor(from));
  for (let i = k0; i < lv; i++) {
    const L = levels[i];
    const base = (i - k0) * nx;
    for (let jx = 0; jx < nx; jx++) {
      const s = xs[jx] - c;
      let v: number;
      let dv: number;
      let ddv: number;
      if (Math.abs(s) <= a) {
        const ks = L.k * s;
        if (L.even) {
          v = L.amp * Math.cos(ks);
          dv = -L.amp * L.k * Math.sin(ks);
        } else {
          v = L.amp * Math.sin(ks);
          dv = L.amp * L.k * Math.cos(ks);
        }
        ddv = -L.k * L.k * v;
      } else {
        const e = Math.exp(-L.kappa * (Math.abs(s) - a));
        const side = s > 0 ? 1 : L.even ? 1 : -1;
        v = side * L.edge * e;
        dv = -Math.sign(s) * L.kappa * v;
        ddv = L.kappa * L.kappa * v;
      }
      out[base + jx] = v;
      if (d1) d1[base + jx] = dv;
      if (d2) d2[base + jx] = ddv;
    }
  }
}
