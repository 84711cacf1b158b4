/**
 * Design sweeps (analysis/sweep/): the points against closed forms, the refinement against the
 * published positions of bound-level appearances and population crossings, the design window, the
 * sweep line's findings and the budget.
 */
import { describe, expect, it } from 'vitest';
import { analyseWithSweep, prepareSweep, runPoints, runSweep, type SweepResult } from '../../server/src/analysis/sweep/index';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';
import { clearBasisMemo } from '../../server/src/analysis/systems';
import { createBudget, manualClock } from '../../server/src/physics/budget';

function sweep(text: string): { result: SweepResult; diagnostics: { code: string; severity: string; start: number; end: number; message: string; fixes?: { text: string }[] }[] } {
  const r = runSweep(text);
  if (!r) throw new Error('no sweep');
  return r;
}

describe('finite well: bound levels appear at z0 = k pi / 2', () => {
  // The standard square-well result (any quantum mechanics text, e.g. Griffiths, finite square well):
  // with z0 = a sqrt(2 m V0) / hbar (a the half width) the count is ceil(2 z0 / pi), so level k + 1
  // appears at z0 = k pi / 2, that is V0 = (k pi / 2)^2 hbar^2 / (2 m a^2).
  it('locates each step in natural units to 1e-8 relative', () => {
    const { result } = sweep('let D = 5\nsystem well(depth = D, width = 2)\nstate gaussian(center = 0, width = 0.5)\nsweep D from 0.5 to 40 steps 12\n');
    const steps = result.located.filter((l) => l.kind === 'bound');
    // a = 1, m = hbar = 1: V0_k = k^2 pi^2 / 8 (derived in the comment above); 40 holds k = 1..5.
    expect(steps.map((s) => [s.before, s.after])).toEqual([[1, 2], [2, 3], [3, 4], [4, 5], [5, 6]]);
    steps.forEach((s, i) => {
      const want = ((i + 1) ** 2 * Math.PI ** 2) / 8;
      expect(Math.abs(s.at - want) / want).toBeLessThan(1e-8);
      expect(s.bracket[0]).toBeLessThanOrEqual(want * (1 + 1e-12));
      expect(s.bracket[1]).toBeGreaterThanOrEqual(want * (1 - 1e-12));
    });
    // Every point's count is ceil(2 z0 / pi) with z0 = sqrt(2 D) (the same closed form).
    for (const p of result.points) expect(p!.bound).toBe(Math.max(1, Math.ceil((2 * Math.sqrt(2 * p!.at[0]!)) / Math.PI)));
  });

  it('locates the steps of a width sweep in physical units (CODATA 2018)', () => {
    const text = 'units nm, meV\nmass 0.067 m_e\nlet w = 5 nm\nsystem well(depth = 150 meV, width = w)\nstate gaussian(center = 0, width = 1 nm)\nsweep w from 1 nm to 30 nm steps 20\n';
    const { result } = sweep(text);
    expect(result.axes[0]!.unit).toBe('nm');
    // hbar^2/(2 m_e) = 0.0380998211615486 eV nm^2 (CHECKS.md, CODATA 2018): level k + 1 appears at
    // a = (k pi / 2) sqrt(hbar^2/(2 m) / V0), w = 2 a.
    const c = 38.0998211615486 / 0.067; // meV nm^2
    const steps = result.located.filter((l) => l.kind === 'bound');
    expect(steps.length).toBeGreaterThan(3);
    steps.forEach((s) => {
      const k = s.before;
      const want = 2 * ((k * Math.PI) / 2) * Math.sqrt(c / 150);
      expect(Math.abs(s.at - want) / want).toBeLessThan(1e-8);
    });
  });
});

