/**
 * The walls of a numerical potential: declared `hard` or `open` (`walls hard open`), the boundary
 * condition judged on the state's value at and beyond the walls (never on weight near them), and a
 * state that does not vanish at a wall described by its wall values and the energy without them.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { parse } from '../../server/src/language/parser';

const codes = (r: { diagnostics: { code: string }[] }): string[] => r.diagnostics.map((d) => d.code);
const near = (got: number | null | undefined, want: number, tol: number): void => {
  expect(got).not.toBeNull();
  expect(Math.abs(got! - want)).toBeLessThanOrEqual(tol);
};

describe('a state that vanishes at the walls satisfies them, wherever they are', () => {
  it('half oscillator V = x^2/2 on [0, 8] with psi = x exp(-x^2): no boundary finding, <H> = 15/8, Delta H = sqrt(27/32)', () => {
    // Derived in this comment (m = hbar = 1). With I_n = int_0^inf x^n exp(-2 x^2) dx, I_4 / I_2 = 3/4,
    // I_6 / I_2 = 15/16, I_0 / I_2 = 4. <V> = I_4 / (2 I_2) = 3/8; psi' = (1 - 2x^2) e^(-x^2), so
    // <T> = (I_0 - 4 I_2 + 4 I_4) / (2 I_2) = 3/2 and <H> = 15/8 = 1.875. H psi = (3x - 3x^3/2) e^(-x^2),
    // <H^2> = 9 - 9 (3/4) + (9/4)(15/16) = 279/64, so Delta H^2 = 279/64 - 225/64 = 27/32 (0.918558653543692).
    // The cut at x = 8 changes these by about exp(-128).
    const r = analyse('system V(x) = x^2/2 over [0, 8]\nstate psi(x) = x exp(-x^2)\nbasis 40\n');
    expect(codes(r)).not.toContain('boundary');
    near(r.energy?.mean, 15 / 8, 1e-9);
    near(r.energy?.spread, Math.sqrt(27 / 32), 1e-8);
  });

  it("the half oscillator's own ground state: no boundary finding, E = 3/2", () => {
    // The half oscillator's levels are the odd oscillator levels, E = (2k + 3/2) for k = 0, 1, ...
    // (common practice): its ground state has E = 3/2, with its maximum weight near x = 1, 8% of L from the wall.
    const r = analyse('system V(x) = x^2/2 over [0, 8]\nstate eigen(1) of V(x) = x^2/2 over [0, 8]\nbasis 10\n');
    expect(codes(r)).not.toContain('boundary');
    near(r.energy?.mean, 1.5, 1e-9);
  });

  it('step box V = 0 / 20 on [0, 1] with sin(pi x)^2: no boundary finding, <H> = 2 pi^2/3 + 10', () => {
    // Derived in this comment: psi = (1 - cos 2 pi x)/2, norm 3/8, <T> = (pi^2/2) / (2 * 3/8) = 2 pi^2/3,
    // <V> = 20 * (1/2) by symmetry of sin^2 about 1/2. H psi = -pi^2 cos(2 pi x) + V sin^2(pi x), so
    // ||H psi||^2 = pi^4/2 + 2 pi^2 * 20/8 + 400 * 3/16 and <H^2> = (8/3)(pi^4/2 + 5 pi^2 + 75).
    const r = analyse('system V(x) = x < 0.5 ? 0 : 20 over [0, 1]\nstate psi(x) = sin(pi x)^2\nbasis 40\n');
    expect(codes(r)).not.toContain('boundary');
    const mean = (2 * Math.PI ** 2) / 3 + 10;
    near(r.energy?.mean, mean, 1e-8);
    near(r.energy?.spread, Math.sqrt((8 / 3) * (Math.PI ** 4 / 2 + 5 * Math.PI ** 2 + 75) - mean ** 2), 1e-6);
  });
});

describe('declaring the walls', () => {
  it('parses walls hard open (left, right), one kind for both, and refuses anything else', () => {
    const spec = (text: string) => {
      const st = parse(text).file.statements[0];
      return st?.kind === 'system' && st.system.kind === 'potential' ? st.system.walls : 'none';
    };
    expect(spec('system V(x) = x^2 over [0, 8] walls hard open')).toMatchObject({ left: 'hard', right: 'open' });
    expect(spec('system V(x) = x^2 over [0, 8] walls hard')).toMatchObject({ left: 'hard', right: 'hard' });
    expect(spec('system V(x) = x^2 over [0, 8]')).toBeUndefined();
    for (const bad of ['walls soft', 'walls hard open hard', 'walls', 'hard']) {
      const f = parse(`system V(x) = x^2 over [0, 8] ${bad}`);
      expect(f.diagnostics.map((d) => d.code)).toEqual(['syntax']);
      expect(f.file.statements.filter((s) => s.kind === 'system')).toHaveLength(0);
    }
  });

  it('levels above V at the open right wall only: continuum undeclared or with an open right wall, none with two hard walls', () => {
    // V(8) = 32; the half oscillator's levels are E_n = 2n - 1/2 (the odd oscillator levels, common
    // practice), so E_17 = 33.5 is the first above V(8) and all lie above V(0) = 0.
    const cont = (walls: string) =>
      analyse(`system V(x) = x^2/2 over [0, 8]${walls}\nstate gaussian(center = 2, width = 0.5)\nbasis 24\n`).diagnostics.filter((d) => d.code === 'continuum');
    expect(cont('')).toHaveLength(1);
    expect(cont(' walls hard open')).toHaveLength(1);
    expect(cont(' walls hard')).toHaveLength(0);
    // 16 levels all lie below V(8): nothing to label whatever the walls.
    expect(analyse('system V(x) = x^2/2 over [0, 8]\nstate gaussian(center = 2, width = 0.5)\nbasis 16\n').diagnostics.filter((d) => d.code === 'continuum')).toHaveLength(0);
  });

  it('a state cut by a hard wall gets no advice to widen the interval; by an open wall, only that side widens', () => {
    // exp(-x^2/2) is 1 at x = 0 and exp(-4.5) = 0.011 at x = 3 (derived): nonzero at both walls of [0, 3].
    const text = (walls: string): string => `system V(x) = x^2/2 over [0, 3]${walls}\nstate psi(x) = exp(-x^2/2)\n`;
    const fixOf = (walls: string) => analyse(text(walls)).diagnostics.find((d) => d.code === 'boundary')?.fixes;
    expect(fixOf(' walls hard')).toBeUndefined();
    const right = fixOf(' walls hard open');
    expect(right?.[0]).toMatchObject({ kind: 'replace', text: '0, (3) + 1.5' });
    const both = fixOf('');
    expect(both?.[0]).toMatchObject({ kind: 'replace', text: '(0) - 1.5, (3) + 1.5' });
  });
});

describe('the continuum note is worded for what the potential does at the open walls', () => {
  // Wording is the feature here: a potential still rising at the walls is cut off, not levelled into a continuum.
  const note = (text: string): string => analyse(text).diagnostics.find((d) => d.code === 'continuum')!.message;

  it('a quartic cut at |x| = 2 (V = 16 there, still rising): the walls set the levels above it', () => {
    // Box-like levels near (n pi / 4)^2 / 2 pass V(2) = 16 by n = 8 (common practice), so 20 levels include some.
    expect(note('system V(x) = x^4 over [-2, 2]\nstate gaussian(center = 0, width = 0.3)\nbasis 20\n')).toContain('still rising');
  });

  it('a Gaussian dip levelling off at both walls: the box-quantised continuum', () => {
    expect(note('system V(x) = -5 exp(-x^2) over [-6, 6]\nstate gaussian(center = 0, width = 0.5)\nbasis 30\n')).toContain('continuum');
  });
});
