/**
 * States that are infinite at a point: poles and power-law spikes inside a system or at a wall.
 * Whether |psi|^2 ~ |x - x0|^-2p can be integrated follows from the elementary integral of |s|^-q near
 * 0, finite exactly when q < 1 (common practice); the norms below are those elementary integrals, and
 * coefficients are checked against a quadrature after the substitution x = u^5, which makes the
 * integrand smooth (common practice).
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { growthAt } from '../../server/src/analysis/singular';
import type { StateFunction } from '../../server/src/analysis/systems';

function run(system: string, state: string, basis = 20) {
  return analyse(`system ${system}\nstate psi(x) = ${state}\nbasis ${basis}\n`);
}

/** The ranges of a result's findings of one code. */
function ranges(r: ReturnType<typeof analyse>, code: string, severity?: string): [number, number][] {
  return r.diagnostics.filter((d) => d.code === code && (severity === undefined || d.severity === severity)).map((d) => [d.start, d.end]);
}

/** The range of the state's formula in the file `run` writes. */
function formula(system: string, state: string): [number, number] {
  const start = `system ${system}\nstate psi(x) = `.length;
  return [start, start + state.length];
}

describe('poles whose |psi|^2 cannot be integrated', () => {
  it.each([
    ['box(0, 1)', '1/(x - 0.123456)', 0.123456, 1],
    ['box(0, 1)', '1/(x - 0.5)', 0.5, 1],
    ['box(0, 1)', '1/sqrt(abs(x - 0.3))', 0.3, 0.5],
    ['box(0, 1)', '1/x', 0, 1],
    ['box(0, 1)', 'x^-0.6', 0, 0.6],
    ['oscillator(omega = 1)', 'exp(-x^2)/(x - 0.25)', 0.25, 1],
    // x = 0 is a point of the window scan: found by the exact hit, not by the refinement.
    ['oscillator(omega = 1)', 'exp(-x^2)/x', 0, 1],
    ['well(depth = 20, width = 2)', 'exp(-x^2)/sqrt(abs(x + 0.2))', -0.2, 0.5],
  ])('%s, psi = %s: one norm error on the formula, the growth |x - %s|^-%s measured, and no coefficients', (system, state, x0, p) => {
    const r = run(system, state);
    expect(ranges(r, 'norm')).toEqual([formula(system, state)]);
    expect(r.diagnostics.find((d) => d.code === 'norm')!.severity).toBe('error');
    expect(r.singularity).toMatchObject({ integrable: false, logarithmic: false });
    expect(Math.abs(r.singularity!.x - x0)).toBeLessThan(1e-6);
    expect(Math.abs(r.singularity!.power - p)).toBeLessThan(0.01);
    expect(r.levels).toEqual([]);
    // Nothing else pretends to have measured the state (the well's own level count, an info, is a fact of the system).
    expect(ranges(r, 'basis', 'warning')).toEqual([]);
    expect(ranges(r, 'convergence')).toEqual([]);
  });
});

