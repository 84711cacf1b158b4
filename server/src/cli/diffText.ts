/**
 * Printing the change list of `diff.ts` for `eigenspan diff`: one change a line.
 */
import type { Change, Value } from './diff';
import { roundSig } from './physics';

function show(v: Value, unit = ''): string {
  if (v === null) return 'none';
  if (v === 'diverges') return 'diverges';
  return `${roundSig(v)}${unit}`;
}

/** Energy units (with a leading space, or '') of the old and the new setup. */
interface Units {
  old: string;
  new: string;
}

/** The difference new - old, or '' when there is none to give (`unit` null: the two sides' units differ). */
function delta(a: Value, b: Value, unit: string | null = ''): string {
  if (typeof a !== 'number' || typeof b !== 'number' || unit === null) return '';
  const d = roundSig(b - a);
  return ` (${d >= 0 ? '+' : ''}${d}${unit})`;
}

function line(c: Change, u: Units): string {
  const du = u.old === u.new ? u.new : null;
  switch (c.kind) {
    case 'system':
      return `system: ${c.old ?? 'none'} -> ${c.new ?? 'none'}`;
    case 'unit':
      return `energy unit: ${c.old ?? 'natural'} -> ${c.new ?? 'natural'}`;
    case 'weight':
      return `level ${c.n} weight: ${show(c.old)} -> ${show(c.new)}${delta(c.old, c.new)}`;
    case 'energy':
      return `level ${c.n} energy: ${show(c.old, u.old)} -> ${show(c.new, u.new)}${delta(c.old, c.new, du)}`;
    case 'captured':
      return `captured weight: ${show(c.old)} -> ${show(c.new)}${delta(c.old, c.new)}`;
    case 'mean':
    case 'spread':
      return `energy ${c.kind}: ${show(c.old, u.old)} -> ${show(c.new, u.new)}${delta(c.old, c.new, du)}`;
    case 'parity':
      return `parity: ${c.old ?? 'none'} -> ${c.new ?? 'none'}`;
    case 'finding':
      return `${c.change === 'appeared' ? '+' : '-'} ${c.finding}`;
  }
}

/**
 * The text of `eigenspan diff`: a heading naming both sides and the tolerance, then one change a line
 * (`+` a finding that appeared, `-` one that disappeared), or a line saying nothing moved.
 * Names are escaped by the caller.
 */
export function renderChanges(changes: readonly Change[], oldName: string, newName: string, tolerance: number, units: Units): string {
  const head = `physics of ${oldName} -> ${newName} (tolerance ${tolerance}):`;
  if (changes.length === 0) return `${head}\n  no changes beyond the tolerance\n`;
  return [head, ...changes.map((c) => '  ' + line(c, units))].join('\n') + '\n';
}
