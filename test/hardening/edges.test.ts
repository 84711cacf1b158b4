/**
 * Numbers at the edges of double precision and of physics: each gets a specific diagnostic, asserted by
 * code and range. The expected behaviour is common practice for numerical software (IEEE 754 limits:
 * largest double about 1.8e308, smallest subnormal 5e-324).
 */
import { describe, expect, it } from 'vitest';
import { expectFinding, findings, numbersIn } from './helpers';
import { manualClock } from '../../server/src/physics/budget';
import { DEFAULT_LIMITS } from '../../server/src/analysis/options';

describe('numbers at the edges', () => {
  it('1e308 in a state overflows and is named as +Infinity on the expression', () => {
    expectFinding('system box(0, 1e308)\nstate psi(x) = x * (1e308 - x)\n', 'evaluation', 'x * (1e308 - x)', [Infinity]);
  });

  it('a box as wide as the doubles allow is too large, said on the system line', () => {
    expectFinding('system box(-1e308, 1e308)\nstate psi(x) = 1\n', 'evaluation', 'system box(-1e308, 1e308)');
  });

  it('a subnormal box width is too small, said on the system line', () => {
    expectFinding('system box(0, 5e-324)\nstate psi(x) = 1\n', 'evaluation', 'system box(0, 5e-324)');
  });

  it('a subnormal state underflows |psi|^2, not "zero everywhere"', () => {
    expectFinding('system box(0, 1)\nstate psi(x) = 5e-324 * sin(pi * x)\n', 'norm', '5e-324 * sin(pi * x)');
  });

  it('NaN and Infinity written are refused on the word', () => {
    expectFinding('system box(0, 1)\nstate psi(x) = NaN\n', 'forbidden', 'NaN');
    expectFinding('system box(0, Infinity)\nstate psi(x) = 1\n', 'forbidden', 'Infinity');
  });

  it('infinities produced by the arithmetic are found on the expression', () => {
    expectFinding('system box(0, 1)\nstate psi(x) = 1/0\n', 'evaluation', '1/0', [Infinity]);
    expectFinding('system box(0, 1)\nstate psi(x) = 1e200 * 1e200 * x\n', 'evaluation', '1e200 * 1e200 * x', [Infinity]);
  });

  it('a NaN produced from a huge packet is described, not printed as NaN', () => {
    const d = expectFinding('system oscillator(omega = 1)\nstate gaussian(center = 0, width = 1e300)\n', 'evaluation', 'state gaussian(center = 0, width = 1e300)');
    // Wording is the feature here: the message describes the value instead of printing "NaN".
    expect(d.message).toMatch(/not a number/);
    expect(d.message).not.toMatch(/\bNaN\b/);
  });

  it('zero-width and reversed boxes are refused on the box', () => {
    expectFinding('system box(1, 1)\nstate psi(x) = 1\n', 'evaluation', 'box(1, 1)');
    expectFinding('system box(1, 0)\nstate psi(x) = 1\n', 'evaluation', 'box(1, 0)');
  });

  it('negative and zero well depths are refused on the value', () => {
    expectFinding('system well(depth = -5, width = 2)\nstate gaussian(center = 0, width = 0.3)\n', 'evaluation', '-5');
    expectFinding('system well(depth = 0, width = 2)\nstate gaussian(center = 0, width = 0.3)\n', 'evaluation', '0');
  });

  it('negative and zero masses are refused on the value', () => {
    expectFinding('mass -1\nsystem box(0, 1)\nstate psi(x) = x * (1 - x)\n', 'evaluation', '-1');
    expectFinding('mass 0\nsystem box(0, 1)\nstate psi(x) = x * (1 - x)\n', 'evaluation', '0');
  });

  it('a subnormal mass makes the oscillator far wider than the packet, and says so', () => {
    expectFinding('mass 5e-324\nsystem oscillator(omega = 1)\nstate gaussian(center = 0, width = 1)\n', 'norm', 'state gaussian(center = 0, width = 1)');
  });

  it('widths in the wrong unit are units errors on the value', () => {
    expectFinding('units nm, meV\nsystem box(0 nm, 10 meV)\nstate psi(x) = 1\n', 'units', '10 meV');
    const text = 'units nm, meV\nsystem well(depth = 10 nm, width = 2 meV)\nstate gaussian(center = 0 nm, width = 0.3 nm)\n';
    expectFinding(text, 'units', '10 nm');
    expectFinding(text, 'units', '2 meV');
  });

  it('a state that is zero everywhere is a norm error on the expression', () => {
    const d = expectFinding('system box(0, 1)\nstate psi(x) = 0 * x\n', 'norm', '0 * x');
    expect(d.severity).toBe('error');
    expectFinding('system oscillator(omega = 1)\nstate psi(x) = 0\n', 'norm', '0');
  });

  it('a state infinite at a grid point is a norm error on the expression that names how it grows', () => {
    // x = 0 is a wall and a sample of the wall check: the value there is +Infinity, and 1/x^2 is not
    // square-integrable there (the integral of |x|^-4 diverges at 0; common practice): the message names
    // the point 0 and the exponent -2.
    expectFinding('system box(-1, 1)\nstate psi(x) = 1 / x^2\n', 'norm', '1 / x^2', [0, -2]);
  });

  it('a state infinite at one point between grid points is a norm error naming the point, with no numbers', () => {
    const { r, all } = findings('system box(0, 1)\nstate psi(x) = 1 / (x - 0.5)\n', { limits: { maxMillis: 3000 } });
    const norm = all.filter((d) => d.code === 'norm');
    expect(norm).toHaveLength(1);
    expect(norm[0]!.severity).toBe('error');
    expect(norm[0]!.covered).toBe('1 / (x - 0.5)');
    // The point and the measured exponent of the growth |x - 0.5|^-1 (derived: 1 / (x - 0.5)).
    expect(numbersIn(norm[0]!.message)).toEqual(expect.arrayContaining([0.5, -1]));
    expect(r.levels).toEqual([]);
  });

  it('extreme oscillator parameters finish promptly (once an endless loop in the Hermite tables)', () => {
    // The clock stands still, so the time limit can never rescue a loop: the analysis must end by itself
    // (an endless loop fails this test by the runner's time-out). Its counted work stays within one grid
    // at the cap: the oscillator's length is so small that the state's window fills the largest grid
    // allowed (measured: 262,140 points, 41.6 M ops, with every state evaluation charged), and no more.
    const frozen = { clock: manualClock(0), limits: { maxMillis: 2000 } };
    const { r } = findings('mass 0.067\nsystem oscillator(quantum = 123456789012345678901234567890, center = 1.908e-142)\nstate gaussian(center = 3, width = 1)\nbasis 2\n', frozen);
    expect(r.work!.points).toBeLessThanOrEqual(DEFAULT_LIMITS.maxGridPoints);
    expect(r.work!.ops).toBeLessThanOrEqual(200 * DEFAULT_LIMITS.maxGridPoints);
    expect(r.diagnostics.length).toBeGreaterThan(0);
  });
});
