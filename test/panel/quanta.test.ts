/**
 * Oscillator energies in units of the quantum hbar omega in the panel's summary, and the mean quantum
 * number <n>, in headless Chromium with a real engine result.
 * Expected: the trapped ion displaced by 25 nm (examples/ion-trap-kick.qstate) is a coherent state with
 * <n> = m omega d^2 / (2 hbar) = 1.48262 (the example's own closed form), <E> = (<n> + 1/2) hbar omega
 * and Delta E = sqrt(<n>) hbar omega (coherent states, common practice).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { bundleWebview, launchChromium, servePanel, type PanelServer } from './harness';
import { messageForFile, openPanel, post } from './driver';

let browser: Browser;
let server: PanelServer;
let page: Page;
const errors: string[] = [];

beforeAll(async () => {
  server = await servePanel(await bundleWebview());
  browser = await launchChromium();
  page = await openPanel(browser, server.origin, 1100, 720, errors);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('oscillator energies in the summary', () => {
  it('shows <E> and Delta E also in hbar omega, and <n>', async () => {
    await post(page, messageForFile('examples/ion-trap-kick.qstate', 1));
    const summary = (await page.textContent('#summary')) ?? '';
    const n = 1.48262;
    expect(summary).toMatch(/⟨n⟩\s*1\.4826/);
    const mean = Number(/⟨E⟩[^(]*\(([\d.]+) ħω\)/.exec(summary)![1]);
    expect(mean).toBeCloseTo(n + 0.5, 4);
    const spread = Number(/ΔE[^(]*\(([\d.]+) ħω\)/.exec(summary)![1]);
    expect(spread).toBeCloseTo(Math.sqrt(n), 4);
  });

  it('adds nothing of the kind for a system that is no oscillator', async () => {
    await post(page, messageForFile('examples/plucked-box.qstate', 2));
    const summary = (await page.textContent('#summary')) ?? '';
    expect(summary).not.toMatch(/ħω|⟨n⟩/);
    expect(errors).toEqual([]);
  });
});
