/**
 * Sampled states (`state samples("PATH")`, analysis/samples.ts and samplesState.ts): samples of states
 * with closed-form coefficients written as CSV at several resolutions, expanded by the engine, and
 * compared with the closed forms; the resolution finding; the findings of bad tables.
 *
 * Closed forms (derived in this comment):
 * - Box (0, 1), level 1: psi = sqrt(2) sin(pi x), so c_1 = 1 and every other c_n = 0.
 * - Box (0, 1), the tent psi = sqrt(12) min(x, 1 - x) (norm: the integral of min(x, 1-x)^2 is 1/12):
 *   the integral of min(x, 1 - x) sin(n pi x) over (0, 1) is 2 sin(n pi / 2) / (n pi)^2, so
 *   c_n = sqrt(2) sqrt(12) 2 sin(n pi / 2) / (n pi)^2 = 4 sqrt(6) sin(n pi / 2) / (n pi)^2 (c_1^2 = 96/pi^4).
 * - Oscillator omega = m = hbar = 1: the ground state displaced by d, pi^(-1/4) exp(-(x - d)^2 / 2), is the
 *   coherent state of alpha = d / sqrt(2): c_n = exp(-alpha^2 / 2) alpha^n / sqrt(n!) (common practice).
 *
 * Rates the interpolant promises (physics/spline.ts): the not-a-knot cubic spline is O(h^4) for a smooth
 * state, so the coefficients of a smooth state converge at least as h^4 (on even grids the spline's
 * error has a vanishing local mean, so integrals of it often converge faster: the box level shows about
 * h^6 to h^7). A kink at a sample is reproduced only to O(h^2) near it (the spline is C2 and cannot
 * bend sharply), so the tent's coefficients converge as h^2: this is the documented limit of the choice.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import type { AnalysisResult } from '../../server/src/analysis/types';
import { messageProblems } from '../fuzz/harness';
import { numbersIn } from '../hardening/helpers';

function table(f: (x: number) => number, a: number, b: number, N: number, head = 'x, re'): string {
  const rows = ['# written by the test', head];
  for (let i = 0; i <= N; i++) {
    const x = a + ((b - a) * i) / N;
    rows.push(`${x}, ${f(x)}`);
  }
  return rows.join('\n') + '\n';
}

function run(system: string, data: string, extra = 'basis 12'): AnalysisResult {
  return analyse(`${system}\nstate samples("d.csv")\n${extra}\n`, { data: new Map([['d.csv', { text: data }]]) });
}

/** The largest error of c_n over the first ten levels. */
function maxError(r: AnalysisResult, exact: (n: number) => number): number {
  expect(r.levels.length).toBeGreaterThanOrEqual(10);
  let e = 0;
  for (const l of r.levels.slice(0, 10)) e = Math.max(e, Math.hypot(l.re! - exact(l.n), l.im!));
  return e;
}

/** Observed orders log2(e(h) / e(h/2)) along a sequence of halvings. */
function orders(errors: number[]): number[] {
  return errors.slice(1).map((e, k) => Math.log2(errors[k]! / e));
}

const box = 'system box(0, 1)';
const osc = 'system oscillator(omega = 1)';
const coherent = (n: number): number => {
  let c = Math.exp(-0.25);
  for (let k = 1; k <= n; k++) c *= Math.SQRT1_2 / Math.sqrt(k);
  return c;
};

