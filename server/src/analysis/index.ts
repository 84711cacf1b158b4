/**
 * The one function every front end calls: text in, expansion and diagnostics out.
 * `analyseStatic` is the cheap stage (syntax, names, units) run on every keystroke; `analyse` adds the
 * numerics. Both are pure and never throw.
 */
import type { AnalysisResult, EvolutionResult, LevelResult, SampleResult } from './types';
import { diagnostic, type EngineDiagnostic, type FixData } from '../language/catalogue';
import { compositeGaussLegendre } from '../physics/quadrature';
import type { QFile } from '../language/ast';
import { parse } from '../language/parser';
import { buildModel, fmt, type Model } from './model';
import { buildBasis, buildState, MissingLevel, type BuiltBasis, type StateFunction } from './systems';
import { BadValue, classifyBreakpoints, decayOf, expandState, findWindow, gridEnergy, parityParts, replaceFix, warn } from './expand';
import { distanceText, findSingularity, gradedTowards, growthAt, weightWithin, type Singularity } from './singular';
import { checkExpects } from './expects';
import { evolve, revivalTime } from '../physics/evolution';
import { timeToDisplay } from '../expr/units';
import type { Eigenbasis } from '../physics/types';

/** Options of `analyse`, with their defaults. */
export interface AnalyseOptions {
  /** Levels to project on when the file has no `basis` line (default 40). */
  defaultBasis?: number;
  /** When false, only syntax checks run (untrusted workspaces). Default true. */
  evaluate?: boolean;
  /** Include plot samples (`samples`, `evolution.density`) for the panel. Default false. */
  samples?: boolean;
  /** Polled between stages; when it returns true the analysis stops early and returns what it has. */
  cancelled?: () => boolean;
  /** Caps (defaults in `DEFAULT_LIMITS`). */
  limits?: Partial<Limits>;
}

/** Resource caps; each exceeded cap is a `limits` diagnostic. */
export interface Limits {
  maxBasis: number;
  maxGridPoints: number;
  maxExpressionLength: number;
  maxNesting: number;
  maxFileBytes: number;
  maxStatements: number;
  maxEvolveSteps: number;
  /** Time per analysis in milliseconds: past it the stages stop with what they have and a `limits` diagnostic. */
  maxMillis: number;
}

/** Safe defaults for `Limits`. */
export const DEFAULT_LIMITS: Limits = {
  maxBasis: 5000,
  maxGridPoints: 1 << 18,
  maxExpressionLength: 10_000,
  maxNesting: 200,
  maxFileBytes: 256 * 1024,
  maxStatements: 2000,
  maxEvolveSteps: 10_000,
  maxMillis: 10_000,
};

/** The caps a user may set (editor settings `eigenspan.limits.*`, `--limit NAME=VALUE`), the time limit apart. */
export type SettableLimit = Exclude<keyof Limits, 'maxMillis'>;

/**
 * The range each settable cap may take. The upper ends keep the engine safe whatever is set: the
 * expression parser recurses deeply for each bracket (measured: about 260 nested brackets fit Node's
 * default stack on the main thread, where the command line and the editor's quick stage parse; a
 * deeper text is still refused cleanly), grids of 2^21 points with two derivatives take about 100 MB,
 * and the time limit bounds the rest.
 */
export const LIMIT_RANGES: Readonly<Record<SettableLimit, readonly [number, number]>> = Object.freeze({
  maxBasis: [1, 20_000],
  maxGridPoints: [1024, 1 << 21],
  maxExpressionLength: [100, 1_000_000],
  maxNesting: [10, 250],
  maxFileBytes: [1024, 16 * 1024 * 1024],
  maxStatements: [10, 100_000],
  maxEvolveSteps: [1, 100_000],
});

/**
 * Reads settable caps from an untrusted object ({ maxBasis: 8000, ... }): whole numbers inside
 * `LIMIT_RANGES` are kept, anything else is left at its default and named in `problems`
 * (unknown names too). Never throws.
 */
export function readLimits(raw: unknown): { limits: Partial<Limits>; problems: string[] } {
  const limits: Partial<Limits> = {};
  const problems: string[] = [];
  if (raw === undefined || raw === null) return { limits, problems };
  if (typeof raw !== 'object' || Array.isArray(raw)) return { limits, problems: ['the limits must be an object of names and numbers'] };
  for (const [name, value] of Object.entries(raw as Record<string, unknown>)) {
    if (!Object.prototype.hasOwnProperty.call(LIMIT_RANGES, name)) {
      problems.push(`'${name}' is not a limit (known: ${Object.keys(LIMIT_RANGES).join(', ')})`);
      continue;
    }
    const [lo, hi] = LIMIT_RANGES[name as SettableLimit];
    const v = typeof value === 'string' && value.trim() !== '' ? Number(value) : value;
    if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi) {
      problems.push(`${name} must be a whole number from ${lo} to ${hi}`);
      continue;
    }
    limits[name as SettableLimit] = v;
  }
  return { limits, problems };
}

/** Default number of levels when a file has no `basis` line. */
export const DEFAULT_BASIS = 40;

/** Tolerance of the norm, capture and parity checks. */
const TOL = 1e-6;

interface StaticStage {
  file: QFile;
  diagnostics: EngineDiagnostic[];
  model: Model | null;
  limits: Limits;
}

