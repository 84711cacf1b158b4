/**
 * What a user reads in the panel, in headless Chromium with real engine results: the log scale, the
 * findings beside the plots, the time view's honesty about what it shows, rounded and non-overlapping
 * labels, named symmetry classes and no numerical noise shown as data.
 */
import { describe, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { type PanelServer } from './harness';
import { panelSuite } from './suite';
import { messageFor, messageForFile, openPanel, openTab, overlaps, panel, post, resultOf } from './driver';

const plateauFile = 'test/panel/fixtures/centre-plateau.qstate';
const plateau = resultOf(readFileSync(plateauFile, 'utf8')).result;
const EXAMPLES = ['double-well-tunnelling', 'gaas-well-packet', 'gate-release', 'ion-trap-kick', 'morse-bond-packet', 'plucked-box', 'trap-frequency-drop'].map((n) => `examples/${n}.qstate`);

let browser: Browser;
let server: PanelServer;
let page: Page;
let version = 0;
const errors: string[] = [];
const it = panelSuite({
  ready: async (up) => {
    ({ browser, server } = up);
    page = await openPanel(browser, server.origin, 1100, 720, errors);
  },
});

const show = (path: string, p: Page = page) => post(p, messageForFile(path, ++version));
const text = async (sel: string, p: Page = page) => (await p.textContent(sel)) ?? '';

describe('the spectrum on a log scale', () => {
  it('is the natural choice for a long decaying spectrum, with bars growing up from a floor below the smallest weight', async () => {
    await show(plateauFile);
    await openTab(page, 'spectrum');
    await page.selectOption('#scale', 'auto');
    // The plateau's edges are jumps: |c_n|^2 falls as n^-2 over 200 levels, a long algebraic tail.
    expect((await panel(page, 'inspect')).settings.scale).toBe('auto');
    expect(await text('#scale-auto')).toContain('log');
    const bars = await panel(page, 'itemLayouts', 'bars-symmetric');
    const drawn = plateau.levels.map((l, k) => ({ w: l.weight, r: bars[k] })).filter((b) => b.r && Number.isFinite(b.r.height) && b.r.height !== 0);
    expect(drawn.length).toBeGreaterThan(50);
    // Every bar starts at the same baseline, the bottom of the plot, and rises (negative height in screen pixels).
    const base = drawn[0]!.r!.y;
    const bottom = await panel(page, 'yPixel', 0, 0);
    for (const b of drawn) {
      expect(b.r!.y).toBeCloseTo(base, 0);
      expect(b.r!.height).toBeLessThan(0);
    }
    expect(base).toBeCloseTo(bottom, 0);
    // The largest weight has the tallest bar.
    const tallest = drawn.reduce((a, b) => (-b.r!.height > -a.r!.height ? b : a));
    expect(tallest.w).toBe(Math.max(...plateau.levels.map((l) => l.weight)));
  });

  it('labels the log axis in powers of ten', async () => {
    const labels = (await panel(page, 'axisLabels')).y[0]!.filter((l) => l !== '');
    expect(labels.length).toBeGreaterThan(2);
    for (const l of labels) expect(l).toMatch(/^(1|1e-\d+)$/);
  });

  it('does not draw weights below 1e-16 of the total', async () => {
    // A displaced oscillator ground state: Poisson weights L^n e^-L / n! fall below 1e-16 by n = 20 and reach 1e-36 at n = 39.
    await show('examples/ion-trap-kick.qstate');
    await page.selectOption('#scale', 'log');
    const r = resultOf(readFileSync('examples/ion-trap-kick.qstate', 'utf8')).result;
    const data = (await panel(page, 'inspect')).series.find((s) => s.id === 'bars-symmetric' || s.id === 'bars-levels')!.data as (number | null)[];
    const tiny = r.levels.map((l, k) => ({ l, k })).filter(({ l }) => l.weight < 1e-16 * r.captured!);
    expect(tiny.length).toBeGreaterThan(5);
    for (const { k } of tiny) expect(data[k]).toBeNull();
    expect(await text('#notes-spectrum')).toMatch(/\d+ levels? with weight below 1e-16/);
    await page.selectOption('#scale', 'auto');
  });
});

describe('findings and plots', () => {
  it('keeps the plots for a failed expect and shows the check beside them', async () => {
    const src = readFileSync('examples/plucked-box.qstate', 'utf8').replace('expect weight 1 0.9141731452608 +- 1e-10', 'expect weight 1 0.5 +- 1e-3');
    await post(page, messageFor(src, ++version, 'file:///ws/plucked-box.qstate'));
    expect(await page.isVisible('#views')).toBe(true);
    expect(await page.getAttribute('#views', 'class')).not.toContain('stale');
    expect(await page.isVisible('#problems')).toBe(false);
    expect(await page.isVisible('#findings')).toBe(true);
    expect(await text('#findings-list')).toContain('expect');
    expect((await panel(page, 'inspect')).series.length).toBeGreaterThan(1);
  });

  it('dims the last good plots, not blanks them, when a syntax error makes the results meaningless', async () => {
    const good = readFileSync('examples/plucked-box.qstate', 'utf8');
    await post(page, messageFor(good, ++version, 'file:///ws/plucked-box.qstate'));
    const before = (await panel(page, 'inspect')).series.map((s) => s.id);
    await post(page, messageFor(good.replace('system box(0, 1)', 'system box(0, 1'), ++version, 'file:///ws/plucked-box.qstate'));
    expect(await page.isVisible('#problems')).toBe(true);
    expect(await text('#problems-list')).toContain('syntax');
    expect(await page.isVisible('#views')).toBe(true);
    expect(await page.getAttribute('#views', 'class')).toContain('stale');
    expect((await panel(page, 'inspect')).series.map((s) => s.id)).toEqual(before);
    // Fixed: fresh plots, not dimmed.
    await post(page, messageFor(good, ++version, 'file:///ws/plucked-box.qstate'));
    expect(await page.getAttribute('#views', 'class')).not.toContain('stale');
    expect(await page.isVisible('#problems')).toBe(false);
  });
});

describe('the time view', () => {
  it('says that a finite well shows its bound part only, with its weight', async () => {
    await show('examples/gaas-well-packet.qstate');
    await openTab(page, 'time');
    const r = resultOf(readFileSync('examples/gaas-well-packet.qstate', 'utf8')).result;
    const notes = await text('#notes-time');
    expect(notes).toMatch(/bound part only/i);
    const pct = Number(/([\d.]+)%/.exec(notes)![1]);
    expect(pct).toBeCloseTo(100 * (1 - r.continuum!), 1);
  });

  it('says how to get a time evolution when the file has no evolve line, with nothing to play', async () => {
    await show('examples/gate-release.qstate');
    expect(await page.isVisible('#empty-time')).toBe(true);
    expect(await text('#empty-time')).toMatch(/evolve to [\d.e-]+ fs steps \d+/);
    expect(await page.isDisabled('#play')).toBe(true);
    expect(await page.isVisible('#chart-time')).toBe(false);
  });

  it('fits the |psi|^2 axis to the data', async () => {
    await show(plateauFile);
    let dmax = 0;
    for (const row of plateau.evolution!.density!) for (const v of row) dmax = Math.max(dmax, v);
    const labels = (await panel(page, 'axisLabels')).y[0]!.filter((l) => l !== '').map(Number);
    const top = Math.max(...labels);
    expect(top).toBeGreaterThanOrEqual(dmax * 0.75);
    expect(top).toBeLessThanOrEqual(dmax * 1.5);
  });

  it('warns when the evolve steps undersample the fastest beat, and not when they do not', async () => {
    // The plateau's evolve steps of 0.01 against beats up to E_200 - E_1 ~ 2e5: far too coarse.
    expect(await text('#notes-time')).toMatch(/Use steps \d+ or more/);
    // A squeezed oscillator state with steps of 2 pi / 120 and weighted levels up to n ~ 10 (beat period ~ 0.6): well sampled.
    await show('examples/trap-frequency-drop.qstate');
    expect(await text('#notes-time')).not.toMatch(/Use steps/);
  });

  it('draws the survival on its own fine time grid when the result has one', async () => {
    const msg = messageForFile('examples/trap-frequency-drop.qstate', ++version) as { result: { evolution: Record<string, unknown>; levels: { energy: number; weight: number }[] } };
    const ev = msg.result.evolution;
    const survivalTimes = Array.from({ length: 1201 }, (_, j) => (j * 2 * Math.PI) / 1200);
    // S(t) = |sum_n w_n exp(-i E_n t)|^2 (hbar = 1; derived in this comment from the expansion).
    ev.survivalTimes = survivalTimes;
    ev.survivalFine = survivalTimes.map((t) => {
      let re = 0;
      let im = 0;
      for (const l of msg.result.levels) ((re += l.weight * Math.cos(l.energy * t)), (im -= l.weight * Math.sin(l.energy * t)));
      return re * re + im * im;
    });
    await post(page, msg);
    const s = (await panel(page, 'inspect')).series.find((q) => q.id === 'survival')!.data as [number, number][];
    expect(s).toHaveLength(1201);
    // The same result with `survival` itself on the fine grid is accepted too.
    const msg2 = JSON.parse(JSON.stringify(msg));
    msg2.version = ++version;
    msg2.result.evolution.survival = msg2.result.evolution.survivalFine;
    delete msg2.result.evolution.survivalFine;
    await post(page, msg2);
    expect((await panel(page, 'inspect')).version).toBe(version);
    expect(((await panel(page, 'inspect')).series.find((q) => q.id === 'survival')!.data as unknown[]).length).toBe(1201);
  });
});

describe('numbers and labels', () => {
  it('rounds every axis end and tick of every view of every example', async () => {
    for (const f of EXAMPLES) {
      await show(f);
      for (const tab of ['spectrum', 'state', 'time'] as const) {
        await openTab(page, tab);
        const labels = await panel(page, 'axisLabels');
        for (const l of [...labels.x.flat(), ...labels.y.flat()]) {
          if (l === '') continue;
          expect(l, `${f} ${tab}: ${l}`).toMatch(/^(-?\d+(\.\d+)?|-?\d(\.\d+)?e-?\d+)$/);
          // At most six significant digits: no 47.076259296459625 or 3.9999999999999996.
          expect(l.replace(/^-|e.*$/g, '').replace('.', '').replace(/^0+/, '').length, `${f} ${tab}: ${l}`).toBeLessThanOrEqual(6);
        }
      }
    }
  }, 120_000);

  it('draws no label over another label, tick or title, at 480 px and at 1400 px', async () => {
    for (const width of [480, 1400]) {
      const p = await openPanel(browser, server.origin, width, 760, errors);
      for (const f of EXAMPLES) {
        await show(f, p);
        for (const tab of ['spectrum', 'state', 'time'] as const) {
          await openTab(p, tab);
          if (!(await p.isVisible(`#chart-${tab}`))) continue;
          expect(overlaps(await panel(p, 'texts')), `${f} ${tab} at ${width} px`).toEqual([]);
        }
      }
      await p.close();
    }
  }, 180_000);

  it('shares the zero of the psi axis and the energy axis, or says why not', async () => {
    for (const f of EXAMPLES) {
      await show(f);
      await openTab(page, 'state');
      const psi0 = await panel(page, 'yPixel', 0, 0);
      const e0 = await panel(page, 'yPixel', 1, 0);
      const said = /separate zeros/.test(await text('#notes-state'));
      expect(said || Math.abs(psi0 - e0) < 1, `${f}: psi zero at ${psi0} px, energy zero at ${e0} px`).toBe(true);
    }
  });

  it('names the symmetry classes and the level segments in the legend', async () => {
    await show('examples/plucked-box.qstate');
    await openTab(page, 'spectrum');
    const legend = (await panel(page, 'texts')).map((t) => t.text);
    expect(legend).toContain('symmetric about x = 0.5');
    expect(legend).toContain('antisymmetric about x = 0.5');
    expect(legend.join(' ')).not.toMatch(/even levels|odd levels/);
    await openTab(page, 'state');
    expect((await panel(page, 'texts')).map((t) => t.text).some((t) => /^levels E_n/.test(t))).toBe(true);
  });

  it('says which of infinite or not available a missing energy is', async () => {
    await show(plateauFile);
    const s = await text('#summary');
    expect(s).not.toContain('∞ or n/a');
    // A jump in the state: |c_n|^2 ~ n^-2 and E_n ~ n^2, so <E> diverges (common practice).
    expect(s).toMatch(/⟨E⟩ ∞/);
  });

  it('shows numerical noise as zero: the continuum of a well eigenstate, and no phase of 0 π', async () => {
    const src = 'units nm, meV, ps\nmass 0.067 m_e\nsystem well(depth = 220 meV, width = 10 nm)\nstate eigen(1) of well(depth = 220 meV, width = 10 nm)\n';
    const { result } = resultOf(src);
    expect(result.continuum!).toBeLessThan(1e-12);
    await post(page, messageFor(src, ++version, 'file:///ws/eigen-well.qstate'));
    const s = await text('#summary');
    expect(s).toMatch(/continuum 0 \(below 1e-12\)/);
    // An eigenstate's spread is zero to rounding (about 1e-14 of its energy): shown as 0.
    expect(s).toMatch(/ΔE 0 meV \(below 1e-12 of ⟨E⟩\)/);
    expect(s).not.toMatch(/e-1[3-9]/);
    // The tooltip of the ground level: phase 0, not "0 π".
    await openTab(page, 'spectrum');
    const bar = (await panel(page, 'itemLayouts', 'bars-symmetric'))[0]!;
    const box = (await page.locator('#chart-spectrum').boundingBox())!;
    await page.mouse.move(box.x + bar.x + bar.width / 2, box.y + bar.y + bar.height / 2);
    await page.waitForSelector('table.tip', { state: 'visible' });
    const tip = await text('table.tip');
    expect(tip).toMatch(/phase0(?!\.)/);
    expect(tip).not.toContain('0 π');
  });

  it('draws the state as the engine normalised it', async () => {
    const msg = messageForFile('examples/plucked-box.qstate', ++version) as { result: { samples: { re: number[] } } };
    await post(page, msg);
    await openTab(page, 'state');
    const re = (await panel(page, 'inspect')).series.find((s) => s.id === 're')!.data as [number, number][];
    expect(re.map((p) => p[1])).toEqual(msg.result.samples.re);
  });

  it('raised no page errors', async () => {
    expect(errors.join('\n')).toBe('');
  });
});
