/**
 * The panel's pure parts in Node: partial sums, normalisation, axis helpers and the option builders.
 */
import { describe, it, expect } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { l2Distance, sampledState, partialSum, trapezoid } from '../../client/webview/physics';
import { spectrumOption, stateOption, timeOption, decadeAxis, niceCeil, niceBound, niceAxis, tickFormatter, energyWindow, levelClasses, naturalScale, missingEnergyText, phaseText, continuumText, evolveSampling, hbarInFileUnits, stateAxes, DEFAULT_SETTINGS } from '../../client/webview/charts';
import { readPalette } from '../../client/webview/theme';
import { parabolaResult } from '../client/fixtures';

const palette = readPalette(() => '', 'dark');
const ctx = (over: Partial<typeof DEFAULT_SETTINGS> = {}, r = parabolaResult(12, { samples: true })) => ({
  result: r,
  settings: { ...DEFAULT_SETTINGS, ...over },
  palette,
  tooltip: (rows: [string, string][]) => rows.map((x) => x.join(': ')).join('\n'),
});

describe('partial sums', () => {
  const r = parabolaResult(15, { samples: true });
  const s = r.samples!;

  it('takes the sampled state as the engine normalised it', () => {
    const st = sampledState(s);
    expect(Array.from(st.re)).toEqual(s.re);
    expect(trapezoid(s.x, st.density)).toBeCloseTo(1, 3);
  });

  it('converges to the state, with the error squared equal to the weight left out (Parseval)', () => {
    const st = sampledState(s);
    let prev = Infinity;
    for (const K of [1, 3, 5, 9, 15]) {
      const p = partialSum(s, r.levels, K);
      const err = l2Distance(s.x, st.re, st.im, p.re, p.im);
      expect(err).toBeLessThanOrEqual(prev);
      prev = err;
      const left = 1 - r.levels.slice(0, K).reduce((a, l) => a + l.weight, 0);
      // The trapezoid rule on 101 points limits the agreement to about 1e-4.
      expect(err ** 2).toBeCloseTo(left, 4);
    }
    // One term: |c_1|^2 = 960/pi^6, so the error squared is 1 - 0.998555014364018 — Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    const one = partialSum(s, r.levels, 1);
    expect(l2Distance(s.x, st.re, st.im, one.re, one.im) ** 2).toBeCloseTo(1 - 0.998555014364018, 4);
  });

  it('clamps K to the sampled eigenfunctions', () => {
    expect(partialSum(s, r.levels, 1000).terms).toBe(15);
    expect(partialSum(s, r.levels, -2).terms).toBe(0);
  });
});

describe('axis helpers', () => {
  it('rounds axis ends to short labels', () => {
    expect(niceCeil(0.0398)).toBe(0.05);
    expect(niceCeil(2.1)).toBe(2.5);
    expect(niceCeil(7)).toBe(10);
    expect(niceBound(1234, true)).toBe(1300);
    expect(niceBound(-58.2, false)).toBe(-59);
    // The log axis floor sits below the smallest weight shown, at a multiple of the tick step.
    expect(decadeAxis([0.5, 3e-5])).toEqual({ floor: -5, top: 0, step: 1 });
    expect(decadeAxis([0.9, 1e-7])).toEqual({ floor: -8, top: 0, step: 2 });
    expect(decadeAxis([0.9, 2e-15])).toEqual({ floor: -16, top: 0, step: 4 });
    // Round ticks and ends: 0..47.08 becomes 0..50 by 10; labels carry no binary noise.
    expect(niceAxis(0, 47.076259296459625, 5)).toEqual({ min: 0, max: 50, interval: 10 });
    expect(tickFormatter(0.2)(3.9999999999999996)).toBe('4');
    expect(tickFormatter(0.2)(0.30000000000000004)).toBe('');
  });

  it('frames the energies that carry weight', () => {
    const r = parabolaResult(12, { samples: true });
    const [lo, hi] = energyWindow(r);
    expect(lo).toBeLessThanOrEqual(0);
    // Only level 1 holds at least 1 % of the top weight here, so the mean plus two spreads sets the top.
    expect(hi).toBeGreaterThan(r.energy!.mean! + 2 * r.energy!.spread!);
  });
});