function staticStage(text: string, options: AnalyseOptions): StaticStage {
  const limits = { ...DEFAULT_LIMITS, ...options.limits };
  const diagnostics: EngineDiagnostic[] = [];
  if (text.length > limits.maxFileBytes) {
    diagnostics.push(
      diagnostic('limits', 0, Math.min(text.length, 1), `The file is ${text.length} characters long, above the limit of ${limits.maxFileBytes}; it is not analysed.`),
    );
    return { file: { text, statements: [] }, diagnostics, model: null, limits };
  }
  const parsed = parse(text);
  diagnostics.push(...parsed.diagnostics);
  let file = parsed.file;
  if (file.statements.length > limits.maxStatements) {
    const s = file.statements[limits.maxStatements]!;
    diagnostics.push(diagnostic('limits', s.span.start, s.span.end, `The file has ${file.statements.length} statements, above the limit of ${limits.maxStatements}; the rest are ignored.`));
    file = { text, statements: file.statements.slice(0, limits.maxStatements) };
  }
  const model = buildModel(
    file,
    {
      defaultBasis: options.defaultBasis ?? DEFAULT_BASIS,
      maxBasis: limits.maxBasis,
      maxEvolveSteps: limits.maxEvolveSteps,
      maxExpressionLength: limits.maxExpressionLength,
      maxNesting: limits.maxNesting,
      evaluate: options.evaluate !== false,
    },
    diagnostics,
  );
  return { file, diagnostics, model, limits };
}

/** Syntax, name and unit checks only: cheap enough to run on every keystroke. Never throws. */
export function analyseStatic(text: string, options: AnalyseOptions = {}): { file: QFile; diagnostics: EngineDiagnostic[] } {
  try {
    const s = staticStage(text, options);
    return { file: s.file, diagnostics: sortDiagnostics(s.diagnostics) };
  } catch (err) {
    return { file: { text, statements: [] }, diagnostics: [internalError(err, text)] };
  }
}

function emptyResult(file: QFile | null, diagnostics: EngineDiagnostic[], started: number): AnalysisResult {
  return {
    file,
    diagnostics,
    units: { length: null, energy: null, time: null },
    system: null,
    levels: [],
    norm: null,
    captured: null,
    energy: null,
    parity: null,
    decay: null,
    levelsFor999: null,
    evolution: null,
    samples: null,
    elapsedMs: performance.now() - started,
  };
}

function internalError(err: unknown, text: string): EngineDiagnostic {
  const msg = err instanceof Error ? err.message : String(err);
  return diagnostic('evaluation', 0, Math.min(1, text.length), `The analysis stopped on an internal error (${msg}); please report this file.`);
}

function sortDiagnostics(d: EngineDiagnostic[]): EngineDiagnostic[] {
  return d.sort((a, b) => a.start - b.start || a.end - b.end);
}

/** Options with the deadline of the time limit (performance.now() milliseconds), for the grid refinement. */
type Timed = AnalyseOptions & { deadline?: number };

/** Parses, checks and expands a `.qstate` file. Never throws. */
export function analyse(text: string, options: AnalyseOptions = {}): AnalysisResult {
  const started = performance.now();
  let stage: StaticStage;
  try {
    stage = staticStage(text, options);
  } catch (err) {
    return emptyResult(null, [internalError(err, text)], started);
  }
  const result = emptyResult(stage.file, stage.diagnostics, started);
  // The time limit: every stage polls `cancelled`, and the grid refinement also sees the deadline.
  const maxMillis = stage.limits.maxMillis;
  let outOfTime = false;
  const timed: Timed = { ...options, deadline: started + maxMillis, cancelled: () => options.cancelled?.() === true || (outOfTime ||= performance.now() > started + maxMillis) };
  try {
    if (stage.model && options.evaluate !== false) numericStage(stage.model, stage, timed, result);
  } catch (err) {
    if (err instanceof BadValue) {
      const st = stage.model?.state?.stmt;
      const span = st && st.kind === 'state' && st.state.kind === 'psi' ? st.state.expr : st?.span ?? { start: 0, end: 0 };
      const what = Number.isNaN(err.value) ? 'not a number (as from 0/0 or Infinity - Infinity)' : `${err.value > 0 ? '+' : '-'}Infinity`;
      if (err.growth && !err.growth.integrable) result.diagnostics.push(diagnostic('norm', span.start, span.end, notSquareIntegrable(err.growth), { severity: 'error' }));
      else if (err.growth) {
        result.diagnostics.push(
          diagnostic('evaluation', span.start, span.end, `The state is infinite at x = ${fmt(err.x)}, growing like ${growthText(err.growth)} there: |psi|^2 is integrable, but the energy is infinite and the grid cannot sample that point. Remove the singularity or move it off x = ${fmt(err.x)}.`),
        );
      } else result.diagnostics.push(diagnostic('evaluation', span.start, span.end, `The state is ${what} at ${Number.isFinite(err.x) ? `x = ${fmt(err.x)}` : 'a point the grid cannot represent (a position overflows double precision)'}; it must be finite everywhere.`));
    } else if (err instanceof MissingLevel) {
      // Systems without walls evaluate the state while looking for its window, before the expansion.
      const st = stage.model?.state?.stmt;
      const span = st && st.kind === 'state' && st.state.kind === 'psi' ? st.state.expr : st?.span ?? { start: 0, end: 0 };
      result.diagnostics.push(diagnostic('evaluation', span.start, span.end, `'phi(${err.level}, x)' is not among the levels of the basis; raise \`basis\` until it includes level ${err.level}.`));
    } else {
      result.diagnostics.push(internalError(err, text));
    }
  }
  if (outOfTime) {
    const at = stage.model?.system?.stmt.keywordSpan ?? { start: 0, end: Math.min(1, text.length) };
    result.diagnostics.push(diagnostic('limits', at.start, at.end, `The analysis took longer than the time limit of ${maxMillis} ms and was stopped; the results are incomplete.`));
  }
  result.diagnostics = sortDiagnostics(result.diagnostics);
  result.elapsedMs = performance.now() - started;
  return result;
}

