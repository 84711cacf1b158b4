/**
 * Positions in findings carry the file's length unit, and fitted exponents are rounded to what the fit
 * resolves. The states are chosen so the positions are known (derived in this comment): a triangle with
 * its corner at x = 2 nm has its kink there; a Gaussian centred in an open interval is cut at its ends.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';

const message = (t: string, code: string) => analyse(t).diagnostics.find((d) => d.code === code)?.message ?? '';

describe('positions in findings', () => {
  it('name the kink in nm, with the exponent to three digits', () => {
    const m = message('units nm, meV\nsystem box(0 nm, 10 nm)\nstate psi(x) = x < 2 nm ? x / nm : (10 nm - x) / (4 nm)\n', 'convergence');
    expect(m).toMatch(/kink at x = 2 nm/);
    expect(m).toMatch(/n\^-\d(\.\d\d?)?\.$/);
  });

  it('name the walls in nm where the state is cut', () => {
    const m = message('units nm, meV\nsystem V(x) = 1 meV * (x / nm)^2 over [-5 nm, 5 nm]\nstate gaussian(center = 0 nm, width = 1 nm)\n', 'boundary');
    expect(m).toMatch(/psi\(-5 nm\) = /);
    expect(m).toMatch(/walls at -5 and 5 nm/);
  });
});