describe('convergence to closed-form coefficients', () => {
  it('box level 1: at least h^4', () => {
    const errs = [16, 32, 64].map((N) => maxError(run(box, table((x) => Math.SQRT2 * Math.sin(Math.PI * x), 0, 1, N)), (n) => (n === 1 ? 1 : 0)));
    for (const p of orders(errs)) expect(p).toBeGreaterThan(3.8);
    expect(errs[2]).toBeLessThan(1e-9);
  });

  it('coherent state in the oscillator: h^4 (observed order 3.8 to 4.6)', () => {
    const errs = [64, 128, 256].map((N) => maxError(run(osc, table((x) => Math.PI ** -0.25 * Math.exp(-((x - 1) ** 2) / 2), -9, 11, N)), coherent));
    for (const p of orders(errs)) {
      expect(p).toBeGreaterThan(3.8);
      expect(p).toBeLessThan(4.6);
    }
  });

  it('the kinked tent: h^2 (observed order 1.9 to 2.2), with the weights adding up', () => {
    const tent = (n: number): number => (4 * Math.sqrt(6) * Math.sin((n * Math.PI) / 2)) / (n * n * Math.PI * Math.PI);
    const runs = [32, 64, 128].map((N) => run(box, table((x) => Math.sqrt(12) * Math.min(x, 1 - x), 0, 1, N)));
    const ps = orders(runs.map((r) => maxError(r, tent)));
    for (const p of ps) {
      expect(p).toBeGreaterThan(1.9);
      expect(p).toBeLessThan(2.2);
    }
    // The weights still add up to what was captured, and the norm is the tent's (1, to the spline's accuracy).
    const r = runs[2]!;
    expect(r.norm!).toBeCloseTo(1, 3);
    expect(r.levels.reduce((s, l) => s + l.weight, 0)).toBeCloseTo(r.captured!, 12);
  });

  it('a displaced, moving packet on 13106 samples: no jump at the knots, and the coherent-state energies', () => {
    // Displaced by d = 1 with wave number k = 2 in the oscillator of omega = 1: |alpha|^2 = (d^2 + k^2) / 2,
    // <H> = |alpha|^2 + 1/2 = 3 and Delta H = |alpha| = sqrt(2.5) (coherent states, common practice).
    const N = 13105;
    const rows = ['x re im'];
    for (let i = 0; i <= N; i++) {
      const x = -15 + (30 * i) / N;
      const g = Math.PI ** -0.25 * Math.exp(-((x - 1) ** 2) / 2);
      rows.push(`${x} ${g * Math.cos(2 * x)} ${g * Math.sin(2 * x)}`);
    }
    const r = run(osc, rows.join('\n'), 'basis 40');
    expect(r.diagnostics.filter((d) => d.severity !== 'info')).toEqual([]);
    expect(r.energy!.mean!).toBeCloseTo(3, 6);
    expect(r.energy!.spread!).toBeCloseTo(Math.sqrt(2.5), 6);
  });

  it('abs and phase columns give the same state as re and im (a moving packet, phase in degrees)', () => {
    const k = 2;
    const g = (x: number): number => Math.PI ** -0.25 * Math.exp(-(x * x) / 2);
    const rows = ['x, abs, phase [deg]'];
    const rows2 = ['x re im'];
    for (let i = 0; i <= 200; i++) {
      const x = -10 + (20 * i) / 200;
      rows.push(`${x}, ${g(x)}, ${((k * x * 180) / Math.PI) % 360}`);
      rows2.push(`${x} ${g(x) * Math.cos(k * x)} ${g(x) * Math.sin(k * x)}`);
    }
    const a = run(osc, rows.join('\n'));
    const b = run(osc, rows2.join('\n'));
    for (let n = 0; n < 10; n++) {
      expect(a.levels[n]!.re!).toBeCloseTo(b.levels[n]!.re!, 9);
      expect(a.levels[n]!.im!).toBeCloseTo(b.levels[n]!.im!, 9);
    }
    // A Gaussian pushed by momentum k: <H> = (k^2 + 1) / 2 for the oscillator's ground-state width (closed form, common practice).
    expect(a.energy!.mean!).toBeCloseTo((k * k + 1) / 2, 4);
  });
});

