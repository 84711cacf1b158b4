/**
 * The sweep view's pure parts: the design window's outline (contour.ts) against the closed form of the
 * widened box, a saddle cell, the provisional sweep built from points as they arrive (liveSweep.ts),
 * the host's sweep store, and the checks of the sweep messages that cross to the panel.
 */
import { describe, expect, it } from 'vitest';
import { runSweep } from '../../server/src/analysis/sweep/index';
import type { SweepPoint, SweepResult } from '../../server/src/analysis/sweep/types';
import { windowContour } from '../../client/webview/charts/contour';
import { cellEdges } from '../../client/webview/charts/sweepMap';
import { liveResult, startLive, addPoint } from '../../client/src/liveSweep';
import { SweepStore } from '../../client/src/sweeps';
import { sweepFrame } from '../../client/src/sweepFrame';
import { parseHostMessage, parsePanelMessage } from '../../client/src/messages';

/**
 * The ground state of the box (0, a) released into the box (0, L): with r = a / L,
 * c_1 = 2 sqrt(r) sin(pi r) / (pi (1 - r^2)) (derived in this comment from
 * int_0^1 sin(pi u) sin(pi r u) du = sin(pi r) / (pi (1 - r^2))), so P_1 depends on r alone; at r = 1/2
 * it is 32/(9 pi^2) (CHECKS.md, the suddenly widened well).
 */
const P1 = (r: number) => (4 * r * Math.sin(Math.PI * r) ** 2) / (Math.PI ** 2 * (1 - r * r) ** 2);
/** r where P_1 = 1/2, by bisection (P_1 rises from 0.36 at r = 0.5 to 1 at r = 1). */
function half(): number {
  let [lo, hi] = [0.5, 0.99];
  for (let k = 0; k < 200; k++) {
    const m = (lo + hi) / 2;
    if (P1(m) < 0.5) lo = m;
    else hi = m;
  }
  return (lo + hi) / 2;
}

const BOXES = 'let L = 1.2\nlet a = 1\nsystem box(0, L)\nstate eigen(1) of box(0, a)\nbasis 40\nexpect weight 1 >= 0.5\nsweep L from 1 to 2 steps 10\nsweep a from 0.5 to 1 steps 4\n';

describe('the design window outline', () => {
  const sweep = runSweep(BOXES, {}, { maxMillis: 120_000 })!.result;

  it('passes through the window ends the engine located in each row, and closes', () => {
    expect(Math.abs(P1(0.5) - 32 / (9 * Math.PI ** 2))).toBeLessThan(1e-15);
    const lines = windowContour(sweep);
    expect(lines).toHaveLength(1);
    const line = lines[0]!;
    expect(line[0]).toEqual(line[line.length - 1]);
    const rs = half();
    // In every row a, the window ends inside 1..2 at L = a / r*, and the outline turns there.
    for (const a of [0.625, 0.75, 0.875, 1]) {
      const near = Math.min(...line.filter(([, y]) => y === a).map(([x]) => Math.abs(x - a / rs) / x));
      expect(near, `row a = ${a}`).toBeLessThan(1e-9);
    }
    // Elsewhere the outline runs along the range swept or crosses between points: every other vertex lies on the grid's values or halfway.
    const grid = (v: number, vs: number[]) => vs.includes(v) || vs.some((w, k) => k > 0 && Math.abs(v - (w + vs[k - 1]!) / 2) < 1e-12);
    const located = new Set([0.625, 0.75, 0.875, 1].map((a) => a / rs));
    for (const [x, y] of line) if (![...located].some((l) => Math.abs(l - x) < 1e-9)) expect(grid(x, sweep.axes[0]!.values) && grid(y, sweep.axes[1]!.values)).toBe(true);
    // Between rows, halfway (the rows are linear in a).
    expect(line.some(([x, y]) => x === 1 && Math.abs(y - 0.5625) < 1e-12)).toBe(true);
  });

  it('cuts off the corners that hold in a saddle cell, separately', () => {
    const pt = (i: number, j: number, holds: boolean): SweepPoint => ({ index: [i, j], at: [i, j], valid: true, problem: null, findings: [], levels: [], captured: 1, continuum: null, mean: 0, spread: 0, bound: null, expects: [holds] });
    const axis = (name: string) => ({ name, unit: null, from: 0, to: 1, steps: 1, spacing: 'linear' as const, values: [0, 1] });
    const s: SweepResult = { axes: [axis('x'), axis('y')], points: [pt(0, 0, true), pt(1, 0, false), pt(0, 1, false), pt(1, 1, true)], expects: [{ line: 1, text: 'expect' }], located: [], windows: [], systemFixed: true, finished: 4, total: 4, stopped: null, probes: 0 };
    const lines = windowContour(s);
    // Two closed loops, one round each holding corner, neither reaching the other corner.
    expect(lines).toHaveLength(2);
    for (const l of lines) expect(l[0]).toEqual(l[l.length - 1]);
    const around = lines.map((l) => l.every(([x, y]) => x <= 0.5 && y <= 0.5) || l.every(([x, y]) => x >= 0.5 && y >= 0.5));
    expect(around).toEqual([true, true]);
  });

  it('gives cells that meet halfway, geometrically on a log axis', () => {
    expect(cellEdges([1, 2, 3], false)).toEqual([0.5, 1.5, 2.5, 3.5]);
    const log = cellEdges([1, 4, 16], true);
    [0.5, 2, 8, 32].forEach((v, k) => expect(log[k]).toBeCloseTo(v, 12));
  });
});

