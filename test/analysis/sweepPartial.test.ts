/**
 * A sweep stopped short keeps a design window over the points that finished (analysis/sweep/locate.ts,
 * `partialWindows`), marked partial, and its findings say so: the limits finding names how many points
 * finished and the window over them; an `expect window` line is judged when the finished points settle it.
 * Stopping is driven by counted points (the cancel hook) or a manual clock, never by the machine's time.
 */
import { describe, expect, it } from 'vitest';
import { runSweep } from '../../server/src/analysis/sweep/index';
import { manualClock } from '../../server/src/physics/budget';

// A Gaussian packet in a unit box, its centre swept; the ground-level weight falls off both ways from
// the middle, so `expect weight 1 >= 0.6` holds on a band of centres around 0.5.
const BASE = 'let c = 0\nsystem box(0, 1)\nstate gaussian(center = 0.5 + c, width = 0.1)\nexpect weight 1 >= 0.6\nsweep c from -0.3 to 0.3 steps 12\n';

/** The sweep of `text` stopped (cancelled) after `n` points. */
function stoppedAfter(text: string, n: number) {
  let finished = 0;
  return runSweep(text, {}, { cancelled: () => finished >= n, onPoint: (k) => void (finished = k) })!;
}

describe('a sweep stopped short', () => {
  it('has a partial window over the finished points, from the first to the last holding point of the run', () => {
    const full = runSweep(BASE)!;
    const { result } = stoppedAfter(BASE, 7);
    expect(result.stopped).toBe('cancelled');
    expect(result.finished).toBe(7);
    // The finished points are the first 7 (c = -0.3 .. 0, 0.05 apart); they agree with the full sweep's.
    expect(result.points.slice(0, 7)).toEqual(full.result.points.slice(0, 7));
    const holding = result.points.filter((p) => p !== null && p.valid && p.expects.every(Boolean)).map((p) => p!.at[0]!);
    expect(holding.length).toBeGreaterThan(0);
    expect(result.windows).toEqual([{ from: holding[0], to: holding[holding.length - 1], fromEdge: false, toEdge: false, row: null, partial: true }]);
    // The full sweep's window (refined, not partial) holds the partial one.
    expect(full.result.windows.every((w) => !w.partial)).toBe(true);
    expect(full.result.windows[0]!.from).toBeLessThanOrEqual(result.windows[0]!.from);
  });

  it('judges a window line the finished points settle, and only says "cannot be judged" otherwise', () => {
    const verdict = (range: string): string[] => stoppedAfter(`${BASE}expect window covers ${range}\n`, 7).diagnostics.filter((d) => d.code === 'expect').map((d) => d.message);
    const { result } = stoppedAfter(BASE, 7);
    const w = result.windows[0]!;
    // Inside the window of finished points: it holds.
    expect(verdict(`${w.from}..${w.to}`)).toEqual([]);
    // Reaching down to the first point, where the weight expect fails (a finished point inside the range): it fails.
    const down = verdict(`-0.3..${w.to}`);
    expect(down).toHaveLength(1);
    expect(down[0]).toContain('every expect holds for');
    // Reaching past the last finished point: not judged.
    const up = verdict(`${w.from}..0.1`);
    expect(up).toHaveLength(1);
    expect(up[0]).toContain('stopped after 7 of 13 points, so it cannot be judged');
  });

  it('cut by its time limit, names the points finished and the window over them', () => {
    // Each point reads the manual clock a counted number of times; 1 ms a reading runs out part way.
    const { result, diagnostics } = runSweep(BASE, {}, { maxMillis: 150, clock: manualClock(1) })!;
    expect(result.stopped).toBe('time');
    expect(result.finished).toBeGreaterThan(0);
    expect(result.finished).toBeLessThan(13);
    const lim = diagnostics.filter((d) => d.code === 'limits');
    expect(lim).toHaveLength(1);
    expect(lim[0]!.message).toContain(`finished ${result.finished} of 13 points`);
    expect(lim[0]!.message).toContain(result.windows.length === 0 ? 'no finished point satisfies every expect' : 'over the points that finished, every expect holds for c = ');
    expect(result.windows.every((x) => x.partial)).toBe(true);
  });
});
