/**
 * The panel with a mixed state, in headless Chromium: the populations P_n as bars, the density
 * <x|rho|x> in the state view instead of Re/Im psi, the purity in the summary, and no NaN anywhere
 * although the levels' re and im are null.
 */
import { describe, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { artifacts } from './harness';
import { panelSuite } from './suite';
import { messageFor, openPanel, openTab, panel, post, resultOf } from './driver';

const source = readFileSync('examples/thermal-ion-shift.qstate', 'utf8');
const { result } = resultOf(source);

let page: Page;
const errors: string[] = [];
const it = panelSuite({
  ready: async ({ browser, server }) => {
    // Preconditions: a real mixed result with its density samples.
    expect(result.mixture?.kind).toBe('thermal');
    expect(result.levels.every((l) => l.re === null && l.im === null)).toBe(true);
    expect(result.samples?.density?.length).toBe(result.samples?.x.length);
    page = await openPanel(browser, server.origin, 1100, 680, errors);
    await post(page, messageFor(source, 1, 'file:///ws/thermal-ion-shift.qstate'));
  },
});

const seriesData = async (id: string): Promise<unknown[] | null> => (await panel(page, 'inspect')).series.find((s) => s.id === id)?.data ?? null;

describe('a mixed state in the panel', () => {
  it('shows the populations and the purity, and no NaN', async () => {
    await openTab(page, 'spectrum');
    const summary = (await page.textContent('#summary')) ?? '';
    expect(summary).toContain('purity');
    // 1 / (2 nbar + 1) with nbar = 0.171854 (the example's closed form), to the 6 digits the summary shows.
    expect(summary).toContain('0.744209');
    const texts = (await panel(page, 'texts')).map((t) => t.text);
    expect(texts).toContain('P_n');
    expect(await page.textContent('body')).not.toMatch(/NaN/);
    expect(errors).toEqual([]);
  });

  it('draws the density <x|rho|x> in the state view instead of Re and Im psi', async () => {
    await openTab(page, 'state');
    const density = (await seriesData('density')) as [number, number][];
    expect(density).not.toBeNull();
    const sent = result.samples!.density!;
    density.forEach(([, d], j) => expect(d).toBeCloseTo(sent[j]!, 12));
    // The density integrates to Tr rho = 1 over the plot window (trapezoid rule; the window holds all of it).
    let integral = 0;
    for (let j = 0; j + 1 < density.length; j++) integral += ((density[j + 1]![0] - density[j]![0]) * (density[j]![1] + density[j + 1]![1])) / 2;
    expect(integral).toBeCloseTo(1, 4);
    for (const id of ['re', 'im', 'partial']) expect(await seriesData(id)).toBeNull();
    expect((await panel(page, 'texts')).map((t) => t.text)).toContain('ρ(x) (1/nm)');
    expect(await page.textContent('#terms-out')).toContain('mixed state');
    // For a look by eye only (the ignored test-artifacts folder).
    await page.screenshot({ path: `${artifacts()}/panel-mixed-state.png` });
    expect(await page.textContent('body')).not.toMatch(/NaN/);
  });

  it('labels the survival of the ensemble in the time view', async () => {
    await openTab(page, 'time');
    const texts = (await panel(page, 'texts')).map((t) => t.text).join(' ');
    expect(texts).toContain('Σ p_k');
    expect(await page.textContent('body')).not.toMatch(/NaN/);
    expect(errors).toEqual([]);
  });
});
