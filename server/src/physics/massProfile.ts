/**
 * A position-dependent mass for numerical potentials: H = -(1/2) d/dx (1/m(x)) d/dx + V(x) between hard
 * walls at a and b (hbar = 1), the kinetic operator of BenDaniel & Duke, Phys. Rev. 152, 683 (1966).
 *
 * Method: Galerkin in the sines of the mass coordinate xi(x) = integral_a^x m dt (massMap.ts),
 * u_k(x) = sqrt(2/X) sin(k pi xi(x)/X), X = xi(b). They vanish at both walls; and since
 * du_k/dx = m(x) u_k'(xi), the kinetic form integral u_k' u_l' / (2m) dx = (1/2) integral u_k'(xi) u_l'(xi) dxi
 * = (k pi/X)^2/2 delta_kl is diagonal and exact, symmetric by construction. The overlap and the potential,
 * M_kl = integral u_k u_l dx and V_kl = integral u_k V u_l dx, are the Toeplitz-plus-Hankel forms
 * C(k - l) - C(k + l) of the moments C(q) = (1/X) integral f(x) cos(q pi xi(x)/X) dx of f = 1 and f = V
 * (product-to-sum identity), integrated on panels that end on every jump of m and V; the levels solve
 * (K + V) c = E M c (Cholesky of M, then the symmetric eigensolver). M is the plain inner product, so
 * the levels are orthonormal in it. Why this basis: in xi an eigenfunction has psi_xi = psi'/m, which the
 * interface condition makes continuous, and psi_xixi = 2 (V - E) psi / m, so a jump of m (or V) is only a
 * jump in the second derivative: the energy error falls as N^-3 (as for a step of V), where sines of x
 * would see the kink of psi itself and converge as N^-1. For a smooth m and V the convergence is
 * exponential. With m constant xi = m (x - a) and this is the sine Galerkin of the constant-mass solver.
 * A profile without jumps is solved in the Liouville coordinate y = integral sqrt(m) dx instead, where
 * the kinetic form is a Toeplitz-plus-Hankel matrix of the overlap's moments (`coordinateDensity`) and
 * the local wave number no longer depends on m, so light and heavy regions need the same grid.
 */
import type { Eigenbasis } from './types';
import type { Budget } from './budget';
import type { PotentialFn, PotentialNote } from './potential';
import { scanPotential, type Jump, type PotentialScan } from './potentialScan';
import { symmetricLowest } from './tridiag';
import { sineLadder } from './sines';
import { sineDvrWork, type SineDvrSolution } from './dvr';
import { buildMassMap, xiAt, MAP_ORDER, type MassMap } from './massMap';
import { makeBasis } from './potentialView';

/** A mass that depends on x (internal units). */
export interface MassProfile {
  /** m at every x. */
  at(xs: Float64Array): Float64Array;
  /** dm/dx at every x (exact where m is smooth). */
  slope(xs: Float64Array): Float64Array;
  /** Points in (a, b) where m jumps or kinks, known exactly (the compiler's breakpoints); panel ends. */
  breaks: number[];
}

/** A solution in the mass coordinate: a sine-series solution of zeta, with its map and zeta' = m^power. */
export interface MassSolution extends SineDvrSolution {
  map: MassMap;
  power: 0.5 | 1;
}

/** The mass profile's part of a potential solve (see `massSetup`). */
export interface MassSetup {
  /** The scan with the mass's jumps among V's (so the jump climb runs) and the joint symmetry. */
  scan: PotentialScan;
  /** The points where m jumps, ascending. */
  jumps: number[];
  notes: PotentialNote[];
  /** The first grid size for K levels (as `firstGridSize`, for the heaviest mass, rescaled to xi). */
  firstSize(K: number, o: { pointsPerWavelength: number; minPoints: number; growth: number }, cap: number): number;
  solve(N: number, wall: number, K: number, V: PotentialFn, budget: Budget): MassSolution | null;
  /** Notes on the final solution's grid: see {@link resolutionNotes}. */
  check(sol: MassSolution): PotentialNote[];
}

/**
 * Checks the profile on the scan's samples (positive and finite, else a note with the first bad x),
 * finds its jumps (the compiler's breakpoints where m changes by more than 1e-12 relative, and any the
 * sample scan finds), and merges them with V's: every one becomes a panel end.
 */
