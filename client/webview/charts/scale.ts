/**
 * Axis numbers: ends and ticks at round values, labels through the one number formatter, and the
 * decade axis of the log view. Pure.
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import type { Option } from './context';

/** The smallest of 1, 2, 2.5, 5 or 10 times a power of ten that is at least v > 0 (a tick-friendly ceiling). */
export function niceCeil(v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) return 1;
  const p = 10 ** Math.floor(Math.log10(v));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= v * (1 - 1e-12)) return m * p;
  return 10 * p;
}

/** The smallest of 1, 1.5, 2, 2.5, 3, 4, 5, 6, 8 or 10 times a power of ten that is at least v > 0 (a finer tick step). */
export function roundStep(v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) return 1;
  const p = 10 ** Math.floor(Math.log10(v));
  for (const m of [1, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) if (m * p >= v * (1 - 1e-12)) return clean(m * p);
  return 10 * p;
}

/** Rounds away from zero to two significant digits, so explicit axis ends get short labels. */
export function niceBound(v: number, up: boolean): number {
  if (!Number.isFinite(v) || v === 0) return 0;
  const p = 10 ** (Math.floor(Math.log10(Math.abs(v))) - 1);
  return (up ? Math.ceil(v / p) : Math.floor(v / p)) * p;
}

/** `v` cleared of binary rounding noise (3.9999999999999996 becomes 4): twelve significant digits. */
export function clean(v: number): number {
  return v === 0 || !Number.isFinite(v) ? v : Number(v.toPrecision(12));
}

/** Tick label of a value axis: the shared formatter, '' for values off the tick grid (unrounded axis ends). */
export function tickFormatter(interval: number): (v: number) => string {
  return (v: number) => {
    const k = v / interval;
    if (Math.abs(k - Math.round(k)) > 1e-6) return '';
    return formatNumber(clean(Math.round(k) * interval), 6);
  };
}

/** A round value axis over [lo, hi]: ticks every `interval`, ends widened to ticks unless `exact`. */
export interface AxisRange {
  min: number;
  max: number;
  interval: number;
}

/**
 * A round axis over the data [lo, hi] with about `ticks` intervals, its ends widened to ticks (ECharts
 * counts ticks from the axis minimum, so a minimum off the tick grid would shift every label).
 */
export function niceAxis(lo: number, hi: number, ticks = 5): AxisRange {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return { min: 0, max: 1, interval: 0.2 };
  if (hi <= lo) hi = lo + (Math.abs(lo) || 1);
  // Of the round intervals giving between 2 and 1.5 `ticks` (at least 6) intervals: the one that widens the data
  // least, and of those the one whose count of intervals is nearest `ticks`.
  let best: AxisRange | null = null;
  let score = [Infinity, Infinity];
  let first = niceCeil((hi - lo) / Math.max(1, 2 * ticks));
  for (let k = 0; k < 8; k++, first = niceCeil(first * 1.0001)) {
    const interval = clean(first);
    const r = { min: clean(Math.floor(lo / interval + 1e-9) * interval), max: clean(Math.ceil(hi / interval - 1e-9) * interval), interval };
    const count = Math.round((r.max - r.min) / interval);
    if (count < 2 || count > Math.max(6, Math.floor(1.5 * ticks))) continue;
    const s = [Number(((r.max - r.min) / (hi - lo)).toPrecision(9)), Math.abs(count - ticks)];
    if (s[0]! < score[0]! || (s[0] === score[0] && s[1]! < score[1]!)) ((best = r), (score = s));
  }
  return best ?? { min: lo, max: hi, interval: clean(niceCeil((hi - lo) / Math.max(1, ticks))) };
}

/** ECharts value-axis fields for a range: explicit ends, interval and the rounded labels. */
export function valueAxis(r: AxisRange, labelColor: string): Option {
  return { type: 'value', min: r.min, max: r.max, interval: r.interval, axisLabel: { color: labelColor, formatter: tickFormatter(r.interval), hideOverlap: true } };
}

/** A decade exponent as a tick label: '1', '0.1' never, '1e-3' always (powers of ten in exponent form). */
export function decadeLabel(exp: number): string {
  return exp === 0 ? '1' : `1e${exp}`;
}

/**
 * The log view's axis: bars are drawn as decades above a floor (log10 w - floor), so they grow up from
 * the floor, the largest weight tallest. `floor` is a power of ten below the smallest weight shown.
 */
export interface DecadeAxis {
  /** Exponent of the floor (the axis bottom is 10^floor). */
  floor: number;
  /** Exponent of the top. */
  top: number;
  /** Decades between labelled ticks. */
  step: number;
}

/** The decade axis for the positive weights `shown`: the floor below the smallest, the top at or above the largest. */
export function decadeAxis(shown: number[]): DecadeAxis {
  const pos = shown.filter((w) => w > 0 && Number.isFinite(w));
  if (pos.length === 0) return { floor: -16, top: 0, step: 2 };
  const lo = Math.min(...pos);
  const hi = Math.max(...pos);
  // Strictly below the smallest weight (an exact power of ten gets the decade under it).
  const below = Math.floor(Math.log10(lo) - 1e-9);
  const top = Math.max(Math.ceil(Math.log10(hi) - 1e-9), below + 1);
  const span = top - below;
  const step = span <= 6 ? 1 : span <= 12 ? 2 : span <= 24 ? 4 : 5;
  // Ticks at exponents that are multiples of the step: 1e-16, 1e-12, ... 1.
  const floor = step * Math.floor(below / step);
  return { floor: floor + 0, top: step * Math.ceil(top / step) + 0, step };
}
/** Height of a weight's bar on the decade axis, or null below the floor. */
export function decadeHeight(w: number, axis: DecadeAxis): number | null {
  return w > 0 ? Math.max(0, Math.log10(w) - axis.floor) : null;
}
