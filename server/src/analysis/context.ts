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
