/**
 * The frame of a running sweep, read off the document's text: each `sweep` line's name, step count
 * (when written as a plain whole number) and spacing, the unit its let is shown in (from the latest
 * analysis), and the ordinary `expect` lines the points' verdicts refer to. The points of
 * `eigenspan/sweepPoint` carry only values; this names them until the sweep's result arrives.
 */
import { parse } from '../../server/src/language/parser';
import type { SweepFrame } from './liveSweep';

/** The frame of `text`'s sweep; `values` are the latest result's let values (for the units). */
export function sweepFrame(text: string, values: { name: string; unit: string | null }[] | undefined): SweepFrame {
  const file = parse(text).file;
  const line = (offset: number) => text.slice(0, offset).split('\n').length;
  const axes = file.statements.flatMap((s) => {
    if (s.kind !== 'sweep') return [];
    const steps = Number(s.sweep.steps.text.trim());
    return [{ name: s.sweep.name, unit: values?.find((v) => v.name === s.sweep.name)?.unit ?? null, steps: Number.isInteger(steps) && steps >= 1 ? steps : null, spacing: s.sweep.spacing }];
  });
  const expects = file.statements.flatMap((s) => (s.kind === 'expect' && s.expectation.kind !== 'window' ? [{ line: line(s.span.start), text: text.slice(s.span.start, s.span.end).trim() }] : []));
  return { axes: axes.slice(0, 2), expects };
}