describe('option builders', () => {
  it('splits the symmetric and antisymmetric levels of a symmetric system and ends the cumulative line at the captured weight', () => {
    const o = spectrumOption(ctx()) as { series: { id: string; data: unknown[] }[] };
    const even = o.series.find((s) => s.id === 'bars-symmetric')!.data as (number | null)[];
    const odd = o.series.find((s) => s.id === 'bars-antisymmetric')!.data as (number | null)[];
    // n = 1, 3, ... are drawn; the even n of this even state vanish exactly and are not drawn (Griffiths, parabola state, from memory).
    expect(even.filter((v) => v !== null)).toHaveLength(6);
    expect(odd.filter((v) => v !== null)).toHaveLength(0);
    const cum = o.series.find((s) => s.id === 'cumulative')!.data as number[];
    expect(cum.at(-1)).toBeCloseTo(parabolaResult(12).captured!, 15);
  });

  it('puts weights against energies and drops zeros on a log axis', () => {
    const o = spectrumOption(ctx({ axis: 'energy', scale: 'log' })) as { series: { id: string; data: unknown[] }[]; yAxis: { type: string }[] };
    // The log view draws decades above a floor on a value axis, so the bars grow up from the floor.
    expect(o.yAxis[0]!.type).toBe('value');
    const odd = o.series.find((s) => s.id === 'bars-antisymmetric')!.data as [number, number | null][];
    // Even n of this even state vanish (Griffiths, parabola state, from memory): nothing to draw on a log axis.
    expect(odd.every(([, w]) => w === null)).toBe(true);
    expect(odd[1]![0]).toBeCloseTo((4 * Math.PI ** 2) / 2, 12); // E_2 = 4 pi^2 / 2 in the unit box, common practice
  });

  it('tells no symmetry classes when the system has no symmetry centre', () => {
    const r = parabolaResult(6, { samples: true });
    r.system = { ...r.system!, kind: 'potential', center: null };
    expect(levelClasses(r).map((c) => c.id)).toEqual(['levels']);
    const o = spectrumOption(ctx({}, r)) as { series: { id: string }[] };
    expect(o.series.map((s) => s.id)).toEqual(['bars-levels', 'cumulative', 'cut']);
  });

  it('draws the state, its K-term partial sum, the potential and one segment per weighted level', () => {
    const o = stateOption(ctx({ terms: 3, selected: 2 })) as { series: { id: string; data: unknown[]; markLine?: { data: unknown[] } }[] };
    const ids = o.series.map((s) => s.id);
    expect(ids).toEqual(['density', 're', 'partial', 'picked', 'potential', 'levels', 'mean']);
    // The level segments are a series of their own, with a legend entry that says what they are.
    const levels = o.series.find((s) => s.id === 'levels')! as unknown as { name: string; markLine: { data: unknown[] } };
    expect(levels.name).toContain('E_n');
    // Only level 1 lies inside the energy window (E_3 = 9 pi^2/2 = 44.4 is above <E> + 2 dE = 5 + 2 * 0.5 * sqrt(...)), one segment.
    expect(levels.markLine.data).toHaveLength(1);
    expect(levels.markLine.data.every(Array.isArray)).toBe(true);
    // The two walls are marked on the potential.
    expect(o.series.find((s) => s.id === 'potential')!.markLine!.data).toHaveLength(2);
  });
});