function unitNames(model: Model): AnalysisResult['units'] {
  const u = model.units;
  if (u.mode === 'natural') return { length: null, energy: null, time: null };
  return { length: u.length.name, energy: u.energy.name, time: u.time ? u.time.name : null };
}

function numericStage(model: Model, stage: StaticStage, options: AnalyseOptions, result: AnalysisResult): void {
  const out = result.diagnostics;
  result.units = unitNames(model);
  if (!model.system) {
    const systemRejected = stage.file.rejected?.some((r) => r.keyword === 'system') ?? false;
    if (model.state && model.ok && !systemRejected) {
      const st = model.state.stmt;
      out.push(diagnostic('name', st.keywordSpan.start, st.keywordSpan.end, 'The file has a state but no system to expand it in; add a `system` line.'));
    }
    return;
  }
  const limits = stage.limits;
  const sys = model.system.model;
  const sysStmt = model.system.stmt;
  let count = model.basis.value;
  const built = buildBasis(sys, model.mass, count, out, { maxGridPoints: limits.maxGridPoints, cancelled: options.cancelled, deadline: (options as Timed).deadline });
  if (!built) return;
  const basis = built.basis;
  // Extents at the ends of double precision (box(-1e308, 1e308), box(0, 5e-324), a subnormal mass) would
  // give grids of Infinity or NaN; name the cause instead of reporting a zero or non-finite state.
  const [ea, eb] = basis.walls ?? basis.support;
  const extent = eb - ea;
  if (basis.count > 0 && !(Number.isFinite(extent) && extent > 1e-12 * Math.max(Math.abs(ea), Math.abs(eb)) && extent > 1e-290)) {
    const what = Number.isFinite(extent) || Number.isNaN(extent) ? 'too small to compute with in double precision' : 'too large for double precision';
    out.push(diagnostic('evaluation', sysStmt.span.start, sysStmt.span.end, `The system's extent (${fmt(ea)} to ${fmt(eb)}) is ${what}; rescale its parameters or the mass, or choose other units.`));
    return;
  }
  reportBasisFacts(built, model, sysStmt.span, count, out);
  count = Math.min(count, basis.count);
  const energiesShown = Array.from(basis.energies.subarray(0, Math.min(20, basis.count)));
  result.system = {
    kind: basis.kind,
    energies: energiesShown,
    center: basis.center,
  };
  if (basis.uncertainty) result.system.uncertainties = Array.from(basis.uncertainty.subarray(0, energiesShown.length));
  if (basis.kind === 'well') result.system.boundCount = basis.count;
  if (!model.state || options.cancelled?.()) return;

  const stateStmt = model.state.stmt;
  const stateSpan = stateStmt.kind === 'state' && stateStmt.state.kind === 'psi' ? stateStmt.state.expr : stateStmt.span;
  const state = buildState(model.state.model, basis, model.mass, out, { maxGridPoints: limits.maxGridPoints, cancelled: options.cancelled, deadline: (options as Timed).deadline });
  if (!state) return;
  try {
    stateStage(model, stage, options, result, { built, count, state, stateSpan });
  } catch (err) {
    // A state infinite at a sampled point: say how it grows there (the message is written above).
    if (err instanceof BadValue && Number.isFinite(err.x)) err.growth = growthAt(state, err.x, basis.walls ?? basis.support);
    throw err;
  }
}

