import { describe, it, expect } from 'vitest';
import { wellBasis, wellBoundCount, wellStrength } from '../../server/src/physics/well';
import { boxBasis } from '../../server/src/physics/box';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { basisOrthonormalityError } from './helpers';

/** A well of half-width 1 and mass 1 with strength z0: depth = z0^2 / 2. */
const wellOf = (z0: number, center = 0) => wellBasis((z0 * z0) / 2, 2, center, 1);
/** z_n = a sqrt(2 m E_n) for that well. */
const zOf = (E: number) => Math.sqrt(2 * E);

describe('wellBasis roots', () => {
  it('z0 = 1 has the single even root z = 0.739085133215161', () => {
    const w = wellOf(1);
    expect(w.count).toBe(1);
    // OEIS A003957 (the Dottie number, solution of cos z = z)
    expect(Math.abs(zOf(w.energies[0]) - 0.739085133215161)).toBeLessThan(1e-13);
  });

  it('counts ceil(2 z0 / pi) bound states across multiples of pi/2', () => {
    // Griffiths, Introduction to Quantum Mechanics, finite square well section (from memory)
    for (let k = 1; k <= 12; k++) {
      const edge = (k * Math.PI) / 2;
      expect(wellBoundCount((edge * (1 - 1e-9)) ** 2 / 2, 2, 1)).toBe(k);
      expect(wellBoundCount((edge * (1 + 1e-9)) ** 2 / 2, 2, 1)).toBe(k + 1);
      const w = wellOf(edge * (1 + 1e-9));
      expect(w.count).toBe(k + 1);
      // The new level sits just below the top of the well: E < V0, but barely.
      const top = w.energies[k];
      const depth = (edge * (1 + 1e-9)) ** 2 / 2;
      expect(top).toBeLessThan(depth);
      expect(depth - top).toBeLessThan(1e-6 * depth);
      // Its binding energy kappa^2/2 with kappa a = z0 sin u, u ~ z0 - k pi/2 (derived from the phase
      // equation z0 cos u = u + k pi/2 near u = 0).
      const z0 = edge * (1 + 1e-9);
      const expected = z0 * (z0 - edge);
      expect(Math.abs(Math.sqrt(2 * w.binding[k]) / expected - 1)).toBeLessThan(1e-6);
    }
    for (const z0 of [0.3, 1.2, 2.9, 7.77, 31.4]) expect(wellOf(z0).count).toBe(Math.ceil((2 * z0) / Math.PI));
  });

  it('solves tan z = sqrt(z0^2/z^2 - 1) (even) and -cot z = sqrt(z0^2/z^2 - 1) (odd), one root per interval', () => {
    for (const z0 of [0.05, 1.5707, 4, 13.3, 100]) {
      const w = wellOf(z0);
      for (let i = 0; i < w.count; i++) {
        const z = zOf(w.energies[i]);
        // Each root in its own interval (i pi/2, (i+1) pi/2) below z0.
        expect(z).toBeGreaterThan((i * Math.PI) / 2);
        expect(z).toBeLessThan(Math.min(((i + 1) * Math.PI) / 2, z0));
        const rhs = Math.sqrt((z0 * z0) / (z * z) - 1);
        const lhs = i % 2 === 0 ? Math.tan(z) : -1 / Math.tan(z);
        // Griffiths, Introduction to Quantum Mechanics, finite square well section (from memory)
        // Compare in the sine/cosine form, which stays bounded: z sin z = q cos z or -z cos z = q sin z.
        const q = Math.sqrt(Math.max(0, z0 * z0 - z * z));
        const res = i % 2 === 0 ? z * Math.sin(z) - q * Math.cos(z) : -z * Math.cos(z) - q * Math.sin(z);
        expect(Math.abs(res)).toBeLessThan(1e-12 * z0);
        if (Number.isFinite(lhs) && rhs < 1e6) expect(Math.abs(lhs - rhs)).toBeLessThan(1e-9 * (1 + rhs));
      }
    }
  });

  it('keeps one even state for a very shallow well', () => {
    for (const z0 of [1e-3, 1e-6, 1e-9]) {
      const w = wellOf(z0);
      expect(w.count).toBe(1);
      const depth = (z0 * z0) / 2;
      const E = w.energies[0];
      expect(E).toBeGreaterThan(0);
      expect(E).toBeLessThan(depth);
      // Binding energy V0 - E ~ z0^4 / 2 in units hbar^2/(m a^2) for z0 -> 0 (common practice).
      expect(Math.abs(w.binding[0] / (Math.pow(z0, 4) / 2) - 1)).toBeLessThan(1e-2);
    }
  });

  it('finds all 637 states of a well with z0 = 1000', () => {
    const w = wellOf(1000);
    expect(w.count).toBe(637);
    for (let i = 1; i < w.count; i++) expect(w.energies[i]).toBeGreaterThan(w.energies[i - 1]);
    expect(w.energies[636]).toBeLessThan(500000);
  });

  it("approaches the infinite well's levels as the depth grows", () => {
    let previous = Infinity;
    for (const z0 of [10, 100, 1000, 10000]) {
      const w = wellOf(z0);
      const box = boxBasis(-1, 1, 1, 5);
      // Common practice: E_n -> n^2 pi^2 / (2 m (2a)^2) from below, gap ~ 2/z0.
      const gap = 1 - w.energies[2] / box.energies[2];
      expect(gap).toBeGreaterThan(0);
      expect(gap).toBeLessThan(2.5 / z0);
      expect(gap).toBeLessThan(previous);
      previous = gap;
    }
  });

  it('returns no levels for invalid input', () => {
    expect(wellBasis(-1, 2, 0, 1).count).toBe(0);
    expect(wellBasis(1, 0, 0, 1).count).toBe(0);
    expect(wellStrength(1, 2, NaN)).toBeNaN();
  });
});

