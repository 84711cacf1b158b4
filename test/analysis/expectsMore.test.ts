/**
 * The `expect` forms about one level's energy, the continuum weight, the revival time and a mean at a
 * time, and `expect norm` with the dimension the integral of |psi|^2 really has.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { parse } from '../../server/src/language/parser';

const PI = Math.PI;
const expectFindings = (text: string) => analyse(text).diagnostics.filter((d) => d.code === 'expect' || d.code === 'units' || d.code === 'syntax');
/** The lines of `text` (1-based) that carry an expect, units or syntax finding. */
const failingLines = (text: string): number[] => expectFindings(text).map((d) => text.slice(0, d.start).split('\n').length);

// CODATA 2018: h = 6.62607015e-34 J s and e = 1.602176634e-19 C exact, m_e = 9.1093837015e-31 kg.
const H = 6.62607015e-34;
const HBAR = H / (2 * PI);
const ME = 9.1093837015e-31;
const EV = 1.602176634e-19;

describe('expect level N energy', () => {
  it("checks one level's energy against E_1 = h^2 / (8 m_e L^2) for an electron in a 1 nm box", () => {
    // Box levels E_n = n^2 h^2 / (8 m L^2) (common practice), with the CODATA 2018 values above.
    const e1 = (H * H) / (8 * ME * 1e-18) / EV;
    const base = 'units nm, eV, fs\nsystem box(0, 1 nm)\nstate psi(x) = phi(1, x)\n';
    const text = `${base}expect level 1 energy ${e1.toPrecision(12)} eV +- 1e-10 eV\nexpect level 2 energy ${(4 * e1).toPrecision(12)} eV +- 1e-10 eV\nexpect level 2 energy ${e1} eV +- 1e-3 eV\nexpect level 90 energy 1 eV +- 1 eV\n`;
    expect(failingLines(text)).toEqual([6, 7]);
  });

  it('parses the form and refuses it without the word energy', () => {
    const st = parse('expect level 2 energy 45.4 +- 0.1').file.statements[0];
    expect(st?.kind === 'expect' && st.expectation.kind === 'level' ? st.expectation.level.text : null).toBe('2');
    expect(parse('expect level 2 45.4 +- 0.1').diagnostics.map((d) => d.code)).toEqual(['syntax']);
  });
});

describe('expect continuum', () => {
  it("a finite well's own level has no continuum weight; a box has no continuum to check", () => {
    // An eigenstate lies wholly in the bound levels (orthogonality, common practice).
    const well = 'system well(depth = 20, width = 2)\nstate eigen(1) of well(depth = 20, width = 2)\n';
    expect(failingLines(`${well}expect continuum <= 1e-9\nexpect continuum >= 0.5\n`)).toEqual([4]);
    expect(failingLines('system box(0, 1)\nstate psi(x) = sin(pi x)\nexpect continuum <= 1\n')).toEqual([3]);
  });

  it("a packet far wider than a shallow well: the continuum weight is 1 minus the bound levels' weights", () => {
    const text = 'system well(depth = 1, width = 1)\nstate gaussian(center = 0, width = 3)\n';
    const r = analyse(text);
    const w = 1 - r.levels.reduce((s, l) => s + l.weight, 0);
    expect(w).toBeGreaterThan(0.1);
    expect(failingLines(`${text}expect continuum ${w.toPrecision(12)} +- 1e-9\n`)).toEqual([]);
  });
});

describe('expect revival', () => {
  it('an electron in a 1 nm box revives after 4 m_e L^2 / (pi hbar), in the file time unit', () => {
    // Box revival time T = 4 m L^2 / (pi hbar) = 2 pi hbar / E_1 (Styer, Am. J. Phys. 69, 56 (2001), from memory).
    const T = (4 * ME * 1e-18) / (PI * HBAR) / 1e-15;
    expect(T).toBeCloseTo(10.99823394, 8);
    // Levels 1, 2 and 3: n^2 - 1 = 3 and 8 have no common step, so the state needs the full T.
    const text = `units nm, eV, fs\nsystem box(0, 1 nm)\nstate psi(x) = phi(1, x) + phi(2, x) + phi(3, x)\nexpect revival ${T.toPrecision(12)} fs +- 1e-8 fs\nexpect revival ${(T * 1000).toPrecision(12)} as +- 1e-5 as\nexpect revival 10 fs +- 0.1 fs\n`;
    expect(failingLines(text)).toEqual([6]);
    // Levels 1 and 2 alone: their phases agree again after T / 3 (4 - 1 = 3; derived in evolution.ts).
    const two = `units nm, eV, fs\nsystem box(0, 1 nm)\nstate psi(x) = phi(1, x) + phi(2, x)\nexpect revival ${(T / 3).toPrecision(12)} fs +- 1e-8 fs\nexpect revival ${T.toPrecision(12)} fs +- 1e-8 fs\n`;
    expect(failingLines(two)).toEqual([5]);
  });

  it('the oscillator revives after one period 2 pi / omega', () => {
    // The oscillator's levels are equally spaced by hbar omega, so every state returns after 2 pi / omega (common practice).
    const text = 'system oscillator(omega = 2)\nstate gaussian(center = 1, width = 0.5)\nexpect revival 3.14159265359 +- 1e-9\n';
    expect(failingLines(text)).toEqual([]);
  });
});

