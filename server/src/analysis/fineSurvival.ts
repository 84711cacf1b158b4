/**
 * The survival on its own fine time grid, added to an evolution result: `survivalTimes` and
 * `survivalFine` beside the evolve arrays, which keep their meaning (one entry per evolve time).
 */
import type { EvolutionResult } from './types';
import type { FineSurvival } from '../physics/survival';

/** Adds `survivalTimes` (display units, by `toDisplay`) and `survivalFine`; nothing when the budget stopped it. */
export function addFineSurvival(res: EvolutionResult, fine: FineSurvival, toDisplay: (t: number) => number): void {
  if (fine.stopped !== null || fine.times.length < 2) return;
  const n = fine.times.length;
  const times: number[] = new Array(n);
  const survival: number[] = new Array(n);
  for (let j = 0; j < n; j++) {
    times[j] = toDisplay(fine.times[j]);
    survival[j] = fine.survival[j];
  }
  res.survivalTimes = times;
  res.survivalFine = survival;
}