/** The state's part of the numerical stage: window, expansion, and every finding about the state. */
function stateStage(
  model: Model,
  stage: StaticStage,
  options: AnalyseOptions,
  result: AnalysisResult,
  given: { built: BuiltBasis; count: number; state: StateFunction; stateSpan: { start: number; end: number } },
): void {
  const out = result.diagnostics;
  const limits = stage.limits;
  const sys = model.system!.model;
  const sysStmt = model.system!.stmt;
  const { built, state, stateSpan } = given;
  const basis = built.basis;
  let count = given.count;
  if (!model.state) return;

  // The integration window: the walls for hard-walled systems, a scanned window on the line otherwise.
  let window: [number, number];
  if (basis.walls) window = [basis.walls[0], basis.walls[1]];
  else {
    const w = findWindowSafe(state, basis);
    if (!w) {
      out.push(warn('norm', stateSpan, 'The state does not fall off away from the system: |psi|^2 cannot be integrated over the line.', undefined, 'error'));
      return;
    }
    window = w;
  }

  let ex: ReturnType<typeof expandState>;
  try {
    ex = expandState(state, basis, count, window, { maxGridPoints: limits.maxGridPoints, cancelled: options.cancelled, deadline: (options as Timed).deadline });
  } catch (err) {
    if (err instanceof MissingLevel) {
      out.push(warn('evaluation', stateSpan, `'phi(${err.level}, x)' is not a level of this system: levels run from ${basis.firstLabel} to ${basis.firstLabel + basis.count - 1}${basis.kind === 'well' ? '' : ' (raise `basis`)'}.`));
      return;
    }
    throw err;
  }
  if (ex.re.length < count) {
    out.push(warn('limits', stateSpan, `Only the first ${ex.re.length} of ${count} levels could be projected within the time limit of ${limits.maxMillis} ms; lower \`basis\` or raise the limit.`));
    count = ex.re.length;
  }
  // A refinement that never settles may be chasing a point where the state is infinite.
  const singular = ex.capped ? findSingularity(state, ex.q, ex.values, window) : null;
  if (singular && !singular.integrable) {
    out.push(warn('norm', stateSpan, notSquareIntegrable(singular), undefined, 'error'));
    return;
  }
  // An integrable spike: expand again on a grid graded towards it, and measure what double precision
  // cannot reach (relative to the norm).
  let unresolvedNearSpike = 0;
  let closest = 0;
  // The state as the projections see it (with the graded breakpoints once a spike is found).
  let projected: StateFunction = state;
  if (singular && !ex.late && !(options.cancelled?.() ?? false)) {
    const graded = gradedTowards(state, singular, window);
    closest = graded.closest;
    try {
      ex = expandState(graded.state, basis, count, window, { maxGridPoints: limits.maxGridPoints, cancelled: options.cancelled, deadline: (options as Timed).deadline });
      projected = graded.state;
    } catch (err) {
      if (!(err instanceof BadValue)) throw err;
    }
    unresolvedNearSpike = weightWithin(state, singular, closest, window) / (ex.norm > 0 ? ex.norm : 1);
  }
  if (ex.capped && ex.late) out.push(warn('limits', stateSpan, `The time limit of ${limits.maxMillis} ms stopped the grid refinement; the coefficients may be inaccurate.`));
  else if (ex.capped) out.push(warn('limits', stateSpan, `The grid cap of ${limits.maxGridPoints} points stopped refinement; the coefficients may be inaccurate.`));
  const norm = ex.norm;
  if (norm === Infinity) {
    out.push(warn('evaluation', stateSpan, 'The integral of |psi|^2 overflows (the state is too large to square in double precision); scale the state down.', undefined, 'error'));
    return;
  }
  if (!(norm > 0) && maxAbs(ex.values.re, ex.values.im) > 0) {
    out.push(warn('norm', stateSpan, 'The state is so small that |psi|^2 underflows to zero in double precision; multiply it by a large factor.', undefined, 'error'));
    return;
  }
  const mid = !(norm > 0) && state.window ? state.evaluate(new Float64Array([(state.window[0] + state.window[1]) / 2]), 0) : null;
  if (mid && maxAbs(mid.re, mid.im) > 0) {
    // The grid over the system's extent stepped over a state far narrower than the system.
    out.push(warn('norm', stateSpan, `The state is far narrower than the system's extent (${fmt(window[0])} to ${fmt(window[1])}), so the grid misses it; check the mass and the system's size.`, undefined, 'error'));
    return;
  }
  if (!(norm > 0)) {
    out.push(warn('norm', stateSpan, 'The state is zero everywhere in the system; there is nothing to expand.', undefined, 'error'));
    return;
  }
  result.norm = norm;
  const s = 1 / Math.sqrt(norm);
  const levels: LevelResult[] = [];
  let captured = 0;
  const weights = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const re = ex.re[k]! * s;
    const im = ex.im[k]! * s;
    const w = re * re + im * im;
    weights[k] = w;
    captured += w;
    const lv: LevelResult = { n: k + basis.firstLabel, energy: basis.energies[k]!, re, im, weight: w };
    if (basis.uncertainty) lv.uncertainty = basis.uncertainty[k]!;
    levels.push(lv);
  }
  if (!Number.isFinite(captured) || levels.some((l) => !Number.isFinite(l.energy))) {
    // Overflowing or underflowing parameters (a mass of 1e-300) make coefficients NaN or energies infinite.
    out.push(warn('evaluation', stateSpan, "The coefficients or level energies are not finite numbers: the system's, the mass's or the state's values are beyond what double precision can compute; rescale them.", undefined, 'error'));
    return;
  }
  result.levels = levels;
  result.captured = captured;
  let acc = 0;
  for (let k = 0; k < count; k++) {
    acc += weights[k]!;
    if (acc >= 0.999) {
      result.levelsFor999 = k + 1;
      break;
    }
  }

  // Norm.
  if (model.state.model.kind === 'psi' && Math.abs(norm - 1) > TOL) {
    const factor = 1 / Math.sqrt(norm);
    const expr = model.state.model.expr;
    const factorText = formatFactor(factor);
    out.push(
      warn('norm', stateSpan, `The integral of |psi|^2 is ${fmt(norm)}, not 1; results are for the normalised state. Multiply psi by ${factorText} to normalise it.`, [
        replaceFix('Normalise the state', expr, `${factorText} * (${expr.text})`),
      ]),
    );
  }

  // Hard walls: the state's value at the walls and weight outside them.
  // Next to a spike the largest values on the grid say nothing about the state's size: use its rms instead.
  const rms = Math.sqrt(norm / (window[1] - window[0]));
  const scalePsi = singular ? rms : maxAbs(ex.values.re, ex.values.im) || 1;
  const scaleD = singular ? rms / (window[1] - window[0]) : maxAbs(ex.values.d1re!, ex.values.d1im!) || scalePsi / (window[1] - window[0]);
  let wallBreak = false;
  if (basis.walls) wallBreak = checkWalls(state, basis, norm, stateSpan, scalePsi, out, sys.kind === 'potential' ? sysStmt : null);

  const found = classifyBreakpoints(state, window, { psi: scalePsi, dpsi: scaleD });
  // A breakpoint at the singularity (the corner of abs(x - x0)) is reported as the singularity, not as a jump or kink.
  const apart = (x: number): boolean => !singular || Math.abs(x - singular.x) > 1e-6 * (window[1] - window[0]);
  const jumps = found.jumps.filter(apart);
  const kinks = found.kinks.filter(apart);

  // Energy: from the grid, with divergence decided by jumps, kinks and wall values.
  let meanFromLevels = 0;
  for (let k = 0; k < count; k++) meanFromLevels += weights[k]! * basis.energies[k]!;
  const g = gridEnergy(basis, ex.q, ex.values, norm);
  let mean: number | null = g.mean;
  let spread: number | null = Math.sqrt(Math.max(0, g.meanSquare - g.mean * g.mean));
  // Levels the solver could not resolve say nothing about the state's smoothness.
  const resolved = built.unresolved ? Math.max(0, Math.min(count, built.unresolved - basis.firstLabel)) : count;
  const decay = decayOf(basis, weights.subarray(0, resolved));
  if (decay) decay.at = jumps[0] ?? kinks[0] ?? null;
  if (wallBreak || jumps.length > 0 || decay?.classification === 'jump') {
    mean = null;
    spread = null;
  } else if (kinks.length > 0 || decay?.classification === 'kink') {
    spread = null;
  }
  if (singular) {
    // |psi|^2 integrable across the spike, |psi'|^2 not: the energy mean (and spread) are infinite.
    mean = null;
    spread = null;
    out.push(
      warn('convergence', stateSpan, `The state is infinite at x = ${fmt(singular.x)}, growing like ${growthText(singular)}: |psi|^2 is integrable there but |psi'|^2 is not, so the energy mean is infinite and the coefficients converge slowly.`),
    );
    if (unresolvedNearSpike > 1e-9) {
      out.push(
        warn('limits', stateSpan, `Double precision cannot sample closer to x = ${fmt(singular.x)} than about ${fmt(closest)}, and about ${fmt(unresolvedNearSpike)} of |psi|^2 lies that close; the norm and coefficients are accurate to about that.`, undefined, 'warning'),
      );
    }
  }
  // Overflowing integrals (a subnormal mass makes hbar^2 k^2 / 2m infinite) diverge like a jump: null.
  if (mean !== null && !Number.isFinite(mean)) mean = null;
  if (spread !== null && !Number.isFinite(spread)) spread = null;
  result.energy = { mean, spread };
  result.decay = decay;
  reportConvergence(basis, decay, jumps, kinks, wallBreak, mean, meanFromLevels, captured, stateSpan, out);

  // Parity.
  if (basis.center !== null) {
    const p = parityParts(state, ex.q, ex.values, basis.center);
    const total = p.even + p.odd;
    const minor = Math.min(p.even, p.odd) / total;
    const parity = p.odd / total < 1e-10 ? 'even' : p.even / total < 1e-10 ? 'odd' : 'mixed';
    result.parity = parity;
    reportParity(basis, parity, minor, p.odd < p.even ? 'even' : 'odd', stateSpan, out);
    if (parity !== 'mixed') {
      // Levels of the other parity vanish by symmetry; make their zeros exact.
      for (const lv of levels) {
        const k = lv.n - basis.firstLabel;
        const levelEven = basis.kind === 'oscillator' ? k % 2 === 0 : k % 2 === 0;
        if ((parity === 'even') !== levelEven && lv.weight < 1e-20) {
          captured -= lv.weight;
          lv.re = 0;
          lv.im = 0;
          lv.weight = 0;
        }
      }
      result.captured = captured;
    }
  }

  // Capture: basis too small, or weight in a well's continuum.
  if (basis.kind === 'well') {
    const cont = Math.max(0, 1 - captured);
    result.continuum = cont;
    if (cont > TOL) {
      out.push(
        warn('continuum', stateSpan, `${pct(cont)} of the state lies outside the ${basis.count} bound state${basis.count === 1 ? '' : 's'} (in the continuum of unbound states); the bound levels capture ${pct(captured)}.`),
      );
    }
  } else if (captured < 1 - TOL && !wallBreak) {
    const need = levelsNeeded(projected, basis, sys, model, window, limits, options);
    const basisStmt = model.basis.stmt;
    const fixes = need !== null && need <= limits.maxBasis
      ? [basisStmt && basisStmt.kind === 'basis'
          ? replaceFix(`Raise basis to ${need}`, basisStmt.expr, String(need))
          : { kind: 'insert' as const, title: `Add basis ${need}`, at: sysStmt.span.end, text: `\nbasis ${need}` }]
      : undefined;
    const span = basisStmt ? basisStmt.span : stateSpan;
    out.push(
      warn('basis', span, `The ${count} levels capture ${captureText(captured)} of the state, short of 1 by ${fmt(1 - captured)}.${need !== null ? ` ${need} levels capture all but 1e-6.` : ' Even the largest basis allowed does not capture all but 1e-6.'}`, fixes),
    );
  }

  if (options.cancelled?.()) return;
  checkExpects(model, result, out);

  const plotX = plotGrid(basis, window);
  if (model.evolve) result.evolution = evolution(model, basis, levels, options.samples ? plotX : undefined, options.cancelled);
  if (options.samples) result.samples = samples(state, basis, plotX, norm, levels);
}

