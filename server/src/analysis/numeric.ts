/**
 * The numerical stage: the system's basis, the state's measurements, the findings of each check
 * family, the `expect` lines, the evolution and the plot samples, in that order, under the one budget
 * of the compute context.
 */
import type { AnalysisResult, EvolutionResult, LevelResult, SampleResult } from './types';
import type { QFile } from '../language/ast';
import type { Eigenbasis } from '../physics/types';
import { evolve, revivalTime } from '../physics/evolution';
import { fineSurvival } from '../physics/survival';
import { addFineSurvival } from './fineSurvival';
import { meanQuantumNumber } from '../shared/quanta';
import { timeToDisplay } from '../expr/units';
import type { Model } from './model';
import { buildBasis, buildState, type BuiltBasis, type StateFunction } from './systems';
import { BadValue } from './expand';
import { growthAt, type Singularity } from './singular';
import { measureState, type StateMeasurements } from './measure';
import { checkBasisFacts, STATE_CHECKS, stopFinding, type CheckContext } from './checks';
import { markUnresolved } from './unresolvedLevels';
import { checkExpects } from './expects';
import { fmt, warn } from './findings';
import type { ComputeContext } from './context';
import { resolvedCount, samplePoints } from './samplesState';
import { massRegions, massSamples } from './massView';
import { viewGrid } from './viewGrid';
import { isMixed, mixedStage } from './mixedStage';
import { tableOps } from './charged';
import { Stopped, type Budget } from '../physics/budget';

/** What the numerical stage works on. */
export interface NumericInput {
  model: Model;
  file: QFile;
  ctx: ComputeContext;
  /** Include plot samples for the panel. */
  samples: boolean;
  /** Their grid (AnalyseOptions.plot). */
  plot?: { points?: number; levels?: number };
}

/** Runs the numerical stage, filling `result` (its diagnostics included). Throws `BadValue` and `MissingLevel` for the caller to word. */
export function numericStage(input: NumericInput, result: AnalysisResult): void {
  try {
    numericStageIn(input, result);
  } catch (err) {
    // An evaluation cut by the budget (charged.ts): what was filled stands, and the caller reports the limit.
    if (!(err instanceof Stopped)) throw err;
  }
}

function numericStageIn(input: NumericInput, result: AnalysisResult): void {
  const { model, ctx } = input;
  const out = result.diagnostics;
  result.units = unitNames(model);
  if (!model.system) {
    const systemRejected = input.file.rejected?.some((r) => r.keyword === 'system') ?? false;
    if (model.state && model.ok && !systemRejected) {
      const st = model.state.stmt;
      out.push(warn('name', st.keywordSpan, 'The file has a state but no system to expand it in; add a `system` line.'));
    }
    return;
  }
  const sysStmt = model.system.stmt;
  const asked = model.basis.value;
  const built = buildBasis(model.system.model, model.mass, asked, out, { maxGridPoints: ctx.limits.maxGridPoints, budget: ctx.budget });
  if (!built) return;
  const basis = built.basis;
  const extent = extentProblem(basis);
  if (extent) {
    out.push(warn('evaluation', sysStmt.span, extent));
    return;
  }
  const stateStmt = model.state?.stmt;
  const stateSpan = stateStmt ? (stateStmt.kind === 'state' && stateStmt.state.kind === 'psi' ? stateStmt.state.expr : stateStmt.span) : sysStmt.span;
  const checks: CheckContext = { model, basis, stateSpan, systemStmt: sysStmt, limits: ctx.limits };
  out.push(...checkBasisFacts(built, asked, checks));
  result.system = systemFacts(basis);
  if (built.unresolved) result.system.unresolvedFrom = built.unresolved;
  const massFacts = massRegions(basis, model.units);
  if (massFacts) result.system.mass = massFacts;
  if (!model.state || ctx.budget.expired()) return;
  if (isMixed(model.state.model)) return mixedStage({ input, built, count: Math.min(asked, basis.count), checks }, result);
  const state = buildState(model.state.model, basis, model.mass, out, { maxGridPoints: ctx.limits.maxGridPoints, budget: ctx.budget });
  if (!state) return;
  // A sampled state is expanded only on the levels its samples resolve.
  const count = resolvedCount(model.state.model, basis, Math.min(asked, basis.count), out);
  if (count === 0) return;
  if (count < Math.min(asked, basis.count)) checks.resolved = count;
  try {
    stateStage({ input, built, count, state, checks }, result);
  } catch (err) {
    // A state infinite at a sampled point: say how it grows there (the caller words it).
    if (err instanceof BadValue && Number.isFinite(err.x)) {
      err.growth = growthAt(state, err.x, basis.walls ?? basis.support);
      if (err.growth) result.singularity = singularityOf(err.growth, 0);
    }
    throw err;
  }
}

