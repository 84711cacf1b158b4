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

function messages(r: ReturnType<typeof analyse>, code: string): string[] {
  return r.diagnostics.filter((d) => d.code === code).map((d) => d.message);
}

describe('poles whose |psi|^2 cannot be integrated', () => {
  it.each([
    ['box(0, 1)', '1/(x - 0.123456)', '|x - 0.123456|^-1'],
    ['box(0, 1)', '1/(x - 0.5)', '|x - 0.5|^-1'],
    ['box(0, 1)', '1/sqrt(abs(x - 0.3))', '|x - 0.3|^-0.5'],
    ['box(0, 1)', '1/x', '|x|^-1'],
    ['box(0, 1)', 'x^-0.6', '|x|^-0.6'],
    ['oscillator(omega = 1)', 'exp(-x^2)/(x - 0.25)', '|x - 0.25|^-1'],
    // x = 0 is a point of the window scan: found by the exact hit, not by the refinement.
    ['oscillator(omega = 1)', 'exp(-x^2)/x', '|x|^-1'],
    ['well(depth = 20, width = 2)', 'exp(-x^2)/sqrt(abs(x + 0.2))', '|x + 0.2|^-0.5'],
  ])('%s, psi = %s: a norm error naming the growth %s, and no coefficients', (system, state, growth) => {
    const r = run(system, state);
    const norm = r.diagnostics.filter((d) => d.code === 'norm');
    expect(norm).toHaveLength(1);
    expect(norm[0]!.severity).toBe('error');
    expect(norm[0]!.message).toContain('not square-integrable');
    expect(norm[0]!.message).toContain(growth);
    expect(r.levels).toEqual([]);
    // Nothing else pretends to have measured the state (the well's own level count is a fact of the system).
    expect(messages(r, 'basis').filter((m) => !m.startsWith('The well holds'))).toEqual([]);
    expect(messages(r, 'convergence')).toEqual([]);
  });
});

describe('integrable spikes', () => {
  it('|x - 0.3|^-1/4 in a box: norm (0.3^(1/2) + 0.7^(1/2)) / (1/2), an infinite energy, the spike named', () => {
    const r = run('box(0, 1)', 'abs(x - 0.3)^(-0.25)');
    const exact = (Math.sqrt(0.3) + Math.sqrt(0.7)) / 0.5;
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(1e-5);
    expect(r.energy?.mean ?? null).toBeNull();
    const conv = messages(r, 'convergence');
    expect(conv.some((m) => m.includes('infinite at x = 0.3') && m.includes('|x - 0.3|^-0.25'))).toBe(true);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    // The walls are still checked against the state's size, not against the spike's height.
    expect(messages(r, 'boundary')).toHaveLength(1);
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
      expect(Math.abs(l.re - coefficient(n))).toBeLessThan(1e-7);
    }
    expect(messages(r, 'convergence').some((m) => m.includes('|x|^-0.4'))).toBe(true);
  });

  it('exp(-x^2) |x|^-1/4 on the line, spike on a scan point: norm 2^(-1/4) Gamma(1/4)', () => {
    // The integral 2 int_0^inf e^{-2x^2} x^{-1/2} dx = 2^{-1/4} Gamma(1/4) by u = 2 x^2; Gamma(1/4) =
    // 3.625609908221908 (Abramowitz & Stegun, table 6.1 and 6.1.10 (from memory)).
    const r = run('oscillator(omega = 1)', 'exp(-x^2) * abs(x)^(-0.25)');
    const exact = Math.pow(2, -0.25) * 3.625609908221908;
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(1e-6);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(messages(r, 'convergence').some((m) => m.includes('infinite at x = 0') && m.includes('|x|^-0.25'))).toBe(true);
    expect(r.energy?.mean ?? null).toBeNull();
  });

  it.each([
    // int_0^a log^2 s ds = a (log^2 a - 2 log a + 2) (elementary; common practice).
    ['log(abs(x - 0.3))', 'log(1/|x - 0.3|)', [0.3, 0.7]],
    ['log(x)', 'log(1/|x|)', [1]],
  ])('psi = %s grows like %s: named, its norm the elementary integral of log^2', (state, growth, pieces) => {
    const r = run('box(0, 1)', state);
    const exact = (pieces as number[]).reduce((t, a) => t + a * (Math.log(a) ** 2 - 2 * Math.log(a) + 2), 0);
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(1e-6);
    expect(messages(r, 'convergence').some((m) => m.includes(growth as string))).toBe(true);
    expect(r.energy?.mean ?? null).toBeNull();
  });

  it('a spike close to |x - x0|^-1/2 says how much of |psi|^2 double precision cannot reach', () => {
    const r = run('box(0, 1)', 'abs(x - 0.3)^(-0.45)');
    const exact = (0.3 ** 0.1 + 0.7 ** 0.1) / 0.1;
    const lim = messages(r, 'limits').find((m) => m.startsWith('Double precision cannot sample'));
    expect(lim).toBeDefined();
    // The stated share is an honest bound on the norm's error.
    const share = Number(/about ([0-9.e-]+) of \|psi\|\^2/.exec(lim!)![1]);
    expect(Math.abs(r.norm! - exact) / exact).toBeLessThan(share);
  });
});

describe('no spike where there is none', () => {
  it.each([
    ['a narrow smooth peak', 'exp(-(x - 0.5)^2 / 1e-8)'],
    ['a kink', 'abs(x - 0.3) * x * (1 - x)'],
  ])('%s is not reported as infinite', (_what, state) => {
    const r = run('box(0, 1)', state);
    expect(r.diagnostics.some((d) => d.message.includes('not square-integrable') || d.message.includes('growing like'))).toBe(false);
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
