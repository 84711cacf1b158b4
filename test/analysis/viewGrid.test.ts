/**
 * The panel's plot grid (analysis/viewGrid.ts): dense where the state lives, spanning the whole extent,
 * with exact points at the potential's jumps and the mass's interfaces, and evenly spaced when a number
 * of points is asked for (the command line's export, docs/format.md "Exporting samples").
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';

// A 9 nm well of depth 230 meV, 0.067 m_e inside and 0.088 m_e outside, holding the ground level of a
// 6 nm well of the same kind (a sudden widening; a scenario of our own). The well's edges are at +-4.5 nm.
const WIDENED = 'units nm, meV, ps\nmass 0.067 m_e\nsystem well(depth = 230 meV, width = 9 nm, barrier_mass = 0.088 m_e)\nstate eigen(1) of well(depth = 230 meV, width = 6 nm, barrier_mass = 0.088 m_e)\n';

function samplesOf(text: string, plot?: { points: number }) {
  const r = analyse(text, { samples: true, limits: { maxMillis: 60_000 }, ...(plot ? { plot } : {}) });
  expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
  return r.samples!;
}

/** The first and last x where |psi|^2 reaches 1e-3 of its peak: the range the state view shows (client/webview/charts/xrange.ts). */
function mainRange(s: { x: number[]; re: number[]; im: number[] }): [number, number] {
  const d = s.re.map((r, j) => r * r + s.im[j]! ** 2);
  const peak = Math.max(...d);
  const inside = s.x.filter((_, j) => d[j]! >= 1e-3 * peak);
  return [inside[0]!, inside[inside.length - 1]!];
}

describe('the panel grid of a pure state', () => {
  it('puts most points where the state lives and still spans the whole support', () => {
    const s = samplesOf(WIDENED);
    for (let j = 1; j < s.x.length; j++) expect(s.x[j]!).toBeGreaterThan(s.x[j - 1]!);
    // The support holds the levels' weight to 1e-16, far wider than the state (about +-89 nm, measured): the samples keep spanning it.
    expect(s.x[0]!).toBeLessThan(-50);
    expect(s.x[s.x.length - 1]!).toBeGreaterThan(50);
    const [lo, hi] = mainRange(s);
    const inside = s.x.filter((x) => x >= lo && x <= hi).length;
    // Evenly spaced over the support, 400 points put about 45 here (seen); the panel grid puts more than 150.
    expect(inside).toBeGreaterThan(150);
    let gap = 0;
    for (let j = 1; j < s.x.length; j++) if (s.x[j - 1]! >= lo && s.x[j]! <= hi) gap = Math.max(gap, s.x[j]! - s.x[j - 1]!);
    expect(gap).toBeLessThan((hi - lo) / 150);
    // The samples are normalised (SampleResult): the trapezoid rule on the uneven grid gives 1 (an invariant).
    let norm = 0;
    for (let j = 1; j < s.x.length; j++) norm += ((s.x[j]! - s.x[j - 1]!) * (s.re[j - 1]! ** 2 + s.re[j]! ** 2)) / 2;
    expect(Math.abs(norm - 1)).toBeLessThan(1e-3);
  });

  it('has a point at each edge of the well and one on each side, so the wall of V is vertical there', () => {
    const s = samplesOf(WIDENED);
    for (const edge of [-4.5, 4.5]) {
      const j = s.x.findIndex((x) => Math.abs(x - edge) < 1e-12);
      expect(j, `a sample at ${edge} nm`).toBeGreaterThan(0);
      const [inner, outer] = edge < 0 ? [j + 1, j - 1] : [j - 1, j + 1];
      expect(Math.abs(s.x[inner]! - edge)).toBeLessThan(1e-6);
      expect(Math.abs(s.x[outer]! - edge)).toBeLessThan(1e-6);
      // The depth of the well, 230 meV, from the file: V is 0 inside and 230 meV outside.
      expect(s.potential[inner]).toBeCloseTo(0, 9);
      expect(s.potential[outer]).toBeCloseTo(230, 9);
      // The mass on each side, from the file: 0.067 m_e inside, 0.088 m_e outside.
      expect(s.mass![inner]).toBeCloseTo(0.067, 12);
      expect(s.mass![outer]).toBeCloseTo(0.088, 12);
    }
    expect(s.interfaces).toEqual([-4.5, 4.5]);
  });

  it('has a point at each jump of a numerical potential', () => {
    // A step of 50 meV at x = 1 nm in a 10 nm box with a packet on the left (a scenario of our own).
    const s = samplesOf('units nm, meV\nmass 0.067 m_e\nsystem V(x) = x < 1 nm ? 0 meV : 50 meV over [-5 nm, 5 nm]\nstate gaussian(center = -2 nm, width = 0.6 nm)\n');
    const j = s.x.findIndex((x) => Math.abs(x - 1) < 1e-12);
    expect(j).toBeGreaterThan(0);
    expect(s.potential[j - 1]).toBeCloseTo(0, 9);
    expect(s.potential[j + 1]).toBeCloseTo(50, 9);
    expect(s.x[j + 1]! - s.x[j - 1]!).toBeLessThan(1e-6);
  });

  it('gives a mixture the same grid: dense where it lives, a point at each edge of the well', () => {
    // A thermal mixture of the 9 nm well's own levels at 300 K (a scenario of our own): k_B T = 25.85 meV
    // (CODATA k_B), so the ground level holds nearly all of it and the grid is dense over the well.
    const s = samplesOf('units nm, meV\nmass 0.067 m_e\nsystem well(depth = 230 meV, width = 9 nm, barrier_mass = 0.088 m_e)\nstate thermal(temperature = 300 K) of well(depth = 230 meV, width = 9 nm, barrier_mass = 0.088 m_e)\n');
    for (const edge of [-4.5, 4.5]) expect(s.x.some((x) => Math.abs(x - edge) < 1e-12), `a sample at ${edge} nm`).toBe(true);
    expect(s.x.filter((x) => Math.abs(x) <= 4.5).length).toBeGreaterThan(100);
  });

  it('keeps an even grid over a box the state fills', () => {
    // A box's ground level fills the box: the whole extent is dense, 400 evenly spaced points (the panel's default).
    const s = samplesOf('system box(0, 1)\nstate eigen(1) of box(0, 1)\n');
    expect(s.x).toHaveLength(400);
    for (let j = 1; j < 400; j++) expect(s.x[j]! - s.x[j - 1]!).toBeCloseTo(1 / 399, 12);
  });

  it('is evenly spaced when a number of points is asked for (the export)', () => {
    const s = samplesOf(WIDENED, { points: 1000 });
    expect(s.x).toHaveLength(1000);
    const h = s.x[1]! - s.x[0]!;
    for (let j = 1; j < 1000; j++) expect(Math.abs(s.x[j]! - s.x[j - 1]! - h)).toBeLessThan(1e-9 * h * 1000);
  });
});
