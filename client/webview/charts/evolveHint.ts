/**
 * What to write to get a time evolution: an `evolve` line over a few periods of the main beat, valid in
 * the file's own units (a file with a `units` line needs a time with a unit, even when that line names
 * no time unit and the results are then shown in hbar/energy). Pure (no DOM).
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import { HBAR_SI, energyUnitSI } from '../../../server/src/expr/constants';
import type { PanelResult } from '../../src/messages';
import { hbarInFileUnits, relevantLevels, resolved, weightFloor } from './facts';
import { niceCeil } from './scale';

/** Time units a hint may use, largest first, with their size in seconds (SI prefixes). */
const TIME_UNITS: [string, number][] = [
  ['s', 1],
  ['ms', 1e-3],
  ['us', 1e-6],
  ['ns', 1e-9],
  ['ps', 1e-12],
  ['fs', 1e-15],
];

/** The energies of the two levels whose beat sets the hint's span: the relevant ones, else the two largest weights. */
function beatEnergies(result: PanelResult): number[] {
  const es = relevantLevels(result).map((l) => l.energy!);
  if (es.length >= 2) return es;
  const floor = weightFloor(result);
  return result.levels
    .filter((l) => resolved(l, floor) && l.energy !== null)
    .sort((a, b) => b.weight! - a.weight!)
    .slice(0, 2)
    .map((l) => l.energy!);
}

/**
 * A duration of at least `t` (in the file's time unit), rounded up, as it must be written in the file:
 * with that unit, with an SI time unit when the `units` line names an energy but no time (t is then in
 * hbar/energy unit), bare in natural units; and its value in the file's time unit. Null when the energy
 * unit is unknown to the panel.
 */
export function writtenTime(t: number, units: PanelResult['units']): { text: string; value: number } | null {
  if (units.time || !units.energy) {
    const v = niceCeil(t);
    return { text: `${written(v)}${units.time ? ` ${units.time}` : ''}`, value: v };
  }
  const e = energyUnitSI(units.energy);
  if (e === null) return null;
  const seconds = (t * HBAR_SI) / e;
  const [name, size] = TIME_UNITS.find(([, s]) => seconds >= s) ?? TIME_UNITS[TIME_UNITS.length - 1]!;
  const v = niceCeil(seconds / size);
  return { text: `${written(v)} ${name}`, value: (v * size * e) / HBAR_SI };
}

/** A round duration as a user writes it: a whole number plainly (2000, not 2e3), else three digits. */
function written(v: number): string {
  return Number.isInteger(v) && Math.abs(v) < 1e6 ? String(v) : formatNumber(v, 3);
}

/** The hint shown (and printed by the command line) for a file without an `evolve` line. */
export function evolveHint(result: PanelResult): string {
  const known = hbarInFileUnits(result.units);
  const hbar = known ?? 1;
  const es = known === null ? [] : beatEnergies(result);
  // Three periods of the main beat (or, with one level, of its phase), in steps that sample the widest beat 8 times a period.
  const main = es.length >= 2 ? Math.abs(es[1]! - es[0]!) : Math.abs(es[0] ?? 0);
  const spread = es.length >= 2 ? Math.max(...es) - Math.min(...es) : 0;
  const to = writtenTime(main > 0 ? (3 * 2 * Math.PI * hbar) / main : 10, result.units);
  const steps = to && spread > 0 ? Math.min(10000, Math.max(100, Math.ceil((to.value * 8 * spread) / (2 * Math.PI * hbar)))) : 200;
  const line = `evolve to ${to?.text ?? '1 ps'} steps ${steps}`;
  // A finite well's continuum part is not evolved (the time view shows the bound part): say which part stands still.
  const bound = (result.continuum ?? 0) > 0 ? 'bound ' : '';
  const part = bound ? "the bound part's " : '';
  const still = known !== null && es.length < 2 ? ` Only one ${bound}level holds weight here, so ${part}|ψ(x,t)|² stands still and its survival stays 1.` : '';
  return `No time evolution in this file. Add a line such as \`${line}\` to see |ψ(x,t)|² and the survival probability.${still}`;
}
