/**
 * The placement of the sweep view's located-place labels in the band above the plot
 * (client/webview/charts/sweepLabels.ts), and how the view makes room for that band: pure, no browser.
 * The expected layouts are derived in the comments from the rule in sweepLabels.ts's header.
 */
import { describe, expect, it } from 'vitest';
import { LABEL_GAP, MAX_LABEL_ROWS, labelBandHeight, placeLabels } from '../../client/webview/charts/sweepLabels';
import { sweepView } from '../../client/webview/charts/sweep';
import { readPalette } from '../../client/webview/theme';
import { plotTop } from '../../client/webview/charts/layout';
import { runSweep } from '../../server/src/analysis/sweep/index';
import type { SweepResult } from '../../server/src/analysis/sweep/types';
import { textWidth } from '../../server/src/shared/textWidth';

const FONT = 13;
/** The horizontal span each placed label covers, per row, from the placement and textWidth. */
function spans(labels: { x: number; text: string }[], band: ReturnType<typeof placeLabels>): Map<number, [number, number][]> {
  const rows = new Map<number, [number, number][]>();
  labels.forEach((l, k) => {
    const place = band.places[k];
    if (!place) return;
    const w = textWidth(l.text, FONT);
    const s: [number, number] = place.align === 'center' ? [l.x - w / 2, l.x + w / 2] : place.align === 'left' ? [l.x, l.x + w] : [l.x - w, l.x];
    rows.set(place.row, [...(rows.get(place.row) ?? []), s]);
  });
  return rows;
}

describe('placing the located-place labels above the plot', () => {
  it('keeps labels far apart in one row, centred on their lines', () => {
    const labels = [200, 500, 800].map((x) => ({ x, text: 'bound 1 → 2' }));
    const band = placeLabels(labels, 64, 1300, FONT);
    expect(band.rows).toBe(1);
    expect(band.places).toEqual(labels.map(() => ({ row: 0, align: 'center' })));
  });

  it('starts a label at its line when centring would cross the plot edge, and ends it at the line on the right', () => {
    const band = placeLabels([{ x: 70, text: 'line 11 holds' }, { x: 995, text: 'bound 3 → 4' }], 64, 1000, FONT);
    expect(band.places).toEqual([{ row: 0, align: 'left' }, { row: 0, align: 'right' }]);
  });

  it('moves a label meeting another up a row, and leaves one out beyond the last row', () => {
    // All on one line: a centred label leaves no room beside it in its row for another label on the same x.
    const labels = Array.from({ length: MAX_LABEL_ROWS + 2 }, (_, k) => ({ x: 500, text: `bound ${k} → ${k + 1}` }));
    const band = placeLabels(labels, 0, 1000, FONT);
    expect(band.rows).toBe(MAX_LABEL_ROWS);
    expect(band.places.slice(0, MAX_LABEL_ROWS).map((q) => q?.row)).toEqual(Array.from({ length: MAX_LABEL_ROWS }, (_, k) => k));
    expect(band.places.slice(MAX_LABEL_ROWS)).toEqual([null, null]);
  });

  it('never puts two labels of a row within the gap of each other nor outside the span, for crowded lines in any order', () => {
    // Lines 0 to 60 px apart in a scrambled order, as located places of a long sweep at a narrow width.
    const xs = [64, 300, 75, 90, 410, 130, 131, 250, 400, 200, 405, 380];
    const labels = xs.map((x, k) => ({ x, text: k % 2 ? `line ${k} fails` : `bound ${k} → ${k + 1}` }));
    const band = placeLabels(labels, 64, 416, FONT);
    for (const row of spans(labels, band).values()) {
      for (const [a, b] of row) expect(a >= 64 && b <= 416).toBe(true);
      const sorted = [...row].sort((p, q) => p[0] - q[0]);
      for (let k = 1; k < sorted.length; k++) expect(sorted[k]![0] - sorted[k - 1]![1]).toBeGreaterThanOrEqual(LABEL_GAP);
    }
  });
});

describe('the sweep view makes room for its labels', () => {
  // The ground state of the box (0, 1) in the box (0, L), L from 1 to 2: P_1 falls from 1 (CHECKS.md, the
  // suddenly widened well: 32/(9 pi^2) at L = 2), so the expect line fails somewhere between.
  const sweep = JSON.parse(JSON.stringify(runSweep('let L = 1.2\nsystem box(0, L)\nstate eigen(1) of box(0, 1)\nbasis 20\nsweep L from 1 to 2 steps 10\nexpect weight 1 >= 0.5\n', {}, { maxMillis: 60_000 })!.result)) as SweepResult;
  const palette = readPalette(() => '', 'light');
  const size = { width: 480, height: 600 };
  type View = { grid: { top: number }; yAxis: { nameGap: number }[]; series: { name: string; markLine?: { data: { label: { show: boolean; position?: string } }[] } }[] };
  const view = (s: SweepResult) => sweepView(s, palette, size, null);

  it('moves the plot and the axis names down by the band the labels take', () => {
    expect(sweep.located.length).toBeGreaterThan(0);
    const o = view(sweep).option as unknown as View;
    const top = plotTop(o.series.map((q) => q.name), size, palette);
    expect(o.grid.top).toBe(top + labelBandHeight(1, palette.fontSize));
    expect(o.yAxis.every((a) => a.nameGap === 15 + labelBandHeight(1, palette.fontSize))).toBe(true);
    expect(o.series[0]!.markLine!.data.every((d) => d.label.show && d.label.position === 'end')).toBe(true);
    // Without located places, no band.
    const bare = view({ ...sweep, located: [] }).option as unknown as View;
    expect(bare.grid.top).toBe(top);
  });

  it('names the places whose labels found no room in a note', () => {
    const crowded: SweepResult = { ...sweep, located: Array.from({ length: MAX_LABEL_ROWS + 1 }, (_, k) => ({ kind: 'bound' as const, at: 1.5, bracket: [1.5, 1.5] as [number, number], before: k + 1, after: k + 2, row: null, axis: 0 })) };
    const d = view(crowded);
    expect(d.notes.some((n) => n.includes(`bound ${MAX_LABEL_ROWS + 1} → ${MAX_LABEL_ROWS + 2} at L = 1.5`))).toBe(true);
    const o = d.option as unknown as View;
    expect(o.series[0]!.markLine!.data.filter((q) => q.label.show)).toHaveLength(MAX_LABEL_ROWS);
  });
});
