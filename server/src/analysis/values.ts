/**
 * The values of a file's `let` names in the file's own units, for hovers and inlay hints: computed once,
 * by the model of the analysis itself (so with the caller's caps), and carried in the result.
 */
import type { AnalysisResult } from './types';
import type { Dimension, UnitSystem } from '../expr/types';
import { fromInternal, isDimensionless, sameDimension, timeToDisplay, timeUnitName } from '../expr/units';
import { DIM } from '../expr/constants';
import type { Model } from './model';
import { formatDecimals } from '../shared/numbers';

/** One `let` value as a front end shows it. */
export type LetValue = NonNullable<AnalysisResult['values']>[number];

/** SI spelling of a dimension, for values that have no unit of their own in the file: m, kg, s, C with powers. */
function siUnit(dim: Dimension): string {
  const names = ['m', 'kg', 's', 'C', 'K'];
  const parts = dim.map((p = 0, k) => (Math.abs(p) < 1e-9 ? '' : p === 1 ? names[k]! : `${names[k]}^${formatDecimals(p, 3)}`)).filter(Boolean);
  return parts.join(' ');
}

/** One value in the units a reader of the file expects. Internal lengths and energies already are in file units. */
function display(re: number, im: number, dim: Dimension, u: UnitSystem): { re: number; im: number; unit: string | null } {
  if (u.mode === 'natural' || isDimensionless(dim)) return { re, im, unit: null };
  if (sameDimension(dim, DIM.length)) return { re, im, unit: u.length.name };
  if (sameDimension(dim, DIM.energy)) return { re, im, unit: u.energy.name };
  if (sameDimension(dim, DIM.time)) return { re: timeToDisplay(re, u), im: timeToDisplay(im, u), unit: timeUnitName(u) };
  // Internal lengths are file lengths, so a pure power of length is shown in the file's length unit.
  if (dim[1] === 0 && dim[2] === 0 && dim[3] === 0 && !dim[4]) return { re, im, unit: `${u.length.name}^${formatDecimals(dim[0], 3)}` };
  return { re: fromInternal(re, dim, u), im: fromInternal(im, dim, u), unit: siUnit(dim) };
}

/** The `let` values of a model in file order; names whose value could not be computed are left out. */
export function letValues(model: Model): LetValue[] {
  const out: LetValue[] = [];
  for (const [name, l] of model.lets) out.push({ name, ...display(l.value.re, l.value.im, l.dimension, model.units) });
  return out;
}
