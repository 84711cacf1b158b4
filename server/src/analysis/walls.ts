/**
 * The walls of a numerical potential as the file declares them (`walls hard open`): which levels the
 * continuum rule labels, and how far the analysis's grid cap lets the potential solver go.
 */
import type { PotentialOptions } from '../physics/potential';
import { DEFAULT_LIMITS } from './options';

/** Which end the solver found a level above the potential at. */
export type WallEnd = 'left' | 'right' | 'both';

/**
 * The documented continuum rule with declared walls: a level is a box-quantised stand-in for the
 * continuum when it lies above the potential at every truncating (undeclared or `open`) wall. A
 * declared hard wall is physics, not truncation, so it takes no part: with one hard wall the level
 * need only lie above V at the other one; with two hard walls no level is labelled. `above` and `ends`
 * are the solver's `wallLevels` and `wallEnds` (indices of levels above V at one or both ends).
 */
export function continuumLevels(above: readonly number[], ends: readonly WallEnd[], hard: readonly [boolean, boolean] | undefined): number[] {
  const [hardLeft, hardRight] = hard ?? [false, false];
  if (hardLeft && hardRight) return [];
  const out: number[] = [];
  above.forEach((k, i) => {
    const end = ends[i];
    const overLeft = end === 'left' || end === 'both';
    const overRight = end === 'right' || end === 'both';
    if ((hardLeft || overLeft) && (hardRight || overRight)) out.push(k);
  });
  return out;
}

/** The solver's defaults its caps scale from (potential.ts: 4096 intervals, 4e9 flops a solve). */
const SOLVER_POINTS = 4096;
const SOLVER_WORK = 4e9;

/**
 * The potential solver's caps under the analysis's grid cap `maxGridPoints`: both scale with the cap's
 * ratio r to its default (2^18), the grid cap as r (at least 64 intervals) and the work cap as r^3 (a
 * solve costs n^3), so the default cap keeps the solver's defaults, raising the cap lets it refine
 * further and lowering it makes it stop sooner.
 */
export function solverCaps(maxGridPoints: number): Pick<PotentialOptions, 'maxPoints' | 'maxWork'> {
  const r = maxGridPoints / DEFAULT_LIMITS.maxGridPoints;
  if (!(r > 0) || !Number.isFinite(r)) return {};
  return { maxPoints: Math.max(64, Math.round(SOLVER_POINTS * r)), maxWork: SOLVER_WORK * r ** 3 };
}