/** The state's part: measure, judge each family, then the expects, the evolution and the samples. */
function stateStage(s: { input: NumericInput; built: BuiltBasis; count: number; state: StateFunction; checks: CheckContext }, result: AnalysisResult): void {
  const { input, checks } = s;
  const { model, ctx } = input;
  const out = result.diagnostics;
  const m = measureStopped(() => measureState({ model, built: s.built, count: s.count, state: s.state, ctx }));
  if ('stop' in m) {
    if (m.stop === 'notFinite') result.norm = m.norm;
    if (m.stop === 'notSquareIntegrable') result.singularity = singularityOf(m.singular, 0);
    out.push(stopFinding(m, checks));
    return;
  }
  for (const check of STATE_CHECKS) out.push(...check(m, checks));
  fillResult(m, result);
  markUnresolved(result.levels, s.built);
  if (m.basis.kind === 'oscillator') result.meanQuantumNumber = meanQuantumNumber(result.system, result.energy?.mean);
  // A pure state: Tr rho^2 = 1 exactly.
  result.purity = 1;
  if (ctx.budget.expired()) return;
  checkExpects(model, result, out, { basis: m.basis, levels: m.levels, budget: ctx.budget });
  // An asked number of points (the export's) is evenly spaced; the panel's grid is dense where the state lives.
  // Only a result with samples needs the grid (viewGrid evaluates the state on its probes: not free).
  const plotX = !input.samples ? undefined : input.plot?.points !== undefined ? plotGrid(m.basis, m.window, input.plot.points) : viewGrid(m.basis, m.window, s.state, m.levels, VIEW_POINTS);
  if (model.evolve) result.evolution = evolution(model, m.basis, m.levels, plotX, ctx);
  if (input.samples && plotX) {
    result.samples = { ...samples(s.state, m.basis, plotX, m.norm, m.levels, input.plot?.levels ?? 100, ctx.budget), ...massSamples(m.basis, plotX, model.units) };
    if (model.state?.model.kind === 'samples') result.samples.data = samplePoints(model.state.model, m.norm);
  }
}

/** The measurement, or the time stop when an evaluation was cut by the budget before it finished (charged.ts). */
function measureStopped(measure: () => ReturnType<typeof measureState>): ReturnType<typeof measureState> {
  try {
    return measure();
  } catch (err) {
    if (err instanceof Stopped) return { stop: 'noTime' };
    throw err;
  }
}

/** The measured numbers a front end shows. */
export function fillResult(m: StateMeasurements, result: AnalysisResult): void {
  result.norm = m.norm;
  result.levels = m.levels;
  result.captured = m.captured;
  result.levelsFor999 = m.levelsFor999;
  result.energy = { mean: m.mean, spread: m.spread };
  result.decay = m.decay;
  if (m.parity) result.parity = m.parity.parity;
  if (m.continuum !== null) result.continuum = m.continuum;
  if (m.singular) result.singularity = singularityOf(m.singular, m.unresolvedNearSpike);
}

function singularityOf(g: Singularity, unresolvedWeight: number): NonNullable<AnalysisResult['singularity']> {
  return { x: g.x, power: g.power, logarithmic: g.logarithmic === true, integrable: g.integrable, unresolvedWeight };
}

function unitNames(model: Model): AnalysisResult['units'] {
  const u = model.units;
  if (u.mode === 'natural') return { length: null, energy: null, time: null };
  const energyKind = u.energy.frequency ? 'frequency' : u.energy.name === 'invcm' ? 'wavenumber' : 'energy';
  return { length: u.length.name, energy: u.energy.name, time: u.time ? u.time.name : null, energyKind };
}

/**
 * Extents at the ends of double precision (box(-1e308, 1e308), box(0, 5e-324), a subnormal mass) would
 * give grids of Infinity or NaN: the message naming the cause, or null when the extent is usable.
 */
function extentProblem(basis: Eigenbasis): string | null {
  const [ea, eb] = basis.walls ?? basis.support;
  const extent = eb - ea;
  if (basis.count === 0 || (Number.isFinite(extent) && extent > 1e-12 * Math.max(Math.abs(ea), Math.abs(eb)) && extent > 1e-290)) return null;
  const what = Number.isFinite(extent) || Number.isNaN(extent) ? 'too small to compute with in double precision' : 'too large for double precision';
  return `The system's extent (${fmt(ea)} to ${fmt(eb)}) is ${what}; rescale its parameters or the mass, or choose other units.`;
}