describe('displaced oscillator: ground population e^{-L}', () => {
  // Glauber 1963: a displaced ground state is a coherent state with Poisson populations
  // P_n = e^{-L} L^n / n!, L = m omega d^2 / (2 hbar). With m = omega = hbar = 1 the ground state's
  // position spread is 1/sqrt(2), and P_0 = 1/2 at d = sqrt(2 ln 2).
  const text = [
    'let d = 1',
    'system oscillator(omega = 1)',
    'state gaussian(center = d, width = 1 / sqrt(2))',
    'basis 60',
    'expect weight 0 >= 0.5',
    'sweep d from 0 to 3 steps 30',
    'expect window covers 0.2..1.1',
  ].join('\n');

  it('matches the Poisson populations at every point and reuses the basis', () => {
    const { result } = sweep(text);
    expect(result.finished).toBe(31);
    expect(result.systemFixed).toBe(true);
    for (const p of result.points) {
      const d = p!.at[0]!;
      const L = (d * d) / 2;
      for (let n = 0; n < 3; n++) {
        const want = (Math.exp(-L) * L ** n) / [1, 1, 2][n]!;
        expect(Math.abs(p!.levels[n]!.weight - want)).toBeLessThan(1e-11);
      }
      // The energy mean of a coherent state is hbar omega (L + 1/2) (Glauber 1963).
      expect(Math.abs(p!.mean! - (L + 0.5))).toBeLessThan(1e-9);
    }
  });

  it('locates the 1/2 crossing to 1e-9 and ends the design window there', () => {
    const { result, diagnostics } = sweep(text);
    const want = Math.sqrt(2 * Math.LN2);
    const flips = result.located.filter((l) => l.kind === 'expect');
    expect(flips).toHaveLength(1);
    expect(flips[0]!.before).toBe(1);
    expect(flips[0]!.after).toBe(0);
    expect(Math.abs(flips[0]!.at - want) / want).toBeLessThan(1e-9);
    expect(result.windows).toHaveLength(1);
    const w = result.windows[0]!;
    expect(w.from).toBe(0);
    expect(w.fromEdge).toBe(true);
    expect(w.toEdge).toBe(false);
    expect(Math.abs(w.to - want) / want).toBeLessThan(1e-9);
    // 0.2..1.1 lies inside [0, 1.1774]: the window expectation holds.
    expect(diagnostics.filter((d) => d.code === 'expect')).toEqual([]);
  });

  it('fails the window expectation when the range reaches past the crossing', () => {
    const wider = text.replace('covers 0.2..1.1', 'covers 0.2..1.5');
    const r = analyseWithSweep(wider);
    const line = wider.indexOf('expect window');
    const f = r.diagnostics.filter((d) => d.code === 'expect');
    expect(f).toHaveLength(1);
    expect(f[0]!.start).toBe(line);
    expect(f[0]!.severity).toBe('error');
    // The documented fields keep the let's own value d = 1: P_0 = e^{-1/2} (Glauber 1963).
    expect(Math.abs(r.levels[0]!.weight - Math.exp(-0.5))).toBeLessThan(1e-11);
    expect(r.sweep!.points).toHaveLength(31);
  });
});

describe('box doubling', () => {
  it('passes through 32/(9 pi^2) at twice the width', () => {
    // CHECKS.md: the ground state of [0, L] released into [0, 2L] keeps 32/(9 pi^2) in the ground level
    // (Griffiths, the suddenly widened well, from memory); for a box [0, b] the overlap is
    // c_1 = (2 / sqrt b) * integral_0^1 sin(pi x) sin(pi x / b) dx (derived here, b > 1).
    const { result } = sweep('let b = 2\nsystem box(0, b)\nstate eigen(1) of box(0, 1)\nsweep b from 1.5 to 3 steps 6\n');
    const at2 = result.points.find((p) => Math.abs(p!.at[0]! - 2) < 1e-12)!;
    expect(Math.abs(at2.levels[0]!.weight - 32 / (9 * Math.PI ** 2))).toBeLessThan(1e-12);
    expect(Math.abs(at2.levels[1]!.weight - 0.5)).toBeLessThan(1e-12);
    for (const p of result.points) {
      const b = p!.at[0]!;
      // With q = 1/b, integral_0^1 sin(pi x) sin(q pi x) dx = sin(q pi) / (pi (1 - q^2)) (derived here by
      // the product-to-sum rule), so c_1 = (2 / sqrt b) sin(q pi) / (pi (1 - q^2)).
      const q = 1 / b;
      const c1 = ((2 / Math.sqrt(b)) * Math.sin(q * Math.PI)) / (Math.PI * (1 - q * q));
      expect(Math.abs(p!.levels[0]!.weight - c1 * c1)).toBeLessThan(1e-10);
    }
    expect(result.systemFixed).toBe(false);
  });
});

