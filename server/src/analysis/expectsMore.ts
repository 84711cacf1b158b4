/**
 * Checking the `expect` forms about one level's energy, the continuum weight, the revival time and a
 * mean at a time (<x>(t), <p>(t)), each measured by the module that owns the quantity.
 */
import type { EngineDiagnostic } from '../language/catalogue';
import type { AnalysisResult } from './types';
import type { ExpectModel, Model } from './model';
import { evolve, revivalTime } from '../physics/evolution';
import { timeToDisplay, timeUnitName } from '../expr/units';
import { compare, type ExpectDynamics } from './expects';
import { fmt, warn } from './findings';

type MoreExpect = Extract<ExpectModel, { kind: 'level' | 'continuum' | 'revival' | 'mean' }>;

/** Checks one of the forms above, appending an `expect` error when it does not hold. */
export function checkMore(x: MoreExpect, model: Model, result: AnalysisResult, dyn: ExpectDynamics | null, out: EngineDiagnostic[]): void {
  const span = x.stmt.span;
  const u = model.units;
  const unit = (name: string | null): string => (u.mode === 'physical' && name ? ` ${name}` : '');
  switch (x.kind) {
    case 'level': {
      const lv = result.levels.find((l) => l.n === x.level);
      if (!lv) {
        const range = result.levels.length > 0 ? `the expansion holds levels ${result.levels[0]!.n} to ${result.levels[result.levels.length - 1]!.n}` : 'the analysis has no levels';
        out.push(warn('expect', span, `The energy of level ${x.level} cannot be checked: ${range}.`));
        return;
      }
      compare(x.comparison, lv.energy, `the energy of level ${x.level}`, unit(u.mode === 'physical' ? u.energy.name : null), span, out);
      return;
    }
    case 'continuum': {
      if (result.continuum === undefined) {
        out.push(warn('expect', span, 'Only a finite well has a continuum weight (its states above the well are not in the basis); this system has none to check.'));
        return;
      }
      compare(x.comparison, result.continuum, 'the continuum weight', '', span, out);
      return;
    }
    case 'revival': {
      const c = coefficients(dyn);
      const t = c && dyn ? revivalTime(dyn.basis, c.re, c.im, { budget: dyn.budget }) : null;
      if (c && t === null && !dyn!.budget.expired()) {
        out.push(warn('expect', span, 'The state has no revival time: its survival probability never falls and comes back within the search horizon.'));
        return;
      }
      compare(x.comparison, t, 'the revival time', unit(timeUnitName(u)), span, out, (v) => timeToDisplay(v, u));
      record(result, span.start, t === null ? null : timeToDisplay(t, u), u.mode === 'physical' ? timeUnitName(u) : null);
      return;
    }
    case 'mean': {
      const c = coefficients(dyn);
      const r = c && dyn ? evolve(dyn.basis, c.re, c.im, Float64Array.of(x.time), { budget: dyn.budget }) : null;
      const v = r && r.meanX.length === 1 ? (x.observable === 'x' ? r.meanX[0]! : r.meanP[0]!) : null;
      const what = `<${x.observable}>(${fmt(timeToDisplay(x.time, u))}${unit(timeUnitName(u))})`;
      const name = u.mode === 'physical' ? (x.observable === 'x' ? u.length.name : `1/${u.length.name}`) : null;
      compare(x.comparison, v !== null && Number.isFinite(v) ? v : null, what, unit(name), span, out);
      record(result, span.start, v !== null && Number.isFinite(v) ? v : null, name);
      return;
    }
  }
}

/** Keeps what an `expect` line measured on the result, for the hover. */
function record(result: AnalysisResult, start: number, value: number | null, unit: string | null): void {
  (result.measured ??= []).push({ start, value, unit });
}

/** The normalised coefficients of the levels, or null without them. */
function coefficients(dyn: ExpectDynamics | null): { re: Float64Array; im: Float64Array } | null {
  // A mixed state has no coefficients (re and im are null): the forms that need them cannot be judged.
  if (!dyn || dyn.levels.length === 0 || dyn.levels[0]!.re === null) return null;
  const re = Float64Array.from(dyn.levels, (l) => l.re ?? NaN);
  const im = Float64Array.from(dyn.levels, (l) => l.im ?? NaN);
  return { re, im };
}