const GATE = 'units nm, meV\nmass 0.067 m_e\nlet width = 4 nm\nsystem well(depth = 220 meV, width = width)\nstate gaussian(center = 0 nm, width = 1.2 nm)\nexpect weight 1 >= 0.9\nsweep width from 2 nm to 20 nm steps 18\n';

describe('a sweep while its points arrive', () => {
  const full = runSweep(GATE, {}, { maxMillis: 120_000 })!.result;
  const frame = sweepFrame(GATE, [{ name: 'width', unit: 'nm' }]);

  it('reads the frame off the sweep lines and spans the whole axis from the first points', () => {
    expect(frame).toEqual({ axes: [{ name: 'width', unit: 'nm', steps: 18, spacing: 'linear' }], expects: [{ line: 6, text: 'expect weight 1 >= 0.9' }] });
    const live = startLive(frame, full.total);
    for (const k of [0, 1, 4]) addPoint(live, full.points[k]!, 3, full.total);
    const r = liveResult(live)!;
    // 2 nm to 20 nm in 18 steps: 2, 3, ..., 20 nm (the sweep line's own numbers).
    r.axes[0]!.values.forEach((v, k) => expect(v).toBeCloseTo(2 + k, 9));
    expect(r.points.filter((p) => p !== null)).toHaveLength(3);
    expect(r.finished).toBe(3);
    expect(r.stopped).toBeNull();
  });

  it('places the points of a map as they arrive, the second axis too', () => {
    const boxes = runSweep(BOXES, {}, { maxMillis: 120_000 })!.result;
    const live = startLive(sweepFrame(BOXES, []), boxes.total);
    // The first row and a half (the first axis runs fastest).
    for (let k = 0; k < 17; k++) addPoint(live, boxes.points[k]!, k + 1, boxes.total);
    const r = liveResult(live)!;
    expect(r.axes.map((a) => a.values.length)).toEqual([11, 5]);
    // 0.5 to 1 in 4 steps (the sweep line's own numbers), from the two rows seen.
    r.axes[1]!.values.forEach((v, k) => expect(v).toBeCloseTo(0.5 + k / 8, 12));
    expect(r.points.slice(0, 17).every((p) => p !== null)).toBe(true);
    expect(r.points.slice(17).every((p) => p === null)).toBe(true);
  });

  it('keeps the latest version in the host store and forwards each point', () => {
    const store = new SweepStore();
    const sent: string[] = [];
    store.onMessage((_u, m) => sent.push(m.type));
    const uri = 'file:///g.qstate';
    expect(store.point({ uri, version: 2, finished: 1, total: full.total, point: full.points[0] }, () => frame)).toBe(true);
    expect(store.point({ uri, version: 1, finished: 2, total: full.total, point: full.points[1] }, () => frame)).toBe(false);
    expect(store.point({ uri, version: 2, finished: 2, total: full.total, point: { ...full.points[1], at: 'x' } }, () => frame)).toBe(false);
    expect(store.snapshot(uri)!.sweep!.points.filter((p) => p !== null)).toHaveLength(1);
    expect(store.result({ uri, version: 2, sweep: full })).toBe(true);
    expect(store.snapshot(uri)!.sweep).toBe(full);
    expect(sent).toEqual(['sweepPoint', 'sweep']);
  });

  it('lets only well-formed sweep messages through to the panel, and picks back to the host', () => {
    const point = { type: 'sweepPoint', uri: 'file:///g.qstate', version: 1, finished: 1, total: 19, point: full.points[0], frame };
    expect(parseHostMessage(point)).toEqual(point);
    expect(parseHostMessage({ ...point, point: { ...full.points[0], levels: 'many' } })).toBeNull();
    expect(parseHostMessage({ ...point, frame: { axes: [{ name: 1 }], expects: [] } })).toBeNull();
    const whole = { type: 'sweep', uri: 'file:///g.qstate', version: 1, sweep: JSON.parse(JSON.stringify(full)) };
    expect(parseHostMessage(whole)).toEqual(whole);
    expect(parseHostMessage({ ...whole, sweep: { ...whole.sweep, points: whole.sweep.points.slice(1) } })).toBeNull();
    expect(parseHostMessage({ type: 'pointResult', uri: 'file:///g.qstate', at: [5], result: null, reason: 'gone' })).not.toBeNull();
    expect(parsePanelMessage({ type: 'pickPoint', at: [5] })).toEqual({ type: 'pickPoint', at: [5] });
    expect(parsePanelMessage({ type: 'pickPoint', at: [Infinity] })).toBeNull();
    expect(parsePanelMessage({ type: 'pickPoint', at: [1, 2, 3] })).toBeNull();
  });
});