describe('the sweep line', () => {
  const codes = (text: string) => analyse(text).diagnostics.filter((d) => d.severity === 'error').map((d) => [d.code, text.slice(d.start, d.end)]);

  it('checks names, dimensions and steps on the exact text', () => {
    const well = 'units nm, meV\nlet w = 4 nm\nsystem well(depth = 100 meV, width = w)\nstate gaussian(center = 0, width = 1 nm)\n';
    expect(codes(well + 'sweep w from 1 meV to 3 nm steps 5\n')).toEqual([['units', '1 meV']]);
    expect(codes(well + 'sweep q from 1 nm to 3 nm steps 5\n')).toEqual([['name', 'q']]);
    expect(codes(well + 'sweep w from 1 nm to 3 nm steps 2.5\n')).toEqual([['evaluation', '2.5']]);
    expect(codes(well + 'sweep w from 1 nm to 2 w steps 3\n')).toEqual([['name', 'w']]);
    expect(codes(well + 'sweep w from -1 nm to 3 nm steps 2 log\n')).toEqual([['evaluation', 'log']]);
    expect(codes(well + 'sweep w from 1 nm to 3 nm\n')).toEqual([['syntax', 'to']]);
    expect(codes(well + 'sweep w from 1 nm to 3 nm steps 3\nsweep w from 1 nm to 2 nm steps 3\n')).toEqual([['name', 'w']]);
    expect(codes(well + 'expect window covers 1 nm..2 nm\n')).toEqual([['name', 'expect']]);
    expect(codes(well + 'sweep w from 1 nm to 3 nm steps 3\nexpect window covers 0.5 nm..2 nm\n')).toEqual([['evaluation', '0.5 nm..2 nm']]);
    // A valid sweep adds nothing to the quick stage.
    expect(codes(well + 'sweep w from 1 nm to 3 nm steps 3 log\n')).toEqual([]);
  });

  it('checks names and dimensions in an untrusted workspace, evaluating nothing', () => {
    const well = 'units nm, meV\nlet w = 4 nm\nsystem well(depth = 100 meV, width = w)\nstate gaussian(center = 0, width = 1 nm)\n';
    const untrusted = (text: string) => analyseUntrusted(text).diagnostics.filter((d) => d.severity === 'error').map((d) => [d.code, text.slice(d.start, d.end)]);
    expect(untrusted(well + 'sweep w from 1 meV to 3 nm steps 5\n')).toEqual([['units', '1 meV']]);
    expect(untrusted(well + 'sweep q from 1 nm to 3 nm steps 5\n')).toEqual([['name', 'q']]);
    expect(untrusted(well + 'sweep w from 1 nm to 3 nm steps 5 nm\nexpect window covers 1 meV..2 nm\n')).toEqual([['units', '5 nm'], ['units', '1 meV']]);
    expect(untrusted(well + 'sweep w from 1 nm to 3 nm steps 5\nexpect window covers 1 nm..2 nm\n')).toEqual([]);
  });

  it('names the values where the setup is invalid', () => {
    const text = 'let a = 1\nsystem box(0, a)\nstate psi(x) = x * (1 - x)\nsweep a from -0.5 to 2 steps 5\n';
    const { result, diagnostics } = sweep(text);
    expect(result.points.map((p) => p!.valid)).toEqual([false, false, true, true, true, true]);
    const bad = diagnostics.filter((d) => d.code === 'evaluation');
    expect(bad).toHaveLength(1);
    expect(bad[0]!.start).toBe(text.indexOf('sweep'));
    expect(bad[0]!.severity).toBe('warning');
    expect(bad[0]!.message).toContain('a = -0.5 to 0');
    // Where the box is narrower than the state (a < 1) the state is cut by the wall: a warning with its values.
    const walls = diagnostics.filter((d) => d.code === 'boundary');
    expect(walls.length).toBe(1);
    expect(walls[0]!.message).toContain('a = 0.5');
  });

  it('stops at its own time limit with a coarser step offered', () => {
    const text = 'let c = 0\nsystem box(0, 1)\nstate gaussian(center = 0.5 + c, width = 0.05)\nsweep c from -0.1 to 0.1 steps 40\n';
    // Each point reads the manual clock a known number of times; 1 ms a reading runs out part way.
    const r = runSweep(text, {}, { maxMillis: 100, clock: manualClock(1) })!;
    expect(r.result.finished).toBeGreaterThan(0);
    expect(r.result.finished).toBeLessThan(41);
    expect(r.result.stopped).toBe('time');
    const lim = r.diagnostics.filter((d) => d.code === 'limits');
    expect(lim).toHaveLength(1);
    expect(lim[0]!.message).toContain(`${r.result.finished} of 41 points`);
    const steps = Number(lim[0]!.fixes![0]!.text);
    expect(steps).toBeGreaterThanOrEqual(1);
    expect(steps + 1).toBeLessThanOrEqual(r.result.finished);
  });

  it('makes a map from two sweeps', () => {
    const text = 'let c = 0.5\nlet s = 0.05\nsystem box(0, 1)\nstate gaussian(center = c, width = s)\nexpect weight 1..3 >= 0.9\nsweep c from 0.3 to 0.7 steps 4\nsweep s from 0.05 to 0.2 steps 3 log\n';
    const { result } = sweep(text);
    expect(result.axes.map((a) => a.values.length)).toEqual([5, 4]);
    expect(result.points).toHaveLength(20);
    // The second axis is logarithmic: 0.05, 0.05 * 4^(1/3), ... (a geometric sequence).
    const v = result.axes[1]!.values;
    expect(Math.abs(v[1]! / v[0]! - Math.cbrt(4))).toBeLessThan(1e-12);
    expect(result.points[7]!.index).toEqual([2, 1]);
    expect(Math.abs(result.points[7]!.at[1]! - v[1]!)).toBeLessThan(1e-15);
    // Windows and located flips are given per row of the second axis.
    for (const w of result.windows) expect(v).toContain(w.row);
  });
});

