/**
 * What looking at every view of every example in the light and dark themes, at 480 px and 1400 px,
 * found, in headless Chromium with real engine results (one test per fix).
 */
import { describe, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { panelSuite } from './suite';
import { runSweep } from '../../server/src/analysis/sweep/index';
import type { SweepResult } from '../../server/src/analysis/sweep/types';
import { messageFor, messageForFile, openPanel, openTab, overlaps, panel, post, resultOf } from './driver';

let page: Page;
let narrow: Page;
let version = 0;
const errors: string[] = [];
const it = panelSuite({
  errors,
  ready: async ({ browser, server }) => {
    page = await openPanel(browser, server.origin, 1100, 720, errors);
    narrow = await openPanel(browser, server.origin, 480, 900, errors);
  },
});

const show = (path: string, p: Page = page) => post(p, messageForFile(path, ++version));
const showText = (source: string, p: Page = page) => post(p, messageFor(source, ++version, 'file:///ws/scenario.qstate'));
const text = async (sel: string, p: Page = page) => (await p.textContent(sel)) ?? '';

/** The `evolve` line the time view's hint suggests. */
async function suggested(p: Page = page): Promise<string> {
  await openTab(p, 'time');
  const hint = await text('#empty-time', p);
  const m = /`(evolve [^`]+)`/.exec(hint);
  expect(m, hint).not.toBeNull();
  return m![1]!;
}

describe('the time view hint for a file without an evolve line', () => {
  // An electron in a 6 nm well with a 200 meV offset, started off centre (so two bound levels beat);
  // the units line names no time unit, so times are shown in hbar/meV but must be written with one.
  const noTimeUnit = ['units nm, meV', 'mass 0.067 m_e', 'system well(depth = 200 meV, width = 6 nm)', 'state gaussian(center = 1 nm, width = 1.5 nm)', ''].join('\n');

  it('suggests a line that the file accepts: a time with a unit when the units line names none', async () => {
    for (const source of [noTimeUnit, readFileSync('examples/gate-widened-well.qstate', 'utf8'), readFileSync('examples/gate-release.qstate', 'utf8'), readFileSync('examples/plucked-box.qstate', 'utf8')]) {
      await showText(source);
      const line = await suggested();
      const after = resultOf(`${source}\n${line}\n`).result;
      const errs = after.diagnostics.filter((d) => d.severity === 'error').map((d) => d.message);
      expect(errs, `${line}`).toEqual([]);
      const steps = Number(/steps (\d+)/.exec(line)![1]);
      expect(after.evolution?.times.length, line).toBe(steps + 1);
    }
  });

  it('spans a few beats of the two levels that hold the weight, in an SI time unit', async () => {
    await showText(noTimeUnit);
    const line = await suggested();
    const after = resultOf(`${noTimeUnit}\n${line}\n`).result;
    const ev = after.evolution!;
    // Times are in hbar/meV here (docs/format.md, evolve); the main beat's period is 2 pi hbar / (E2 - E1).
    const [e1, e2] = after.levels.map((l) => l.energy!);
    const period = (2 * Math.PI) / (e2! - e1!);
    const span = ev.times[ev.times.length - 1]!;
    expect(line).toMatch(/^evolve to \d+(\.\d+)? (fs|ps|ns) steps \d+$/);
    expect(span / period).toBeGreaterThanOrEqual(3);
    expect(span / period).toBeLessThan(3 * 2.5 + 1e-9);
  });

  it('says when one level holds all the bound weight, so nothing would move', async () => {
    await show('examples/gate-widened-well.qstate');
    await openTab(page, 'time');
    expect(await text('#empty-time')).toMatch(/Only one bound level holds weight here, so the bound part's/);
    await show('examples/gate-release.qstate');
    expect(await text('#empty-time')).not.toMatch(/Only one/);
  });
});

describe('the time axis', () => {
  it('ends where the evolution ends, not at the next round tick past it', async () => {
    // evolve to 2 pi: the axis ran on to 7.5 (1400 px) and 6.5 (480 px), a fifth of the narrow plot empty.
    const f = 'examples/trap-frequency-drop.qstate';
    const r = resultOf(readFileSync(f, 'utf8')).result;
    const end = r.evolution!.times[r.evolution!.times.length - 1]!;
    expect(end).toBeCloseTo(2 * Math.PI, 9);
    for (const p of [page, narrow]) {
      await show(f, p);
      await openTab(p, 'time');
      const ts = (await panel(p, 'axisLabels')).x[1]!.filter((l) => l !== '').map(Number);
      expect(Math.max(...ts), ts.join(' ')).toBeLessThanOrEqual(end);
      expect(Math.max(...ts)).toBeGreaterThan(end / 2);
    }
  });
});

describe('the spectrum legend', () => {
  it('says "first K = 1 level", not "1 levels"', async () => {
    await show('examples/gate-widened-well.qstate');
    await openTab(page, 'spectrum');
    const texts = (await panel(page, 'texts')).map((t) => t.text);
    expect(texts).toContain('first K = 1 level (ψ_K)');
    await show('examples/gaas-well-packet.qstate');
    expect((await panel(page, 'texts')).map((t) => t.text)).toContain('first K = 2 levels (ψ_K)');
  });
});

describe('the sweep view at 480 px', () => {
  // An electron packet in a box whose width is swept from 2 nm to 20 nm (box levels are closed forms: quick).
  const BOX = ['units nm, meV', 'mass 0.067 m_e', 'let width = 4 nm', 'system box(0 nm, width)', 'state gaussian(center = 1 nm, width = 0.2 nm)', 'sweep width from 2 nm to 20 nm steps 18', ''].join('\n');
  const URI = 'file:///ws/box-sweep.qstate';

  it('labels both ends of the swept range and no round tick crowding them (2 and 3 sat side by side)', async () => {
    const sweep = JSON.parse(JSON.stringify(runSweep(BOX, {}, { maxMillis: 120_000 })!.result)) as SweepResult;
    expect(sweep.finished).toBe(19);
    await post(narrow, messageFor(BOX, ++version, URI));
    await post(narrow, { type: 'sweep', uri: URI, version, sweep });
    await narrow.click('#tab-sweep');
    const xs = (await panel(narrow, 'axisLabels')).x[0]!.filter((l) => l !== '').map(Number);
    expect(xs[0], xs.join(' ')).toBe(2);
    expect(xs[xs.length - 1], xs.join(' ')).toBe(20);
    const gaps = xs.slice(1).map((v, k) => v - xs[k]!);
    expect(Math.min(...gaps), xs.join(' ')).toBeGreaterThanOrEqual(0.5 * Math.max(...gaps));
  });
});

describe('the controls at 480 px', () => {
  it('keep the name "Terms K" on one line beside a mixed state\'s long explanation', async () => {
    await show('examples/thermal-ion-shift.qstate', narrow);
    await openTab(narrow, 'state');
    const box = await narrow.$eval('label[for="terms"]', (el) => ({ h: el.getBoundingClientRect().height, font: parseFloat(getComputedStyle(el).fontSize) }));
    // One line is about 1.2 font sizes tall (common practice for normal line height); two lines are 2.4.
    expect(box.h).toBeLessThan(1.8 * box.font);
  });
});

describe('the density axes name their unit', () => {
  // |psi|^2 integrates to 1 over x, so it is per length; psi is per square root of length (derived in this comment).
  it('gives psi and |psi|^2 (or rho) per length in a file with units, with nothing drawn over the title, at 480 px', async () => {
    const cases: [string, string][] = [
      ['examples/gaas-well-packet.qstate', 'ψ (nm^-1/2), |ψ|² (1/nm)'],
      ['examples/morse-bond-packet.qstate', 'ψ (angstrom^-1/2), |ψ|² (1/angstrom)'],
      ['examples/thermal-ion-shift.qstate', 'ρ(x) (1/nm)'],
    ];
    for (const [f, title] of cases) {
      await show(f, narrow);
      await openTab(narrow, 'state');
      const texts = await panel(narrow, 'texts');
      expect(texts.map((t) => t.text), f).toContain(title);
      expect(overlaps(texts).filter((o) => o.includes(title)), f).toEqual([]);
    }
    await show('examples/gaas-well-packet.qstate', narrow);
    await openTab(narrow, 'time');
    expect((await panel(narrow, 'texts')).map((t) => t.text)).toContain('|ψ|² (1/nm)');
  });

  it('keeps the bare names in natural units', async () => {
    await show('examples/plucked-box.qstate');
    await openTab(page, 'state');
    expect((await panel(page, 'texts')).map((t) => t.text)).toContain('ψ, |ψ|²');
  });
});

describe('a well deeper than the state view shows', () => {
  it('says how high V reaches when its barriers run off the top of the plot', async () => {
    // The widened well: barriers at 230 meV (the file's offset), levels and mean far below.
    await show('examples/gaas-well-widened.qstate');
    await openTab(page, 'state');
    const notes = await text('#notes-state');
    expect(notes).toMatch(/V reaches 230 meV, above the top of the plot \(\d+ meV\)/);
    const top = Number(/above the top of the plot \((\d+) meV\)/.exec(notes)![1]);
    const ys = (await panel(page, 'axisLabels')).y[1]!.filter((l) => l !== '').map(Number);
    expect(Math.max(...ys)).toBe(top);
  });

  it('says nothing when the barriers are on the plot or V only rises steadily (oscillator, Morse, double well)', async () => {
    for (const f of ['examples/gaas-well-packet.qstate', 'examples/gate-widened-well.qstate', 'examples/ion-trap-kick.qstate', 'examples/morse-bond-packet.qstate', 'examples/double-well-tunnelling.qstate', 'examples/plucked-box.qstate']) {
      await show(f);
      await openTab(page, 'state');
      expect(await text('#notes-state'), f).not.toMatch(/V reaches/);
    }
  });
});