/** The growth law of a singularity for a message: |x - 0.3|^-0.25. */
function growthText(g: Singularity): string {
  if (g.logarithmic) return `log(1/${distanceText(g.x, fmt)})`;
  return `${distanceText(g.x, fmt)}^-${Number(g.power.toFixed(2))}`;
}

/** The finding for a state whose |psi|^2 cannot be integrated across a point. */
function notSquareIntegrable(g: Singularity): string {
  return `The state is not square-integrable: near x = ${fmt(g.x)} it grows like ${growthText(g)}, so the integral of |psi|^2 diverges there and no normalisation exists. Remove the singularity or move it outside the system.`;
}

function findWindowSafe(state: StateFunction, basis: Eigenbasis): [number, number] | null {
  return findWindow(state, basis);
}

function reportBasisFacts(built: BuiltBasis, model: Model, sysSpan: { start: number; end: number }, asked: number, out: EngineDiagnostic[]): void {
  const basis = built.basis;
  if (basis.kind === 'well' && model.basis.stmt && asked > basis.count) {
    out.push(
      warn('basis', model.basis.stmt.span, `The well holds ${basis.count} bound state${basis.count === 1 ? '' : 's'}; basis ${asked} is capped at ${basis.count}.`, undefined, 'info'),
    );
  }
  if (built.unresolved !== undefined && built.unresolved !== null) {
    out.push(
      warn('limits', sysSpan, built.timeLimited
        ? `The time limit stopped the solver's refinement: level ${built.unresolved} and above are not resolved to 1e-9; lower \`basis\` or raise the limit.`
        : `The grid cap stopped refinement: level ${built.unresolved} and above are not resolved to 1e-9.`),
    );
  }
  if (built.wallArtefacts && built.wallArtefacts.length > 0) {
    const first = built.wallArtefacts[0]! + basis.firstLabel;
    out.push(
      warn('continuum', sysSpan, `Levels from n = ${first} lie above the potential where it levels off at a wall: they are the walls' box-quantised continuum, not bound states of the potential.`, undefined, 'info'),
    );
  }
}