describe('the chart module', () => {
  it('holds no browser code, so a command-line renderer can import it', () => {
    const dir = 'client/webview/charts';
    for (const f of readdirSync(dir)) {
      const src = readFileSync(`${dir}/${f}`, 'utf8').replace(/\/\*[\s\S]*?\*\/|\/\/.*$/gm, '');
      // Browser names in code, not in the text of labels (the sweep view's 'design window').
      const code = src.replace(/'(?:[^'\\\n]|\\.)*'|`(?:[^`\\]|\\.)*`/g, "''");
      expect(code, f).not.toMatch(/\b(window|document|navigator|HTMLElement|requestAnimationFrame|getComputedStyle)\b/);
      for (const m of src.matchAll(/from '([^']+)'/g)) expect(m[1], `${f} imports ${m[1]}`).toMatch(/^\.\.?\//);
    }
  });

  it('labels the spectrum axes and the K mark, with the cumulative axis from 0 to 1', () => {
    const o = spectrumOption(ctx({ terms: 4, scale: 'linear' })) as { xAxis: { name: string; data: string[] }; yAxis: { name: string; min: number; max?: number }[]; series: { id: string; name: string; data: unknown[] }[] };
    expect(o.xAxis.name).toBe('n');
    expect(o.xAxis.data.slice(0, 3)).toEqual(['1', '2', '3']);
    expect(o.yAxis[0]!.name).toBe('|c_n|²');
    expect(o.yAxis[0]!.min).toBe(0);
    expect([o.yAxis[1]!.min, o.yAxis[1]!.max]).toEqual([0, 1]);
    const cut = o.series.find((s) => s.id === 'cut')!;
    expect(cut.name).toContain('K = 4');
    expect(cut.data).toEqual([
      ['4', 0],
      ['4', 1],
    ]);
  });

  it('draws the time view: |psi(x, t)|^2 over x above, the survival over the evolve times below', () => {
    const r = parabolaResult(12, { samples: true });
    const x = r.samples!.x as number[];
    const times = Array.from({ length: 21 }, (_, j) => j * 0.01);
    // Survival |sum_n w_n exp(-i E_n t)|^2 (derived in this comment from the expansion, hbar = 1).
    const survival = times.map((t) => {
      let re = 0;
      let im = 0;
      for (const l of r.levels) ((re += l.weight * Math.cos(l.energy * t)), (im -= l.weight * Math.sin(l.energy * t)));
      return re * re + im * im;
    });
    const density = times.map(() => (r.samples!.re as number[]).map((v) => v * v));
    r.evolution = { times, meanX: times.map(() => 0.5), meanP: times.map(() => 0), survival, revival: 4 / Math.PI, density };
    const o = timeOption(ctx({ timeIndex: 5 }, r)) as { xAxis: { name: string; min: number; max: number }[]; yAxis: { name: string; min: number; max: number }[]; series: { id: string; data: [number, number][] }[] };
    expect(o.series.map((s) => s.id)).toEqual(['density-t', 'survival', 'now', 'revival']);
    expect(o.series[0]!.data).toHaveLength(x.length);
    expect(o.series[1]!.data[0]![1]).toBeCloseTo(r.captured! ** 2, 12);
    expect([o.xAxis[0]!.min, o.xAxis[0]!.max]).toEqual([0, 1]);
    expect([o.xAxis[1]!.min, o.xAxis[1]!.max]).toEqual([0, 0.2]);
    expect(o.yAxis[1]!.name).toBe('survival');
    // 30 x^2 (1 - x)^2 peaks at 30/16 = 1.875 at x = 1/2: the axis ends at the next tick-friendly value.
    expect(o.yAxis[0]!.max).toBe(2);
  });
});

