/**
 * Facts the views read off a result, each from the result itself (never re-derived from plot samples):
 * which levels are numerical noise, the symmetry classes of the levels, which findings make the plots
 * meaningless, the natural vertical scale, what the time view shows and how well `evolve` samples it.
 * Pure (no DOM).
 */
import { formatNumber, formatPercent } from '../../../server/src/shared/numbers';
import { HBAR_SI, UNITS, energyUnitSI } from '../../../server/src/expr/constants';
import type { PanelResult } from '../../src/messages';

type Level = PanelResult['levels'][number];

/**
 * Weights below this fraction of the total are numerical zeros: double precision resolves a sum of
 * order 1 to about 1e-16 (IEEE 754 binary64, unit roundoff 1.1e-16), so they are not drawn.
 */
export const WEIGHT_FLOOR = 1e-16;

/**
 * Sums over many levels (the continuum weight 1 - captured) are resolved to about 1e-12, the
 * quadrature accuracy the engine states for smooth states (README, Cautions); less is shown as 0.
 */
export const SUM_RESOLUTION = 1e-12;

/** The total weight the floor is relative to: the captured weight, or 1 when it is missing. */
export function totalWeight(result: PanelResult): number {
  const c = result.captured;
  return c !== null && c > 0 && Number.isFinite(c) ? c : 1;
}

/**
 * The weight below which a level is not resolved: `WEIGHT_FLOOR` of the total (numerical zero), or for a
 * thermal mixture the share its sum left out, when larger (a population that small can be wrong by its
 * whole size: the left-out levels would have added to it).
 */
export function weightFloor(result: PanelResult): number {
  return Math.max(WEIGHT_FLOOR * totalWeight(result), result.mixture?.omitted ?? 0);
}

/** Whether the floor comes from a thermal sum's left-out share rather than from rounding. */
export function floorIsOmitted(result: PanelResult): boolean {
  return (result.mixture?.omitted ?? 0) > WEIGHT_FLOOR * totalWeight(result);
}

/** The reason a level below `weightFloor` is not drawn, as the panel words it. */
export function floorText(result: PanelResult): string {
  return floorIsOmitted(result)
    ? `below ${formatNumber(result.mixture!.omitted, 2)}, the share the thermal sum leaves out (not resolved)`
    : `below ${formatNumber(WEIGHT_FLOOR)} of the total (numerical zero)`;
}

/** Whether a level's weight is above the floor (`weightFloor`), so it is drawn and has a meaningful phase. */
export function resolved(l: Level, floor: number): boolean {
  return l.weight !== null && l.weight > floor;
}

/** The phase of c_n in units of pi, as text: '0', '1', '-0.5' (followed by ' π' unless 0). */
export function phaseText(re: number, im: number): string {
  const f = Math.atan2(im, re) / Math.PI;
  const r = Math.round(f * 1e4) / 1e4;
  if (r === 0) return '0';
  return `${formatNumber(r, 4)} π`;
}

/** The continuum weight rounded to what the sum resolves: '0' below `SUM_RESOLUTION`, else a percentage. */
export function continuumText(c: number): string {
  return c < SUM_RESOLUTION ? `0 (below ${formatNumber(SUM_RESOLUTION)})` : formatPercent(c);
}

/**
 * The captured weight as one figure rounded to what the sum resolves: `100%` when it is 1 to within
 * `SUM_RESOLUTION`, `1 − 4.3e-10` for a shortfall below 1e-5, enough digits to show a shortfall below
 * 1e-2 to two significant digits (99.9977%), else four significant digits (85.08%, as `formatPercent`).
 */
export function capturedText(c: number): string {
  const gap = 1 - c;
  if (Math.abs(gap) < SUM_RESOLUTION) return '100%';
  // A shortfall of a few parts in a million or less reads better as itself than as a row of nines.
  if (gap > 0 && gap < 1e-5) return `1 − ${formatNumber(gap, 2)}`;
  if (gap > 0 && gap < 1e-2) {
    // The percentage's decimals that reach the shortfall's second significant digit.
    const decimals = Math.min(10, Math.ceil(-Math.log10(gap)) - 1);
    return `${(100 * c).toFixed(decimals).replace(/\.?0+$/, '')}%`;
  }
  return formatPercent(c);
}

/** A symmetry class of the levels: its legend name and which level indices belong to it. */
export interface LevelClass {
  id: 'symmetric' | 'antisymmetric' | 'levels';
  name: string;
  member: (k: number) => boolean;
}

/**
 * The levels' symmetry classes. A system with a symmetry centre (the engine gives `system.center`
 * only then) has levels alternately symmetric and antisymmetric about it, starting with a symmetric
 * lowest level (in one dimension the n-th bound level has n - 1 nodes: common practice); the count
 * starts at the basis's first label, `levels[0].n`.
 */
export function levelClasses(result: PanelResult): LevelClass[] {
  const c = result.system?.center;
  const levels = result.levels;
  if (c === null || c === undefined || levels.length === 0) return [{ id: 'levels', name: 'levels', member: () => true }];
  const first = levels[0]!.n;
  const about = `about x = ${formatNumber(c)}${result.units.length ? ` ${result.units.length}` : ''}`;
  return [
    { id: 'symmetric', name: `symmetric ${about}`, member: (k) => (levels[k]!.n - first) % 2 === 0 },
    { id: 'antisymmetric', name: `antisymmetric ${about}`, member: (k) => (levels[k]!.n - first) % 2 !== 0 },
  ];
}

