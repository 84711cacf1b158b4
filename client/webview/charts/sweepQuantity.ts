/**
 * What the sweep views can show of each point (the chooser's quantities) and the full text of one
 * point for its tooltip. Pure: the panel and the command line read the same definitions. Numbers reach
 * the reader only through the one number formatter (server/src/shared/numbers.ts).
 */
import type { SweepPoint, SweepResult } from '../../../server/src/analysis/sweep/types';
import { formatNumber } from '../../../server/src/shared/numbers';
import type { Palette } from '../theme';
import { baseOption, type Option, type TooltipRows } from './context';

/** The quantities of the chooser, in its order; `overview` is the default. */
export const SWEEP_QUANTITIES = ['overview', 'captured', 'continuum', 'populations', 'energies', 'energy', 'bound'] as const;
export type SweepQuantity = (typeof SWEEP_QUANTITIES)[number];

/** The chooser's words for each quantity. */
export const QUANTITY_LABELS: Record<SweepQuantity, string> = {
  overview: 'captured weight, lowest populations, ⟨E⟩',
  captured: 'captured weight',
  continuum: 'continuum weight',
  populations: 'populations of the lowest levels',
  energies: 'level energies',
  energy: 'energy mean and spread',
  bound: 'bound-level count',
};

/** What a value axis of a quantity measures. */
export type QuantityAxis = 'weight' | 'energy' | 'count';

/** One drawn line (in a map, the first line is the mapped value). */
export interface QuantityLine {
  id: string;
  name: string;
  value: (p: SweepPoint) => number | null;
  /** 0: the left axis; 1: the right axis (the overview's ⟨E⟩). */
  axis: 0 | 1;
  colour: string;
  dashed: boolean;
}

/** The lines of a quantity and what each of its value axes measures. */
export interface QuantityPlan {
  lines: QuantityLine[];
  axes: QuantityAxis[];
}

/** The valid points that were computed. */
export const validPoints = (sweep: SweepResult): SweepPoint[] => sweep.points.filter((p): p is SweepPoint => p !== null && p.valid);

/** What a map shows of a quantity: one number a point, the first of its lines. */
const MAP_LABELS: Partial<Record<SweepQuantity, string>> = { populations: 'population of the lowest level', energies: 'energy of the lowest level', energy: 'energy mean ⟨E⟩' };

/** The chooser's words for a quantity of a sweep of `dims` parameters. */
export const quantityLabel = (q: SweepQuantity, dims: number): string => (dims === 2 ? (MAP_LABELS[q] ?? QUANTITY_LABELS[q]) : QUANTITY_LABELS[q]);

/**
 * The quantities this sweep has numbers for (the continuum only for a finite well, the count only
 * where it is known); a map has no overview (it maps one number a point).
 */
export function availableQuantities(sweep: SweepResult): SweepQuantity[] {
  const pts = validPoints(sweep);
  const have = (q: SweepQuantity) => (q === 'continuum' ? pts.some((p) => p.continuum !== null) : q === 'bound' ? pts.some((p) => p.bound !== null) : !(q === 'overview' && sweep.axes.length === 2));
  return SWEEP_QUANTITIES.filter(have);
}

/** The labels n of the lowest `count` levels any point reports. */
function lowestLabels(pts: SweepPoint[], count: number): number[] {
  return [...new Set(pts.flatMap((q) => q.levels.slice(0, count).map((l) => l.n)))].sort((a, b) => a - b).slice(0, count);
}

/** The lines of quantity `q` for the sweep. */
export function quantityPlan(q: SweepQuantity, sweep: SweepResult, p: Palette): QuantityPlan {
  const pts = validPoints(sweep);
  const colours = [p.real, p.imag, p.partial, p.cumulative, p.odd];
  const weightOf = (n: number) => (x: SweepPoint) => x.levels.find((l) => l.n === n)?.weight ?? null;
  const energyOf = (n: number) => (x: SweepPoint) => x.levels.find((l) => l.n === n)?.energy ?? null;
  const line = (id: string, name: string, value: QuantityLine['value'], colour: string, axis: 0 | 1 = 0, dashed = false): QuantityLine => ({ id, name, value, axis, colour, dashed });
  const captured = line('captured', 'captured weight', (x) => x.captured, p.density);
  switch (q) {
    case 'overview':
      return {
        lines: [captured, ...lowestLabels(pts, 3).map((n, k) => line(`P${n}`, `P(${n})`, weightOf(n), colours[k]!)), line('mean', '⟨E⟩', (x) => x.mean, p.foreground, 1, true)],
        axes: ['weight', 'energy'],
      };
    case 'captured':
      return { lines: [captured], axes: ['weight'] };
    case 'continuum':
      return { lines: [line('continuum', 'continuum weight', (x) => x.continuum, p.density)], axes: ['weight'] };
    case 'populations':
      return { lines: lowestLabels(pts, 5).map((n, k) => line(`P${n}`, `P(${n})`, weightOf(n), colours[k]!)), axes: ['weight'] };
    case 'energies':
      return { lines: lowestLabels(pts, 5).map((n, k) => line(`E${n}`, `E(${n})`, energyOf(n), colours[k]!)), axes: ['energy'] };
    case 'energy':
      return {
        lines: [
          line('mean', '⟨E⟩', (x) => x.mean, p.density),
          line('mean+spread', '⟨E⟩ + ΔE', (x) => (x.mean === null || x.spread === null ? null : x.mean + x.spread), p.real, 0, true),
          line('mean-spread', '⟨E⟩ − ΔE', (x) => (x.mean === null || x.spread === null ? null : x.mean - x.spread), p.real, 0, true),
          line('spread', 'ΔE', (x) => x.spread, p.imag),
        ],
        axes: ['energy'],
      };
    case 'bound':
      return { lines: [line('bound', 'bound levels', (x) => x.bound, p.density)], axes: ['count'] };
  }
}

