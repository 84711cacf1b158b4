import { describe, expect, it } from 'vitest';
import { parityFromLevels, MIXED_FLOOR } from '../../server/src/analysis/parityFromLevels';
import { analyse } from '../../server/src/analysis/index';

describe('parity settled from the coefficients (analysis/parityFromLevels.ts)', () => {
  it('calls a plainly mixed state mixed, with the even share of its weights', () => {
    // c_1 = 0.8, c_2 = 0.6 (index 0 even, 1 odd): the odd part holds 0.36 of the norm 1 (orthonormal levels, common practice).
    const p = parityFromLevels(Float64Array.of(0.8, 0.6), new Float64Array(2), new Float64Array(2).fill(1e-15), 1, 0.5)!;
    expect(p.parity).toBe('mixed');
    expect(p.minor).toBeCloseTo(0.36, 14);
    expect(p.major).toBe('even');
  });

  it('leaves a state near a parity to the mirror evaluation: the finding may depend on it', () => {
    // The odd share 1e-4 is below MIXED_FLOOR: "almost even" is worded from the mirrored samples.
    const odd = Math.sqrt(1e-4);
    expect(1e-4).toBeLessThan(MIXED_FLOOR);
    expect(parityFromLevels(Float64Array.of(Math.sqrt(1 - 1e-4), odd), new Float64Array(2), new Float64Array(2).fill(1e-15), 1, 0.5)).toBeNull();
    // The tenth of the weight the levels leave out could belong to either part; a 0.05 odd share still exceeds
    // MIXED_FLOOR times the norm plus that tenth (2.2e-3), so the state is mixed (derived in this comment).
    const p = parityFromLevels(Float64Array.of(Math.sqrt(0.85), Math.sqrt(0.05)), new Float64Array(2), new Float64Array(2).fill(1e-15), 1, 0.5);
    expect(p?.parity).toBe('mixed');
    // Errors that could swallow the minor part leave it undecided.
    expect(parityFromLevels(Float64Array.of(0.99, 0.01), new Float64Array(2), Float64Array.of(1e-15, 0.02), 1, 0.5)).toBeNull();
    expect(parityFromLevels(Float64Array.of(0.8, 0.6), new Float64Array(2), Float64Array.of(Infinity, 0), 1, 0.5)).toBeNull();
  });

  it('an almost even state still gets its finding through analyse', () => {
    // sin(pi x) + 0.01 sin(2 pi x): the odd part's share is 1e-4 / (1 + 1e-4) (orthogonal sines, common practice).
    const r = analyse('system box(0, 1)\nstate psi(x) = sin(pi * x) + 0.01 * sin(2 * pi * x)\nbasis 20\n');
    const d = r.diagnostics.find((x) => x.code === 'parity');
    expect(d?.message).toContain('almost even');
    expect(r.parity).toBe('mixed');
  });
});