export function massSetup(profile: MassProfile, a: number, b: number, scanV: PotentialScan, samples: number, symmetryTolerance: number): MassSetup | PotentialNote {
  const ms = scanPotential(profile.at, a, b, samples, symmetryTolerance);
  if ('kind' in ms) return { kind: 'mass', message: `The mass is ${/NaN/.test(ms.message) ? 'not a number' : 'not finite'} at x = ${ms.at ?? a}.`, at: ms.at };
  for (let j = 0; j < ms.sv.length; j++) {
    const v = ms.sv[j]!;
    if (!(v > 0 && Number.isFinite(v))) return { kind: 'mass', message: `The mass is ${v > 0 ? 'infinite' : 'not positive'} at x = ${ms.sx[j]}.`, at: ms.sx[j] };
  }
  const L = b - a;
  const jumps: number[] = [];
  const h = 1e-9 * L;
  const sides = profile.at(Float64Array.from(profile.breaks.flatMap((x) => [x - h, x + h])));
  profile.breaks.forEach((x, i) => {
    if (Math.abs(sides[2 * i]! - sides[2 * i + 1]!) > 1e-12 * Math.max(sides[2 * i]!, sides[2 * i + 1]!)) jumps.push(x);
  });
  for (const jp of ms.jumps) if (!jumps.some((x) => Math.abs(x - jp.x) < 1e-9 * L)) jumps.push(jp.x);
  jumps.sort((p, q) => p - q);
  const all: Jump[] = [...scanV.jumps];
  for (const x of [...jumps, ...profile.breaks]) if (!all.some((jp) => Math.abs(jp.x - x) < 1e-12 * L)) all.push({ x, left: NaN, right: NaN });
  all.sort((p, q) => p.x - q.x);
  const scan: PotentialScan = { ...scanV, jumps: jumps.length > 0 || scanV.jumps.length > 0 ? all : [], symmetric: scanV.symmetric && ms.symmetric, slopes: undefined };
  const cuts = all.map((jp) => jp.x);
  const notes: PotentialNote[] = [];
  if (jumps.length > 0) {
    notes.push({ kind: 'jumps', message: `The mass jumps at ${jumps.length} point(s); energies converge algebraically (about N^-3), not exponentially.`, at: jumps[0] });
  }
  const input: SolveInput = { profile, a, b, cuts, symmetric: scan.symmetric, power: jumps.length > 0 ? 1 : 0.5 };
  return {
    scan,
    jumps,
    notes,
    firstSize: (K, o, cap) => Math.min(Math.max(8, Math.floor(cap / o.growth)), Math.max(firstSizeXi(scanV, ms, K, o, input.power), Math.floor(o.minPoints), K + 8)),
    check: (sol) => resolutionNotes(sol, coordinateDensity(profile, input.power), cuts, jumps),
    solve: (N, wall, K, V, budget) => massSolve(input, N, wall, K, V, budget),
  };
}

/**
 * The first grid in zeta: `pointsPerWavelength` points per shortest wavelength of the coordinate,
 * 2 pi / max_x sqrt(2 (E_K - V)_+) m^(1/2 - p) (the local wave number sqrt(2 m (E - V)) over zeta' = m^p), at
 * the WKB estimate of E_K from (1/pi) integral sqrt(2 m (E - V)_+) dx = K (Bohr–Sommerfeld), on the
 * scans' common samples, plus 16 (as `firstGridSize` for a constant mass).
 */
function firstSizeXi(sv: PotentialScan, sm: PotentialScan, K: number, o: { pointsPerWavelength: number }, power: 0.5 | 1): number {
  const n = Math.min(sv.sv.length, sm.sv.length);
  const vs = sv.sv.map((y) => (y === Infinity ? sv.vmaxFinite + 1e300 : y));
  const count = (E: number): number => {
    let s = 0;
    for (let j = 0; j < n; j++) if (E > vs[j]!) s += Math.sqrt(2 * sm.sv[j]! * (E - vs[j]!));
    return (s * sv.hs) / Math.PI;
  };
  let lo = sv.vmin;
  let hi = sv.vmin + 1;
  for (let i = 0; i < 2000 && count(hi) < K; i++) hi = sv.vmin + 2 * (hi - sv.vmin);
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (lo + hi);
    if (count(mid) < K) lo = mid;
    else hi = mid;
  }
  let X = 0;
  let kmax = 0;
  for (let j = 0; j < n; j++) {
    // In zeta (zeta' = m^p) the local wave number is sqrt(2 (E - V)) m^(1/2 - p).
    X += sm.sv[j]! ** power * sv.hs;
    if (hi > vs[j]!) kmax = Math.max(kmax, Math.sqrt(2 * (hi - vs[j]!)) * sm.sv[j]! ** (0.5 - power));
  }
  return Math.ceil((o.pointsPerWavelength * X * kmax) / (2 * Math.PI)) + 16;
}