describe('facts read off the result', () => {
  it('takes the log scale for an algebraic tail or a long spectrum, linear otherwise', () => {
    const r = parabolaResult(12);
    // |c_n| ~ n^-3 for the parabola (Griffiths, from memory): an algebraic tail.
    expect(naturalScale({ ...r, decay: { exponent: 3, classification: 'algebraic', at: null } })).toBe('log');
    expect(naturalScale({ ...r, decay: { exponent: null, classification: 'smooth', at: null }, levelsFor999: 3 })).toBe('linear');
    expect(naturalScale({ ...r, decay: { exponent: null, classification: 'smooth', at: null }, levelsFor999: 40 })).toBe('log');
  });

  it('says whether a missing energy diverges or was not computed', () => {
    const r = parabolaResult(12);
    expect(missingEnergyText({ ...r, decay: { exponent: 1, classification: 'jump', at: 0.3 } }, 'mean')).toMatch(/^∞/);
    expect(missingEnergyText({ ...r, decay: { exponent: 2, classification: 'kink', at: 0.3 } }, 'spread')).toMatch(/^∞/);
    expect(missingEnergyText({ ...r, decay: { exponent: null, classification: 'smooth', at: null } }, 'mean')).toBe('n/a');
    expect(missingEnergyText({ ...r, levels: [] }, 'mean')).toMatch(/^n\/a/);
  });

  it('rounds phases and sums to what is resolved', () => {
    expect(phaseText(1, 0)).toBe('0');
    expect(phaseText(1, 1e-17)).toBe('0');
    expect(phaseText(-1, 0)).toBe('1 π');
    expect(phaseText(0, -1)).toBe('-0.5 π');
    expect(continuumText(1.1102230246251565e-16)).toBe('0 (below 1e-12)');
    expect(continuumText(0.1491540399898)).toBe('14.92%');
  });

  it('finds the fastest beat and how often evolve samples it', () => {
    const r = parabolaResult(12);
    // Level 1 alone holds 99.86 % of the parabola state (960/pi^6): no second level, no beat.
    expect(evolveSampling({ ...r, evolution: { times: [0, 0.1], meanX: [0, 0], meanP: [0, 0], survival: [1, 1], revival: null } })).toBeNull();
    // Weights 0.6 and 0.4 on levels 1 and 3: the beat E_3 - E_1 = 4 pi^2 has period 2 pi / (4 pi^2) = 1/(2 pi) (hbar = 1, derived here).
    r.levels = r.levels.map((l) => ({ ...l, weight: l.n === 1 ? 0.6 : l.n === 3 ? 0.4 : 0 }));
    r.captured = 1;
    const times = Array.from({ length: 11 }, (_, j) => j * 0.1);
    r.evolution = { times, meanX: times.map(() => 0.5), meanP: times.map(() => 0), survival: times.map(() => 1), revival: null };
    const s = evolveSampling(r)!;
    expect(s.period).toBeCloseTo(1 / (2 * Math.PI), 12);
    expect(s.perPeriod).toBeCloseTo(1 / (2 * Math.PI) / 0.1, 12);
    expect(s.stepsNeeded).toBe(Math.ceil(8 / (1 / (2 * Math.PI))));
    // With meV and ps, hbar = 0.6582119569 meV ps (CODATA 2018).
    expect(hbarInFileUnits({ length: 'nm', energy: 'meV', time: 'ps' })).toBeCloseTo(0.6582119569, 9);
  });

  it('shares the zero of the psi and energy axes with round ends, or not when one would be squashed', () => {
    const a = stateAxes([-0.3, 1.7], [-50, 400]);
    expect(a.shared).toBe(true);
    const zero = (r: { min: number; max: number }) => -r.min / (r.max - r.min);
    expect(zero(a.psi)).toBeCloseTo(zero(a.energy), 12);
    for (const r of [a.psi, a.energy]) {
      expect(r.min).toBeLessThanOrEqual(r === a.psi ? -0.3 : -50);
      expect(Math.abs(r.min / r.interval - Math.round(r.min / r.interval))).toBeLessThan(1e-9);
    }
    // A well whose levels all lie far below zero against a positive state: no shared zero.
    expect(stateAxes([0, 1], [-100, -80]).shared).toBe(false);
  });

  it('names the symmetry classes about the centre, in the file unit', () => {
    const r = parabolaResult(4);
    r.units = { length: 'nm', energy: 'meV', time: 'ps' };
    expect(levelClasses(r).map((c) => c.name)).toEqual(['symmetric about x = 0.5 nm', 'antisymmetric about x = 0.5 nm']);
  });
});
