/**
 * The panel's sweep view in headless Chromium, fed as the extension host feeds it: a real engine
 * sweep sent point by point (`sweepPoint`, with the frame the host reads off the document) and then
 * whole (`sweep`); hovering a point shows its full result; clicking one asks the host for it
 * (`pickPoint`) and the answer (`pointResult`, here the real analysis of the point, standing in for
 * the language server) opens the state view on that point with a way back. A two-parameter map; the
 * themes and the narrow and wide widths with no text drawn over other text.
 */
import { describe, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { analyse } from '../../server/src/analysis/index';
import { runSweep } from '../../server/src/analysis/sweep/index';
import { pointText } from '../../server/src/analysis/sweep/pointText';
import type { SweepResult } from '../../server/src/analysis/sweep/types';
import { sweepFrame } from '../../client/src/sweepFrame';
import { pointRows } from '../../client/webview/charts/sweepQuantity';
import { formatNumber } from '../../server/src/shared/numbers';
import { artifacts, type PanelServer } from './harness';
import { panelSuite } from './suite';
import { messageFor, openPanel, overlaps, panel, post } from './driver';

const GATE_TEXT = readFileSync('examples/gate-widened-well.qstate', 'utf8');
const GATE_URI = 'file:///ws/gate-widened-well.qstate';
// The map example, coarser, so the test stays quick: 9 widths x 5 offsets.
const MAP_TEXT = readFileSync('examples/well-growth-map.qstate', 'utf8').replace(/steps 16/, 'steps 8').replace(/steps 8 log/, 'steps 4 log');
const MAP_URI = 'file:///ws/well-growth-map.qstate';

const sweepOf = (text: string): SweepResult => JSON.parse(JSON.stringify(runSweep(text, {}, { maxMillis: 120_000 })!.result)) as SweepResult;
const gate = sweepOf(GATE_TEXT);
const map = sweepOf(MAP_TEXT);
const gateMessage = messageFor(GATE_TEXT, 1, GATE_URI);
const frame = sweepFrame(GATE_TEXT, (gateMessage.result as { values?: { name: string; unit: string | null }[] }).values);

let browser: Browser;
let server: PanelServer;
let page: Page;
const errors: string[] = [];
const it = panelSuite({
  setupTimeout: 180_000,
  testTimeout: 60_000,
  ready: async (up) => {
    ({ browser, server } = up);
    // Preconditions: the engine's sweep finished, with its window and located places.
    expect(gate.finished).toBe(19);
    expect(gate.windows.length).toBeGreaterThan(0);
    expect(map.axes).toHaveLength(2);
    page = await openPanel(browser, server.origin, 1100, 720, errors);
  },
});

type Series = { id: string; data: unknown[][] };
const series = async (p: Page = page) => (await panel(p, 'inspect')).series as unknown as Series[];
/** Where datum k of series id lies in page pixels (the page's pixelOf). */
const pixelOf = (id: string, k: number) =>
  page.evaluate(([i, n]) => (window as unknown as { eigenspanPanel: { pixelOf(id: string, k: number): { x: number; y: number } | null } }).eigenspanPanel.pixelOf(i as string, n as number), [id, k] as const);
const posted = (p: Page = page) => p.evaluate(() => (window as unknown as { __posted: { type: string; at?: number[] }[] }).__posted);
const pointMessage = (k: number, finished: number) => ({ type: 'sweepPoint', uri: GATE_URI, version: 1, finished, total: gate.total, point: gate.points[k], frame });

describe('the sweep view in Chromium', () => {
  it('appears with the first sweep point and draws the points as they arrive, then the whole sweep', async () => {
    await post(page, gateMessage);
    expect(await page.isHidden('#tab-sweep')).toBe(true);
    for (let k = 0; k < 5; k++) await post(page, pointMessage(k, k + 1));
    expect(await page.isVisible('#tab-sweep')).toBe(true);
    await page.click('#tab-sweep');
    expect((await panel(page, 'inspect')).tab).toBe('sweep');
    const partial = (await series()).find((s) => s.id === 'captured')!;
    expect(partial.data.map((d) => d[0])).toEqual([2, 3, 4, 5, 6]);
    expect(await page.textContent('#sweep-status')).toContain('running: 5 of 19 points');
    // The axis already spans the whole range: the frame gives the step count.
    const labels = (await panel(page, 'axisLabels')).x[0]!;
    expect(labels).toContain('20');
    for (let k = 5; k < gate.total; k++) await post(page, pointMessage(k, k + 1));
    expect((await series()).find((s) => s.id === 'captured')!.data).toHaveLength(19);
    await post(page, { type: 'sweep', uri: GATE_URI, version: 1, sweep: gate });
    expect(await page.textContent('#sweep-status')).toContain('19 of 19 points');
    const texts = (await panel(page, 'texts')).map((t) => t.text);
    expect(texts).toEqual(expect.arrayContaining(['design window', 'bound 1 → 2', 'width (nm)']));
    expect(errors).toEqual([]);
  });

  it('draws a burst of points once a frame, not once a point (counted)', async () => {
    // A new version's sweep, running with one point, so the status can only read 19 of 19 again after the burst.
    const started = { ...gate, points: gate.points.map((q, k) => (k === 0 ? q : null)), finished: 1, located: [], windows: [] };
    await post(page, { type: 'sweep', uri: GATE_URI, version: 2, sweep: started });
    expect(await page.textContent('#sweep-status')).toContain('running: 1 of 19 points');
    const before = (await panel(page, 'inspect')).renders;
    const burst = Array.from({ length: 200 }, (_, k) => ({ ...pointMessage(k % gate.total, gate.total), version: 2 }));
    // The burst, then the finished sweep of the same version, which is drawn at once when it arrives.
    await page.evaluate((msgs) => msgs.forEach((m) => window.postMessage(m, '*')), [...burst, { type: 'sweep', uri: GATE_URI, version: 2, sweep: gate }]);
    await page.waitForFunction(() => /^19 of 19 points/.test(document.getElementById('sweep-status')?.textContent ?? ''));
    const drawn = (await panel(page, 'inspect')).renders - before;
    // Each of the 201 messages drawn on its own would make 201 draws; a frame's worth of points makes one.
    expect(drawn).toBeGreaterThanOrEqual(1);
    expect(drawn).toBeLessThan(100);
    expect((await series()).find((s) => s.id === 'captured')!.data).toHaveLength(19);
  });

  it('shows the full result of a point on hover, in the panel number format with units', async () => {
    const at = (await pixelOf('captured', 3))!;
    await page.mouse.move(at.x, at.y);
    await page.waitForSelector('table.tip', { state: 'visible' });
    const tip = (await page.textContent('table.tip')) ?? '';
    const point = gate.points[3]!;
    expect(point.at[0]).toBe(5);
    expect(tip).toContain('width5 nm');
    expect(tip).toContain(`captured${formatNumber(100 * point.captured!, 5)} %`);
    expect(tip).toContain(`⟨E⟩${formatNumber(point.mean, 5)} meV`);
    // Every row of the point's result is in the tooltip.
    for (const [k, v] of pointRows(gate, point, 'meV')) expect(tip).toContain(`${k}${v}`);
    expect(tip).toMatch(/line 11(holds|fails): expect weight 1 >= 0.9/);
  });

  it('picks a point on click; its result opens the state view, which names the point and goes back', async () => {
    const at = (await pixelOf('captured', 3))!;
    await page.mouse.click(at.x, at.y);
    const picks = (await posted()).filter((m) => m.type === 'pickPoint');
    expect(picks[picks.length - 1]).toEqual({ type: 'pickPoint', at: [5] });
    expect(await page.textContent('#sweep-status')).toContain('analysing width = 5 nm');
    // The host's answer: the real analysis of the file at width = 5 nm (what the server's request returns).
    const text = pointText(GATE_TEXT, [5])!.text;
    const { file: _f, ...result } = analyse(text, { samples: true, limits: { maxMillis: 60_000 } });
    const answer = JSON.parse(JSON.stringify(result));
    await post(page, { type: 'pointResult', uri: GATE_URI, at: [5], result: answer, reason: null });
    expect((await panel(page, 'inspect')).tab).toBe('state');
    expect(await page.isVisible('#state-point')).toBe(true);
    expect(await page.textContent('#state-point-text')).toBe("Showing the sweep point width = 5 nm (the file has width = 4 nm; the figures above are the file's).");
    const potential = () => series().then((s) => s.find((q) => q.id === 'potential')!.data.map((d) => d[1]));
    expect(await potential()).toEqual(answer.samples.potential);
    // For a reader of the test run: the state view on the point (ignored folder).
    await page.screenshot({ path: `${artifacts()}/sweep-point-state.png` });
    await page.click('#state-point-back');
    expect(await page.isHidden('#state-point')).toBe(true);
    expect(await potential()).toEqual((gateMessage.result as { samples: { potential: number[] } }).samples.potential);
  });

  it('draws a two-parameter map with its colour scale, outline and named axes', async () => {
    await post(page, messageFor(MAP_TEXT, 1, MAP_URI));
    await post(page, { type: 'sweep', uri: MAP_URI, version: 1, sweep: map });
    await page.click('#tab-sweep');
    const ids = (await series()).map((s) => s.id);
    expect(ids).toContain('map');
    expect(ids.some((id) => id.startsWith('window-'))).toBe(true);
    expect((await series()).find((s) => s.id === 'map')!.data).toHaveLength(map.points.filter((p) => p?.valid).length);
    const texts = (await panel(page, 'texts')).map((t) => t.text);
    expect(texts).toEqual(expect.arrayContaining(['width (nm)', 'offset (meV)', 'captured weight', 'design window edge']));
    expect(errors).toEqual([]);
  });

  it('picks a cell of the map on click', async () => {
    const k = map.points.findIndex((q) => q !== null && q.valid && q.index[0] === 3 && q.index[1] === 2);
    const cell = (await series()).find((s) => s.id === 'map')!.data.findIndex((d) => d[2] === k);
    const at = (await pixelOf('map', cell))!;
    await page.mouse.click(at.x, at.y);
    const picks = (await posted()).filter((m) => m.type === 'pickPoint');
    expect(picks[picks.length - 1]!.at).toEqual(map.points[k]!.at);
    // Hovering the cell shows the point's full result, both swept values with their units.
    await page.mouse.move(at.x + 1, at.y + 1);
    await page.waitForSelector('table.tip', { state: 'visible' });
    const tip = (await page.textContent('table.tip')) ?? '';
    const [w, o] = map.points[k]!.at;
    expect(tip).toContain(`width${formatNumber(w, 6)} nm`);
    expect(tip).toContain(`offset${formatNumber(o, 6)} meV`);
    for (const [key, v] of pointRows(map, map.points[k]!, 'meV')) expect(tip).toContain(`${key}${v}`);
  });

  it('moves the labels of close located lines apart', async () => {
    // Four places within 0.15 nm of one another: closer on screen than two text heights at either width.
    const close: SweepResult = {
      ...gate,
      located: [
        { kind: 'bound', at: 5, bracket: [5, 5], before: 1, after: 2, row: null, axis: 0 },
        { kind: 'expect', expect: 0, at: 5.05, bracket: [5.05, 5.05], before: 1, after: 0, row: null, axis: 0 },
        { kind: 'expect', expect: 0, at: 5.1, bracket: [5.1, 5.1], before: 0, after: 1, row: null, axis: 0 },
        { kind: 'bound', at: 5.15, bracket: [5.15, 5.15], before: 2, after: 3, row: null, axis: 0 },
      ],
    };
    for (const width of [480, 1400]) {
      const p = await openPanel(browser, server.origin, width, 760, errors);
      await post(p, gateMessage);
      await post(p, { type: 'sweep', uri: GATE_URI, version: 1, sweep: close });
      await p.click('#tab-sweep');
      const texts = await panel(p, 'texts');
      expect(texts.map((t) => t.text)).toEqual(expect.arrayContaining(['bound 1 → 2', 'line 11 fails', 'line 11 holds', 'bound 2 → 3']));
      expect(overlaps(texts), `width ${width}`).toEqual([]);
      await p.close();
    }
  });

  it('returns to the sweep view after a reload once the sweep arrives again', async () => {
    const p = await openPanel(browser, server.origin, 900, 700, errors);
    await post(p, gateMessage);
    await post(p, { type: 'sweep', uri: GATE_URI, version: 1, sweep: gate });
    await p.click('#tab-sweep');
    await p.reload();
    await p.waitForFunction(() => ((window as unknown as { __posted?: unknown[] }).__posted ?? []).length > 0);
    // The host sends the result first, then the sweep (client/src/panel.ts): the result alone shows the spectrum.
    await post(p, gateMessage);
    expect((await panel(p, 'inspect')).tab).toBe('spectrum');
    await post(p, { type: 'sweep', uri: GATE_URI, version: 1, sweep: gate });
    expect((await panel(p, 'inspect')).tab).toBe('sweep');
    await p.close();
  });

  it('keeps every text clear of the others in each theme at 480 px and wide', async () => {
    for (const width of [480, 1400]) {
      const p = await openPanel(browser, server.origin, width, 760, errors);
      // The map, then the lines on the same chart: the map's colour scale must not stay behind.
      for (const [text, uri, sweep] of [[MAP_TEXT, MAP_URI, map], [GATE_TEXT, GATE_URI, gate]] as const) {
        await post(p, messageFor(text, 1, uri));
        await post(p, { type: 'sweep', uri, version: 1, sweep });
        await p.click('#tab-sweep');
        for (const kind of ['light', 'dark', 'high-contrast']) {
          await post(p, { type: 'theme', kind });
          const info = await panel(p, 'inspect');
          expect(info.palette.kind).toBe(kind);
          expect(overlaps(await panel(p, 'texts')), `${uri} ${kind} ${width}`).toEqual([]);
          // The scale's end labels are drawn only with the map.
          const scaleEnds = (await panel(p, 'texts')).filter((t) => t.text === '0.3').length;
          expect(scaleEnds > 0, `${uri} scale`).toBe(uri === MAP_URI);
        }
      }
      await p.close();
    }
    expect(errors).toEqual([]);
  });
});