/** The system's facts for hovers: kind, the first 20 energies, the well's bound-state count, the centre. */
function systemFacts(basis: Eigenbasis): NonNullable<AnalysisResult['system']> {
  const energies = Array.from(basis.energies.subarray(0, Math.min(20, basis.count)));
  const system: NonNullable<AnalysisResult['system']> = { kind: basis.kind, firstLabel: basis.firstLabel, energies, center: basis.center };
  if (basis.uncertainty) system.uncertainties = Array.from(basis.uncertainty.subarray(0, energies.length));
  if (basis.kind === 'well') system.boundCount = basis.count;
  return system;
}

function evolution(model: Model, basis: Eigenbasis, levels: LevelResult[], densityX: Float64Array | undefined, ctx: ComputeContext): EvolutionResult {
  const ev = model.evolve!;
  const k = levels.length;
  const cRe = new Float64Array(k);
  const cIm = new Float64Array(k);
  levels.forEach((l, i) => {
    cRe[i] = l.re ?? 0;
    cIm[i] = l.im ?? 0;
  });
  const times = new Float64Array(ev.steps + 1);
  for (let j = 0; j <= ev.steps; j++) times[j] = (ev.to * j) / ev.steps;
  const r = evolve(basis, cRe, cIm, times, { density: densityX, budget: ctx.budget });
  // Cut short by the time limit (reported once for the whole analysis): the times finished, no revival search.
  const rev = r.stopped === null ? revivalTime(basis, cRe, cIm, { budget: ctx.budget }) : null;
  const t = (x: number): number => timeToDisplay(x, model.units);
  const res: EvolutionResult = {
    times: Array.from(times.subarray(0, r.survival.length), t),
    meanX: Array.from(r.meanX),
    meanP: Array.from(r.meanP),
    survival: Array.from(r.survival),
    revival: rev === null ? null : t(rev),
  };
  if (r.density) res.density = r.density.map((d: Float64Array) => Array.from(d));
  if (r.stopped === null) addFineSurvival(res, fineSurvival(basis.energies, cRe, cIm, ev.to, ev.steps, { budget: ctx.budget }), t);
  return res;
}

/** `n` points (400 for the panel) over the walls (or the integration window) for plots. */
export function plotGrid(basis: Eigenbasis, window: [number, number], n: number): Float64Array {
  const [a, b] = basis.walls ?? window;
  const xs = new Float64Array(n);
  for (let j = 0; j < n; j++) xs[j] = a + ((b - a) * j) / (n - 1);
  return xs;
}

/** Points of the panel's grid over where the state lives (viewGrid.ts). */
export const VIEW_POINTS = 400;

/** Levels drawn for a result the budget cut short: its plot is not worth what the limit saved. */
export const CUT_PLOT_LEVELS = 12;

/**
 * The plot samples: the state, the first `maxLevels` levels and the potential at xs. With the budget,
 * the levels' table is charged to it, and a result it already cut short draws only `CUT_PLOT_LEVELS`
 * levels (a numerical basis's table costs its sine terms at every point of every level drawn).
 */
export function samples(state: StateFunction, basis: Eigenbasis, xs: Float64Array, norm: number, levels: LevelResult[], maxLevels: number, budget?: Budget): SampleResult {
  const n = xs.length;
  const v = state.evaluate(xs, 0);
  const s = 1 / Math.sqrt(norm);
  const kmax = Math.min(levels.length, maxLevels, budget?.reason ? CUT_PLOT_LEVELS : Infinity);
  budget?.spend(tableOps(basis, kmax) * n);
  const table = new Float64Array(kmax * n);
  basis.table(xs, kmax, table);
  const phi: number[][] = [];
  for (let k = 0; k < kmax; k++) phi.push(Array.from(table.subarray(k * n, (k + 1) * n)));
  const pot: number[] = [];
  // A numerical potential in one vectorised call, not one evaluation of its formula a point.
  const vs = basis.potentials ? basis.potentials(xs) : null;
  for (let j = 0; j < n; j++) {
    const p = vs ? vs[j]! : basis.potential(xs[j]!);
    pot.push(Number.isFinite(p) ? p : 0);
  }
  // Plots take finite numbers only: a state that is infinite at a plot point (1/x at a wall) is drawn as 0 there.
  const finite = (r: number): number => (Number.isFinite(r * s) ? r * s : 0);
  return { x: Array.from(xs), re: Array.from(v.re, finite), im: Array.from(v.im, finite), potential: pot, phi, walls: basis.walls };
}
