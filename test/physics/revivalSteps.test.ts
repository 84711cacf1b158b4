import { describe, expect, it } from 'vitest';
import { boxBasis } from '../../server/src/physics/box';
import { oscillatorBasis } from '../../server/src/physics/oscillator';
import { evolve, revivalTime } from '../../server/src/physics/evolution';

// The revival of a state is the first time all its populated phases e^{-i E_n t} agree again. For the
// box E_n = n^2 E_1 and for the oscillator E_n = (n + 1/2) hbar omega, so the revival is the full
// spectrum's T divided by the gcd of the populated levels' steps (derived in evolution.ts, commonStep;
// the full-spectrum values are Styer, Am. J. Phys. 69, 56 (2001) (from memory)).

const norm = (re: number[]) => {
  const w = Math.sqrt(re.reduce((s, x) => s + x * x, 0));
  return Float64Array.from(re, (x) => x / w);
};
const survival = (basis: ReturnType<typeof boxBasis>, c: Float64Array, t: number) =>
  evolve(basis, c, new Float64Array(c.length), Float64Array.of(t)).survival[0]!;

describe('revival of a state on some of the levels only', () => {
  const L = 2;
  const m = 0.5;
  const T = (4 * m * L * L) / Math.PI;

  it('odd box levels only (a state symmetric about the centre) revive at T_rev / 8', () => {
    const basis = boxBasis(0, L, m, 7);
    const c = norm([0.6, 0, -0.5, 0, 0.4, 0, 0.3]);
    const t = revivalTime(basis, c, new Float64Array(7))!;
    expect(Math.abs(t - T / 8) / T).toBeLessThan(1e-14);
    // At the revival the state is back; half-way it is not (so the check can fail).
    expect(Math.abs(survival(basis, c, t) - 1)).toBeLessThan(1e-12);
    expect(survival(basis, c, t / 2)).toBeLessThan(0.9);
  });

  it('levels 1 and 2 of a box revive at T_rev / 3; all levels keep T_rev', () => {
    const basis = boxBasis(0, L, m, 4);
    expect(Math.abs(revivalTime(basis, norm([1, 1, 0, 0]), new Float64Array(4))! - T / 3) / T).toBeLessThan(1e-14);
    expect(Math.abs(revivalTime(basis, norm([1, 1, 1, 1]), new Float64Array(4))! - T) / T).toBeLessThan(1e-14);
  });

  it('even oscillator levels only (a squeezed vacuum) revive after half a period', () => {
    const omega = 3;
    const basis = oscillatorBasis(omega, 0, 1, 8);
    const c = norm([0.8, 0, 0.45, 0, 0.3, 0, 0.2, 0]);
    const t = revivalTime(basis, c, new Float64Array(8))!;
    expect(Math.abs(t - Math.PI / omega)).toBeLessThan(1e-13);
    expect(Math.abs(survival(basis as never, c, t) - 1)).toBeLessThan(1e-12);
    expect(survival(basis as never, c, t / 2)).toBeLessThan(0.99);
  });

  it('a state on one level has no revival, in the box and in the oscillator', () => {
    expect(revivalTime(boxBasis(0, L, m, 3), Float64Array.of(0, 1, 0), new Float64Array(3))).toBeNull();
    expect(revivalTime(oscillatorBasis(1, 0, 1, 3), Float64Array.of(1, 0, 0), new Float64Array(3))).toBeNull();
  });
});