describe('what the samples resolve', () => {
  // Box of width 1 sampled at N equal intervals wall to wall: levels 1 .. N - 1 are resolved, level N
  // (wave number N pi, spacing 1/N: exactly pi / h) is the first that is not (samplesState.ts).
  const N = 10;
  const data = table((x) => Math.SQRT2 * Math.sin(Math.PI * x), 0, 1, N);
  it('no finding up to level N - 1', () => {
    const r = run(box, data, `basis ${N - 1}`);
    expect(r.diagnostics.filter((d) => d.code === 'basis')).toEqual([]);
    expect(r.levels).toHaveLength(N - 1);
  });
  it('from level N on: a basis finding on the path, and only N - 1 levels', () => {
    const text = `${box}\nstate samples("d.csv")\nbasis ${N}\n`;
    const r = analyse(text, { data: new Map([['d.csv', { text: data }]]) });
    const f = r.diagnostics.filter((d) => d.code === 'basis');
    expect(f).toHaveLength(1);
    expect(text.slice(f[0]!.start, f[0]!.end)).toBe('"d.csv"');
    // The first level the samples do not resolve.
    expect(numbersIn(f[0]!.message)).toContain(N);
    expect(r.levels).toHaveLength(N - 1);
  });
  it('oscillator: level n is resolved while sqrt(2 n + 1) < pi / h', () => {
    // h = 0.5: pi / h = 6.283, sqrt(2 n + 1) < 6.283 for n <= 19; level 20 is the first past it.
    const r = run(osc, table((x) => Math.PI ** -0.25 * Math.exp(-(x * x) / 2), -10, 10, 40), 'basis 30');
    expect(r.levels).toHaveLength(20);
    expect(numbersIn(r.diagnostics.find((d) => d.code === 'basis')?.message ?? '')).toContain(20);
  });
});

describe('the capture finding past the resolution', () => {
  it('offers no basis the samples cannot support', () => {
    // The tent at 16 intervals: levels 1 .. 15 are resolved; their capture falls short of 1 - 1e-6
    // (the tent's |c_n|^2 falls as n^-4), but a larger basis would only expand the spline.
    const r = run(box, table((x) => Math.sqrt(12) * Math.min(x, 1 - x), 0, 1, 16), 'basis 40');
    expect(r.levels).toHaveLength(15);
    const capture = r.diagnostics.filter((d) => d.code === 'basis' && d.message.includes('capture'));
    expect(capture).toHaveLength(1);
    expect(capture[0]!.fixes).toBeUndefined();
    expect(numbersIn(capture[0]!.message)).toContain(15);
  });
});

describe('the clause samples("PATH")', () => {
  const codeAt = (line: string): [string, string][] => {
    const text = `${box}\n${line}\n`;
    return analyse(text, { data: new Map() }).diagnostics.map((d) => [d.code, text.slice(d.start, d.end)]);
  };
  it('an empty path', () => expect(codeAt('state samples("")')).toEqual([['syntax', '""']]));
  it('a backslash', () => expect(codeAt('state samples("data\\p.csv")')).toEqual([['syntax', '"data\\p.csv"']]));
  it('an unclosed quote', () => expect(codeAt('state samples("data/p.csv)')).toEqual([['syntax', '"']]));
  it('no quotes', () => expect(codeAt('state samples(data)')).toEqual([['syntax', '(d']]));
  it('text after the call', () => expect(codeAt('state samples("p.csv") of box(0, 1)')).toEqual([['syntax', 'of box(0, 1)']]));
  it('a # in the path ends it at a comment', () => expect(codeAt('state samples("a#b.csv")')[0]![0]).toBe('syntax'));
  it('the untrusted pipeline reads nothing and finds nothing', () => {
    expect(analyse(`${box}\nstate samples("p.csv")\n`, { evaluate: false }).diagnostics).toEqual([]);
  });
});