function checkWalls(
  state: StateFunction,
  basis: Eigenbasis,
  norm: number,
  span: { start: number; end: number },
  scalePsi: number,
  out: EngineDiagnostic[],
  potentialStmt: import('../language/ast').Statement | null,
): boolean {
  const [a, b] = basis.walls!;
  const L = b - a;
  const problems: string[] = [];
  const v = state.evaluate(new Float64Array([a, b]), 0);
  const va = Math.hypot(v.re[0]!, v.im[0]!);
  const vb = Math.hypot(v.re[1]!, v.im[1]!);
  const tol = 1e-6 * scalePsi;
  const sn = Math.sqrt(norm);
  const at = (x: number, v: number): string => (Number.isFinite(v) ? `psi(${fmt(x)}) = ${fmt(v / sn)}` : `psi is infinite at ${fmt(x)}`);
  if (va > tol && vb > tol) problems.push(`it is not zero at the hard walls (${at(a, va)}, ${at(b, vb)}, normalised)`);
  else if (va > tol) problems.push(`it is not zero at the left wall (${at(a, va)}, normalised)`);
  else if (vb > tol) problems.push(`it is not zero at the right wall (${at(b, vb)}, normalised)`);
  // Weight outside the walls is dropped. Only states with an extent of their own (a packet, a level
  // of another system) can have such weight: a formula is read as the state inside the walls.
  const extent = state.support ?? state.window;
  if (extent && (extent[0] < a - 1e-12 * L || extent[1] > b + 1e-12 * L)) {
    const lo = Math.min(extent[0], a);
    const hi = Math.max(extent[1], b);
    let outside = 0;
    for (const [x0, x1] of [
      [lo, a],
      [b, hi],
    ] as const) {
      if (x1 - x0 <= 1e-12 * L) continue;
      const q = compositeGaussLegendre(x0, x1, { breakpoints: state.breakpoints(x0, x1), panels: 64, order: 20 });
      const w = state.evaluate(q.x, 0);
      for (let j = 0; j < q.x.length; j++) {
        const r = w.re[j]!;
        const i = w.im[j]!;
        if (Number.isFinite(r) && Number.isFinite(i)) outside += q.w[j]! * (r * r + i * i);
      }
    }
    const frac = outside / (outside + norm);
    if (frac > 1e-9) problems.push(`${pct(frac)} of |psi|^2 lies outside the walls at ${fmt(a)} and ${fmt(b)} and is dropped`);
  }
  // Numerical systems: weight piled against a wall means the interval cuts the state.
  const isPotential = potentialStmt !== null && potentialStmt.kind === 'system' && potentialStmt.system.kind === 'potential';
  if (isPotential && problems.length === 0) {
    const edge = 0.02 * L;
    let near = 0;
    let total = 0;
    const n = 4000;
    const xs = new Float64Array(n);
    for (let j = 0; j < n; j++) xs[j] = a + (L * (j + 0.5)) / n;
    const w = state.evaluate(xs, 0);
    for (let j = 0; j < n; j++) {
      const p = w.re[j]! ** 2 + w.im[j]! ** 2;
      total += p;
      if (xs[j]! < a + edge || xs[j]! > b - edge) near += p;
    }
    if (total > 0 && near / total > 1e-8) problems.push(`${pct(near / total)} of |psi|^2 lies within 2% of the walls`);
  }
  if (problems.length === 0) return false;
  let message = `The state breaks the walls' boundary condition: ${problems.join('; ')}.`;
  let fixes: FixData[] | undefined;
  if (isPotential && potentialStmt.kind === 'system' && potentialStmt.system.kind === 'potential') {
    const spec = potentialStmt.system;
    message += ' The walls cut the state: widen the interval.';
    fixes = [replaceFix('Widen the interval', { start: spec.from.start, end: spec.to.end }, `${widen(spec.from.text, -1, L)}, ${widen(spec.to.text, 1, L)}`)];
  } else if (va > tol || vb > tol) {
    message += ' Its coefficients fall off only as 1/n and its energy mean is infinite.';
  }
  out.push(warn('boundary', span, message, fixes));
  return va > tol || vb > tol || problems.length > 0;
}