/** Codes whose findings make the expansion meaningless (the plots are then replaced, dimmed). */
const INVALIDATING = new Set(['syntax', 'name', 'units', 'evaluation', 'forbidden']);

/** Whether the result's findings (or the lack of levels) make its plots meaningless. */
export function invalidates(result: PanelResult): boolean {
  if (result.levels.length === 0) return true;
  return result.diagnostics.some((d) => d.severity === 'error' && INVALIDATING.has(d.code));
}

/**
 * The natural vertical scale of the spectrum: log for a long, decaying spectrum, linear otherwise.
 * Long and decaying means: the coefficients fall off as a power of n (the engine's decay class is a
 * jump, a kink or algebraic), or more than 20 levels are needed for 99.9 % of the weight.
 */
export function naturalScale(result: PanelResult): 'linear' | 'log' {
  const c = result.decay?.classification;
  if (c === 'jump' || c === 'kink' || c === 'algebraic') return 'log';
  const need = result.levelsFor999;
  return need === null ? (result.levels.length > 20 ? 'log' : 'linear') : need > 20 ? 'log' : 'linear';
}

/** Why the energy mean or spread is missing: '∞' when it diverges, 'n/a' when it was not computed. */
export function missingEnergyText(result: PanelResult, which: 'mean' | 'spread'): string {
  if (!result.energy || result.levels.length === 0) return 'n/a (no expansion)';
  const c = result.decay?.classification;
  const diverges = result.diagnostics.some((d) => d.code === 'convergence') || c === 'jump' || (which === 'spread' && c === 'kink');
  if (!diverges) return 'n/a';
  // The convergence finding names what it found in the state itself (a jump or a kink at some x), beyond the decay fit.
  const said = result.diagnostics.find((d) => d.code === 'convergence')?.message ?? '';
  const jump = c === 'jump' || /\bjumps\b/.test(said);
  const kink = c === 'kink' || /\bkink\b/.test(said);
  const why = jump ? 'the state jumps' : kink ? 'the state has a kink' : 'the coefficients decay too slowly';
  return `∞ (${why})`;
}

/**
 * The levels that matter for the dynamics: the fewest, largest weights that together hold 99 % of the
 * captured weight.
 */
export function relevantLevels(result: PanelResult): Level[] {
  const floor = weightFloor(result);
  const sorted = result.levels.filter((l) => resolved(l, floor) && l.energy !== null).sort((a, b) => b.weight! - a.weight!);
  const out: Level[] = [];
  let acc = 0;
  for (const l of sorted) {
    out.push(l);
    acc += l.weight!;
    if (acc >= 0.99 * totalWeight(result)) break;
  }
  return out;
}

/**
 * hbar in (file energy unit) x (file time unit), so an energy difference dE gives the angular frequency
 * dE / hbar in 1/(time unit); 1 in natural units and when times are shown in hbar/energy. Null when a
 * unit is not known to the panel.
 */
export function hbarInFileUnits(units: PanelResult['units']): number | null {
  if (!units.energy || !units.time) return 1;
  const e = energyUnitSI(units.energy);
  const t = UNITS.get(units.time);
  if (e === null || !t) return null;
  return HBAR_SI / (e * t.si);
}

/** How well the `evolve` steps sample the fastest beat between the relevant levels. */
export interface Sampling {
  /** Period 2 pi hbar / max |E_n - E_m| of the fastest beat, in the file's time unit. */
  period: number;
  /** The evolve step. */
  step: number;
  /** Samples per period of that beat. */
  perPeriod: number;
  /** Steps that give `MIN_SAMPLES_PER_PERIOD` samples a period over the same span. */
  stepsNeeded: number;
}

/**
 * Fewer samples than this a period of the fastest beat is undersampled: Nyquist asks for more than 2
 * to see the beat at all, and at 3-5 a period the curve's peaks are cut (seen); 8 draws it smoothly.
 */
export const MIN_SAMPLES_PER_PERIOD = 8;

/** The sampling of the evolution, or null without an evolution, a second relevant level or known units. */
export function evolveSampling(result: PanelResult): Sampling | null {
  const ev = result.evolution;
  const hbar = hbarInFileUnits(result.units);
  if (!ev || ev.times.length < 2 || hbar === null) return null;
  const es = relevantLevels(result).map((l) => l.energy!);
  if (es.length < 2) return null;
  const spread = Math.max(...es) - Math.min(...es);
  const step = (ev.times[ev.times.length - 1]! - ev.times[0]!) / (ev.times.length - 1);
  if (!(spread > 0) || !(step > 0)) return null;
  const period = (2 * Math.PI * hbar) / spread;
  const span = step * (ev.times.length - 1);
  return { period, step, perPeriod: period / step, stepsNeeded: Math.ceil((MIN_SAMPLES_PER_PERIOD * span) / period) };
}

/** What share of the state the time view animates: the bound part of a finite well, or all of it. */
export function evolvedShare(result: PanelResult): { bound: number; continuum: number } | null {
  if (result.continuum === undefined || result.continuum < SUM_RESOLUTION) return null;
  return { bound: 1 - result.continuum, continuum: result.continuum };
}
