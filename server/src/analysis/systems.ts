/**
 * Turning a checked system into its eigenbasis, and a checked state into something that can be
 * evaluated (with derivatives) on any grid.
 */
import type { Eigenbasis } from '../physics/types';
import type { GridValues, PhiProvider } from '../expr/types';
import { boxBasis } from '../physics/box';
import { wellBasis } from '../physics/well';
import { oscillatorBasis } from '../physics/oscillator';
import { potentialBasis } from '../physics/potential';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { StateModel, SystemModel } from './model';
import type { Budget, StopReason } from './context';
import { fmt, plural } from './findings';
import { continuumLevels, solverCaps, type WallEnd } from './walls';
import { coarserBasis } from './coefficientErrors';
import { stoppedInFirstGrid } from './unresolvedLevels';
import { samplesState } from './samplesState';
import { massFindings, massProfileOf } from './massSystems';
import { charged, chargedPhi, formulaPointOps, GAUSSIAN_POINT_OPS, tableOps } from './charged';

/** A built basis together with facts the diagnostics need. */
export interface BuiltBasis {
  basis: Eigenbasis;
  /**
   * Numerical systems: indices of the wall-only levels, as the solver reports them (`wallLevels`,
   * `wallEnds`), kept by the one documented rule: a level above the potential at both truncating walls
   * is a box-quantised stand-in for the continuum.
   */
  wallLevels?: number[];
  /** Numerical systems: what V does towards each wall (the solver's `wallTrend`), for wording. */
  wallTrend?: { left: 'rises' | 'levels' | 'falls'; right: 'rises' | 'levels' | 'falls' };
  /** Numerical systems: the ends the file declares hard (`walls hard open`), or absent (both open). */
  hardWalls?: [boolean, boolean];
  /** Numerical systems: the label of the first level not resolved to tolerance, or null. */
  unresolved?: number | null;
  /** Numerical systems: grid points used. */
  points?: number;
  /** Numerical systems: the grid the levels would want and the solver's cap (the solver's `grid`), for the unresolved levels' finding. */
  grid?: { wanted: number | null; cap: number; capWhy: string; note: string | null };
  /** Numerical systems: why the solver's refinement stopped short (null when it finished). */
  stopped?: StopReason | null;
  /**
   * Numerical systems: the basis on the solver's next-to-last grid, to give each coefficient an
   * uncertainty by the same two-grid comparison as the levels (coefficientErrors.ts); absent when the
   * solver stopped on its first grid or the budget ran out.
   */
  coarse?: Eigenbasis;
  /** Findings of the solve that a remembered basis must repeat (the mass profile's, massSystems.ts). */
  findings?: EngineDiagnostic[];
}

/** Options of `buildBasis` and `buildState`. */
export interface BuildOptions {
  /** The grid cap of the analysis. */
  maxGridPoints: number;
  /** The budget of the analysis. */
  budget: Budget;
  /** Numerical systems: also solve the next-to-last grid for coefficient uncertainties (default true). */
  coarse?: boolean;
}

/** How many solved numerical bases are kept (least recently used dropped first). */
const BASIS_MEMO_SIZE = 8;
const basisMemo = new Map<string, { built: BuiltBasis; above: number[]; ends: WallEnd[] }>();

/**
 * Forgets every remembered numerical basis (benchmarks time cold analyses with it; tests may reset).
 */
export function clearBasisMemo(): void {
  basisMemo.clear();
}

/**
 * Builds the eigenbasis of `system` with `count` levels (the finite well holds all its bound states).
 * Returns null (with a diagnostic) when the system cannot be solved.
 * Numerical potentials are solved once per key (the potential's text, units and the values of the names
 * it uses; the walls; the mass; the level count) and remembered in a memo of 8 entries, so edits that
 * change only the state, an `expect` or `evolve` line reuse the solved basis. Bases are never mutated
 * after they are built, so sharing them is safe.
 */
