/**
 * What a physicist new to the tool reads in the panel, in headless Chromium with real engine results:
 * the x window of the state and time views, the spectrum's level ticks, one captured figure, and the
 * fixes made after looking at every view of every example.
 */
import { describe, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import type { PanelServer } from './harness';
import { panelSuite } from './suite';
import { messageForFile, openPanel, openTab, overlaps, panel, post, resultOf } from './driver';

let browser: Browser;
let server: PanelServer;
let page: Page;
let version = 0;
const errors: string[] = [];
const it = panelSuite({
  errors,
  ready: async (up) => {
    ({ browser, server } = up);
    page = await openPanel(browser, server.origin, 1100, 720, errors);
  },
});

const show = (path: string, p: Page = page) => post(p, messageForFile(path, ++version));
const text = async (sel: string, p: Page = page) => (await p.textContent(sel)) ?? '';
const xLabels = async () => (await panel(page, 'axisLabels')).x[0]!.filter((l) => l !== '').map(Number);

describe('the x window of the state and time views', () => {
  const well = 'examples/gaas-well-packet.qstate';
  it('shows where a finite well state and its levels live, not the whole integration window, and says so', async () => {
    const r = resultOf(readFileSync(well, 'utf8')).result;
    const full = [r.samples!.x[0]!, r.samples!.x[r.samples!.x.length - 1]!];
    await show(well);
    await openTab(page, 'state');
    const xs = await xLabels();
    // The well is 10 nm wide (|x| < 5 nm) in a window of about ±47 nm; the packet and both bound levels fit in ±20 nm.
    expect(full[1]! - full[0]!).toBeGreaterThan(90);
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(-20);
    expect(Math.max(...xs)).toBeLessThanOrEqual(20);
    expect(Math.min(...xs)).toBeLessThanOrEqual(-5);
    expect(Math.max(...xs)).toBeGreaterThanOrEqual(5);
    expect(await text('#notes-state')).toMatch(/computed on -47\.1 to 47\.1 nm/);
    await openTab(page, 'time');
    const xt = await xLabels();
    expect(Math.max(...xt)).toBeLessThanOrEqual(20);
    expect(await text('#notes-time')).toMatch(/computed on -47\.1 to 47\.1 nm/);
  });

  it('keeps the whole box, with no note, when the state fills it', async () => {
    await show('examples/plucked-box.qstate');
    await openTab(page, 'state');
    const xs = await xLabels();
    expect(Math.min(...xs)).toBe(0);
    expect(Math.max(...xs)).toBe(1);
    expect(await text('#notes-state')).not.toMatch(/computed on/);
  });

  it('puts the zero of psi and of V at one height, or says why not', async () => {
    await show(well);
    await openTab(page, 'state');
    const notes = await text('#notes-state');
    if (!/separate zeros/.test(notes)) expect(await panel(page, 'yPixel', 0, 0)).toBeCloseTo(await panel(page, 'yPixel', 1, 0), 0);
  });
});

describe('the spectrum level ticks', () => {
  it('label round level numbers (1, 5, 10, ... or 10, 20, ...), not odd steps', async () => {
    for (const f of ['examples/plucked-box.qstate', 'examples/ion-trap-kick.qstate', 'examples/trap-frequency-drop.qstate', 'examples/morse-bond-packet.qstate']) {
      await show(f);
      await openTab(page, 'spectrum');
      await page.selectOption('#axis', 'n');
      const r = resultOf(readFileSync(f, 'utf8')).result;
      const first = r.levels[0]!.n;
      const ns = await xLabels();
      expect(ns.length, f).toBeGreaterThan(2);
      const multiples = ns.filter((n) => n !== first);
      const step = multiples.length > 1 ? multiples[1]! - multiples[0]! : 1;
      expect([1, 2, 5, 10, 20, 25, 50, 100], `${f}: ${ns.join(' ')}`).toContain(step);
      for (const n of multiples) expect(n % step, `${f}: ${ns.join(' ')}`).toBe(0);
    }
  });
});

describe('the summary line', () => {
  it('gives the captured weight once, rounded to what the sum resolves', async () => {
    await show('examples/gaas-well-packet.qstate');
    const s = await text('#summary');
    expect(s).toContain('captured 85.08%');
    expect(s).not.toMatch(/85\.0846/);
    expect(s.match(/85\.08/g)).toHaveLength(1);
  });
});

describe('what looking at every example found', () => {
  it('names the time view density of a mixed state rho(x,t), not |psi|^2', async () => {
    await show('examples/thermal-ion-shift.qstate');
    await openTab(page, 'time');
    const texts = (await panel(page, 'texts')).map((t) => t.text);
    expect(texts).toContain('ρ(x,t)');
    expect(texts).not.toContain('|ψ|²');
  });

  it('disables the partial-sum slider of a mixed state, which has no wave function to sum', async () => {
    await show('examples/thermal-ion-shift.qstate');
    await openTab(page, 'state');
    expect(await page.isDisabled('#terms')).toBe(true);
    expect(await text('#terms-out')).toMatch(/no wave function/);
    await show('examples/ion-trap-kick.qstate');
    expect(await page.isDisabled('#terms')).toBe(false);
  });

  it('gives a captured weight within 1e-5 of 1 as its shortfall, not a row of nines', async () => {
    // The Morse packet's 24 levels capture all but about 4e-10 (expand --table: 0.9999999996).
    await show('examples/morse-bond-packet.qstate');
    const s = await text('#summary');
    expect(s).toMatch(/captured 1 − \d(\.\d)?e-10/);
    expect(s).not.toMatch(/99\.9999/);
  });
});

describe('the reason for an infinite spread', () => {
  it('follows the finding: a kink in the state, not a slow decay the basis of two bound levels cannot show', async () => {
    // The widened well's state has a kink at x = -3 nm (its convergence finding says so).
    await show('examples/gaas-well-widened.qstate');
    expect(await text('#summary')).toMatch(/ΔE ∞ \(the state has a kink\)/);
  });
});

describe('the decay figure of the summary', () => {
  // The laws and their meaning are derived in test/shared/decayText.test.ts (a kink gives n^-2; a
  // thermal mixture's populations fall geometrically, by about e^(-hbar omega / kT) a level).
  const decay = async () => (await page.$$eval('#summary .figure', (els) => els.map((e) => e.textContent ?? ''))).find((t) => t.startsWith('decay')) ?? '';

  it('says a thermal mixture\'s populations fall geometrically with their ratio, not n^-29.8 (smooth)', async () => {
    await show('examples/thermal-ion-shift.qstate');
    const d = await decay();
    expect(d).toMatch(/^decay P_n falls geometrically, by about a factor 0\.2\d* a level over n\s=\s\d+\.\.\d+: faster than any power of n$/);
    expect(d).not.toMatch(/n\^-|√|smooth\)/);
  });

  it('names the derivative that jumps for a power law', async () => {
    await show('examples/plucked-box.qstate');
    expect(await decay()).toMatch(/^decay \|c_n\| ~ n\^-2 over n\s=\s\d+\.\.\d+: ψ′ jumps \(ψ has a kink\)$/);
  });
});

