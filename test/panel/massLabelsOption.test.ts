/**
 * The placement of the state view's mass labels without a browser: the free-height search
 * (client/webview/charts/freeBand.ts) on paths of known shape, and the note that names the regions
 * when a region is too narrow on screen for its label (client/webview/charts/massLabels.ts).
 */
import { describe, expect, it } from 'vitest';
import { freeHeight, tracesOf } from '../../client/webview/charts/freeBand';
import { describeView, DEFAULT_SETTINGS } from '../../client/webview/charts';
import { readPalette } from '../../client/webview/theme';
import { resultOf } from './driver';

const frame = { width: 200, height: 100 };

describe('free height for a label', () => {
  it('takes the top when nothing runs there', () => {
    // A diagonal from (0, 0) to (1, 1) takes heights 0.4 to 0.5 over u in [0.4, 0.5]; a 10 px box with
    // 3 px of room sits centred 8 px below the top: v = 1 - 8/100 = 0.92 (derived in this comment).
    expect(freeHeight([{ u: [0, 1], v: [0, 1] }], 0.4, 0.5, 10, frame)).toBeCloseTo(0.92, 12);
  });

  it('moves below a line near the top', () => {
    // A horizontal line at v = 0.9 (10 px below the top): the box's centre must be 8 px (half height and
    // room) below it, v < 0.82, so the first whole pixel from the top is 19: v = 0.81 (derived in this comment).
    expect(freeHeight([{ u: [0, 1], v: [0.9, 0.9] }], 0.2, 0.3, 10, frame)).toBeCloseTo(0.81, 12);
  });

  it('keeps out of a filled area and finds nothing when the span is full', () => {
    // A curve at 0.95 filled down to 0 leaves no room over the span (0.95 + 0.08 > 1, and nothing below).
    expect(freeHeight([{ u: [0, 1], v: [0.95, 0.95], fillTo: 0 }], 0.2, 0.3, 10, frame)).toBeNull();
    // A vertical line inside the span takes the whole height too.
    expect(freeHeight([{ u: [0.25, 0.25], v: [0, 1] }], 0.2, 0.3, 10, frame)).toBeNull();
  });

  it('reads the paths of series and their mark lines on their own axes', () => {
    const series = [
      { data: [[0, 0], [10, 5]], yAxisIndex: 1 },
      { data: [], markLine: { data: [{ yAxis: 2 }, { xAxis: 5 }, [{ coord: [2, 1] }, { coord: [4, 1] }]] } },
    ];
    const t = tracesOf(series, { min: 0, max: 10 }, [{ min: 0, max: 4 }, { min: 0, max: 10 }]);
    expect(t.map((q) => [q.u, q.v])).toEqual([
      [[0, 1], [0, 0.5]],
      [[0, 1], [0.5, 0.5]],
      [[0.5, 0.5], [0, 1]],
      [[0.2, 0.4], [0.25, 0.25]],
    ]);
  });
});

describe('mass regions too narrow for their labels', () => {
  it('are named in a note beside the plot, every region with its bounds', () => {
    // An 8 nm well (edges at +-4 nm), 0.067 m_e inside and 0.092 m_e outside (a scenario of our own).
    const { result } = resultOf('units nm, meV\nmass 0.067 m_e\nsystem well(depth = 250 meV, width = 8 nm, barrier_mass = 0.092 m_e)\nstate gaussian(center = 1 nm, width = 1.5 nm)\n');
    const view = (width: number) => describeView({ result, settings: { ...DEFAULT_SETTINGS, tab: 'state' }, palette: readPalette(() => '', 'light'), tooltip: () => '', size: { width, height: 500 } });
    const note = 'Mass by region: 0.092 m_e for x < -4 nm; 0.067 m_e from -4 to 4 nm; 0.092 m_e for x > 4 nm.';
    // At the command line's narrowest picture, 400 px (a plot 272 px wide: 400 less the two 64 px margins), the well's 8 nm cannot hold its
    // label with room to its interfaces; at 1100 px every label fits and no note is needed.
    expect(view(400).notes).toContain(note);
    expect(view(1100).notes.some((n) => n.startsWith('Mass by region'))).toBe(false);
  });
});
