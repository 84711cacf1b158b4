/**
 * The wording of the fitted decay of the coefficients, on fits from real expansions.
 * Expected laws (box of width 1, sine levels phi_n = sqrt(2) sin(n pi x)), derived in this comment by
 * integrating c_n = integral of psi phi_n dx by parts: every sine vanishes at the walls, so a jump of
 * psi^(k) inside, or a nonzero even derivative psi^(k) at a wall, leaves a term in n^-(k+1) (Boyd,
 * Chebyshev and Fourier Spectral Methods, ch. 2 (from memory), the check table's decay row):
 * - psi = 1: nonzero at the walls, |c_n| = 2 sqrt(2)/(n pi) for odd n: n^-1.
 * - psi = min(x, 1 - x): a kink at 1/2, |c_n| = 2 sqrt(2)/(n pi)^2 for odd n: n^-2.
 * - psi = x - 2 x^3 + x^4: psi = psi'' = 0 at both walls, psi'''' = 24, so c_n = sqrt(2) 48/(n pi)^5 for
 *   odd n: n^-5, the 4th derivative nonzero at the walls.
 * - psi = exp(-(x - 1/2)^2 / (4 S^2)), S = 0.04: its wall values e^-39 are far below the fit's floor, and
 *   the Fourier integral of the Gaussian gives |c_n| proportional to exp(-(n pi S)^2) for odd n, so the
 *   ratio per unit of n, exp(-(pi S)^2 (2n + 1)), falls from 0.48 at n = 23 to 0.25 at n = 43: faster
 *   than any power, and a geometric fit over that range has its ratio between those.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { analyse } from '../../server/src/analysis/index';
import { decayText } from '../../server/src/shared/decayText';
import type { AnalysisResult } from '../../server/src/analysis/types';

function text(r: AnalysisResult, ascii = false): string | null {
  return decayText(r.decay, { mixture: Boolean(r.mixture), kind: r.system?.kind, ascii, parity: r.parity });
}

/** The ratio printed in "a factor R a level". */
function ratioIn(t: string | null): number {
  const m = /a factor ([0-9.e+-]+) (a level|from one weighted level to the next)/.exec(t ?? '');
  expect(m, t ?? 'no text').not.toBeNull();
  return Number(m![1]);
}

const box = (psi: string, basis: number): AnalysisResult => analyse(`system box(0, 1)\nstate psi(x) = ${psi}\nbasis ${basis}\n`);

describe('decay wording of a box state', () => {
  it('a state nonzero at the walls falls as n^-1: psi jumps or is nonzero at a wall', () => {
    const r = box('1', 200);
    expect(r.decay?.exponent).toBeCloseTo(1, 2);
    expect(text(r)).toMatch(/^\|c_n\| ~ n\^-1 over n\s=\s\d+\.\.\d+: ψ jumps, or is nonzero at a wall$/);
    expect(text(r, true)).toMatch(/: psi jumps, or is nonzero at a wall$/);
  });

  it('a kink falls as n^-2: the first derivative jumps', () => {
    const r = box('min(x, 1 - x)', 200);
    expect(r.decay?.exponent).toBeCloseTo(2, 2);
    expect(text(r)).toMatch(/^\|c_n\| ~ n\^-2 over n\s=\s\d+\.\.\d+: ψ′ jumps \(ψ has a kink\)$/);
    expect(text(r, true)).toContain("psi' jumps (psi has a kink)");
  });

  it('a 4th derivative nonzero at the walls falls as n^-5 and is said so, not just "smooth"', () => {
    const r = box('x - 2*x^3 + x^4', 200);
    expect(Math.abs(r.decay!.exponent! - 5)).toBeLessThan(0.02);
    const t = text(r)!;
    expect(t).toMatch(/^\|c_n\| ~ n\^-5 over n\s=\s\d+\.\.\d+: d⁴ψ\/dx⁴ jumps, or is nonzero at a wall$/);
    expect(t).not.toMatch(/smooth/);
    expect(text(r, true)).toContain('d^4 psi/dx^4 jumps, or is nonzero at a wall');
  });

  it('a narrow Gaussian falls faster than any power: a geometric fall with its ratio, no exponent', () => {
    const r = box('exp(-(x - 0.5)^2 / (4 * 0.04^2))', 44);
    expect(r.decay?.exponent).toBeNull();
    // Symmetric about the centre: only odd n hold weight, so the factor is from one odd n to the next.
    expect(r.parity).toBe('even');
    const t = text(r)!;
    expect(t).toMatch(/^\|c_n\| falls geometrically, by about a factor [0-9.]+ from one weighted level to the next \(every second n\) over n\s=\s\d+\.\.\d+: faster than any power of n, so ψ is smooth$/);
    expect(t).not.toMatch(/n\^-/);
    // The per-level ratio 0.25..0.48 (see the header) over two levels.
    const q = ratioIn(t);
    expect(q).toBeGreaterThan(0.25 ** 2);
    expect(q).toBeLessThan(0.48 ** 2);
    // Without the symmetry the same fit reads per level.
    const perLevel = ratioIn(decayText(r.decay, { mixture: false, kind: 'box', parity: 'mixed' }));
    expect(Math.abs(perLevel * perLevel - q) / q).toBeLessThan(1e-2);
  });
});