describe('the room kept for the legend', () => {
  // ECharts wraps a plain legend into rows; the plot starts below the rows the chart builder expects.
  // The axis names sit right under the last row (common practice: no empty band) and never under it.
  const examples = ['thermal-ion-shift', 'gaas-well-widened', 'morse-bond-packet', 'double-well-tunnelling'];
  for (const width of [480, 1400]) {
    it(`leaves no empty row between the legend and the axis names at ${width} px`, async () => {
      const p = await openPanel(browser, server.origin, width, 720, errors);
      try {
        for (const name of examples) {
          await show(`examples/${name}.qstate`, p);
          for (const tab of ['spectrum', 'state'] as const) {
            await openTab(p, tab);
            const texts = await panel(p, 'texts');
            const axisName = texts.find((t) => t.text === 'cumulative' || t.text.startsWith('E, V'));
            expect(axisName, `${name} ${tab}`).toBeDefined();
            const above = texts.filter((t) => t.y < axisName!.y - 1);
            expect(above.length, `${name} ${tab}: legend`).toBeGreaterThan(0);
            const gap = axisName!.y - Math.max(...above.map((t) => t.y + t.height));
            expect(gap, `${name} ${tab} at ${width} px`).toBeGreaterThanOrEqual(0);
            expect(gap, `${name} ${tab} at ${width} px`).toBeLessThan(16);
            // No legend entry wrapped onto the axis names' line (seen: the thermal state's ⟨E⟩ on ρ(x) at 480 px).
            expect(overlaps(texts.filter((t) => t.y < axisName!.y + axisName!.height)), `${name} ${tab} at ${width} px`).toEqual([]);
          }
        }
      } finally {
        await p.close();
      }
    }, 120_000);
  }
});