describe('expect mean x(T) and p(T)', () => {
  // Derived (m = hbar = 1, box [0, 1]): for (phi_1 + phi_2)/sqrt(2), <x>(t) = 1/2 - 16/(9 pi^2) cos(w t) with
  // w = E_2 - E_1 = 3 pi^2 / 2 (<1|x|2> = -16/(9 pi^2) by integrating x sin(pi x) sin(2 pi x) by parts),
  // and <p>(t) = m d<x>/dt = (16/(9 pi^2)) w sin(w t).
  const w = (3 * PI * PI) / 2;
  const x = (t: number): number => 0.5 - (16 / (9 * PI * PI)) * Math.cos(w * t);
  const p = (t: number): number => (16 / (9 * PI * PI)) * w * Math.sin(w * t);
  const base = 'system box(0, 1)\nstate psi(x) = phi(1, x) + phi(2, x)\n';

  it('holds at the closed form and fails away from it', () => {
    const text = `${base}expect mean x(0) ${x(0).toPrecision(13)} +- 1e-10\nexpect mean x(0.1) ${x(0.1).toPrecision(13)} +- 1e-10\nexpect mean p(0.1) ${p(0.1).toPrecision(13)} +- 1e-9\nexpect mean x(0.1) 0.5 +- 1e-3\n`;
    expect(failingLines(text)).toEqual([6]);
  });

  it('takes the time in the file time unit and the position in its length unit', () => {
    // The same state in physical units: w = 3 E_1 / hbar with E_1 = h^2 / (8 m_e L^2), L = 1 nm (common practice).
    const w1 = (3 * (H * H) / (8 * ME * 1e-18)) / HBAR;
    const xt = 0.5 - (16 / (9 * PI * PI)) * Math.cos(w1 * 1e-15);
    const text = `units nm, eV, fs\nsystem box(0, 1 nm)\nstate psi(x) = phi(1, x) + phi(2, x)\nexpect mean x(1 fs) ${xt.toPrecision(12)} nm +- 1e-9 nm\nexpect mean x(1000 as) ${(xt * 10).toPrecision(12)} angstrom +- 1e-8 angstrom\nexpect mean x(1 fs) 1 eV +- 1 eV\n`;
    expect(failingLines(text)).toEqual([6]);
  });
});

describe('expect norm with a dimension', () => {
  // psi = sqrt(5) sin(pi x / L) on [0, L], L = 2.5 nm: the integral of |psi|^2 is 5 L / 2 = 6.25 nm (derived).
  const base = 'units nm, eV, fs\nsystem box(0, 2.5 nm)\nstate psi(x) = sqrt(5) * sin(pi x / (2.5 nm))\n';
  it('accepts the length the integral has, converted, and a bare number as before', () => {
    const text = `${base}expect norm 6.25 nm +- 1e-9 nm\nexpect norm 62.5 angstrom +- 1e-8 angstrom\nexpect norm 6.25 +- 1e-9\nexpect norm 6 nm +- 1e-9 nm\n`;
    expect(failingLines(text)).toEqual([7]);
  });

  it('refuses a dimension the integral does not have', () => {
    expect(failingLines(`${base}expect norm 6.25 eV +- 1e-9 eV\n`)).toEqual([4]);
    // A state built from phi (dimension length^-1/2) has a dimensionless norm.
    expect(failingLines('units nm, eV, fs\nsystem box(0, 1 nm)\nstate psi(x) = phi(1, x)\nexpect norm 1 nm +- 1e-9 nm\n')).toEqual([4]);
  });
});

describe('the untrusted pipeline checks the new forms', () => {
  it('names each value of the wrong dimension, evaluating nothing', async () => {
    const { analyseUntrusted } = await import('../../server/src/analysis/index');
    const t = 'units nm, meV, fs\nsystem box(0 nm, 1 nm)\nstate psi(x) = phi(1, x)\nexpect level 1 energy 40 nm +- 1 meV\nexpect revival 500 meV +- 10 fs\nexpect mean x(10 nm) 5 nm +- 0.1 nm\nexpect mean p(1 fs) 5 nm +- 0.1 / nm\nexpect continuum <= 1 fs\n';
    const covered = analyseUntrusted(t).diagnostics.filter((d) => d.code === 'units').map((d) => t.slice(d.start, d.end));
    expect(covered).toEqual(['40 nm', '500 meV', '10 nm', '5 nm', '1 fs']);
  });
});