function widen(text: string, sign: number, L: number): string {
  const half = L / 2;
  return sign < 0 ? `(${text}) - ${fmt(half)}` : `(${text}) + ${fmt(half)}`;
}

function reportConvergence(
  basis: Eigenbasis,
  decay: AnalysisResult['decay'],
  jumps: number[],
  kinks: number[],
  wallBreak: boolean,
  mean: number | null,
  meanFromLevels: number,
  captured: number,
  span: { start: number; end: number },
  out: EngineDiagnostic[],
): void {
  const p = decay?.exponent != null ? ` |c_n| falls off as n^-${fmt(decay.exponent)}.` : '';
  if (jumps.length > 0) {
    out.push(warn('convergence', span, `The state jumps at x = ${fmt(jumps[0]!)}: the expansion converges slowly (Gibbs ringing) and the energy mean is infinite.${p}`));
    return;
  }
  if (wallBreak) return; // Already explained by the boundary diagnostic.
  if (kinks.length > 0) {
    out.push(warn('convergence', span, `The state has a kink at x = ${fmt(kinks[0]!)}: the energy mean is finite but the energy spread is infinite.${p}`, undefined, 'info'));
    return;
  }
  if (decay && (decay.classification === 'jump' || decay.classification === 'kink')) {
    out.push(warn('convergence', span, `The coefficients decay slowly, as for a ${decay.classification}, so ${decay.classification === 'jump' ? 'the energy mean is infinite' : 'the energy spread is infinite'}.${p}`));
    return;
  }
  if (mean !== null && basis.kind !== 'well' && captured > 1 - 1e-3) {
    const scale = Math.max(Math.abs(mean), Math.abs(basis.energies[0]!), 1e-300);
    const rel = Math.abs(meanFromLevels / captured - mean) / scale;
    if (rel > 1e-3) {
      out.push(
        warn('convergence', span, `The energy mean from the levels computed (${fmt(meanFromLevels / captured)}) differs from <psi|H|psi> (${fmt(mean)}) by ${pct(rel)}: the high levels carry energy the basis leaves out; raise \`basis\`.`),
      );
    }
  }
}

function reportParity(
  basis: Eigenbasis,
  parity: 'even' | 'odd' | 'mixed',
  minor: number,
  major: 'even' | 'odd',
  span: { start: number; end: number },
  out: EngineDiagnostic[],
): void {
  const c = fmt(basis.center!);
  // Levels of even parity: n = 1, 3, ... (first label 1) or n = 0, 2, ... (oscillator).
  const vanish = (p: 'even' | 'odd'): string => {
    const first = basis.firstLabel + (p === 'even' ? 1 : 0);
    return `n = ${first}, ${first + 2}, ${first + 4}, ...`;
  };
  if (parity !== 'mixed') {
    out.push(warn('parity', span, `The state is ${parity} about x = ${c}: the levels ${vanish(parity)} vanish by symmetry.`, undefined, 'info'));
  } else if (minor < 1e-3) {
    out.push(
      warn('parity', span, `The state is almost ${major} about x = ${c} but not quite: the ${major === 'even' ? 'odd' : 'even'} part carries ${pct(minor)} of the weight.`, undefined, 'warning'),
    );
  }
}

