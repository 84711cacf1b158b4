/**
 * The state view draws the samples of a sampled state (`samples("PATH")`) over the reconstruction, in
 * headless Chromium: the real panel HTML served from 127.0.0.1, with a real analysis result posted the
 * way the extension host does.
 *
 * Expected values: sqrt(2) sin(pi x) on the box (0, 1) is level 1 (infinite square well, from memory),
 * so the samples, normalised by the engine, are sqrt(2) sin(pi x_j) to the spline's accuracy (its norm
 * differs from 1 by less than 1e-6 at 32 intervals).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { analyse } from '../../server/src/analysis/index';
import { bundleWebview, launchChromium, servePanel, type PanelServer } from './harness';

const N = 32;
const csv = ['x, re', ...Array.from({ length: N + 1 }, (_, i) => `${i / N}, ${Math.SQRT2 * Math.sin((Math.PI * i) / N)}`)].join('\n');
const { file: _f, ...result } = analyse('system box(0, 1)\nstate samples("d.csv")\nbasis 8\n', { samples: true, data: new Map([['d.csv', { text: csv }]]), limits: { maxMillis: 60_000 } });

let browser: Browser;
let server: PanelServer;
let page: Page;

beforeAll(async () => {
  server = await servePanel(await bundleWebview());
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1000, height: 640 } });
  await page.goto(`${server.origin}/`);
  await page.waitForFunction(() => ((window as unknown as { __posted?: unknown[] }).__posted ?? []).length > 0);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

type Inspect = { series: { id: string; data: unknown[] }[]; renders: number };
const inspect = (): Promise<Inspect> => page.evaluate(() => (window as unknown as { eigenspanPanel: { inspect(): unknown } }).eigenspanPanel.inspect()) as Promise<Inspect>;

describe('sampled states in the panel', () => {
  it('draws every sample over the partial sum on the state view', async () => {
    expect(result.samples?.data?.x).toHaveLength(N + 1);
    await page.evaluate((m) => window.postMessage(m, '*'), { type: 'result', uri: 'file:///ws/s.qstate', version: 1, fileName: 's.qstate', result: JSON.parse(JSON.stringify(result)) });
    await page.waitForFunction(() => Number(document.body.dataset.renders ?? '0') > 0, undefined, { timeout: 5000 });
    await page.click('#tab-state');
    await page.waitForFunction(() => {
      const i = (window as unknown as { eigenspanPanel: { inspect(): { series: { id: string }[] } } }).eigenspanPanel.inspect();
      return i.series.some((s) => s.id === 'data');
    });
    const i = await inspect();
    const pts = i.series.find((s) => s.id === 'data')!.data as [number, number][];
    expect(pts).toHaveLength(N + 1);
    pts.forEach(([x, y], j) => {
      expect(x).toBeCloseTo(j / N, 12);
      expect(y).toBeCloseTo(Math.SQRT2 * Math.sin(Math.PI * x), 6);
    });
    expect(i.series.some((s) => s.id === 'partial')).toBe(true);
    await page.screenshot({ path: 'test-artifacts/panel-samples.png' });
  });
});