/**
 * What the final grid does not resolve, as notes of kind `mass`: (1) the mass changes faster than its
 * panels follow (xi at the panel ends moves by more than 1e-9 of X when the panels are halved: a steep
 * but smooth step, or a jump no breakpoint reported), with the first such x; (2) a layer between two
 * jumps (or a jump and a wall) thinner in xi than two grid spacings X/N, which the N - 1 sines cannot
 * shape however the panels fall.
 */
function resolutionNotes(sol: MassSolution, density: (xs: Float64Array) => Float64Array, cuts: number[], jumps: number[]): PotentialNote[] {
  const notes: PotentialNote[] = [];
  const map = sol.map;
  const P = map.ends.length - 1;
  const fine = buildMassMap(density, map.a, map.b, cuts, 2 * P);
  if (fine) {
    const again = xiAt(fine, map.ends);
    for (let p = 1; p <= P; p++) {
      if (Math.abs(again[p]! - map.xiEnds[p]!) > 1e-9 * map.total) {
        const x = map.ends[p - 1]!;
        notes.push({ kind: 'mass', message: `The mass changes faster than the solver's panels follow near x = ${x}; give the step as a jump (a ?: condition) or refine it less sharply.`, at: x });
        break;
      }
    }
  }
  const edges = [map.a, ...jumps, map.b];
  const xiEdges = xiAt(map, Float64Array.from(edges));
  const spacing = map.total / sol.intervals;
  for (let i = 0; i + 1 < edges.length; i++) {
    if (jumps.length === 0) break;
    if (xiEdges[i + 1]! - xiEdges[i]! < 2 * spacing) {
      notes.push({
        kind: 'mass',
        message: `The mass layer from x = ${edges[i]} to ${edges[i + 1]} is thinner than two grid spacings of the solver (${sol.intervals} intervals); its effect on the levels is not resolved.`,
        at: edges[i],
      });
      break;
    }
  }
  return notes;
}

/** Moments C(q) = (1/X) sum_i w_i f_i cos(q theta_i), q < count, for f = 1 (cw) and f = V (cv). */
function moments(map: MassMap, v: Float64Array, count: number): { cw: Float64Array; cv: Float64Array } {
  const cw = new Float64Array(count);
  const cv = new Float64Array(count);
  const s = new Float64Array(count);
  const c = new Float64Array(count);
  const X = map.total;
  for (let i = 0; i < map.x.length; i++) {
    const w = map.w[i]! / X;
    const wv = w * v[i]!;
    cw[0] += w;
    cv[0] += wv;
    sineLadder((Math.PI * map.xi[i]!) / X, count - 1, s, c);
    for (let q = 1; q < count; q++) {
      cw[q] += w * c[q]!;
      cv[q] += wv * c[q]!;
    }
  }
  return { cw, cv };
}

interface SolveInput {
  profile: MassProfile;
  a: number;
  b: number;
  cuts: number[];
  symmetric: boolean;
  /** The coordinate zeta' = m^power: 1 where m jumps, 1/2 for a profile without jumps. */
  power: 0.5 | 1;
  /** A coarse map that places the panels at equal steps of zeta (made by the first solve). */
  pilot?: MassMap;
}

/**
 * The density zeta' = m^p of the solver's coordinate. p = 1 is the mass coordinate xi, in which an
 * eigenfunction is C^1 across a jump of m (psi_xi = psi'/m); p = 1/2 is the Liouville coordinate
 * y = integral sqrt(m) dx, in which the local wave number sqrt(2 (E - V)) does not depend on m, so a
 * uniform grid in y resolves light and heavy regions alike (in xi it is sqrt(2 (E - V)/m), and the light
 * regions would set the grid). For sines u_k of zeta, integral u_k' u_l' / (2m) dx =
 * (pi/Z)^2 k l [D(k - l) + D(k + l)] with D(q) = (1/Z) integral m^(2p-1)/2 cos(q pi zeta/Z) dx (derived
 * as in the module comment): diagonal for p = 1, half the overlap's moments for p = 1/2.
 */
