/**
 * The sweep view's labels of its located places (where the bound count steps, where an expect line
 * flips), in headless Chromium with the real engine sweep of examples/gate-widened-well.qstate: at
 * 480 px and 1400 px, in the light and dark themes, no label's box meets a drawn curve (its points or
 * the straight segments between them, read from the chart instance), no label meets another text
 * (tick labels, axis titles, legend), and each label still touches its line's x position.
 */
import { describe, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { runSweep } from '../../server/src/analysis/sweep/index';
import type { SweepResult } from '../../server/src/analysis/sweep/types';
import { artifacts, type PanelServer } from './harness';
import { panelSuite } from './suite';
import { messageFor, openPanel, overlaps, panel, post, type DrawnText } from './driver';

const GATE_TEXT = readFileSync('examples/gate-widened-well.qstate', 'utf8');
const GATE_URI = 'file:///ws/gate-widened-well.qstate';
const gate = JSON.parse(JSON.stringify(runSweep(GATE_TEXT, {}, { maxMillis: 120_000 })!.result)) as SweepResult;
const gateMessage = messageFor(GATE_TEXT, 1, GATE_URI);
/** The labels the view writes on its located lines (sweep.ts). */
const LABEL = /^(bound \d+ → \d+|line \d+ (holds|fails))$/;
/** The label a located place should carry: its bound step, or its expect line (by line number) holding or failing. */
const labelOf = (l: SweepResult['located'][number]) => (l.kind === 'bound' ? `bound ${l.before} → ${l.after}` : `line ${gate.expects[l.expect ?? 0]!.line} ${l.after ? 'holds' : 'fails'}`);

let browser: Browser;
let server: PanelServer;
const errors: string[] = [];
const it = panelSuite({
  setupTimeout: 180_000,
  testTimeout: 120_000,
  ready: async (up) => {
    ({ browser, server } = up);
    // Precondition: the engine located the places the labels name (a bound step and the expect line's flips).
    expect(gate.located.filter((l) => l.row === null).length).toBeGreaterThanOrEqual(3);
  },
});

type Pixel = { x: number; y: number };

/** Every drawn curve as its points in chart pixels (the coordinates the texts' boxes are in), one array per series and unbroken run. */
async function curves(p: Page): Promise<{ id: string; points: Pixel[] }[]> {
  const series = (await panel(p, 'inspect')).series as { id: string; data: unknown[][] }[];
  const box = await p.$eval('#chart-sweep', (el) => el.getBoundingClientRect().toJSON() as { left: number; top: number });
  const out: { id: string; points: Pixel[] }[] = [];
  for (const s of series) {
    let run: Pixel[] = [];
    for (let k = 0; k < s.data.length; k++) {
      const at = s.data[k]![1] === null ? null : await p.evaluate(([i, n]) => (window as unknown as { eigenspanPanel: { pixelOf(id: string, k: number): Pixel | null } }).eigenspanPanel.pixelOf(i as string, n as number), [s.id, k] as const);
      if (at === null || !Number.isFinite(at.x) || !Number.isFinite(at.y)) {
        if (run.length > 0) out.push({ id: s.id, points: run });
        run = [];
        continue;
      }
      run.push({ x: at.x - box.left, y: at.y - box.top });
    }
    if (run.length > 0) out.push({ id: s.id, points: run });
  }
  return out;
}

/**
 * Whether a curve comes within `pad` pixels of a box: each point (drawn as a symbol of radius up to
 * 3 px, the view's symbolSize 6 / 2) and each straight segment, walked in half-pixel steps.
 */
function meets(points: Pixel[], t: DrawnText, pad: number): boolean {
  const inside = (q: Pixel, r: number) => q.x >= t.x - r && q.x <= t.x + t.width + r && q.y >= t.y - r && q.y <= t.y + t.height + r;
  if (points.some((q) => inside(q, 3 + pad))) return true;
  for (let k = 1; k < points.length; k++) {
    const [a, b] = [points[k - 1]!, points[k]!];
    const n = Math.ceil(2 * Math.hypot(b.x - a.x, b.y - a.y)) + 1;
    for (let j = 0; j <= n; j++) if (inside({ x: a.x + ((b.x - a.x) * j) / n, y: a.y + ((b.y - a.y) * j) / n }, pad)) return true;
  }
  return false;
}

describe('the sweep view labels its located lines clear of the data', () => {
  for (const width of [480, 1400]) {
    it(`at ${width} px, light and dark`, async () => {
      const p = await openPanel(browser, server.origin, width, 900, errors);
      await post(p, gateMessage);
      await post(p, { type: 'sweep', uri: GATE_URI, version: 1, sweep: gate });
      await p.click('#tab-sweep');
      for (const kind of ['light', 'dark']) {
        await post(p, { type: 'theme', kind });
        const texts = await panel(p, 'texts');
        const labels = texts.filter((t) => LABEL.test(t.text));
        // Every located place of the sweep is labelled (the texts are the engine's: its bound step and the expect line's flips).
        const located = gate.located.filter((l) => l.row === null);
        expect(labels.map((t) => t.text).sort(), `${kind} ${width}`).toEqual(located.map(labelOf).sort());
        const drawn = await curves(p);
        expect(drawn.map((c) => c.id)).toEqual(expect.arrayContaining(['captured', 'mean']));
        for (const t of labels) for (const c of drawn) expect(meets(c.points, t, 1), `"${t.text}" on ${c.id}, ${kind} ${width}`).toBe(false);
        // No label over another text: tick labels, axis titles, legend, the other labels.
        expect(overlaps(texts), `${kind} ${width}`).toEqual([]);
        // Each label still touches its line: the x of the located place, mapped as the axis maps the points (linear here).
        const captured = drawn.find((c) => c.id === 'captured')!.points;
        const xs = (gate.points.filter((q) => q?.valid) as { at: number[] }[]).map((q) => q.at[0]!);
        const [x0, x1] = [captured[0]!.x, captured[captured.length - 1]!.x];
        const xPixel = (v: number) => x0 + ((v - xs[0]!) / (xs[xs.length - 1]! - xs[0]!)) * (x1 - x0);
        for (const l of located) {
          const name = labelOf(l);
          const t = labels.filter((q) => q.text === name).find((q) => q.x - 2 <= xPixel(l.at) && xPixel(l.at) <= q.x + q.width + 2);
          expect(t, `${name} at ${l.at}, ${kind} ${width}`).toBeDefined();
        }
      }
      await p.screenshot({ path: `${artifacts()}/sweep-labels-${width}.png` });
      await p.close();
      expect(errors).toEqual([]);
    });
  }
});