/** hbar omega / k_B T for f = 2 MHz, T = 50 uK, with the exact SI values of h and k_B (CODATA 2018). */
const X = (6.62607015e-34 * 2e6) / (1.380649e-23 * 50e-6);
const ION = 'units nm, ueV, us\nmass 9.012 u\nlet trap = 2 MHz\nsystem oscillator(frequency = trap)\n';

describe('decay wording of a thermal mixture', () => {
  it('in its own trap: P_n falls by exactly e^(-hbar omega / kT) a level', () => {
    // P_n = (1 - q) q^n with q = e^(-hbar omega / k_B T) (Boltzmann populations, common practice).
    const r = analyse(`${ION}state thermal(temperature = 50e-6 K) of oscillator(frequency = trap)\n`);
    const q = Math.exp(-X);
    expect(q).toBeCloseTo(0.14665, 4);
    // The fit is of sqrt(P_n) ~ e^(-r n): the populations fall by e^(-2 r).
    expect(Math.exp(-2 * r.decay!.rate!)).toBeCloseTo(q, 8);
    const t = text(r)!;
    expect(t).toMatch(/^P_n falls geometrically, by about a factor 0\.147 a level over n\s=\s\d+\.\.\d+: faster than any power of n$/);
    expect(t).not.toMatch(/√|sqrt|ψ/);
  });

  it('the example displaced by 30 nm: its tail ratio lies between the closed form\'s local ratios', () => {
    const src = readFileSync('examples/thermal-ion-shift.qstate', 'utf8');
    const r = analyse(src);
    const t = text(r, true)!;
    expect(t).toMatch(/^P_n falls geometrically, by about a factor [0-9.]+ a level over n\s=\s\d+\.\.\d+: faster than any power of n$/);
    // Displaced thermal state (Cahill & Glauber 1969, as in the example's comment):
    // P_n = nbar^n/(nbar+1)^(n+1) e^(-|a|^2/(nbar+1)) L_n(-|a|^2/(nbar (nbar+1))), nbar = 1/(e^X - 1),
    // |a|^2 = 0.80245. Its ratio P_(n+1)/P_n tends to nbar/(nbar+1) = e^(-hbar omega/kT) = 0.147 only
    // as n grows without bound; over the fitted range it is larger, and the fit must lie within it.
    const nbar = 1 / Math.expm1(X);
    const y = -0.80245 / (nbar * (nbar + 1));
    const lag = [1, 1 - y];
    for (let n = 1; n < 60; n++) lag.push(((2 * n + 1 - y) * lag[n]! - n * lag[n - 1]!) / (n + 1));
    const P = (n: number): number => (nbar ** n / (nbar + 1) ** (n + 1)) * Math.exp(-0.80245 / (nbar + 1)) * lag[n]!;
    const [a, b] = r.decay!.range!;
    // The engine's populations over the fitted range agree with the closed form.
    for (let n = a; n <= b; n++) expect(Math.abs(r.levels[n]!.weight! / P(n) - 1)).toBeLessThan(0.02);
    const local = Array.from({ length: b - a }, (_, k) => P(a + k + 1) / P(a + k));
    const q = ratioIn(t);
    expect(q).toBeGreaterThan(Math.min(...local) * 0.99);
    expect(q).toBeLessThan(Math.max(...local) * 1.01);
    expect(q).toBeGreaterThan(Math.exp(-X));
  });
});

describe('decay wording without a fit', () => {
  it('says nothing when the law is unknown, and names a finite sum of levels', () => {
    expect(decayText(null, { mixture: false, kind: 'box' })).toBeNull();
    expect(decayText({ exponent: null, classification: 'unknown' }, { mixture: false, kind: 'box' })).toBeNull();
    // sin^3(pi x) = (3 sin(pi x) - sin(3 pi x))/4 (a trigonometric identity): two levels, then nothing.
    const r = box('sin(pi*x)^3', 40);
    expect(text(r, true)).toBe('|c_n| stops after n = 3: a finite sum of levels');
    expect(text(r)).toBe('|c_n| stops after n\u00a0=\u00a03: a finite sum of levels');
  });
});