function coordinateDensity(profile: MassProfile, power: 0.5 | 1): (xs: Float64Array) => Float64Array {
  return power === 1 ? profile.at : (xs) => profile.at(xs).map(Math.sqrt);
}

/**
 * One Galerkin solve with N - 1 sines of xi (see the module comment). Panels: N of equal length in xi,
 * one per wavelength X / N of the highest moment q = 2N (as interfaces.ts for V alone), cut at every jump.
 * Null when V or m fails on the nodes.
 */
function massSolve(s: SolveInput, N: number, wall: number, K: number, V: PotentialFn, budget: Budget): MassSolution | null {
  const density = coordinateDensity(s.profile, s.power);
  s.pilot ??= buildMassMap(density, s.a, s.b, s.cuts, 256) ?? undefined;
  if (!s.pilot) return null;
  const map = buildMassMap(density, s.a, s.b, s.cuts, Math.max(4, N), s.pilot);
  if (!map) return null;
  let v: Float64Array;
  try {
    v = V(map.x);
  } catch {
    return null;
  }
  let vmax = 0;
  for (let i = 0; i < v.length; i++) {
    if (v[i] === Infinity) v[i] = wall;
    if (!Number.isFinite(v[i]!)) return null;
    vmax = Math.max(vmax, Math.abs(v[i]!));
  }
  const n = N - 1;
  const { cw, cv } = moments(map, v, 2 * N);
  const kin = (Math.PI / map.total) ** 2 / 2;
  const blocks = s.symmetric
    ? [Int32Array.from({ length: Math.ceil(n / 2) }, (_, r) => 2 * r + 1), Int32Array.from({ length: Math.floor(n / 2) }, (_, r) => 2 * r + 2)]
    : [Int32Array.from({ length: n }, (_, r) => r + 1)];
  // Counted in the unit the refinement predicts with (`sineDvrWork`, which `wouldOverrun` scales by the
  // last solve's measured rate), so the prediction stays proportional; the true flops are about 2.5 times
  // that (Cholesky and the two triangular solves besides the eigensolver).
  budget.count(sineDvrWork(N, s.symmetric) + map.x.length * 2 * N, map.x.length);
  const want = Math.min(K, n);
  const found: { e: number; parity: number; ks: Int32Array; vec: Float64Array }[] = [];
  for (let bi = 0; bi < blocks.length; bi++) {
    const ks = blocks[bi]!;
    const k = Math.min(ks.length, s.symmetric ? (bi === 0 ? Math.ceil(want / 2) + 1 : Math.floor(want / 2) + 1) : want);
    if (ks.length === 0 || k === 0) continue;
    const r = generalized(ks, cw, cv, kin, k, s.power);
    if (!r) return null;
    for (let j = 0; j < r.values.length; j++) found.push({ e: r.values[j]!, parity: s.symmetric ? bi + 1 : 0, ks, vec: r.vectors.subarray(j * ks.length, (j + 1) * ks.length) });
  }
  found.sort((p, q) => p.e - q.e);
  const count = Math.min(want, found.length);
  const energies = new Float64Array(count);
  const coefficients = new Float64Array(count * n);
  const parity = new Uint8Array(count);
  const terms = new Int32Array(count);
  for (let j = 0; j < count; j++) {
    const f = found[j]!;
    energies[j] = f.e;
    parity[j] = f.parity;
    let mx = 0;
    for (let r = 0; r < f.ks.length; r++) {
      coefficients[j * n + f.ks[r]! - 1] = f.vec[r]!;
      mx = Math.max(mx, Math.abs(f.vec[r]!));
    }
    let last = n;
    while (last > 1 && !(Math.abs(coefficients[j * n + last - 1]!) > 1e-15 * mx)) last--;
    terms[j] = last;
  }
  if (!energies.every(Number.isFinite)) return null;
  // ||M^-1/2 H M^-1/2|| <= ||M^-1|| (||K|| + ||V||) with rho = zeta' = m^p: ||M^-1|| <= max rho,
  // ||V|| <= max|V| / min rho and ||K|| <= (n pi/Z)^2 max(m^(p-1)) / 2 = kin n^2 max(rho^((p-1)/p)).
  const kinMax = s.power === 1 ? 1 : Math.max(map.mMin ** -1, map.mMax ** -1);
  const normBound = map.mMax * (kin * n * n * kinMax + vmax / map.mMin);
  return { a: s.a, b: s.b, mass: map.mMin, intervals: N, energies, coefficients, parity, terms, normBound, map, power: s.power };
}