function levelsNeeded(
  state: StateFunction,
  basis: Eigenbasis,
  sys: import('./model').SystemModel,
  model: Model,
  window: [number, number],
  limits: Limits,
  options: AnalyseOptions,
): number | null {
  // Project on more levels until the captured weight reaches 1 - TOL or the limit is hit.
  let n = Math.min(limits.maxBasis, Math.max(2 * basis.count, 100));
  for (let attempt = 0; attempt < 3; attempt++) {
    if (options.cancelled?.()) return null;
    const scratch: EngineDiagnostic[] = [];
    const b = n <= basis.count ? { basis } : buildBasis(sys, model.mass, n, scratch, { maxGridPoints: limits.maxGridPoints, cancelled: options.cancelled, deadline: (options as Timed).deadline });
    if (!b) return null;
    const m = Math.min(n, b.basis.count);
    const ex = expandState(state, b.basis, m, window, { maxGridPoints: limits.maxGridPoints, cancelled: options.cancelled, deadline: (options as Timed).deadline });
    let acc = 0;
    for (let k = 0; k < Math.min(m, ex.re.length); k++) {
      acc += (ex.re[k]! ** 2 + ex.im[k]! ** 2) / ex.norm;
      if (acc >= 1 - TOL) return k + 1;
    }
    if (n >= limits.maxBasis || m < n) return null;
    n = Math.min(limits.maxBasis, n * 4);
  }
  return null;
}

function evolution(
  model: Model,
  basis: Eigenbasis,
  levels: LevelResult[],
  densityX: Float64Array | undefined,
  cancelled: (() => boolean) | undefined,
): EvolutionResult {
  const ev = model.evolve!;
  const k = levels.length;
  const cRe = new Float64Array(k);
  const cIm = new Float64Array(k);
  levels.forEach((l, i) => {
    cRe[i] = l.re;
    cIm[i] = l.im;
  });
  const times = new Float64Array(ev.steps + 1);
  for (let j = 0; j <= ev.steps; j++) times[j] = (ev.to * j) / ev.steps;
  const r = evolve(basis, cRe, cIm, times, { density: densityX, cancelled });
  // Cut short by the time limit (reported once for the whole analysis): the times finished, no revival search.
  const rev = r.complete ? revivalTime(basis, cRe, cIm, { cancelled }) : null;
  const t = (x: number): number => timeToDisplay(x, model.units);
  const res: EvolutionResult = {
    times: Array.from(times.subarray(0, r.survival.length), t),
    meanX: Array.from(r.meanX),
    meanP: Array.from(r.meanP),
    survival: Array.from(r.survival),
    revival: rev === null ? null : t(rev),
  };
  if (r.density) res.density = r.density.map((d: Float64Array) => Array.from(d));
  return res;
}

/** 400 points over the walls (or the integration window) for plots. */
function plotGrid(basis: Eigenbasis, window: [number, number]): Float64Array {
  const [a, b] = basis.walls ?? window;
  const n = 400;
  const xs = new Float64Array(n);
  for (let j = 0; j < n; j++) xs[j] = a + ((b - a) * j) / (n - 1);
  return xs;
}

function samples(state: StateFunction, basis: Eigenbasis, xs: Float64Array, norm: number, levels: LevelResult[]): SampleResult {
  const n = xs.length;
  const v = state.evaluate(xs, 0);
  const s = 1 / Math.sqrt(norm);
  const kmax = Math.min(levels.length, 100);
  const table = new Float64Array(kmax * n);
  basis.table(xs, kmax, table);
  const phi: number[][] = [];
  for (let k = 0; k < kmax; k++) phi.push(Array.from(table.subarray(k * n, (k + 1) * n)));
  const pot: number[] = [];
  for (let j = 0; j < n; j++) {
    const p = basis.potential(xs[j]!);
    pot.push(Number.isFinite(p) ? p : 0);
  }
  // Plots take finite numbers only: a state that is infinite at a plot point (1/x at a wall) is drawn as 0 there.
  const finite = (r: number): number => (Number.isFinite(r * s) ? r * s : 0);
  return {
    x: Array.from(xs),
    re: Array.from(v.re, finite),
    im: Array.from(v.im, finite),
    potential: pot,
    phi,
    walls: basis.walls,
  };
}

function maxAbs(re: Float64Array, im: Float64Array): number {
  let m = 0;
  for (let j = 0; j < re.length; j++) m = Math.max(m, Math.hypot(re[j]!, im[j]!));
  return m;
}

/** A percentage for messages, with enough digits to be useful for tiny and large fractions. */
export function pct(f: number): string {
  const p = f * 100;
  if (p >= 1) return `${Number(p.toPrecision(4))}%`;
  if (p >= 1e-3) return `${Number(p.toPrecision(3))}%`;
  return `${p.toExponential(2).replace('e+', 'e')}%`;
}

/** A captured fraction with enough digits to show how far from 1 it is. */
function captureText(f: number): string {
  const short = 1 - f;
  const digits = short > 0 ? Math.min(15, Math.max(3, Math.ceil(-Math.log10(short)) + 2)) : 6;
  return String(Number(f.toPrecision(digits)));
}

/** A normalising factor as text, exact to 12 significant digits. */
function formatFactor(f: number): string {
  return String(Number(f.toPrecision(12)));
}
