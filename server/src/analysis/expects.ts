/**
 * Checking `expect` lines against the measured results.
 */
import type { AnalysisResult, LevelResult } from './types';
import type { Eigenbasis } from '../physics/types';
import type { Budget } from './context';
import { checkMore } from './expectsMore';
import type { EngineDiagnostic, FixData } from '../language/catalogue';
import type { ComparisonModel, Model } from './model';
import { capital, fmt, formatFactor, replaceFix, warn } from './findings';
import { formatRounded } from '../shared/numbers';

/** What the forms about dynamics need besides the result: the basis, the levels and the budget. */
export interface ExpectDynamics {
  basis: Eigenbasis;
  levels: LevelResult[];
  budget: Budget;
}

/** Appends an `expect` error for every expect line the result does not satisfy. */
export function checkExpects(model: Model, result: AnalysisResult, out: EngineDiagnostic[], dyn?: ExpectDynamics): void {
  const eu = model.units.mode === 'physical' ? ` ${model.units.energy.name}` : '';
  for (const x of model.expects) {
    if (x.kind === 'level' || x.kind === 'continuum' || x.kind === 'revival' || x.kind === 'mean') {
      checkMore(x, model, result, dyn ?? null, out);
      continue;
    }
    const span = x.stmt.span;
    switch (x.kind) {
      case 'parity': {
        const got = result.parity;
        if (got === null) out.push(warn('expect', span, 'Expected parity ' + x.value + ', but the system has no centre of symmetry.'));
        else if (got !== x.value) out.push(warn('expect', span, `Expected parity ${x.value}, measured ${got}.`));
        break;
      }
      case 'norm':
        compare(x.comparison, result.norm, 'the norm', x.unit ? ` ${x.unit}` : '', span, out, undefined, normaliseFix(model, x.comparison, result.norm));
        break;
      case 'energy':
        compare(x.comparison, result.energy?.mean ?? null, 'the energy mean', eu, span, out);
        break;
      case 'spread':
        compare(x.comparison, result.energy?.spread ?? null, 'the energy spread', eu, span, out);
        break;
      case 'weight': {
        let sum = 0;
        let found = 0;
        for (const l of result.levels) {
          if (l.n >= x.from && l.n <= x.to) {
            sum += l.weight;
            found++;
          }
        }
        const what = x.from === x.to ? `the weight of level ${x.from}` : `the weight of levels ${x.from}..${x.to}`;
        if (found < x.to - x.from + 1 && result.levels.length > 0) {
          const last = result.levels[result.levels.length - 1]!.n;
          if (x.to > last) {
            // A finite well has no levels past its bound states: a larger basis cannot help there.
            const bound = result.system?.kind === 'well' ? result.system.boundCount : undefined;
            const why = bound !== undefined && bound <= last ? `the well holds only ${bound} bound state${bound === 1 ? '' : 's'}; the rest of the state is in its continuum` : `the expansion stops at level ${last} (raise \`basis\`)`;
            out.push(warn('expect', span, `${capital(what)} cannot be checked: ${why}.`));
            break;
          }
        }
        compare(x.comparison, result.levels.length > 0 ? sum : null, what, '', span, out);
        break;
      }
    }
  }
}

/**
 * On a failed `expect norm V +- T` of a formula: scale the state so the integral of |psi|^2 becomes V
 * (factor sqrt(V / measured)): the file's state is what is wrong, not the check.
 */
function normaliseFix(model: Model, c: ComparisonModel, norm: number | null): FixData | null {
  const state = model.state?.model;
  if (state?.kind !== 'psi' || c.kind !== 'tolerance' || norm === null || !(norm > 0) || !(c.value > 0)) return null;
  const factor = Math.sqrt(c.value / norm);
  if (!Number.isFinite(factor)) return null;
  const title = c.value === 1 ? 'Normalise the state' : `Scale the state to the norm ${fmt(c.value)}`;
  return { ...replaceFix(title, state.expr, `${formatFactor(factor)} * (${state.expr.text})`), preferred: true };
}

export function compare(
  c: ComparisonModel,
  measured: number | null,
  what: string,
  unit: string,
  span: { start: number; end: number },
  out: EngineDiagnostic[],
  show: (v: number) => number = (v) => v,
  repair: FixData | null = null,
): void {
  if (measured === null) {
    out.push(warn('expect', span, `${capital(what)} could not be measured (it diverges or the analysis stopped), so the expectation fails.`));
    return;
  }
  let ok: boolean;
  let wanted: string;
  switch (c.kind) {
    case 'tolerance':
      ok = Math.abs(measured - c.value) <= c.tolerance;
      wanted = `${fmt(show(c.value))}${unit} ± ${fmt(show(c.tolerance))}${unit}`;
      break;
    case 'atLeast':
      ok = measured >= c.value;
      wanted = `at least ${fmt(show(c.value))}${unit}`;
      break;
    case 'atMost':
      ok = measured <= c.value;
      wanted = `at most ${fmt(show(c.value))}${unit}`;
      break;
  }
  if (!ok) {
    const text = `${measuredText(show(measured))}${unit}`;
    const fixes: FixData[] = repair ? [repair] : [];
    // Making the check agree with the measurement is offered, but not preferred when the file itself can be repaired.
    if (c.kind === 'tolerance') fixes.push({ ...replaceFix(`Set the expected value to ${text}`, c.valueText, text), preferred: repair ? false : undefined });
    out.push(warn('expect', span, `Expected ${what} ${wanted}, measured ${text}.`, fixes.length > 0 ? fixes : undefined));
  }
}

/** A measured value with 10 significant digits (enough for a tolerance of 1e-9 relative). */
function measuredText(v: number): string {
  return formatRounded(v, 10);
}