describe('wellBasis eigenfunctions', () => {
  const check = (z0: number, center: number) => {
    const w = wellOf(z0, center);
    const q = compositeGaussLegendre(w.support[0], w.support[1], { breakpoints: w.breakpoints, panels: 120, order: 30 });
    const worst = basisOrthonormalityError(w, q, w.count);
    return { w, worst };
  };

  it('is orthonormal by quadrature (invariant) for shallow to moderately deep wells', () => {
    for (const [z0, c] of [[0.2, 0], [1, 3], [20, -1.5], [60, 0.25]] as const) {
      const { w, worst } = check(z0, c);
      expect(w.count).toBe(Math.ceil((2 * z0) / Math.PI));
      expect(worst).toBeLessThan(1e-12);
    }
  });

  it('keeps full precision in very deep wells (z0 = 1e6 to 1e15): orthonormal, levels n^2 pi^2 / (8 a^2 (1 + 1/z0)^2)', () => {
    // A deep well's low levels sit within 1/z0 of the angle pi/2, where the old angle form kept only
    // eps z0 of relative precision (z0 = 1e9: levels 2e-7 from orthogonal, a captured weight above 1).
    for (const z0 of [1e6, 1e9, 1e15]) {
      const w = wellBasis((z0 * z0) / 2, 2, 0, 1, { maxLevels: 12 });
      const q = compositeGaussLegendre(-1.001, 1.001, { breakpoints: w.breakpoints, panels: 60, order: 30 });
      expect(basisOrthonormalityError(w, q, w.count)).toBeLessThan(1e-12);
      // Derived in this comment: with w = pi/2 - u the phase equation reads z0 sin w = n pi/2 - w, so
      // w = (n pi/2)/(z0 + 1) + O(n^3 / z0^3) and z_n = z0 sin w = (n pi/2) z0/(z0 + 1) + O(n^3/z0^2).
      for (let i = 0; i < w.count; i++) {
        const z = ((i + 1) * Math.PI) / 2 * (z0 / (z0 + 1));
        expect(Math.abs(w.energies[i] / ((z * z) / 2) - 1)).toBeLessThan(1e-13);
      }
    }
  });

  it('is continuous in value and slope at both edges and positive in the left tail', () => {
    const c = 0.7;
    const w = wellOf(13.3, c);
    // Adjacent doubles on either side of each edge, so the two branches (cos/sin inside, exponential
    // outside) are compared essentially at the same point.
    const step = (x: number, dir: number) => {
      const f = new Float64Array([x]);
      const u = new BigInt64Array(f.buffer);
      u[0] += BigInt(dir * Math.sign(x || 1));
      return f[0];
    };
    const inside = (x: number) => Math.abs(x - c) <= 1;
    let left = c - 1;
    while (!inside(left)) left = step(left, 1);
    let right = c + 1;
    while (!inside(right)) right = step(right, -1);
    let leftOut = step(left, -1);
    while (inside(leftOut)) leftOut = step(leftOut, -1);
    let rightOut = step(right, 1);
    while (inside(rightOut)) rightOut = step(rightOut, 1);
    const xs = Float64Array.of(leftOut, left, right, rightOut, c - 1.5);
    const v = new Float64Array(w.count * 5);
    const d1 = new Float64Array(w.count * 5);
    const d2 = new Float64Array(w.count * 5);
    w.table(xs, w.count, v, d1, d2);
    for (let i = 0; i < w.count; i++) {
      const b = i * 5;
      expect(Math.abs(xs[0] - xs[1])).toBeLessThan(1e-15);
      expect(Math.abs(xs[3] - xs[2])).toBeLessThan(1e-15);
      // Value and slope continuous to rounding (the branches differ only through the matching conditions).
      const scale = Math.max(1, Math.abs(d1[b + 1]));
      expect(Math.abs(v[b] - v[b + 1])).toBeLessThan(1e-13 * scale);
      expect(Math.abs(v[b + 2] - v[b + 3])).toBeLessThan(1e-13 * scale);
      expect(Math.abs(d1[b] - d1[b + 1])).toBeLessThan(1e-12 * scale);
      expect(Math.abs(d1[b + 2] - d1[b + 3])).toBeLessThan(1e-12 * scale);
      // FORMAT.md sign convention: positive just inside the left end of its non-negligible region.
      expect(v[b + 4]).toBeGreaterThan(0);
      // Alternating parity about the centre (common practice).
      const mirror = new Float64Array(w.count * 2);
      w.table(Float64Array.of(c - 0.3, c + 0.3), w.count, mirror);
      const sgn = i % 2 === 0 ? 1 : -1;
      expect(Math.abs(mirror[i * 2] - sgn * mirror[i * 2 + 1])).toBeLessThan(1e-14);
    }
    // phi'' jumps at the edges: it is -k^2 phi inside and kappa^2 phi outside.
    const jv = new Float64Array(2);
    const jd2 = new Float64Array(2);
    w.table(Float64Array.of(c - 1.001, c - 0.999), 1, jv, undefined, jd2);
    expect(Math.sign(jd2[0])).toBe(Math.sign(jv[0]));
    expect(Math.sign(jd2[1])).toBe(-Math.sign(jv[1]));
  });

  it('has a support leaving under 1e-16 of any level outside', () => {
    const w = wellOf(5.2);
    const [lo] = w.support;
    for (let i = 0; i < w.count; i++) {
      // Tail weight beyond lo: phi(lo)^2 / (2 kappa), kappa = sqrt(2 (V0 - E)).
      const v = new Float64Array(1);
      const big = new Float64Array(w.count);
      w.table(Float64Array.of(lo), w.count, big);
      v[0] = big[i];
      const kappa = Math.sqrt(2 * (5.2 * 5.2 / 2 - w.energies[i]));
      expect((v[0] * v[0]) / (2 * kappa)).toBeLessThanOrEqual(0.6e-16);
    }
  });
});
