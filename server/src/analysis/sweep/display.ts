/**
 * Swept values as a reader of the file sees them: in the unit the swept `let`'s hover shows
 * (analysis/values.ts is the one home of that rule; this module only applies it to other values of
 * the same dimension).
 */
import { letValues } from '../values';
import type { Model } from '../model';
import type { PlannedAxis } from './plan';

interface HasAxes {
  model: Model;
  setting: { axes: PlannedAxis[] };
}

function shown(job: HasAxes, k: number, v: number): { re: number; unit: string | null } {
  const a = job.setting.axes[k]!;
  const lets: Model['lets'] = new Map([[a.spec.name, { value: { re: v, im: 0 }, dimension: a.dimension, span: a.letStmt.nameSpan, valueSpan: a.letStmt.expr }]]);
  const [only] = letValues({ ...job.model, lets });
  return { re: only!.re, unit: only!.unit };
}

/** The display value of internal value v of axis k. */
export function displayOf(job: HasAxes, k: number): (v: number) => number {
  return (v) => shown(job, k, v).re;
}

/** The unit axis k is shown in (null in natural units or for a dimensionless let). */
export function unitOf(job: HasAxes, k: number): string | null {
  return shown(job, k, 1).unit;
}
