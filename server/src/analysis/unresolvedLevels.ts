/**
 * The finding and the marks for levels a numerical solver left unresolved: which levels (from the first
 * unresolved label to the last asked for), why (the time limit or a cap, with the grid reached and the
 * grid the levels want), and what raises the limit. Wording only; the solver measured everything.
 */
import type { EngineDiagnostic } from '../language/catalogue';
import type { Span } from '../language/ast';
import type { PotentialBasisResult } from '../physics/potential';
import type { BuiltBasis } from './systems';
import type { CheckContext } from './checks';
import type { LevelResult } from './types';
import { fmt, warn } from './findings';
import { raiseHint } from '../shared/limits';

/** The solver's tolerance the analysis asks for (physics/potential.ts, its default). */
const TOLERANCE_TEXT = '1e-9';

/** `levels 287 to 3200`, or `level 7` when only one. */
function levelRange(from: number, to: number): string {
  return from >= to ? `Level ${fmt(from)} is` : `Levels ${fmt(from)} to ${fmt(to)} are`;
}

/** `; the levels asked for want a first grid of about W intervals` when the solver's estimate exceeds the grid reached (with the cap it is over, when `withCap`). */
function wantedText(built: BuiltBasis, withCap: boolean): string {
  const wanted = built.grid?.wanted;
  if (wanted === null || wanted === undefined || built.points === undefined || !(wanted > built.points)) return '';
  const over = withCap && built.grid && wanted > built.grid.cap ? `, over ${built.grid.capWhy}` : '';
  return `; the levels asked for want a first grid of about ${fmt(wanted)} intervals (2.5 points a wavelength at the top level)${over}`;
}

/**
 * The `limits` finding on the system for levels the solver left unresolved (`built.unresolved` to the
 * last level asked for), or null when every level is resolved or the analysis was cancelled.
 */
export function unresolvedFinding(built: BuiltBasis, asked: number, ctx: CheckContext): EngineDiagnostic | null {
  const from = built.unresolved;
  if (from === undefined || from === null || built.stopped === 'cancelled') return null;
  const span = ctx.systemStmt.span;
  const what = `${levelRange(from, Math.max(from, asked))} not resolved to ${TOLERANCE_TEXT}`;
  const at = built.points !== undefined ? ` at ${fmt(built.points)} grid intervals` : '';
  if (built.stopped === 'time') {
    // No level has an estimate when the time ran out before a second grid checked the first.
    const unchecked = from === 1 && !(ctx.basis.uncertainty && Number.isFinite(ctx.basis.uncertainty[0]!));
    const when = unchecked ? `${at}, before a second grid checked that one` : at;
    return warn('limits', span, `${what}: the time limit of ${fmt(ctx.limits.maxMillis)} ms stopped the solver's refinement${when}${wantedText(built, true)}. Raise the limit or lower \`basis\`.${raiseHint('time')}`);
  }
  const g = built.grid;
  if (g && built.points !== undefined && built.points >= g.cap) {
    return warn(
      'limits',
      span,
      `${what}: ${g.capWhy} stopped the solver's refinement${at}${wantedText(built, false)}. A time limit above 10 s raises the caps in proportion, as does a larger \`maxGridPoints\`.${raiseHint('time')}${raiseHint('maxGridPoints')}`,
    );
  }
  // Below the cap: double precision or algebraic convergence ended it (the solver's note says which).
  const why = g?.note ? ` ${g.note}` : '';
  return warn('limits', span, `${what}: the solver's refinement stopped${at}.${why}`);
}

/**
 * True when the budget stopped the solver inside its first grid (no levels at all); on the time limit it
 * adds the `limits` finding that every level asked for is unresolved, with the grid and what it wanted.
 */
export function stoppedInFirstGrid(solved: PotentialBasisResult, span: Span, asked: number, limitMs: number, out: EngineDiagnostic[]): boolean {
  if (solved.basis.count !== 0 || (solved.stopped !== 'time' && solved.stopped !== 'cancelled')) return false;
  if (solved.stopped === 'time') out.push(firstGridStopped(span, asked, solved.sizes, solved.grid, limitMs));
  return true;
}

function firstGridStopped(span: Span, asked: number, sizes: readonly number[], grid: BuiltBasis['grid'], limitMs: number): EngineDiagnostic {
  const size = sizes.length > 0 ? ` of ${fmt(sizes[0]!)} intervals` : '';
  const wanted = grid?.wanted && sizes.length > 0 && grid.wanted > sizes[0]! ? ` (the levels asked for want about ${fmt(grid.wanted)}; ${grid.capWhy} allows ${fmt(grid.cap)})` : '';
  return warn('limits', span, `${levelRange(1, Math.max(1, asked))} not resolved: the time limit of ${fmt(limitMs)} ms stopped the solver inside its first grid${size}${wanted}. Raise the limit or lower \`basis\`.${raiseHint('time')}`);
}

/** Marks the levels from the first unresolved label on (`unresolved: true` in the JSON). */
export function markUnresolved(levels: LevelResult[], built: BuiltBasis): void {
  const from = built.unresolved;
  if (from === undefined || from === null) return;
  for (const l of levels) if (l.n >= from) l.unresolved = true;
}