/** A swept value with its unit: `4.5 nm`. */
export function valueText(v: number | null | undefined, unit: string | null, digits = 6): string {
  return `${formatNumber(v, digits)}${unit ? ` ${unit}` : ''}`;
}

/** A weight as a percentage, `93.47 %`. */
const weightText = (w: number | null) => (w === null ? '—' : `${formatNumber(100 * w, 5)} %`);

/**
 * Every field of one point as label/value rows, units named: the swept values, whether the setup is
 * valid here (and its problem), the captured and continuum weight, the energy mean and spread, the
 * bound-level count, each reported level's energy and population, the findings and every expect line's verdict.
 */
export function pointRows(sweep: SweepResult, point: SweepPoint, energyUnit: string | null): TooltipRows {
  const rows: TooltipRows = sweep.axes.map((a, k) => [a.name, valueText(point.at[k], a.unit)]);
  const total = sweep.axes.map((a) => a.steps + 1);
  rows.push(['point', `${point.index.map((i, k) => `${i + 1} of ${total[k] ?? '?'}`).join(', ')}`]);
  if (!point.valid) {
    rows.push(['setup', `invalid here: ${point.problem ?? 'no reason given'}`]);
    return rows;
  }
  rows.push(['captured', weightText(point.captured)]);
  if (point.continuum !== null) rows.push(['continuum', weightText(point.continuum)]);
  rows.push(['⟨E⟩', valueText(point.mean, energyUnit, 5)], ['ΔE', valueText(point.spread, energyUnit, 4)]);
  rows.push(['bound levels', point.bound === null ? 'not counted (every level is bound)' : String(point.bound)]);
  for (const l of point.levels) rows.push([`level ${l.n}`, `E = ${valueText(l.energy, energyUnit, 5)}, P = ${weightText(l.weight)}`]);
  rows.push(['findings', point.findings.length === 0 ? 'none' : point.findings.join(', ')]);
  sweep.expects.forEach((x, k) => rows.push([`line ${x.line}`, `${point.expects[k] ? 'holds' : 'fails'}: ${x.text}`]));
  return rows;
}

/** The axis name of a quantity's value axis. */
export function quantityAxisName(kind: QuantityAxis, energyUnit: string | null, names: string[]): string {
  if (kind === 'count') return 'bound levels';
  if (kind === 'weight') return 'weight';
  const e = names.length === 1 ? names[0]! : 'energy';
  return `${e}${energyUnit ? ` (${energyUnit})` : ''}`;
}

/** The sweep view's chart option, notes and, without a plot, why. */
export interface SweepDescription {
  option: Option | null;
  notes: string[];
  empty: string | null;
}

/** Choices of the sweep view beyond the data. */
export interface SweepViewOptions {
  /** What to draw (default the overview). */
  quantity?: SweepQuantity;
  /** Builds a tooltip's content from rows (default plain text lines). */
  tooltip?: (rows: TooltipRows) => unknown;
}

/** Tooltip rows as plain text, where no panel builds them. */
export const plainRows = (rows: TooltipRows): string => rows.map((r) => r.join(': ')).join('\n');

/** The tooltip of a sweep's points: the full result of the point a datum names by its index. */
export function pointTooltip(sweep: SweepResult, energyUnit: string | null, tooltip: (rows: TooltipRows) => unknown, p: Palette): Option {
  return {
    ...(baseOption(p).tooltip as Option),
    trigger: 'item',
    formatter: (params: { data?: unknown }) => {
      const k = Array.isArray(params.data) ? Number(params.data[2]) : NaN;
      const point = Number.isInteger(k) ? sweep.points[k] : null;
      return point ? tooltip(pointRows(sweep, point, energyUnit)) : '';
    },
  };
}

/** What the view leaves out or where it stopped. */
export function sweepNotes(sweep: SweepResult): string[] {
  const notes: string[] = [];
  const running = sweep.finished < sweep.total && sweep.stopped === null;
  if (running) notes.push(`The sweep is running: ${sweep.finished} of ${sweep.total} points so far; the design window and the located places follow when it ends.`);
  if (sweep.stopped !== null) notes.push(`The sweep stopped (${sweep.stopped === 'time' ? 'its time limit' : 'cancelled'}) after ${sweep.finished} of ${sweep.total} points; the curves end there and nothing was refined.`);
  const invalid = sweep.points.filter((q) => q !== null && !q.valid).length;
  if (invalid > 0) notes.push(`${invalid} point(s) where the setup is invalid are left out (hover the sweep line in the editor for the values).`);
  if (!running && sweep.stopped === null && sweep.expects.length > 0 && sweep.windows.length === 0) notes.push('No swept value satisfies every expect line: there is no design window.');
  return notes;
}
