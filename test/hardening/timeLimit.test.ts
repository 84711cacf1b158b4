/**
 * Work the time limit did not see (issue 14, round two): evaluations of the state (window scans, the
 * grids, parity, walls, the plot), the quick stage and the plot samples of a result already cut. Each is
 * now charged to the one budget (server/src/analysis/charged.ts), so these tests run on a clock of
 * counted work (`workClock`: one counted operation a nanosecond) and assert counted work and stops,
 * never wall time.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { workClock, type Clock } from '../../server/src/physics/budget';
import { CUT_PLOT_LEVELS } from '../../server/src/analysis/numeric';
import { CHUNK_OPS, CUT_OPS, FORMULA_OPS_PER_CHAR } from '../../server/src/analysis/charged';

const MS_PER_OP = 1e-6;
const clock = (): Clock => workClock(MS_PER_OP);
/** The largest overshoot past the limit: one poll (2^20), one chunk and the cut allowance of an evaluation, in ms of counted work. */
const OVERSHOOT_MS = ((1 << 20) + CHUNK_OPS + CUT_OPS) * MS_PER_OP + 5;

describe('the time limit sees the evaluation of the state', () => {
  it('level 4,999 of an oscillator (a recurrence through every level below) stops at the limit', () => {
    // Before: each evaluation of the state was uncounted, so on this clock the analysis never reached its
    // limit while it spent 3.6 s of CPU under a 200 ms limit on the machine's clock (measured).
    const text = 'system oscillator(omega = 1.1)\nstate eigen(4999) of oscillator(omega = 1)\nbasis 5000\n';
    const r = analyse(text, { limits: { maxMillis: 30 }, clock: clock() });
    expect(r.diagnostics.some((d) => d.code === 'limits')).toBe(true);
    expect(r.elapsedMs!).toBeGreaterThan(30);
    expect(r.elapsedMs!).toBeLessThanOrEqual(30 + OVERSHOOT_MS);
    expect(r.diagnostics.some((d) => /internal error/i.test(d.message))).toBe(false);
  });

  it('phi(n, x) of a high level inside a formula stops at the limit, without a bad-value finding', () => {
    const text = 'system oscillator(omega = 1)\nstate psi(x) = phi(3000, x) * exp(-x^2 / 1000)\nbasis 5000\n';
    const r = analyse(text, { limits: { maxMillis: 30 }, clock: clock() });
    expect(r.diagnostics.some((d) => d.code === 'limits')).toBe(true);
    expect(r.elapsedMs!).toBeLessThanOrEqual(30 + OVERSHOOT_MS);
    // The provider's cut is a time stop, not a state that is not a number.
    expect(r.diagnostics.filter((d) => d.code === 'evaluation')).toEqual([]);
  });

  it('a longer formula with the same values counts more work, about 2 operations a character a point', () => {
    // Same values (the padding is 0 * ...), so the same grids: the difference is the formula's charge.
    const pad = ' + 0 * (x + x + x + x + x + x + x + x + x + x)';
    const work = (psi: string): number => analyse(`system box(0, 1)\nstate psi(x) = ${psi}\nbasis 10\n`, { clock: clock() }).work!.ops;
    const short = work('x * (1 - x)');
    const long = work(`x * (1 - x)${pad.repeat(10)}`);
    // At least the window's grid of 16 panels of 20 nodes, evaluated with two derivatives (3 orders).
    expect(long - short).toBeGreaterThanOrEqual(FORMULA_OPS_PER_CHAR * pad.length * 10 * 16 * 20 * 3);
  });
});

describe('work after a time stop is proportionate', () => {
  it(`a result the limit cut in its evolution draws ${CUT_PLOT_LEVELS} levels in its plot, and stops near the limit`, () => {
    const text = 'system V(x) = (x^2 - 4)^2 / 16 over [-6, 6]\nstate gaussian(center = -2, width = 0.5)\nbasis 30\nevolve to 120 steps 3000\n';
    const full = analyse(text, { samples: true, clock: clock() });
    expect(full.samples!.phi).toHaveLength(30);
    // The smallest limit (of a 1.25 x ladder) at which the levels are done and the evolution is cut.
    let cut = null;
    for (let ms = 5; ms < 5000 && cut === null; ms *= 1.25) {
      const r = analyse(text, { samples: true, limits: { maxMillis: ms }, clock: clock() });
      if (r.levels.length === 30 && r.evolution && r.evolution.times.length < 3001) cut = { r, ms };
    }
    expect(cut).not.toBeNull();
    expect(cut!.r.samples!.phi).toHaveLength(CUT_PLOT_LEVELS);
    expect(cut!.r.diagnostics.some((d) => d.code === 'limits')).toBe(true);
    expect(cut!.r.elapsedMs!).toBeLessThanOrEqual(cut!.ms + OVERSHOOT_MS);
  }, 120_000);
});