describe('reuse of the eigenbasis', () => {
  const potential = (swept: string) => `let c = 0\nlet k = 1\nsystem V(x) = k x^4 over [-4, 4]\nstate gaussian(center = c, width = 0.5)\nbasis 30\nsweep ${swept}\n`;

  it('reads from the model which lets the system depends on', () => {
    expect(prepareSweep(potential('c from -0.5 to 0.5 steps 4'))!.systemFixed).toBe(true);
    expect(prepareSweep(potential('k from 1 to 2 steps 4'))!.systemFixed).toBe(false);
    // Through another let: the wall a depends on w.
    expect(prepareSweep('let w = 1\nlet a = w / 2\nsystem box(0, a)\nstate psi(x) = x * (a - x)\nsweep w from 1 to 2 steps 2\n')!.systemFixed).toBe(false);
  });

  it('solves the numerical system once when only the state changes', () => {
    // Work counted by the budget (operations of the solve and the projections), not time.
    const work = (swept: string, points: number): number => {
      clearBasisMemo();
      const job = prepareSweep(potential(swept))!;
      const b = createBudget();
      runPoints(job, [...Array(points).keys()], b);
      return b.work.ops;
    };
    const one = work('c from -0.5 to 0.5 steps 10', 1);
    const eleven = work('c from -0.5 to 0.5 steps 10', 11);
    const changing = work('k from 1 to 2 steps 10', 11);
    // Ten more points cost less than half of what ten more solves do: each point projects the state
    // (on the solver's last two grids, for the coefficients' uncertainty) but solves nothing.
    expect(eleven - one).toBeLessThan((changing - one) / 2);
  });
});