/**
 * The lowest `want` solutions of (K + V) c = E M c on the sine indices `ks`: M = L L^T (Cholesky), the
 * symmetric A = L^-1 (K + V) L^-T, its eigenvectors y, and c = L^-T y (so c^T M c = 1). Golub & Van
 * Loan, Matrix Computations, section 8.7 (from memory). Null when M is not positive definite.
 */
function generalized(ks: Int32Array, cw: Float64Array, cv: Float64Array, kin: number, want: number, power: 0.5 | 1): { values: Float64Array; vectors: Float64Array } | null {
  const m = ks.length;
  const H = new Float64Array(m * m);
  const Lm = new Float64Array(m * m);
  for (let r = 0; r < m; r++) {
    for (let c = 0; c <= r; c++) {
      const k = ks[r]!;
      const l = ks[c]!;
      // Kinetic: (pi/Z)^2 k l [D(k - l) + D(k + l)] with D = moments of m^(2p-1)/2: diagonal for p = 1,
      // the overlap's moments over two for p = 1/2 (see `coordinateDensity`).
      const t = power === 1 ? (r === c ? kin * k * k : 0) : kin * k * l * (cw[k - l]! + cw[k + l]!);
      const h = cv[k - l]! - cv[k + l]! + t;
      H[r * m + c] = h;
      H[c * m + r] = h;
      Lm[r * m + c] = cw[k - l]! - cw[k + l]!;
    }
  }
  // Cholesky, lower triangle in place.
  for (let j = 0; j < m; j++) {
    let d = Lm[j * m + j]!;
    for (let p = 0; p < j; p++) d -= Lm[j * m + p]! ** 2;
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    Lm[j * m + j] = ljj;
    for (let i = j + 1; i < m; i++) {
      let sum = Lm[i * m + j]!;
      for (let p = 0; p < j; p++) sum -= Lm[i * m + p]! * Lm[j * m + p]!;
      Lm[i * m + j] = sum / ljj;
    }
  }
  // B = L^-1 H (row i of B from the rows above it: contiguous row operations).
  const forward = (src: Float64Array): Float64Array => {
    const out = src.slice();
    for (let i = 0; i < m; i++) {
      const row = i * m;
      for (let p = 0; p < i; p++) {
        const l = Lm[row + p]!;
        if (l === 0) continue;
        const above = p * m;
        for (let c = 0; c < m; c++) out[row + c] -= l * out[above + c]!;
      }
      const inv = 1 / Lm[row + i]!;
      for (let c = 0; c < m; c++) out[row + c] *= inv;
    }
    return out;
  };
  const B = forward(H);
  // A = B L^-T, lower triangle only (all the eigensolver reads): row i solves A[i, :] L^T = B[i, :].
  const A = new Float64Array(m * m);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = B[i * m + j]!;
      for (let p = 0; p < j; p++) sum -= A[i * m + p]! * Lm[j * m + p]!;
      A[i * m + j] = sum / Lm[j * m + j]!;
    }
  }
  const eig = symmetricLowest(A, m, want);
  const count = eig.values.length;
  const vectors = new Float64Array(count * m);
  for (let e = 0; e < count; e++) {
    // c = L^-T y: back substitution.
    for (let i = m - 1; i >= 0; i--) {
      let sum = eig.vectors[e * m + i]!;
      for (let p = i + 1; p < m; p++) sum -= Lm[p * m + i]! * vectors[e * m + p]!;
      vectors[e * m + i] = sum / Lm[i * m + i]!;
    }
  }
  return { values: eig.values, vectors };
}

/**
 * phi_j(x) = sqrt(2/X) sum_k c_jk sin(k theta), theta = pi xi(x)/X, with phi' = m phi_xi and
 * phi'' = m' phi_xi + m^2 phi_xixi (chain rule); zero outside [a, b]. Layout as `Eigenbasis.table`.
 */