export function buildBasis(
  system: SystemModel,
  mass: number,
  count: number,
  out: EngineDiagnostic[],
  options: BuildOptions,
): BuiltBasis | null {
  switch (system.kind) {
    case 'box':
      return { basis: boxBasis(system.a, system.b, mass, count) };
    case 'well':
      return { basis: wellBasis(system.depth, system.width, system.center, mass, system.barrierMass === undefined ? {} : { barrierMass: system.barrierMass }) };
    case 'oscillator':
      return { basis: oscillatorBasis(system.omega, system.center, mass, count) };
    case 'potential':
      return solvePotential(system, mass, count, out, options);
  }
}

/** A numerical system's basis: V probed for bad values, solved, and remembered in the memo, with the next-to-last grid's basis the solver kept from its climb (`coarse`; a second solve to that size is the fallback). */
function solvePotential(system: Extract<SystemModel, { kind: 'potential' }>, mass: number, count: number, out: EngineDiagnostic[], options: BuildOptions): BuiltBasis | null {
  const memoKey = system.key === undefined ? null : `${system.key}|${system.a}|${system.b}|${mass}|${count}|${options.maxGridPoints}`;
  const hit = memoKey === null ? undefined : basisMemo.get(memoKey);
  if (hit && memoKey !== null) {
    // Most recently used last.
    basisMemo.delete(memoKey);
    basisMemo.set(memoKey, hit);
    if (hit.built.findings) out.push(...hit.built.findings);
    return declared(hit, system.hard);
  }
  const V = system.V;
  let bad: { x: number; value: string } | null = null;
  const evalV = (xs: Float64Array): Float64Array => {
    const v = V.evaluate(xs, 0);
    const re = v.re;
    for (let j = 0; j < xs.length && bad === null; j++) {
      if (!Number.isFinite(re[j]!)) bad = { x: xs[j]!, value: Number.isNaN(re[j]!) ? 'not a number' : re[j]! > 0 ? 'infinite' : 'minus infinity' };
      else if (Math.abs(v.im[j]!) > 1e-12 * Math.max(1, Math.abs(re[j]!))) bad = { x: xs[j]!, value: 'complex' };
    }
    return re;
  };
  // Probe the potential before solving so a bad value is reported, not solved with.
  const probe = new Float64Array(513);
  for (let j = 0; j < probe.length; j++) probe[j] = system.a + ((j + 0.5) / probe.length) * (system.b - system.a);
  evalV(probe);
  if (bad !== null) {
    const b = bad as { x: number; value: string };
    out.push(
      diagnostic(
        'evaluation',
        system.exprSpan.start,
        system.exprSpan.end,
        b.value === 'complex'
          ? `The potential is complex at x = ${fmt(b.x)}; it must be real.`
          : `The potential is ${b.value} at x = ${fmt(b.x)}; it must be finite inside the interval.`,
      ),
    );
    return null;
  }
  const massProfile = massProfileOf(system, out);
  if (massProfile === null) return null;
  const caps = { budget: options.budget, ...solverCaps(options.maxGridPoints), ...(massProfile ? { massProfile } : {}) };
  const solved = potentialBasis(evalV, system.a, system.b, mass, count, caps);
  const findings: EngineDiagnostic[] = [];
  massFindings(system, solved.notes, findings);
  out.push(...findings);
  if (bad !== null) {
    const b = bad as { x: number; value: string };
    out.push(diagnostic('evaluation', system.exprSpan.start, system.exprSpan.end, `The potential is ${b.value} at x = ${fmt(b.x)}.`));
    return null;
  }
  // Stopped inside the first solve: the analysis reports the time limit (index.ts), not a bad potential, and which levels it left.
  if (stoppedInFirstGrid(solved, system.exprSpan, count, options.budget.limitMs, out)) return null;
  if (solved.basis.count === 0) {
    if (solved.notes.some((n) => n.kind === 'mass')) return null;
    const note = solved.notes.find((n) => n.kind === 'evaluation' || n.kind === 'input')?.message ?? 'The potential could not be solved.';
    // The solver's notes name raw values; say them in words.
    const why = note.replace(/-Infinity/g, 'minus infinity').replace(/\bInfinity\b/g, 'infinity').replace(/\bNaN\b/g, 'not a number');
    out.push(diagnostic('evaluation', system.exprSpan.start, system.exprSpan.end, why));
    return null;
  }
  const stopped = solved.stopped;
  const built: BuiltBasis = {
    basis: solved.basis,
    unresolved: solved.unresolved,
    points: solved.points,
    stopped,
    wallTrend: solved.wallTrend, grid: solved.grid,
    ...(findings.length > 0 ? { findings } : {}),
  };
  const coarse = options.coarse === false || options.budget.expired() ? null : (solved.coarse ?? coarserBasis(solved.sizes, options, (maxPoints) => potentialBasis(evalV, system.a, system.b, mass, count, { ...caps, maxPoints })));
  if (coarse) built.coarse = coarse;
  const entry = { built, above: solved.wallLevels, ends: solved.wallEnds };
  // A solve cut short by the time limit or a cancellation is not kept: the next edit deserves a full one.
  if (memoKey !== null && (stopped === null || stopped === 'cap')) {
    basisMemo.set(memoKey, entry);
    while (basisMemo.size > BASIS_MEMO_SIZE) basisMemo.delete(basisMemo.keys().next().value as string);
  }
  return declared(entry, system.hard);
}

