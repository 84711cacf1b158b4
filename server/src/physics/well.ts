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
 * Root of level j (1-based) of the well equations. With z = k a inside, w = kappa a outside and the
 * angle u with z = z0 cos u, w = w0 sin u (z0 = a sqrt(2 m_w V0), w0 = a sqrt(2 m_b V0), so that
 * k^2/(2 m_w) + kappa^2/(2 m_b) = V0 holds for every u), the even condition (k/m_w) tan z = kappa/m_b
 * reads tan z = rho tan u and the odd one -(k/m_w) cot z = kappa/m_b reads tan(z - pi/2) = rho tan u,
 * rho = sqrt(m_w/m_b) (derived; rho = 1 is the constant-mass well). On the level's own interval
 * ((j-1) pi/2, j pi/2) both become the phase equation
 *   h(u) = z0 cos u - (j - 1) pi / 2 - atan2(rho sin u, cos u) = 0,   u in [0, pi/2].
 * h decreases strictly (both terms do), h(0) = z0 - (j-1) pi/2 > 0 for a bound level and
 * h(pi/2) = -j pi/2 < 0, so the bracket always holds one root, found by safeguarded Newton. Working in u
 * keeps kappa accurate at the top of the well (z -> z0) and for very shallow wells (u -> 0). The bound
 * count ceil(2 z0/pi) therefore depends on the inside mass only.
 */
function levelAngle(z0: number, j: number, rho = 1): number {
  const shift = ((j - 1) * Math.PI) / 2;
  let lo = 0;
  let hi = Math.PI / 2;
  let u = Math.min(hi, Math.max(lo, Math.acos(Math.min(1, (shift + Math.PI / 4) / z0))));
  for (let it = 0; it < 200; it++) {
    const su = Math.sin(u);
    const cu = Math.cos(u);
    // rho = 1 keeps the constant-mass phase u itself, bit for bit.
    const phase = rho === 1 ? u : Math.atan2(rho * su, cu);
    const h = z0 * cu - phase - shift;
    if (h > 0) lo = u;
    else hi = u;
    const dh = -z0 * su - (rho === 1 ? 1 : rho / (cu * cu + rho * rho * su * su));
    let next = u - h / dh;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - u) <= 4e-16 * Math.max(1e-300, Math.abs(u)) || hi - lo <= 1e-300) {
      u = next;
      break;
    }
    u = next;
  }
  return u;
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
    const z = z0 * Math.cos(u);
    const k = z / a;
    const kappa = (w0 * Math.sin(u)) / a;
    const even = j % 2 === 1;
    binding[i] = (kappa * kappa) / (2 * mb);
    // Near the top V0 - binding is the accurate form; keep E strictly below V0 even when the
    // difference is below the rounding of V0 (the contract 0 < E < V0).
    let E = binding[i] < 0.5 * depth ? depth - binding[i] : (k * k) / (2 * mass);
    if (E >= depth) E = depth * (1 - Number.EPSILON);
    energies[i] = E;
    const level = wellLevel(z, k, kappa, a, even);
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
function wellLevel(z: number, k: number, kappa: number, a: number, even: boolean): WellLevel {
  const sz = Math.sin(z);
  const cz = Math.cos(z);
  // sin(2z)/(2k) = sz cz a / z, written so it stays accurate as z -> 0.
  const inner = even ? a + (sz * cz * a) / Math.max(z, 1e-300) : a - (sz * cz * a) / Math.max(z, 1e-300);
  const edgeTrig = even ? cz : sz;
  const norm = inner + (edgeTrig * edgeTrig) / kappa;
  let amp = 1 / Math.sqrt(norm);
  // Left-tail value is amp * cz (even) or -amp * sz (odd); make it positive.
  const leftSign = even ? Math.sign(cz) : -Math.sign(sz);
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
