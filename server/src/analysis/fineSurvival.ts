/**
 * The survival on its own fine time grid, added to an evolution result: `survivalTimes` and
 * `survivalFine` beside the evolve arrays, which keep their meaning (one entry per evolve time).
 */
import type { EvolutionResult } from './types';
import type { FineSurvival } from '../physics/survival';

/** Adds `survivalTimes` (display units, by `toDisplay`) and `survivalFine`; nothing when the budget stopped it. */
export function addFineSurvival(res: EvolutionResult, fine: FineSurvival, toDisplay: (t: number) => number): void {
  if (fine.stopped !== null || fine.times.length < 2) return;
  res.survivalTimes = Array.from(fine.times, toDisplay);
  res.survivalFine = Array.from(fine.survival);
}