/** A solved basis with its continuum levels chosen by the file's wall declaration (walls.ts). */
function declared(entry: { built: BuiltBasis; above: number[]; ends: WallEnd[] }, hard: [boolean, boolean] | undefined): BuiltBasis {
  const built: BuiltBasis = { ...entry.built, wallLevels: continuumLevels(entry.above, entry.ends, hard) };
  if (hard) built.hardWalls = hard;
  return built;
}

/** Something that can be evaluated on a grid: the state as written (not normalised). */
export interface StateFunction {
  /** Values (and derivatives for order 1, 2) at xs. */
  evaluate(xs: Float64Array, order: 0 | 1 | 2): GridValues;
  /** Points in (a, b) where the state (or one of its derivatives) is not smooth. */
  breakpoints(a: number, b: number): number[];
  /** An interval outside which the state vanishes identically, or null when it extends over the line. */
  support: [number, number] | null;
  /** A window that holds essentially all of |psi|^2, when known without scanning. */
  window: [number, number] | null;
  /** Hard walls of the system the state came from (sudden changes), which are kinks of the state. */
  walls: [number, number] | null;
  /**
   * Of the breakpoints, those where the state may jump or kink (checked by `classifyBreakpoints`);
   * all of them when absent. A sampled state's inner knots are smooth by construction (the spline is C2).
   */
  jumpCandidates?(a: number, b: number): number[];
}

/** Makes the `phi(n, x)` provider of a basis; levels beyond the basis are reported through `missing`. */
export function phiProvider(basis: Eigenbasis, missing: (n: number) => void): PhiProvider {
  return (n, xs, out, d1, d2) => {
    const k = Math.round(n) - basis.firstLabel;
    if (!(k >= 0 && k < basis.count) || !Number.isInteger(n)) {
      missing(n);
      out.fill(NaN);
      d1?.fill(NaN);
      d2?.fill(NaN);
      return;
    }
    basis.table(xs, k + 1, out, d1, d2, k);
  };
}

/**
 * A normalised Gaussian packet exp(-(x - x0)^2 / (4 s^2) + i k x) / (2 pi s^2)^(1/4), with exact
 * derivatives. Standard form (position spread s); common practice.
 */
export function gaussianState(x0: number, s: number, k: number): StateFunction {
  const amp = Math.pow(2 * Math.PI * s * s, -0.25);
  return {
    evaluate(xs, order) {
      const n = xs.length;
      const out = zeroValues(n, order);
      const { re, im } = out;
      for (let j = 0; j < n; j++) {
        const x = xs[j]!;
        const u = x - x0;
        const g = amp * Math.exp(-(u * u) / (4 * s * s));
        const c = Math.cos(k * x);
        const sn = Math.sin(k * x);
        re[j] = g * c;
        im[j] = g * sn;
        if (order >= 1) {
          // psi' = (-u/(2 s^2) + i k) psi
          const ar = -u / (2 * s * s);
          out.d1re![j] = ar * re[j]! - k * im[j]!;
          out.d1im![j] = ar * im[j]! + k * re[j]!;
          if (order >= 2) {
            // psi'' = [(-u/(2 s^2) + i k)^2 - 1/(2 s^2)] psi
            const br = ar * ar - k * k - 1 / (2 * s * s);
            const bi = 2 * ar * k;
            out.d2re![j] = br * re[j]! - bi * im[j]!;
            out.d2im![j] = br * im[j]! + bi * re[j]!;
          }
        }
      }
      return out;
    },
    breakpoints: () => [],
    support: null,
    window: [x0 - 10 * s, x0 + 10 * s],
    walls: null,
  };
}