describe('findings of a bad table, with the data file line', () => {
  const check = (data: string, line: number | null, code = 'data'): void => {
    const text = `${box}\nstate samples("d.csv")\n`;
    const r = analyse(text, { data: new Map([['d.csv', { text: data }]]) });
    const f = r.diagnostics.filter((d) => d.code === code);
    expect(f, JSON.stringify(r.diagnostics)).toHaveLength(1);
    expect(text.slice(f[0]!.start, f[0]!.end)).toBe('"d.csv"');
    if (line !== null) expect(f[0]!.message).toContain(`line ${line}`);
    // A sentence a user can act on, by the fuzzer's rule (test/fuzz/harness.ts).
    expect(messageProblems(f[0]!.message)).toEqual([]);
    expect(r.levels).toEqual([]);
  };
  const head = '# comment\nx, re, im\n0, 0, 0\n0.25, 0.7, 0\n0.5, 1, 0\n';
  it('unsorted x', () => check(head + '0.4, 0.9, 0\n1, 0, 0\n', 6));
  it('repeated x', () => check(head + '0.5, 1, 0\n1, 0, 0\n', 6));
  it('NaN cell', () => check(head + '0.75, NaN, 0\n1, 0, 0\n', 6));
  it('blank cell', () => check(head + '0.75, , 0\n1, 0, 0\n', 6));
  it('ragged row', () => check(head + '0.75, 0.7\n1, 0, 0\n', 6));
  it('not a number', () => check(head + '0.75, 0.7, zero\n1, 0, 0\n', 6));
  it('unknown column', () => check('x, re, imag\n0, 0, 0\n', 1));
  it('too few rows', () => check('x, re\n0, 0\n1, 0\n', null));
  it('binary', () => check('x, re\n\u0000\u0001\n', null));
  it('a byte order mark is not a bad header', () => {
    const r = run(box, '\ufeff' + table((x) => Math.SQRT2 * Math.sin(Math.PI * x), 0, 1, 32));
    expect(r.diagnostics.filter((d) => d.code === 'data')).toEqual([]);
    expect(r.levels[0]!.weight).toBeCloseTo(1, 8);
  });
  it('a path the front end did not read', () => {
    const r = analyse(`${box}\nstate samples("d.csv")\n`, { data: new Map() });
    expect(r.diagnostics.map((d) => d.code)).toEqual(['data']);
  });
  it('a refused path: one finding, on the path', () => {
    const text = `${box}\nstate samples("../d.csv")\n`;
    const r = analyse(text, { data: new Map([['../d.csv', { refused: 'a path out of the folder' }]]) });
    expect(r.diagnostics.map((d) => [d.code, text.slice(d.start, d.end)])).toEqual([['data', '"../d.csv"']]);
  });
  it('the quick stage says nothing about data files', async () => {
    const { analyseStatic } = await import('../../server/src/analysis/index');
    expect(analyseStatic(`${box}\nstate samples("d.csv")\n`).diagnostics).toEqual([]);
  });
});

describe('how the samples fit the system', () => {
  const sine = (x: number): number => Math.SQRT2 * Math.sin(Math.PI * x);
  it('samples short of a wall', () => {
    const r = run(box, table((x) => Math.sqrt(2 / 0.9) * Math.sin((Math.PI * x) / 0.9), 0, 0.9, 90));
    expect(r.diagnostics.some((d) => d.code === 'data' && d.severity === 'warning' && d.message.includes('0.9'))).toBe(true);
  });
  it('nonzero samples outside a wall', () => {
    const r = run(box, table((x) => (x < 1 ? sine(x) : 0.1), 0, 1.1, 110));
    expect(r.diagnostics.some((d) => d.code === 'data' && d.message.includes('outside the walls'))).toBe(true);
  });
  it('a state on the line cut off by the samples', () => {
    const r = run(osc, table((x) => Math.PI ** -0.25 * Math.exp(-(x * x) / 2), -1, 10, 110));
    expect(r.diagnostics.some((d) => d.code === 'data' && d.message.includes('cuts it off'))).toBe(true);
  });
  it('a unit on x: samples in angstrom for a file in nm give the same coefficients', () => {
    const nm = 'units nm, eV\nsystem box(0 nm, 1 nm)';
    const a = run(nm, table(sine, 0, 1, 64));
    const b = run(nm, table((x) => sine(x / 10) / Math.sqrt(10), 0, 10, 64, 'x [angstrom], re'));
    expect(a.levels[0]!.re).toBeCloseTo(1, 8);
    expect(b.levels[0]!.re!).toBeCloseTo(a.levels[0]!.re!, 10);
    expect(b.norm!).toBeCloseTo(a.norm!, 10);
  });
});
