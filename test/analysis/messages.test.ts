/**
 * Findings that used to say the wrong thing: an integrable spike called not square-integrable, a narrow
 * Gaussian called zero, and a packet that barely touches a wall losing its other findings.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { fmt } from '../../server/src/analysis/findings';
import { expectFinding, findings, numbersIn } from '../hardening/helpers';

const errors = (text: string, code: string) => analyse(text).diagnostics.filter((d) => d.code === code && d.severity === 'error');
const six = (v: number): number => Number(v.toPrecision(6));

describe('the square-integrability threshold p >= 1/2', () => {
  it('|x - 0.5|^-0.49 is integrable: a convergence finding naming 0.49, no norm error', () => {
    // |psi|^2 ~ |x - 0.5|^-0.98 is integrable (exponent above -1); documented threshold p >= 1/2 in docs/format.md.
    const text = 'system box(0, 1)\nstate psi(x) = abs(x - 0.5)^-0.49\n';
    expect(errors(text, 'norm')).toEqual([]);
    // The message writes the growth as |x - 0.5|^-0.49, read back as the number -0.49.
    expectFinding(text, 'convergence', 'abs(x - 0.5)^-0.49', [-0.49]);
    expect(analyse(text).singularity?.integrable).toBe(true);
  });

  it('|x - 0.5|^-0.5 is not: the norm error stays', () => {
    // |psi|^2 ~ 1/|x - 0.5| diverges logarithmically (common practice).
    expect(errors('system box(0, 1)\nstate psi(x) = abs(x - 0.5)^-0.5\n', 'norm')).toHaveLength(1);
  });
});

describe('a very narrow Gaussian is never called zero', () => {
  it('exp(-1e12 (x - 0.5)^2) in a box: norm sqrt(pi / 2e12), <H> = 1e12 / 2, Delta H = 1e12 / sqrt(2)', () => {
    // Derived: psi = exp(-a u^2) has int |psi|^2 = sqrt(pi / (2a)), <p^2> = a and <p^4> = 3 a^2, so with m = hbar = 1
    // <H> = a/2 and Delta H^2 = (3a^2 - a^2)/4 = a^2/2; the walls at 0.5 from the centre cut off exp(-5e11).
    const a = 1e12;
    const r = analyse('system box(0, 1)\nstate psi(x) = exp(-1e12 (x - 0.5)^2)\n');
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(Math.abs(r.norm! / Math.sqrt(Math.PI / (2 * a)) - 1)).toBeLessThan(1e-9);
    expect(Math.abs(r.energy!.mean! / (a / 2) - 1)).toBeLessThan(1e-8);
    expect(Math.abs(r.energy!.spread! / (a / Math.SQRT2) - 1)).toBeLessThan(1e-8);
  });

  it('two narrow Gaussians: the norm is the sum of their closed forms', () => {
    // Derived: int x^2 exp(-2b (x - 1/4)^2) ~ (1/16) sqrt(pi / (2b)) (1 + 1/(4b (1/4)^2) ...) and 4 sqrt(pi / (2a)).
    const a = 1e12;
    const b = 1e10;
    const r = analyse('system box(0, 1)\nstate psi(x) = x exp(-1e10 (x - 0.25)^2) + 2 exp(-1e12 (x - 0.75)^2)\n');
    const want = Math.sqrt(Math.PI / (2 * b)) * (1 / 16 + 1 / (4 * 2 * b)) + 4 * Math.sqrt(Math.PI / (2 * a));
    expect(Math.abs(r.norm! / want - 1)).toBeLessThan(1e-9);
  });

  it('a peak narrower than double precision resolves: an error naming its centre and width', () => {
    // exp(-1e40 (x - 0.5)^2) has |psi| width 1/sqrt(2e40) = 7.07107e-21 (derived), below the spacing of doubles near 0.5.
    const text = 'system box(0, 1)\nstate psi(x) = exp(-1e40 (x - 0.5)^2)\n';
    const d = expectFinding(text, 'norm', 'exp(-1e40 (x - 0.5)^2)', [0.5, six(1 / Math.sqrt(2e40))]);
    expect(d.severity).toBe('error');
  });
});

describe('a packet barely touching the box walls', () => {
  // psi = exp(-(x - 1/2)^2 / (2 s^2)), s = 0.104 on [0, 1]: psi(0) = psi(1) = exp(-1/(8 s^2)) (about 1e-5 of its peak),
  // int |psi|^2 = s sqrt(pi) erf(1 / (2 s)) with erf(4.8) = 1 - 6e-12 (derived), so psi(0) normalised is
  // exp(-1/(8 s^2)) / sqrt(s sqrt(pi)); the line through equal wall values is that constant, with weight its square.
  const s = 0.104;
  const wall = Math.exp(-1 / (8 * s * s)) / Math.sqrt(s * Math.sqrt(Math.PI));
  const text = (basis: number): string => `system box(0, 1)\nstate psi(x) = exp(-(x - 0.5)^2 / (2 * 0.104^2))\nbasis ${basis}\n`;
  const covered = 'exp(-(x - 0.5)^2 / (2 * 0.104^2))';

  it('names the wall value, its ratio to the peak and the weight of the line through the wall values', () => {
    expectFinding(text(40), 'boundary', covered, [six(wall), six(Math.exp(-1 / (8 * s * s))), six(wall * wall)]);
  });

  it('reports the energy of the state minus that line: the packet kinetic energy 1/(4 s^2) to 1e-4', () => {
    // Derived: a Gaussian exp(-u^2 / (2 s^2)) has <p^2> = 1/(2 s^2), so <H> = 1/(4 s^2) with m = hbar = 1 (V = 0 inside);
    // the constant removed and the walls change it by about psi(0) / psi(peak) = 1e-5 relative.
    const d = findings(text(40)).all.find((x) => x.code === 'boundary')!;
    const got = numbersIn(d.message);
    expect(got.some((v) => Math.abs(v * 4 * s * s - 1) < 1e-4)).toBe(true);
  });

  it('keeps the basis finding beside the boundary one', () => {
    // Ten levels miss about exp(-(11 pi s)^2) ~ 1e-6 or more of a packet this narrow (its sine coefficients fall as a Gaussian in n).
    const codes = analyse(text(10)).diagnostics.map((d) => d.code);
    expect(codes).toContain('boundary');
    expect(codes).toContain('basis');
  });

  it('the decay the warning names is the decay of the result', () => {
    const r = analyse(text(300));
    const p = r.decay?.exponent;
    expect(p).toBeGreaterThan(0.9);
    const d = r.diagnostics.find((x) => x.code === 'boundary')!;
    // Written n^-p, read back as the number -p.
    expect(numbersIn(d.message)).toContain(-Number(fmt(p!)));
  });
});
