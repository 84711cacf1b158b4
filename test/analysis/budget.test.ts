/**
 * One budget: results depend on the clock only where the budget really ran out. The clock is
 * injected, so the time limit is tested deterministically; large expansions give every level asked
 * for, however fast the machine is.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { manualClock, type Clock } from '../../server/src/physics/budget';
import { weightOf } from './helpers';

/** A clock that reads 0 until its `jumpAt`-th reading (0-based), then far past any limit; it counts its readings. */
function jumpingClock(jumpAt: number): Clock & { reads: number } {
  const c = {
    reads: 0,
    now(): number {
      return c.reads++ >= jumpAt ? 1e12 : 0;
    },
  };
  return c;
}

const TENT = 'system box(0, 1)\nstate psi(x) = x < 0.5 ? x : 1 - x\n';

describe('large expansions are never cut by the speed of the machine', () => {
  it('basis 2000 of a kinked box state gives all 2000 levels, each the closed form', { timeout: 120_000 }, () => {
    // The tent peaked at 1/2 (norm 1/12): <phi_n|psi> = sqrt(2) 2 sin(n pi/2)/(n pi)^2, so the normalised
    // c_n = 4 sqrt(6) sin(n pi/2)/(n pi)^2 (derived in this comment from two integrations by parts).
    // The limit is measured on the injected clock, which stands still: however long the work takes on
    // this machine, the budget never runs out, so nothing may be cut.
    const r = analyse(`${TENT}basis 2000\n`, { clock: manualClock(0), limits: { maxMillis: 500 } });
    expect(r.levels).toHaveLength(2000);
    expect(r.diagnostics.filter((d) => d.code === 'limits')).toEqual([]);
    for (const n of [1, 2, 3, 999, 1001, 1999, 2000]) {
      const exact = (4 * Math.sqrt(6) * Math.sin((n * Math.PI) / 2)) / (n * Math.PI) ** 2;
      expect(Math.abs(r.levels[n - 1]!.re! - exact)).toBeLessThan(1e-11);
    }
  });

  it('basis 1000 of a coherent state displaced by d = 30 gives all 1000 Poisson weights', { timeout: 120_000 }, () => {
    // Glauber, Phys. Rev. 131, 2766 (1963): |c_n|^2 = e^-L L^n / n!, L = m omega d^2 / (2 hbar) = 450.
    const r = analyse('system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1, center = 30)\nbasis 1000\n', { clock: manualClock(0), limits: { maxMillis: 500 } });
    expect(r.levels).toHaveLength(1000);
    expect(r.diagnostics.filter((d) => d.code === 'limits')).toEqual([]);
    const L = 450;
    let logFactorial = 0;
    const logPoisson: number[] = [];
    for (let n = 0; n < 1000; n++) {
      if (n > 0) logFactorial += Math.log(n);
      logPoisson.push(-L + n * Math.log(L) - logFactorial);
    }
    for (const n of [0, 300, 400, 450, 500, 600, 999]) expect(Math.abs(weightOf(r, n) - Math.exp(logPoisson[n]!))).toBeLessThan(1e-10);
    expect(Math.abs(r.captured! - 1)).toBeLessThan(1e-9);
  });
});

describe('the time limit, on an injected clock', () => {
  const text = `${TENT}basis 60\nexpect norm >= 0.5\n`;

  it('gives identical results on clocks of any speed while the budget lasts', () => {
    const still = analyse(text, { clock: manualClock(0) });
    const fast = analyse(text, { clock: manualClock(1e-3), limits: { maxMillis: 1e9 } });
    expect(fast.levels).toEqual(still.levels);
    expect(fast.diagnostics.map((d) => [d.code, d.start, d.end])).toEqual(still.diagnostics.map((d) => [d.code, d.start, d.end]));
  });

  it('reports the limit exactly when a poll of the budget finds it spent', () => {
    const counting = jumpingClock(Infinity);
    const full = analyse(text, { clock: counting });
    const reads = counting.reads;
    expect(full.diagnostics.filter((d) => d.code === 'limits')).toEqual([]);
    // The last reading measures the time spent; a jump seen only there stops nothing.
    const late = analyse(text, { clock: jumpingClock(reads - 1) });
    expect(late.diagnostics.filter((d) => d.code === 'limits')).toEqual([]);
    expect(late.levels).toEqual(full.levels);
    // A jump seen by the last poll of the budget: one limits error on the system keyword, and the
    // expect line (checked after that poll) is not judged.
    const spent = analyse(text, { clock: jumpingClock(reads - 2) });
    const limits = spent.diagnostics.filter((d) => d.code === 'limits');
    expect(limits.map((d) => [d.start, d.end, d.severity])).toEqual([[0, 'system'.length, 'error']]);
    expect(spent.diagnostics.filter((d) => d.code === 'expect')).toEqual([]);
  });

  it('a budget spent before the first grid is projected gives no levels and says so on the state', () => {
    // The clock passes the 300 ms limit at its fourth reading: before the first chunk of the projection ends.
    const r = analyse('system oscillator(omega = 1)\nstate gaussian(center = 3, width = 0.5)\nbasis 5000\n', { clock: manualClock(100), limits: { maxMillis: 300 } });
    expect(r.levels).toEqual([]);
    const state = 'system oscillator(omega = 1)\n'.length;
    const spans = r.diagnostics.filter((d) => d.code === 'limits').map((d) => [d.start, d.end]);
    expect(spans).toContainEqual([0, 'system'.length]);
    expect(spans).toContainEqual([state, state + 'state gaussian(center = 3, width = 0.5)'.length]);
  });

  it('a cancellation stops the analysis without a time-limit finding', () => {
    const r = analyse(text, { cancelled: () => true });
    expect(r.diagnostics.filter((d) => d.code === 'limits')).toEqual([]);
    expect(r.levels).toEqual([]);
  });
});

describe('work is counted, not timed', () => {
  it('the projection work of a kinked box state grows about as the basis (sine transform), not as its square', () => {
    // The box's coefficients come from a sine transform of at least 2 (levels + 1) samples with the kink
    // taken out in closed form (analysis/boxTransform.ts), counted as 6 N log2 N: doubling the basis
    // doubles N, so the work grows by about 2 (9/8), where the quadrature it replaced (levels x nodes,
    // the nodes growing with the basis) grew by about 4 (derived in this comment; the norm's grids add
    // a little, and the spot check of six levels on its basis-sized grid 6 x nodes x 32, hence the bounds).
    // The norm's grids are sized to the state (analysis/transformGrids.ts), a part that does not grow with
    // the basis, so the growth is read from the increments: what grows with the basis doubles with it, where
    // a cost quadratic in the basis would give increments growing by 4 (derived in this comment).
    const work = (n: number): number => analyse(`${TENT}basis ${n}\n`, { clock: manualClock(0) }).work!.ops;
    const small = work(100);
    const large = work(200);
    const larger = work(400);
    expect(small).toBeGreaterThan(6 * 256 * 8);
    // Below twice what the old quadrature's first grid alone cost in projection (100 levels x 320 nodes x
    // 8 a term): the state's evaluations on the norm's grids are charged on top of it (analysis/charged.ts,
    // 16 + 2 a character a point; measured 361,322 ops in all).
    expect(small).toBeLessThan(2 * 100 * 320 * 8);
    expect((larger - large) / (large - small)).toBeGreaterThan(1.5);
    expect((larger - large) / (large - small)).toBeLessThan(3);
    // The same file and caps count the same work on any clock.
    expect(analyse(`${TENT}basis 100\n`, { clock: manualClock(7) }).work!.ops).toBe(small);
  });
});

