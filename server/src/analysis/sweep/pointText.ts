/**
 * The text of a file with its swept `let` lines set to one point of the sweep, so the ordinary
 * analysis (`analyse`, with samples for the panel) gives that point's full result. Each swept let's
 * formula is replaced by its range written in the sweep line's own terms, as point.ts does for the
 * sweep's own points (`(A) + ((B) - (A)) * (t)`, or `(A) * ((B) / (A)) ^ (t)` on a logarithmic axis),
 * at the fraction t of the axis where the asked value lies; units and dimensions are then checked
 * exactly as for the let itself. `back` maps an offset of the new text to the file's own, so findings
 * land where the file has them. Never throws.
 */
import type { AnalyseOptions } from '../options';
import { prepareSweep } from './index';
import { displayOf } from './display';

/** The rewritten text and the map of its offsets back to the file's. */
export interface PointText {
  text: string;
  back: (offset: number) => number;
  /** The fraction along each axis the values lie at (0 at `from`, 1 at `to`). */
  fractions: number[];
}

/** How far outside its axis's range a value may lie (relative to the range) and still count as on it. */
const SLACK = 1e-9;

/**
 * The file at swept values `at` (display units of each axis, as `SweepPoint.at`); null when the file
 * has no valid sweep, the count of values differs from the axes', or a value lies off its axis.
 */
export function pointText(text: string, at: readonly number[], options: AnalyseOptions = {}): PointText | null {
  try {
    const job = prepareSweep(text, options);
    if (!job || at.length !== job.setting.axes.length) return null;
    const edits: { start: number; end: number; text: string }[] = [];
    const fractions: number[] = [];
    for (const [k, axis] of job.setting.axes.entries()) {
      const show = displayOf(job, k);
      const [from, to, v] = [show(axis.from), show(axis.to), at[k]!];
      if (!Number.isFinite(v)) return null;
      const log = axis.spacing === 'log';
      const t = from === to ? 0 : log ? Math.log(v / from) / Math.log(to / from) : (v - from) / (to - from);
      if (!Number.isFinite(t) || t < -SLACK || t > 1 + SLACK) return null;
      fractions.push(Math.min(1, Math.max(0, t)));
      const [a, b] = [`(${axis.spec.from.text})`, `(${axis.spec.to.text})`];
      const tt = String(fractions[k]);
      const formula = log ? `${a} * (${b} / ${a}) ^ (${tt})` : `${a} + (${b} - ${a}) * (${tt})`;
      edits.push({ start: axis.letStmt.expr.start, end: axis.letStmt.expr.end, text: formula.replace(/\s+/g, ' ') });
    }
    edits.sort((x, y) => x.start - y.start);
    let out = '';
    let from = 0;
    // Each edit in the new text's offsets: where it starts and ends there, and the file's span it replaced.
    const placed: { newStart: number; newEnd: number; start: number; end: number }[] = [];
    for (const e of edits) {
      out += text.slice(from, e.start);
      placed.push({ newStart: out.length, newEnd: out.length + e.text.length, start: e.start, end: e.end });
      out += e.text;
      from = e.end;
    }
    out += text.slice(from);
    const back = (offset: number): number => {
      let shift = 0;
      for (const p of placed) {
        if (offset < p.newStart) break;
        // Inside a replaced formula: its start in the file (the let's value).
        if (offset < p.newEnd) return p.start;
        shift = p.end - p.newEnd;
      }
      return offset + shift;
    };
    return { text: out, back, fractions };
  } catch {
    return null;
  }
}
