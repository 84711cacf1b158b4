/**
 * The one budget of an analysis: its deadline, its cancellation and its clock, carried through one
 * compute context. Stages poll `expired()` and say why they stopped as data (`StopReason`), never as a
 * message. The clock is injected so tests of the time limit are deterministic, and the budget also
 * counts work (operations and grid points), so a test can bound a stage's cost without timing it.
 *
 * Results depend on the clock only where the budget really ran out: nothing may size a grid or a
 * level count from a measured time.
 *
 * The deadline runs from the start of `analyse` (the quick stage counts), and work outside the numerics'
 * hot loops is charged too: every evaluation of the state (analysis/charged.ts), the energy integrals and
 * the plot's table, so no stretch of an analysis goes unpolled for long.
 */

/** Why a stage stopped before finishing: the time limit, a size cap, or the caller's cancellation. */
export type StopReason = 'time' | 'cap' | 'cancelled';

/** A source of milliseconds (performance.now() by default). */
export interface Clock {
  now(): number;
  /** Given the counters of the budget made on this clock (a clock that runs on counted work, `workClock`). */
  attach?(work: Readonly<WorkCount>): void;
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
  /**
   * Adds to the work counters and polls `expired()` each time the operations counted cross another
   * multiple of `POLL_OPS`; true once the budget has run out. The hot loops of the numerics (eigen-solver,
   * projection, quadrature) call it as they work, so a stage stops within about `POLL_OPS` operations
   * of the deadline, and a small solve never reads the clock at all.
   */
  spend(ops: number, points?: number): boolean;
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

/**
 * Operations between two polls of the clock by `spend` (2^20: about a millisecond of the numerics'
 * inner loops, measured 400 to 1,600 counted operations per microsecond; a poll costs under 0.1 us).
 */
export const POLL_OPS = 1 << 20;

/** The machine's monotonic clock. */
export const SYSTEM_CLOCK: Clock = { now: () => performance.now() };

/** Makes a budget whose deadline is `limitMs` after now on `clock`. */
export function createBudget(options: BudgetOptions = {}): Budget {
  const clock = options.clock ?? SYSTEM_CLOCK;
  const limitMs = options.limitMs ?? Infinity;
  const deadline = clock.now() + limitMs;
  const cancelled = options.cancelled;
  const work: WorkCount = { ops: 0, points: 0 };
  clock.attach?.(work);
  let reason: 'time' | 'cancelled' | null = null;
  const expired = (): boolean => {
    if (reason !== null) return true;
    if (cancelled?.() === true) reason = 'cancelled';
    else if (clock.now() > deadline) reason = 'time';
    return reason !== null;
  };
  return {
    clock,
    deadline,
    limitMs,
    get reason() {
      return reason;
    },
    expired,
    remaining(): number {
      return Math.max(0, deadline - clock.now());
    },
    count(ops: number, points = 0): void {
      work.ops += ops;
      work.points += points;
    },
    spend(ops: number, points = 0): boolean {
      const before = Math.floor(work.ops / POLL_OPS);
      work.ops += ops;
      work.points += points;
      if (reason !== null) return true;
      return Math.floor(work.ops / POLL_OPS) !== before ? expired() : false;
    },
    work,
  };
}

/**
 * Thrown by `charge` inside the numerics' hot loops when the budget runs out mid-stage; the stage's
 * entry point catches it and returns the reason as data (it never leaves the physics layer).
 */
export class Stopped extends Error {
  constructor(readonly reason: 'time' | 'cancelled') {
    super(`stopped: ${reason}`);
  }
}

/** `budget.spend(ops, points)`, throwing `Stopped` once the budget has run out (no budget: nothing). */
export function charge(budget: Budget | undefined, ops: number, points = 0): void {
  if (budget && budget.spend(ops, points)) throw new Stopped(budget.reason ?? 'time');
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

/**
 * A clock for tests that runs on counted work: it reads `msPerOp` milliseconds per operation counted on
 * the budget it is attached to (a machine of exactly that speed), so a time limit is reached after a
 * known amount of work and a test can bound how far past its deadline a stage runs, without timing it.
 * One clock per budget: `createBudget` attaches it to its counters.
 */
export function workClock(msPerOp: number): Clock {
  let counted: Readonly<WorkCount> | null = null;
  return {
    now: () => (counted ? counted.ops * msPerOp : 0),
    attach(work: Readonly<WorkCount>): void {
      counted = work;
    },
  };
}
