/**
 * The mass labels of a heterostructure's state view as Chromium draws them (client/webview/charts/
 * massLabels.ts): one label a region, inside its region, and no drawn curve or line through its box,
 * at a narrow and a wide panel, on the example of a widened GaAs-like well and on a well of our own.
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { bundleWebview, servePanel, launchChromium, type PanelServer } from './harness';
import { messageFor, messageForFile, openPanel, openTab, overlaps, panel, post, resultOf, type DrawnText } from './driver';

let browser: Browser;
let server: PanelServer;
const errors: string[] = [];
let version = 0;

beforeAll(async () => {
  server = await servePanel(await bundleWebview());
  browser = await launchChromium();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

type Box = { x: number; y: number; width: number; height: number };
type Pt = [number, number];

/** Whether the segment p-q crosses the box (Liang-Barsky clipping; common practice). */
function crosses(p: Pt, q: Pt, b: Box): boolean {
  if (![...p, ...q].every(Number.isFinite)) return false;
  let t0 = 0;
  let t1 = 1;
  const dx = q[0] - p[0];
  const dy = q[1] - p[1];
  const sides: [number, number][] = [[-dx, p[0] - b.x], [dx, b.x + b.width - p[0]], [-dy, p[1] - b.y], [dy, b.y + b.height - p[1]]];
  for (const [pp, qq] of sides) {
    if (pp === 0) {
      if (qq < 0) return false;
    } else {
      const t = qq / pp;
      if (pp < 0) t0 = Math.max(t0, t);
      else t1 = Math.min(t1, t);
    }
  }
  return t0 <= t1;
}

const LINE_SERIES = ['density', 're', 'im', 'partial', 'picked', 'potential', 'mass'];

/**
 * Opens the state view at a width, and returns the mass labels' boxes, every drawn text, the pixel x
 * of each interface, and every drawn path as pixel segments (the series' polylines, the horizontal
 * lines of the mean and the levels, the vertical lines of the interfaces).
 */
async function drawn(p: Page, interfaces: number[], result: ReturnType<typeof resultOf>['result']) {
  await openTab(p, 'state');
  const texts = await panel(p, 'texts');
  const labels = texts.filter((t) => /^\d[\d.]* m_e$/.test(t.text));
  const segments: [Pt, Pt][] = [];
  for (const id of LINE_SERIES) {
    const pts = await panel(p, 'linePoints', id);
    for (let j = 0; j + 1 < pts.length; j++) segments.push([pts[j]!, pts[j + 1]!]);
  }
  expect(segments.length).toBeGreaterThan(100);
  const pxs = new Map<number, number>();
  for (const x of interfaces) pxs.set(x, await panel(p, 'xPixel', x));
  const px = (x: number) => pxs.get(x)!;
  const yE = async (e: number) => panel(p, 'yPixel', 1, e);
  const lines: [Pt, Pt][] = [];
  for (const x of interfaces) lines.push([[px(x), -1e6], [px(x), 1e6]]);
  if (result.energy?.mean != null) lines.push([[-1e6, await yE(result.energy.mean)], [1e6, await yE(result.energy.mean)]]);
  for (const l of result.levels) if (l.weight > 1e-5 && Number.isFinite(l.energy)) lines.push([[-1e6, await yE(l.energy)], [1e6, await yE(l.energy)]]);
  return { texts, labels, segments: [...segments, ...lines], px };
}

/** Checks the labels against the regions' masses, their sides and every drawn path. */
function checkLabels(d: Awaited<ReturnType<typeof drawn>>, regions: { from: number | null; to: number | null; text: string }[], what: string): void {
  const inView = regions.filter((r) => d.labels.some((l) => l.text === r.text));
  expect(d.labels.length, `${what}: one label a region`).toBe(regions.length);
  expect(inView.length).toBe(regions.length);
  const sorted = [...d.labels].sort((a, b) => a.x - b.x);
  regions.forEach((r, i) => {
    const l = sorted[i]!;
    expect(l.text, `${what}: region ${i}`).toBe(r.text);
    // The whole box on its region's side of each interface.
    if (r.from !== null) expect(l.x, `${what}: ${l.text} right of ${r.from}`).toBeGreaterThan(d.px(r.from));
    if (r.to !== null) expect(l.x + l.width, `${what}: ${l.text} left of ${r.to}`).toBeLessThan(d.px(r.to));
  });
  for (const l of d.labels) {
    const hit = d.segments.filter(([p, q]) => crosses(p, q, l as Box));
    expect(hit.map(([p, q]) => `${p.map(Math.round)}-${q.map(Math.round)}`), `${what}: paths through "${l.text}"`).toEqual([]);
  }
  expect(overlaps(d.texts as DrawnText[]), what).toEqual([]);
}

describe('mass labels of a heterostructure (Chromium)', () => {
  it('labels the widened GaAs-like well by region, clear of every curve, at 480 and 1400 px', async () => {
    // examples/gaas-well-widened.qstate: 0.067 m_e in the 9 nm well (edges at +-4.5 nm), 0.088 m_e in the barriers (from the file).
    const regions = [
      { from: null, to: -4.5, text: '0.088 m_e' },
      { from: -4.5, to: 4.5, text: '0.067 m_e' },
      { from: 4.5, to: null, text: '0.088 m_e' },
    ];
    const { result } = resultOf((await import('node:fs')).readFileSync('examples/gaas-well-widened.qstate', 'utf8'));
    for (const width of [480, 1400]) {
      const p = await openPanel(browser, server.origin, width, width < 800 ? 900 : 700, errors);
      await post(p, messageForFile('examples/gaas-well-widened.qstate', ++version));
      checkLabels(await drawn(p, [-4.5, 4.5], result), regions, `gaas-well-widened at ${width} px`);
      await p.close();
    }
    expect(errors).toEqual([]);
  }, 120_000);

  it('labels an off-centre packet in an asymmetric pair of barriers', async () => {
    // A scenario of our own: 0.07 m_e in a 10 nm well, 0.09 m_e in the barriers, a packet started at 2 nm.
    const text = 'units nm, meV\nmass 0.07 m_e\nsystem well(depth = 200 meV, width = 10 nm, barrier_mass = 0.09 m_e)\nstate gaussian(center = 2 nm, width = 1.2 nm)\n';
    const { result } = resultOf(text);
    const regions = [
      { from: null, to: -5, text: '0.09 m_e' },
      { from: -5, to: 5, text: '0.07 m_e' },
      { from: 5, to: null, text: '0.09 m_e' },
    ];
    for (const width of [480, 1100]) {
      const p = await openPanel(browser, server.origin, width, 800, errors);
      await post(p, messageFor(text, ++version, 'file:///ws/packet.qstate'));
      checkLabels(await drawn(p, [-5, 5], result), regions, `packet at ${width} px`);
      await p.close();
    }
    expect(errors).toEqual([]);
  }, 120_000);
});
