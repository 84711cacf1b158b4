/**
 * Every stage stops within a small overshoot of its deadline, measured on a clock of counted work
 * (`workClock`: a machine doing exactly one counted operation per nanosecond), so nothing here is timed:
 * the eigen-solver inside one solve, the potential solver's first grid, the fused projection, and whole
 * analyses. The overshoot allowed is one poll of the budget (`POLL_OPS`) plus the largest single charge
 * of the stage (a Householder column, 4 m^2 operations for a trailing block of size m).
 */
import { describe, expect, it } from 'vitest';
import { createBudget, POLL_OPS, Stopped, workClock, type Clock } from '../../server/src/physics/budget';
import { symmetricLowest } from '../../server/src/physics/tridiag';
import { potentialBasis } from '../../server/src/physics/potential';
import { analyse } from '../../server/src/analysis/index';

const MS_PER_OP = 1e-6;

/** A symmetric n x n matrix with a known spectrum-free structure: a seeded pseudo-random fill. */
function randomSymmetric(n: number): Float64Array {
  const A = new Float64Array(n * n);
  let s = 7;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      s = (s * 1103515245 + 12345) % 2147483648;
      const v = s / 2147483648 - 0.5;
      A[i * n + j] = v;
      A[j * n + i] = v;
    }
  }
  return A;
}

/** A clock that counts how often it is read and never moves. */
function countingClock(): Clock & { reads: number } {
  const c = {
    reads: 0,
    now(): number {
      c.reads++;
      return 0;
    },
  };
  return c;
}

describe('budget.spend', () => {
  it('reads the clock once per POLL_OPS operations and not in between', () => {
    const clock = countingClock();
    const budget = createBudget({ limitMs: 1000, clock });
    const before = clock.reads;
    for (let i = 0; i < 1000; i++) expect(budget.spend(1000)).toBe(false);
    // 1e6 operations stay below one poll interval (2^20 = 1,048,576): no reading at all.
    expect(clock.reads).toBe(before);
    budget.spend(POLL_OPS);
    expect(clock.reads).toBe(before + 1);
    expect(budget.work.ops).toBe(1e6 + POLL_OPS);
  });

  it('a work clock reads the counted operations of its own budget', () => {
    const budget = createBudget({ limitMs: 5, clock: workClock(MS_PER_OP) });
    budget.count(3e6);
    expect(budget.remaining()).toBeCloseTo(2, 12);
    expect(budget.spend(POLL_OPS)).toBe(false);
    expect(budget.spend(2 * POLL_OPS)).toBe(true);
    expect(budget.reason).toBe('time');
  });
});

describe('the eigen-solver stops inside a solve', () => {
  it('a 400 x 400 solve under a 20 ms limit stops within one poll and one column of it', () => {
    const n = 400;
    const budget = createBudget({ limitMs: 20, clock: workClock(MS_PER_OP) });
    let stopped: unknown = null;
    try {
      symmetricLowest(randomSymmetric(n), n, 50, budget);
    } catch (err) {
      stopped = err;
    }
    expect(stopped).toBeInstanceOf(Stopped);
    expect((stopped as Stopped).reason).toBe('time');
    // The reduction alone is 4/3 n^3 = 8.5e7 operations: it was cut, at most one poll and one column late.
    expect(budget.work.ops).toBeGreaterThan(20 / MS_PER_OP);
    expect(budget.work.ops).toBeLessThanOrEqual(20 / MS_PER_OP + POLL_OPS + 4 * n * n);
  });

  it('a budget that lasts changes no number of the result', () => {
    const n = 120;
    const plain = symmetricLowest(randomSymmetric(n), n, 10);
    const metered = symmetricLowest(randomSymmetric(n), n, 10, createBudget({ limitMs: 1e9, clock: workClock(MS_PER_OP) }));
    expect(Array.from(metered.values)).toEqual(Array.from(plain.values));
    expect(Array.from(metered.vectors)).toEqual(Array.from(plain.vectors));
  });
});

describe('the potential solver stops inside its first grid', () => {
  it('2,000 levels of a quartic under a 20 ms limit: no levels, stopped time, a cap note, a bounded overshoot', () => {
    const quartic = (xs: Float64Array) => xs.map((x) => x ** 4);
    const budget = createBudget({ limitMs: 20, clock: workClock(MS_PER_OP) });
    const r = potentialBasis(quartic, -8, 8, 0.5, 2000, { budget });
    expect(r.stopped).toBe('time');
    expect(r.basis.count).toBe(0);
    expect(r.notes.map((n) => n.kind)).toContain('cap');
    // The first grid holds about 2,000 levels: two blocks of about 1,000, so a column costs at most 4e6.
    expect(budget.work.ops).toBeLessThanOrEqual(20 / MS_PER_OP + POLL_OPS + 4 * 1200 * 1200);
  });
});

describe('whole analyses stop near their limit, with a limits finding', () => {
  const cases: [string, string][] = [
    // The first solve of a double well with 5,000 levels (capped at 2,290 points): seconds uninterrupted before.
    ['double well, basis 5000', 'system V(x) = (x^2 - 4)^2 / 16 over [-6, 6]\nstate gaussian(center = -2, width = 0.5)\nbasis 5000\n'],
    // The fused projection of 2,000 box levels of a cusp, which the sine transform cannot settle (a kinked
    // state no longer reaches the limit: its transform costs about 3e5 counted operations).
    ['cusp, basis 2000', 'system box(0, 1)\nstate psi(x) = abs(x - 0.3)^0.6\nbasis 2000\n'],
    // The fused projection of 3,000 oscillator levels of a state with a cusp (about 5e9 counted operations
    // uninterrupted; a smooth coherent state now takes the trapezoid rule, about 2e7, and no longer reaches it).
    ['oscillator cusp, basis 3000', 'system oscillator(omega = 1)\nstate psi(x) = abs(x - 0.3)^0.6 * exp(-x^2/50)\nbasis 3000\n'],
    // A Morse bond with a tiny width: a large first grid.
    ['Morse, basis 3000', 'system V(x) = 4.4 * (1 - exp(-1.9 * (x - 0.95)))^2 over [0.45, 4]\nstate gaussian(center = 1.08, width = 0.07)\nbasis 3000\n'],
  ];
  it.each(cases)('%s', (_name, text) => {
    const limit = 30;
    const r = analyse(text, { clock: workClock(MS_PER_OP), limits: { maxMillis: limit } });
    expect(r.diagnostics.filter((d) => d.code === 'limits').length).toBeGreaterThan(0);
    // The time limit is not a bad potential: no evaluation error.
    expect(r.diagnostics.filter((d) => d.code === 'evaluation')).toEqual([]);
    // Counted work past the limit: at most one poll and the largest single charge (25 ms on this clock).
    expect(r.elapsedMs!).toBeLessThanOrEqual(limit + 25);
  });
});
