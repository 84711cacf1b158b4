/**
 * The values of a file's `let` names in the file's own units, for hovers and inlay hints. Used by the
 * worker only while the analysis result does not carry `values` itself (AnalysisResult.values is
 * optional and not filled by the engine yet); it re-runs only the model stage (constant evaluation, no
 * numerics) under the user's caps. Once the engine fills `values`, this module and its call go.
 */
import type { QFile } from '../language/ast';
import type { AnalysisResult } from '../analysis/types';
import type { Dimension, UnitSystem } from '../expr/types';
import { buildModel } from '../analysis/model';
import { DEFAULT_LIMITS, type Limits } from '../analysis/index';
import { fromInternal, isDimensionless, sameDimension, timeToDisplay, timeUnitName } from '../expr/units';
import { DIM } from '../expr/constants';

type LetValue = NonNullable<AnalysisResult['values']>[number];

/** SI spelling of a dimension, for values that have no unit of their own in the file: m, kg, s, C with powers. */
function siUnit(dim: Dimension): string {
  const names = ['m', 'kg', 's', 'C'];
  const parts = dim.map((p, k) => (Math.abs(p) < 1e-9 ? '' : p === 1 ? names[k]! : `${names[k]}^${Number(p.toFixed(3))}`)).filter(Boolean);
  return parts.join(' ');
}

/** One value in the units a reader of the file expects. Internal lengths and energies already are in file units. */
function display(re: number, im: number, dim: Dimension, u: UnitSystem): { re: number; im: number; unit: string | null } {
  if (u.mode === 'natural' || isDimensionless(dim)) return { re, im, unit: null };
  if (sameDimension(dim, DIM.length)) return { re, im, unit: u.length.name };
  if (sameDimension(dim, DIM.energy)) return { re, im, unit: u.energy.name };
  if (sameDimension(dim, DIM.time)) return { re: timeToDisplay(re, u), im: timeToDisplay(im, u), unit: timeUnitName(u) };
  // Internal lengths are file lengths, so a pure power of length is shown in the file's length unit.
  if (dim[1] === 0 && dim[2] === 0 && dim[3] === 0) return { re, im, unit: `${u.length.name}^${Number(dim[0].toFixed(3))}` };
  return { re: fromInternal(re, dim, u), im: fromInternal(im, dim, u), unit: siUnit(dim) };
}

/**
 * The `let` values of `file` in file order, under the caps `limits` (absent ones keep the defaults). Names whose value could not be computed are left out.
 * Never throws (an engine failure gives an empty list).
 */
export function letValues(file: QFile, defaultBasis: number, limits: Partial<Limits> = {}): LetValue[] {
  try {
    const caps = { ...DEFAULT_LIMITS, ...limits };
    const model = buildModel(file, { defaultBasis, maxBasis: caps.maxBasis, maxEvolveSteps: caps.maxEvolveSteps, evaluate: true }, []);
    const out: LetValue[] = [];
    for (const [name, l] of model.lets) out.push({ name, ...display(l.value.re, l.value.im, l.dimension, model.units) });
    return out;
  } catch {
    return [];
  }
}
