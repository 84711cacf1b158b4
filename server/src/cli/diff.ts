/**
 * The comparison behind `eigenspan diff`: two analysis results in, the list of physics changes out.
 * Pure (no files, no printing); `diffText.ts` prints the list.
 *
 * A change is reported when it is larger than the tolerance: weights (populations, captured weight)
 * by an absolute difference, energies (of levels, the mean and the spread) by a relative one. Level
 * energies are compared only for the levels holding more than the tolerance in either setup, so a
 * changed system does not list every empty level. Findings are compared without their positions
 * (which move with any edit) and with the numbers of their messages rounded (physics.ts).
 */
import type { AnalysisResult, LevelResult } from '../analysis/types';
import { findingKey } from './physics';

/** The default tolerance of `diff` (absolute for weights, relative for energies). */
export const DEFAULT_TOLERANCE = 1e-4;

/** A number that may be missing (no state, no such level) or divergent. */
export type Value = number | 'diverges' | null;

/** One change in the physics between two setups. */
export type Change =
  | { kind: 'system' | 'unit'; old: string | null; new: string | null }
  | { kind: 'weight' | 'energy'; n: number; old: Value; new: Value }
  | { kind: 'captured' | 'mean' | 'spread'; old: Value; new: Value }
  | { kind: 'parity'; old: string | null; new: string | null }
  | { kind: 'finding'; change: 'appeared' | 'disappeared'; finding: string };

function moved(a: Value, b: Value, tolerance: number, relative: boolean): boolean {
  if (typeof a !== 'number' || typeof b !== 'number') return a !== b;
  const scale = relative ? Math.max(Math.abs(a), Math.abs(b)) : 1;
  return Math.abs(a - b) > tolerance * scale;
}

function energyValue(r: AnalysisResult, which: 'mean' | 'spread'): Value {
  if (!r.energy) return null;
  const v = r.energy[which];
  return v === null || !Number.isFinite(v) ? 'diverges' : v;
}

function levelChanges(a: AnalysisResult, b: AnalysisResult, tolerance: number): Change[] {
  const byN = (ls: LevelResult[]): Map<number, LevelResult> => new Map(ls.map((l) => [l.n, l]));
  const oa = byN(a.levels);
  const ob = byN(b.levels);
  const ns = [...new Set([...oa.keys(), ...ob.keys()])].sort((x, y) => x - y);
  const out: Change[] = [];
  for (const n of ns) {
    const la = oa.get(n);
    const lb = ob.get(n);
    const wa = la?.weight ?? 0;
    const wb = lb?.weight ?? 0;
    if (moved(wa, wb, tolerance, false)) out.push({ kind: 'weight', n, old: la ? wa : null, new: lb ? wb : null });
    if (wa > tolerance || wb > tolerance) {
      const ea = la?.energy ?? null;
      const eb = lb?.energy ?? null;
      if (moved(ea, eb, tolerance, true)) out.push({ kind: 'energy', n, old: ea, new: eb });
    }
  }
  return out;
}

function findingChanges(a: AnalysisResult, b: AnalysisResult): Change[] {
  const count = (r: AnalysisResult): Map<string, number> => {
    const m = new Map<string, number>();
    for (const d of r.diagnostics) m.set(findingKey(d), (m.get(findingKey(d)) ?? 0) + 1);
    return m;
  };
  const ca = count(a);
  const cb = count(b);
  const out: Change[] = [];
  for (const [k, n] of ca) for (let i = cb.get(k) ?? 0; i < n; i++) out.push({ kind: 'finding', change: 'disappeared', finding: k });
  for (const [k, n] of cb) for (let i = ca.get(k) ?? 0; i < n; i++) out.push({ kind: 'finding', change: 'appeared', finding: k });
  return out;
}

/** The physics changes from `a` (old) to `b` (new), in a fixed order: system, energy unit, levels, totals, parity, findings. */
export function comparePhysics(a: AnalysisResult, b: AnalysisResult, tolerance = DEFAULT_TOLERANCE): Change[] {
  const out: Change[] = [];
  const sa = a.system?.kind ?? null;
  const sb = b.system?.kind ?? null;
  if (sa !== sb) out.push({ kind: 'system', old: sa, new: sb });
  if (a.units.energy !== b.units.energy) out.push({ kind: 'unit', old: a.units.energy, new: b.units.energy });
  out.push(...levelChanges(a, b, tolerance));
  if (moved(a.captured, b.captured, tolerance, false)) out.push({ kind: 'captured', old: a.captured, new: b.captured });
  for (const which of ['mean', 'spread'] as const) {
    const va = energyValue(a, which);
    const vb = energyValue(b, which);
    if (moved(va, vb, tolerance, true)) out.push({ kind: which, old: va, new: vb });
  }
  if (a.parity !== b.parity) out.push({ kind: 'parity', old: a.parity, new: b.parity });
  out.push(...findingChanges(a, b));
  return out;
}
