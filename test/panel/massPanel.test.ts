/**
 * The state view of a heterostructure: the mass profile and its interfaces, as an option in Node and
 * drawn by the real panel in headless Chromium (the way test/panel/panel.test.ts drives it).
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { analyse } from '../../server/src/analysis/index';
import { stateOption, DEFAULT_SETTINGS } from '../../client/webview/charts';
import { readPalette } from '../../client/webview/theme';
import { bundleWebview, servePanel, launchChromium, artifacts, type PanelServer } from './harness';

const text = 'units nm, meV\nmass 0.067 m_e\nsystem well(depth = 250 meV, width = 8 nm, barrier_mass = 0.092 m_e)\nstate gaussian(center = 1 nm, width = 1.5 nm)\n';
const { file: _f, ...result } = analyse(text, { samples: true, limits: { maxMillis: 60_000 } });

type LabelItem = [{ coord: [number, number]; label: { formatter: string } }, { coord: [number, number] }];
type Series = { id?: string; data?: unknown[]; markLine?: { data: ({ xAxis: number } | LabelItem)[] }; yAxisIndex?: number };

describe('mass profile in the state view (option)', () => {
  it('draws m(x) on its own hidden axis, a line at each interface, and labels each region with its mass inside it', () => {
    const option = stateOption({ result, settings: { ...DEFAULT_SETTINGS }, palette: readPalette(() => '', 'dark'), tooltip: () => '' } as never) as { series: Series[]; yAxis: { show?: boolean }[] };
    const mass = option.series.find((s) => s.id === 'mass')!;
    expect(mass).toBeDefined();
    expect(mass.yAxisIndex).toBe(2);
    expect(option.yAxis[2]!.show).toBe(false);
    // The interfaces of the well: its edges at -4 and 4 nm, 0.092 m_e outside and 0.067 m_e inside.
    const marks = mass.markLine!.data;
    expect(marks.filter((d) => !Array.isArray(d)).map((d) => (d as { xAxis: number }).xAxis)).toEqual([-4, 4]);
    // One horizontal label a region, its whole width on its region's side of the interfaces (the label sits in the segment's middle).
    const labels = marks.filter((d): d is LabelItem => Array.isArray(d)).map(([a, b]) => ({ text: a.label.formatter, from: a.coord[0], to: b.coord[0] }));
    expect(labels.map((l) => l.text)).toEqual(['0.092 m_e', '0.067 m_e', '0.092 m_e']);
    expect(labels[0]!.to).toBeLessThan(-4);
    expect(labels[1]!.from).toBeGreaterThan(-4);
    expect(labels[1]!.to).toBeLessThan(4);
    expect(labels[2]!.from).toBeGreaterThan(4);
    const pairs = mass.data as [number, number][];
    for (const [x, m] of pairs) expect(m).toBeCloseTo(Math.abs(x) < 4 ? 0.067 : 0.092, 12);
  });

  it('adds nothing for a constant mass', () => {
    const plain = analyse('system well(depth = 10, width = 2)\nstate gaussian(center = 0, width = 0.3)\n', { samples: true });
    const { file: _p, ...r } = plain;
    const option = stateOption({ result: r, settings: { ...DEFAULT_SETTINGS }, palette: readPalette(() => '', 'dark'), tooltip: () => '' } as never) as { series: Series[]; yAxis: unknown[] };
    expect(option.series.some((s) => s.id === 'mass')).toBe(false);
    expect(option.yAxis).toHaveLength(2);
  });
});

let browser: Browser;
let server: PanelServer;
let page: Page;
const pageErrors: string[] = [];

beforeAll(async () => {
  server = await servePanel(await bundleWebview());
  browser = await launchChromium();
  page = await browser.newPage({ viewport: { width: 1100, height: 680 } });
  page.on('pageerror', (e) => pageErrors.push(e.message));
  await page.goto(`${server.origin}/`);
  await page.waitForFunction(() => ((window as unknown as { __posted?: unknown[] }).__posted ?? []).length > 0);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('mass profile in the state view (Chromium)', () => {
  it('draws the mass series with the engine values after a result arrives', async () => {
    const msg = { type: 'result', uri: 'file:///ws/hetero.qstate', version: 1, fileName: 'hetero.qstate', result: JSON.parse(JSON.stringify(result)) };
    await page.evaluate(async (m) => {
      const before = document.body.dataset.renders ?? '0';
      window.postMessage(m, '*');
      await new Promise<void>((resolve) => {
        const tick = () => ((document.body.dataset.renders ?? '0') !== before ? resolve() : requestAnimationFrame(tick));
        requestAnimationFrame(tick);
      });
    }, msg);
    await page.click('#tab-state');
    await page.waitForFunction(() => (window as unknown as { eigenspanPanel: { inspect(): { tab: string } } }).eigenspanPanel.inspect().tab === 'state');
    const i = (await page.evaluate(() => (window as unknown as { eigenspanPanel: { inspect(): unknown } }).eigenspanPanel.inspect())) as { series: { id: string; data: [number, number][] }[] };
    const mass = i.series.find((s) => s.id === 'mass')!;
    expect(mass).toBeDefined();
    expect(mass.data.length).toBe(result.samples!.x.length);
    expect(mass.data.find(([x]) => Math.abs(x) < 1)![1]).toBeCloseTo(0.067, 12);
    expect(mass.data.find(([x]) => x > 6)![1]).toBeCloseTo(0.092, 12);
    await page.screenshot({ path: `${artifacts()}/mass-state.png` });
    expect(pageErrors).toEqual([]);
  });
});
