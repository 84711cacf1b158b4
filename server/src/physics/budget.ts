/**
 * The one budget of an analysis: its deadline, its cancellation and its clock, carried through one
 * compute context. Stages poll `expired()` and say why they stopped as data (`StopReason`), never as a
 * message. The clock is injected so tests of the time limit are deterministic, and the budget also
 * counts work (operations and grid points), so a test can bound a stage's cost without timing it.
 *
 * Results depend on the clock only where the budget really ran out: nothing may size a grid or a
 * level count from a measured time.
 */

/** Why a stage stopped before finishing: the time limit, a size cap, or the caller's cancellation. */
export type StopReason = 'time' | 'cap' | 'cancelled';

/** A source of milliseconds (performance.now() by default). */
export interface Clock {
  now(): number;
}

/** Work counters a stage adds to; tests bound a stage's cost with them. */
export interface WorkCount {
  /** Arithmetic-sized operations (one per grid point per level projected, per edit-distance cell, ...). */
  ops: number;
  /** Grid points evaluated or solved on. */
  points: number;
}

/** The budget every stage of one analysis shares. */
export interface Budget {
  /** The clock the deadline is measured on. */
  readonly clock: Clock;
  /** Clock time past which the analysis stops (Infinity without a time limit). */
  readonly deadline: number;
  /** The time limit in milliseconds it was made with (Infinity without one). */
  readonly limitMs: number;
  /** True once the deadline has passed or the caller cancelled; the first reason is kept in `reason`. */
  expired(): boolean;
  /** Why the budget ran out (null while it has not). */
  readonly reason: 'time' | 'cancelled' | null;
  /** Milliseconds left before the deadline (Infinity without a time limit; never negative). */
  remaining(): number;
  /** Adds to the work counters. */
  count(ops: number, points?: number): void;
  /** The work counted so far. */
  readonly work: Readonly<WorkCount>;
}

/** Options of `createBudget`. */
export interface BudgetOptions {
  /** Time limit in milliseconds (default: none). */
  limitMs?: number;
  /** The clock (default performance.now()). */
  clock?: Clock;
  /** Polled by `expired()`; true cancels (default: never). */
  cancelled?: () => boolean;
}

/** The machine's monotonic clock. */
export const SYSTEM_CLOCK: Clock = { now: () => performance.now() };

/** Makes a budget whose deadline is `limitMs` after now on `clock`. */
export function createBudget(options: BudgetOptions = {}): Budget {
  const clock = options.clock ?? SYSTEM_CLOCK;
  const limitMs = options.limitMs ?? Infinity;
  const deadline = clock.now() + limitMs;
  const cancelled = options.cancelled;
  const work: WorkCount = { ops: 0, points: 0 };
  let reason: 'time' | 'cancelled' | null = null;
  return {
    clock,
    deadline,
    limitMs,
    get reason() {
      return reason;
    },
    expired(): boolean {
      if (reason !== null) return true;
      if (cancelled?.() === true) reason = 'cancelled';
      else if (clock.now() > deadline) reason = 'time';
      return reason !== null;
    },
    remaining(): number {
      return Math.max(0, deadline - clock.now());
    },
    count(ops: number, points = 0): void {
      work.ops += ops;
      work.points += points;
    },
    work,
  };
}

/** A budget that never runs out (for direct calls of the numerics outside an analysis). */
export function unlimitedBudget(): Budget {
  return createBudget();
}

/**
 * A clock for tests: time moves only when `advance` is called, or by `step` milliseconds on each
 * reading when `step` is given (so a loop that polls the clock runs out after a known number of polls).
 */
export function manualClock(step = 0): Clock & { advance(ms: number): void } {
  let t = 0;
  return {
    now(): number {
      const v = t;
      t += step;
      return v;
    },
    advance(ms: number): void {
      t += ms;
    },
  };
}