/** Zeroed values for n points, with first (order >= 1) and second (order >= 2) derivatives. */
function zeroValues(n: number, order: number): GridValues {
  const out: GridValues = { re: new Float64Array(n), im: new Float64Array(n) };
  if (order >= 1) {
    out.d1re = new Float64Array(n);
    out.d1im = new Float64Array(n);
  }
  if (order >= 2) {
    out.d2re = new Float64Array(n);
    out.d2im = new Float64Array(n);
  }
  return out;
}

/** Level `k` (index) of a basis as a state. */
export function eigenState(basis: Eigenbasis, k: number): StateFunction {
  return {
    evaluate(xs, order) {
      const n = xs.length;
      const out = zeroValues(n, order);
      basis.table(xs, k + 1, out.re, out.d1re, out.d2re, k);
      return out;
    },
    breakpoints: (a, b) => {
      const pts = [...basis.breakpoints];
      if (basis.walls) pts.push(basis.walls[0], basis.walls[1]);
      return pts.filter((x) => x > a && x < b).sort((p, q) => p - q);
    },
    support: basis.walls ? [basis.walls[0], basis.walls[1]] : null,
    window: [basis.support[0], basis.support[1]],
    walls: basis.walls,
  };
}

/** Builds the state function of a state model; `basis` is the target system's basis (for phi). */
export function buildState(
  state: StateModel,
  target: Eigenbasis | null,
  mass: number,
  out: EngineDiagnostic[],
  options: BuildOptions,
): StateFunction | null {
  switch (state.kind) {
    case 'gaussian':
      return charged(gaussianState(state.center, state.width, state.momentum), options.budget, GAUSSIAN_POINT_OPS);
    case 'samples':
      return samplesState(state, target, out);
    case 'eigen': {
      // Labels start at the basis's first label (0 or 1), so level + 1 levels always include it.
      const built = buildBasis(state.system, mass, state.level + 1, out, { ...options, coarse: false });
      if (!built) return null;
      const k0 = state.level - built.basis.firstLabel;
      if (k0 < 0) {
        out.push(diagnostic('evaluation', state.levelSpan.start, state.levelSpan.end, `Levels of this system are numbered from ${built.basis.firstLabel}.`));
        return null;
      }
      if (k0 >= built.basis.count) {
        out.push(
          diagnostic('evaluation', state.levelSpan.start, state.levelSpan.end, `Level ${state.level} does not exist: that system has ${plural(built.basis.count, 'bound level')}.`),
        );
        return null;
      }
      return charged(eigenState(built.basis, k0), options.budget, tableOps(built.basis, k0 + 1, k0));
    }
    case 'psi': {
      const fn = state.fn;
      let missingLevel: number | null = null;
      const cut = { stopped: false };
      const phi = target
        ? chargedPhi(
            phiProvider(target, (n) => {
              if (missingLevel === null) missingLevel = n;
            }),
            target,
            options.budget,
            cut,
          )
        : undefined;
      const f: StateFunction = {
        evaluate(xs, order) {
          const v = fn.evaluate(xs, order, phi);
          if (missingLevel !== null) {
            const n = missingLevel;
            missingLevel = null;
            throw new MissingLevel(n);
          }
          return v;
        },
        breakpoints: (a, b) => fn.breakpoints(a, b, phi),
        support: null,
        window: null,
        walls: null,
      };
      return charged(f, options.budget, formulaPointOps(state.expr.text.length), cut);
    }
    case 'thermal':
    case 'mixture':
      // A mixed state is no single function: mixed.ts builds and measures its pure parts one by one.
      return null;
  }
}

/** Thrown (and caught by the analysis) when `phi(n, x)` names a level the basis does not hold. */
export class MissingLevel extends Error {
  constructor(readonly level: number) {
    super(`phi(${level}, x) is not a level of this system`);
  }
}