export function massTable(sol: MassSolution, profile: MassProfile, xs: Float64Array, levels: number, out: Float64Array, d1?: Float64Array, d2?: Float64Array, from = 0): void {
  const n = sol.intervals - 1;
  const j0 = Math.max(0, Math.floor(from));
  const count = Math.min(levels, sol.energies.length);
  const X = sol.map.total;
  const norm = Math.sqrt(2 / X);
  const kf = Math.PI / X;
  const xi = xiAt(sol.map, xs);
  const m = d1 || d2 ? profile.at(xs) : null;
  const dm = d2 ? profile.slope(xs) : null;
  const p = sol.power;
  // zeta' = m^p and zeta'' = p m^(p-1) m'.
  const z1 = m ? (p === 1 ? m : m.map(Math.sqrt)) : null;
  const z2 = dm && m ? (p === 1 ? dm : dm.map((d, i) => (0.5 * d) / Math.sqrt(m[i]!))) : null;
  let kTop = 1;
  for (let j = j0; j < count; j++) kTop = Math.max(kTop, sol.terms[j]!);
  const S = new Float64Array(kTop + 1);
  const C = new Float64Array(kTop + 1);
  const nx = xs.length;
  for (let i = 0; i < nx; i++) {
    const inside = xs[i]! >= sol.a && xs[i]! <= sol.b;
    if (inside) sineLadder(kf * xi[i]!, kTop, S, C);
    for (let j = j0; j < count; j++) {
      const at = (j - j0) * nx + i;
      let f = 0;
      let g = 0;
      let h = 0;
      if (inside) {
        const off = j * n - 1;
        for (let k = 1; k <= sol.terms[j]!; k++) {
          const ck = sol.coefficients[off + k]!;
          if (ck === 0) continue;
          f += ck * S[k]!;
          g += ck * k * C[k]!;
          h += ck * k * k * S[k]!;
        }
      }
      out[at] = norm * f;
      const pxi = norm * kf * g;
      if (d1) d1[at] = inside ? z1![i]! * pxi : 0;
      if (d2) d2[at] = inside ? z2![i]! * pxi - z1![i]! * z1![i]! * norm * kf * kf * h : 0;
    }
  }
}

/** Flips each level so it is positive at the first of 2N points where |phi| exceeds 1e-6 of its largest there. */
export function fixMassSigns(sol: MassSolution, profile: MassProfile): void {
  const count = sol.energies.length;
  const n = sol.intervals - 1;
  const P = 2 * sol.intervals;
  const xs = Float64Array.from({ length: P - 1 }, (_, i) => sol.a + ((i + 1) * (sol.b - sol.a)) / P);
  const t = new Float64Array(count * xs.length);
  massTable(sol, profile, xs, count, t);
  for (let j = 0; j < count; j++) {
    let mx = 0;
    for (let i = 0; i < xs.length; i++) mx = Math.max(mx, Math.abs(t[j * xs.length + i]!));
    for (let i = 0; i < xs.length; i++) {
      const y = t[j * xs.length + i]!;
      if (!(Math.abs(y) > 1e-6 * mx)) continue;
      if (y < 0) for (let k = 0; k < n; k++) sol.coefficients[j * n + k] = -sol.coefficients[j * n + k]!;
      break;
    }
  }
}

/** The basis of a mass-coordinate solution: the potential view of potentialView.ts with this table and the masses. */
export function massBasis(
  sol: MassSolution,
  profile: MassProfile,
  jumps: number[],
  view: { a: number; b: number; mass: number; V: PotentialFn; center: number | null; breakpoints: number[]; energies: Float64Array; uncertainty: Float64Array },
): Eigenbasis {
  const base = makeBasis(null, view.a, view.b, view.mass, view.V, view.center, view.breakpoints, view.energies, view.uncertainty);
  const count = view.energies.length;
  const basis: Eigenbasis = {
    ...base,
    table: (xs, levels, out, d1, d2, from = 0) => massTable(sol, profile, xs, Math.min(levels, count), out, d1, d2, from),
    masses: (xs) => profile.at(xs),
    massJumps: jumps,
  };
  delete basis.matrixElements;
  delete basis.weightedSums;
  return basis;
}

/** Nodes of the mass map of a solution (benchmarks and reports). */
export function massNodes(sol: MassSolution): number {
  return sol.map.x.length / MAP_ORDER;
}
