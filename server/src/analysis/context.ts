/**
 * The compute context of one analysis: its caps and its one budget (deadline, cancellation, clock and
 * work counters, see physics/budget.ts), passed to every numerical stage. Stages poll
 * `budget.expired()` and return why they stopped as data (`StopReason`); nothing sizes work from a
 * measured time.
 */
import type { Budget, StopReason } from '../physics/budget';
import type { Limits } from './options';

export type { Budget, StopReason };

/** What every numerical stage of one analysis shares. */
export interface ComputeContext {
  /** The one budget of the analysis. */
  budget: Budget;
  /** The caps of the analysis. */
  limits: Limits;
}

/**
 * The budget in the form today's physics functions take (`cancelled`, and a deadline on the
 * machine's clock). Glue until the physics layer takes the budget itself: the deadline is "now plus
 * what the budget has left", so an injected clock still governs how much time is left.
 */
export function physicsTiming(budget: Budget): { cancelled: () => boolean; deadline: number | undefined } {
  const left = budget.remaining();
  return { cancelled: () => budget.expired(), deadline: Number.isFinite(left) ? performance.now() + left : undefined };
}
