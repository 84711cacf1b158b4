/**
 * The budget of a direct call of the potential solver without one (benchmarks, tests, tools): it never
 * runs out and only counts work, like `unlimitedBudget()` (budget.ts).
 *
 * Why a class: the solver's hot loops call `budget.spend` through `charge`, and the optimising compiler
 * inlines that call for the one function object it has seen. `createBudget` makes new closures for every
 * budget, so the second direct solve in a process meets a new `spend` and throws the optimised
 * eigen-solver back to the interpreter (a "wrong call target" deoptimisation in Householder, bisection
 * and the back-transform, measured with node --trace-deopt). The methods of a class are one function
 * object for every instance, so consecutive direct solves keep their optimised code.
 */
import { SYSTEM_CLOCK, type Budget, type Clock, type WorkCount } from './budget';

/** A budget without a time limit or cancellation: `expired()` is always false; work is counted. */
class FreeBudget implements Budget {
  readonly clock: Clock = SYSTEM_CLOCK;
  readonly deadline = Infinity;
  readonly limitMs = Infinity;
  readonly reason = null;
  readonly work: WorkCount = { ops: 0, points: 0 };

  expired(): boolean {
    return false;
  }

  remaining(): number {
    return Infinity;
  }

  count(ops: number, points = 0): void {
    this.work.ops += ops;
    this.work.points += points;
  }

  spend(ops: number, points = 0): boolean {
    this.work.ops += ops;
    this.work.points += points;
    return false;
  }
}

/** A fresh budget that never runs out (see the file's comment). */
export function freeBudget(): Budget {
  return new FreeBudget();
}
