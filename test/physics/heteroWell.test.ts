import { describe, it, expect } from 'vitest';
import { wellBasis } from '../../server/src/physics/well';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { EV_SI, HBAR_SI, ME_SI } from '../../server/src/expr/constants';
import { basisOrthonormalityError } from './helpers';
import { PI, bisect, div, fromDecimal, fromInt, mul, sinCos, sqrt, toNumber } from './fixedPoint';

/** The electron mass in the internal units of a file in nm and meV (hbar = 1). */
const M_E = (ME_SI * 1e-18 * EV_SI * 1e-3) / (HBAR_SI * HBAR_SI);

/**
 * Reference levels of the BenDaniel–Duke well (BenDaniel & Duke, Phys. Rev. 152, 683 (1966): psi and
 * psi'/m continuous), computed here in 50-digit fixed point, independently of well.ts: with z = k a and
 * w = kappa a, z^2/m_w + w^2/m_b = 2 V0 a^2 m_e meV nm^2 / hbar^2 =: S (masses in m_e), the even levels
 * are roots of (z/m_w) sin z - (w/m_b) cos z and the odd ones of -(z/m_w) cos z - (w/m_b) sin z, level j
 * in ((j-1) pi/2, min(j pi/2, z0)) (the phase equations of CHECKS.md multiplied by cos or sin), found by
 * bisection. m_e meV nm^2 / hbar^2 = 4 pi^2 m_e e 10^-21 / h^2 from the exact h and e and CODATA 2018's
 * m_e. Energies E = z^2 / (2 m_w a^2) in meV.
 */
function referenceLevels(widthNm: string, depthMeV: string, mw: string, mb: string): number[] {
  const a = fromDecimal(widthNm) / 2n;
  const V0 = fromDecimal(depthMeV);
  const Mw = fromDecimal(mw);
  const Mb = fromDecimal(mb);
  // m_e meV nm^2 / hbar^2 = 4 pi^2 * 9.1093837015e-31 * 1.602176634e-22 * 1e-18 / (6.62607015e-34)^2.
  const K0 = (91093837015n * 1602176634n * 4n * mul(PI, PI)) / (662607015n ** 2n * 10n ** 6n);
  const S = mul(mul(fromInt(2), V0), mul(mul(a, a), K0));
  const z0 = sqrt(mul(S, Mw));
  const levels: number[] = [];
  for (let j = 1; (BigInt(j - 1) * PI) / 2n < z0; j++) {
    const even = j % 2 === 1;
    const f = (z: bigint): bigint => {
      const rest = S - div(mul(z, z), Mw);
      const w = rest > 0n ? sqrt(mul(rest, Mb)) : 0n;
      const { sin, cos } = sinCos(z);
      return even ? mul(div(z, Mw), sin) - mul(div(w, Mb), cos) : -mul(div(z, Mw), cos) - mul(div(w, Mb), sin);
    };
    const lo = (BigInt(j - 1) * PI) / 2n;
    const top = (BigInt(j) * PI) / 2n;
    const hi = top < z0 ? top : z0;
    const z = bisect(f, lo, hi);
    levels.push(toNumber(div(mul(z, z), mul(mul(fromInt(2), Mw), mul(a, a)))) / toNumber(K0));
  }
  return levels;
}

const wellOf = (width: number, depth: number, mw: number, mb: number) => wellBasis(depth, width, 0, mw * M_E, { barrierMass: mb * M_E });