describe('integrable spikes', () => {
  it('|x - 0.3|^-1/4 in a box: norm (0.3^(1/2) + 0.7^(1/2)) / (1/2), an infinite energy, the spike measured', () => {
    const r = run('box(0, 1)', 'abs(x - 0.3)^(-0.25)');
    const exact = (Math.sqrt(0.3) + Math.sqrt(0.7)) / 0.5;
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(1e-5);
    expect(r.energy?.mean ?? null).toBeNull();
    expect(ranges(r, 'convergence')).toContainEqual(formula('box(0, 1)', 'abs(x - 0.3)^(-0.25)'));
    expect(r.singularity).toMatchObject({ integrable: true, logarithmic: false });
    expect(Math.abs(r.singularity!.x - 0.3)).toBeLessThan(1e-9);
    expect(Math.abs(r.singularity!.power - 0.25)).toBeLessThan(1e-3);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    // The walls are still checked against the state's size, not against the spike's height.
    expect(ranges(r, 'boundary')).toHaveLength(1);
  });

  it('x^-0.4 at the left wall: norm 5 and coefficients as after the substitution x = u^5', () => {
    const r = run('box(0, 1)', 'x^-0.4', 8);
    expect(Math.abs(r.norm! - 5)).toBeLessThan(1e-8);
    // c_n = sqrt(2/5) integral_0^1 x^-0.4 sin(n pi x) dx = sqrt(2/5) integral_0^1 5 u^2 sin(n pi u^5) du (normalised).
    const coefficient = (n: number): number => {
      const N = 200000;
      let s = 0;
      for (let j = 0; j <= N; j++) {
        const u = j / N;
        const f = 5 * u * u * Math.sin(n * Math.PI * u ** 5);
        s += (j === 0 || j === N ? 1 : j % 2 === 1 ? 4 : 2) * f;
      }
      return (Math.sqrt(2 / 5) * s) / (3 * N);
    };
    for (const n of [1, 2, 3, 5, 8]) {
      const l = r.levels.find((v) => v.n === n)!;
      expect(Math.abs(l.re! - coefficient(n))).toBeLessThan(1e-7);
    }
    expect(ranges(r, 'convergence')).toContainEqual(formula('box(0, 1)', 'x^-0.4'));
    expect(r.singularity).toMatchObject({ x: 0, integrable: true });
    expect(Math.abs(r.singularity!.power - 0.4)).toBeLessThan(1e-3);
  });

  it('exp(-x^2) |x|^-1/4 on the line, spike on a scan point: norm 2^(-1/4) Gamma(1/4)', () => {
    // The integral 2 int_0^inf e^{-2x^2} x^{-1/2} dx = 2^{-1/4} Gamma(1/4) by u = 2 x^2; Gamma(1/4) =
    // 3.625609908221908 (Abramowitz & Stegun, table 6.1 and 6.1.10 (from memory)).
    const r = run('oscillator(omega = 1)', 'exp(-x^2) * abs(x)^(-0.25)');
    const exact = Math.pow(2, -0.25) * 3.625609908221908;
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(1e-6);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(ranges(r, 'convergence')).toContainEqual(formula('oscillator(omega = 1)', 'exp(-x^2) * abs(x)^(-0.25)'));
    expect(r.singularity).toMatchObject({ x: 0, integrable: true });
    expect(Math.abs(r.singularity!.power - 0.25)).toBeLessThan(1e-3);
    expect(r.energy?.mean ?? null).toBeNull();
  });

  it.each([
    // int_0^a log^2 s ds = a (log^2 a - 2 log a + 2) (elementary; common practice).
    ['log(abs(x - 0.3))', 0.3, [0.3, 0.7]],
    ['log(x)', 0, [1]],
  ])('psi = %s grows like log(1/|x - %s|): measured as logarithmic, its norm the elementary integral of log^2', (state, x0, pieces) => {
    const r = run('box(0, 1)', state as string);
    const exact = (pieces as number[]).reduce((t, a) => t + a * (Math.log(a) ** 2 - 2 * Math.log(a) + 2), 0);
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(1e-6);
    expect(ranges(r, 'convergence')).toContainEqual(formula('box(0, 1)', state as string));
    expect(r.singularity).toMatchObject({ logarithmic: true, integrable: true });
    expect(Math.abs(r.singularity!.x - (x0 as number))).toBeLessThan(1e-9);
    expect(r.energy?.mean ?? null).toBeNull();
  });

  it('a spike close to |x - x0|^-1/2 says how much of |psi|^2 double precision cannot reach', () => {
    const r = run('box(0, 1)', 'abs(x - 0.3)^(-0.45)');
    const exact = (0.3 ** 0.1 + 0.7 ** 0.1) / 0.1;
    const d = r.diagnostics.find((x) => x.code === 'limits' && x.severity === 'warning');
    expect(d && [d.start, d.end]).toEqual(formula('box(0, 1)', 'abs(x - 0.3)^(-0.45)'));
    // The stated share is an honest bound on the norm's error.
    const share = r.singularity!.unresolvedWeight;
    expect(share).toBeGreaterThan(1e-9);
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(share);
  });
});

describe('no spike where there is none', () => {
  it.each([
    ['a narrow smooth peak', 'exp(-(x - 0.5)^2 / 1e-8)'],
    ['a kink', 'abs(x - 0.3) * x * (1 - x)'],
  ])('%s is not reported as infinite', (_what, state) => {
    const r = run('box(0, 1)', state);
    expect(r.singularity ?? null).toBeNull();
    expect(ranges(r, 'norm', 'error')).toEqual([]);
  });
});

describe('growthAt', () => {
  const power = (p: number, x0: number): StateFunction => ({
    evaluate(xs) {
      const re = xs.map((x) => Math.abs(x - x0) ** -p);
      return { re, im: new Float64Array(xs.length) };
    },
    breakpoints: () => [],
    support: null,
    window: null,
    walls: null,
  });

  it('reads the exponent of |x - x0|^-p on either side, and the integrability', () => {
    for (const p of [0.1, 0.3, 0.45, 0.5, 1, 2.5]) {
      const g = growthAt(power(p, 0.37), 0.37, [0, 1])!;
      expect(g).not.toBeNull();
      expect(Math.abs(g.power - p)).toBeLessThan(1e-6);
      expect(g.integrable).toBe(p < 0.5);
    }
    // Only one side inside: a wall.
    expect(growthAt(power(0.7, 0), 0, [0, 1])!.power).toBeCloseTo(0.7, 6);
    // log(1/|x - x0|): slower than any power, recognised as logarithmic.
    const log: StateFunction = { ...power(0, 0), evaluate: (xs) => ({ re: xs.map((x) => -Math.log(Math.abs(x - 0.37))), im: new Float64Array(xs.length) }) };
    expect(growthAt(log, 0.37, [0, 1])).toMatchObject({ power: 0, integrable: true, logarithmic: true });
    // A bounded function has no growth.
    expect(growthAt({ ...power(0, 0), evaluate: (xs) => ({ re: xs.map((x) => Math.cos(x)), im: new Float64Array(xs.length) }) }, 0.2, [0, 1])).toBeNull();
  });
});