describe('finite well with a barrier mass (BenDaniel–Duke)', () => {
  it('matches the published levels of the 8 nm, 250 meV well', () => {
    // CHECKS.md, "Position-dependent mass" (the phase equations solved in 30-digit arithmetic).
    const hetero = wellOf(8, 250, 0.067, 0.092);
    expect(hetero.count).toBe(2);
    expect(Math.abs(hetero.energies[0] / 41.9494836359 - 1)).toBeLessThan(1e-10);
    expect(Math.abs(hetero.energies[1] / 161.7405425666 - 1)).toBeLessThan(1e-10);
    const same = wellOf(8, 250, 0.067, 0.067);
    expect(Math.abs(same.energies[0] / 45.41964039014 - 1)).toBeLessThan(1e-10);
    expect(Math.abs(same.energies[1] / 168.601400714 - 1)).toBeLessThan(1e-10);
  });

  it('agrees with an independent 50-digit root finder for every level, over a range of mass ratios', () => {
    const cases: [string, string, string, string][] = [
      ['8', '250', '0.067', '0.092'],
      ['8', '250', '0.067', '0.067'],
      ['20', '300', '0.067', '0.092'],
      ['12', '180', '0.04', '0.4'],
      ['6', '500', '0.2', '0.05'],
      ['30', '1000', '0.067', '0.15'],
    ];
    for (const [w, d, mw, mb] of cases) {
      const ref = referenceLevels(w, d, mw, mb);
      const got = wellOf(Number(w), Number(d), Number(mw), Number(mb));
      // The bound count ceil(2 z0 / pi) depends on the inside mass only (kappa -> 0 at the threshold).
      expect(got.count).toBe(ref.length);
      for (let i = 0; i < ref.length; i++) expect(Math.abs(got.energies[i] / ref[i]! - 1)).toBeLessThan(1e-12);
    }
  });

  it('reproduces the constant-mass well when the barrier mass equals the inside mass, and varies continuously', () => {
    const plain = wellBasis(250, 8, 0, 0.067 * M_E);
    const same = wellOf(8, 250, 0.067, 0.067);
    const near = wellBasis(250, 8, 0, 0.067 * M_E, { barrierMass: 0.067 * M_E * (1 + 4 * Number.EPSILON) });
    expect(same.count).toBe(plain.count);
    expect(same.masses).toBeUndefined();
    expect(near.masses).toBeDefined();
    for (let i = 0; i < plain.count; i++) {
      expect(same.energies[i]).toBe(plain.energies[i]);
      // The general (atan2) phase path at a mass ratio of 1 + 4 eps: within 1e-12 of the constant one.
      expect(Math.abs(near.energies[i]! / plain.energies[i]! - 1)).toBeLessThan(1e-12);
    }
  });

  it('joins psi and psi\'/m at both edges and is orthonormal in the plain inner product', () => {
    for (const [mw, mb] of [
      [0.067, 0.092],
      [0.04, 0.4],
      [0.2, 0.05],
    ]) {
      const w = wellOf(30, 1000, mw!, mb!);
      const n = w.count;
      expect(n).toBeGreaterThan(5);
      const h = 1e-9;
      const xs = Float64Array.of(-15 - h, -15 + h, 15 - h, 15 + h);
      const v = new Float64Array(4 * n);
      const d = new Float64Array(4 * n);
      w.table(xs, n, v, d);
      for (let k = 0; k < n; k++) {
        const r = k * 4;
        const scale = Math.max(...[0, 1, 2, 3].map((j) => Math.abs(d[r + j]!)));
        // BenDaniel & Duke, Phys. Rev. 152, 683 (1966): psi and psi'/m continuous.
        expect(Math.abs(v[r]! - v[r + 1]!)).toBeLessThan(1e-6 * Math.abs(v[r]!) + 1e-9);
        expect(Math.abs(d[r]! / mb! - d[r + 1]! / mw!)).toBeLessThan(1e-6 * (scale / mw!));
        expect(Math.abs(d[r + 2]! / mw! - d[r + 3]! / mb!)).toBeLessThan(1e-6 * (scale / mw!));
      }
      const rule = compositeGaussLegendre(w.support[0], w.support[1], { breakpoints: [-15, 15], panels: 200, order: 20 });
      // Orthonormality: common practice for a self-adjoint operator.
      expect(basisOrthonormalityError(w, rule, n)).toBeLessThan(1e-12);
      // The mass profile the basis reports: inside and outside.
      expect(Array.from(w.masses!(Float64Array.of(0, 20, -20)))).toEqual([mw! * M_E, mb! * M_E, mb! * M_E]);
    }
  });

  it('satisfies the phase equations at double precision for shallow and deep wells', () => {
    for (const [depth, mb] of [
      [0.5, 0.3],
      [5, 0.02],
      [4000, 0.5],
    ] as const) {
      const w = wellOf(10, depth, 0.067, mb);
      for (let i = 0; i < w.count; i++) {
        const a = 5;
        const k = Math.sqrt(2 * 0.067 * M_E * w.energies[i]!);
        const kappa = Math.sqrt(2 * mb * M_E * w.binding[i]!);
        const z = k * a;
        // (k/m_w) sin z - (kappa/m_b) cos z = 0 (even), -(k/m_w) cos z - (kappa/m_b) sin z = 0 (odd).
        const res = i % 2 === 0 ? (k / 0.067) * Math.sin(z) - (kappa / mb) * Math.cos(z) : -(k / 0.067) * Math.cos(z) - (kappa / mb) * Math.sin(z);
        expect(Math.abs(res)).toBeLessThan(1e-12 * (k / 0.067 + kappa / mb));
        expect(w.energies[i]).toBeLessThan(depth);
      }
    }
  });
});
