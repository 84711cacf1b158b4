import { describe, it, expect } from 'vitest';
import { hermiteFunction, hermiteFunctionTable } from '../../server/src/physics/hermite';

/**
 * The physicists' Hermite polynomial H_n(x) by H_0 = 1, H_1 = 2x, H_{k+1} = 2x H_k - 2k H_{k-1}
 * (Abramowitz & Stegun 22.7.13 (from memory)). Plain doubles: it overflows to +-Infinity for large
 * n |x|, so the engine uses hermiteFunctionTable; here it is the reference the Hermite functions are
 * checked against.
 */
function hermitePolynomial(n: number, x: number): number {
  let h0 = 1;
  if (n === 0) return h0;
  let h1 = 2 * x;
  for (let k = 1; k < n; k++) {
    const h2 = 2 * x * h1 - 2 * k * h0;
    h0 = h1;
    h1 = h2;
  }
  return h1;
}

/** |BigInt| to a double mantissa and binary exponent: v = m * 2^e, m in [0.5, 1). */
function bigToMantExp(v: bigint): { m: number; e: number } {
  const neg = v < 0n;
  const a = neg ? -v : v;
  const bits = a.toString(2).length;
  const shift = Math.max(0, bits - 64);
  const top = Number(a >> BigInt(shift));
  const m = top / Math.pow(2, Math.min(bits, 64));
  return { m: neg ? -m : m, e: bits };
}

/**
 * Independent reference: psi_n(p/q) from the exact integer recurrence T_{k+1} = 2p T_k - 2k q^2 T_{k-1}
 * for T_k = q^k H_k(p/q) (BigInt), then psi_n = T_n e^{-xi^2/2} / (q^n sqrt(2^n n! sqrt(pi))), with all
 * large factors combined as exact integers and only one logarithm of modest size at the end.
 */
function referencePsi(n: number, p: bigint, q: bigint): number {
  let t0 = 1n;
  let t1 = 2n * p;
  if (n === 0) t1 = 1n;
  for (let k = 1; k < n; k++) {
    const t2 = 2n * p * t1 - 2n * BigInt(k) * q * q * t0;
    t0 = t1;
    t1 = t2;
  }
  // psi^2 sqrt(pi) e^{xi^2} = T^2 / (q^{2n} 2^n n!).
  let fact = 1n;
  for (let k = 2; k <= n; k++) fact *= BigInt(k);
  const num = t1 * t1;
  const den = q ** BigInt(2 * n) * 2n ** BigInt(n) * fact;
  const a = bigToMantExp(num);
  const b = bigToMantExp(den);
  const xi = Number(p) / Number(q);
  const log = Math.log(a.m / b.m) + (a.e - b.e) * Math.LN2 - xi * xi - 0.5 * Math.log(Math.PI);
  return Math.sign(Number(t1 === 0n ? 0n : t1 > 0n ? 1n : -1n)) * Math.exp(0.5 * log);
}

describe('the reference H_n', () => {
  it('gives H_n(1) for n = 0..10', () => {
    // Abramowitz & Stegun, Table 22.12 (from memory)
    const table = [1, 2, 2, -4, -20, -8, 184, 464, -1648, -10720, 8224];
    for (let n = 0; n <= 10; n++) expect(hermitePolynomial(n, 1)).toBe(table[n]);
  });
});

describe('hermiteFunctionTable', () => {
  it('agrees with H_n e^{-x^2/2}/sqrt(2^n n! sqrt(pi)) for small n', () => {
    for (let n = 0; n <= 20; n++) {
      for (const x of [-3.1, -0.4, 0, 0.7, 2.5]) {
        let f = 1;
        for (let k = 2; k <= n; k++) f *= k;
        const direct = (hermitePolynomial(n, x) * Math.exp(-x * x / 2)) / Math.sqrt(Math.pow(2, n) * f * Math.sqrt(Math.PI));
        expect(Math.abs(hermiteFunction(n, x) - direct)).toBeLessThan(1e-13);
      }
    }
  });

  it('matches an exact BigInt evaluation at n = 1000', () => {
    // Points inside the classical region |xi| < sqrt(2001) ~ 44.7 and beyond it.
    const pts: Array<[bigint, bigint]> = [[3n, 2n], [10n, 1n], [301n, 10n], [44n, 1n], [50n, 1n], [-77n, 4n]];
    for (const [p, q] of pts) {
      const ref = referencePsi(1000, p, q);
      const got = hermiteFunction(1000, Number(p) / Number(q));
      expect(Number.isFinite(got)).toBe(true);
      expect(Math.abs(got - ref)).toBeLessThan(1e-10 * Math.abs(ref));
    }
  });

  it('has no NaN and no false underflow in the classical region for n = 1000', () => {
    const n = 1000;
    const xs = new Float64Array(401);
    const turn = Math.sqrt(2 * n + 1);
    for (let j = 0; j < xs.length; j++) xs[j] = -turn * 0.98 + (1.96 * turn * j) / (xs.length - 1);
    const out = new Float64Array((n + 1) * xs.length);
    hermiteFunctionTable(xs, n + 1, out);
    let nonzero = 0;
    for (let j = 0; j < xs.length; j++) {
      const v = out[n * xs.length + j];
      expect(Number.isNaN(v)).toBe(false);
      // WKB envelope (from memory): |psi_n| <~ (2/pi^2)^{1/4} / (2n+1 - xi^2)^{1/4} times a modest factor.
      expect(Math.abs(v)).toBeLessThan(1);
      if (Math.abs(v) > 1e-6) nonzero++;
    }
    expect(nonzero).toBeGreaterThan(300);
  });

  it('gives finite tails at |xi| = 50 for n up to 1000 and exact derivatives', () => {
    const xs = Float64Array.of(-50, 50, 1.3);
    const levels = 1001;
    const out = new Float64Array(levels * 3);
    const d1 = new Float64Array(levels * 3);
    const d2 = new Float64Array(levels * 3);
    hermiteFunctionTable(xs, levels, out, d1, d2);
    // psi_1000(50) is about 1.7e-35, far below e^{-1250} ~ 0 for the Gaussian alone: it must not underflow.
    expect(out[1000 * 3 + 1]).toBeGreaterThan(0);
    // Parity psi_n(-x) = (-1)^n psi_n(x) (common practice).
    expect(out[1000 * 3 + 0]).toBe(out[1000 * 3 + 1]);
    expect(out[999 * 3 + 0]).toBe(-out[999 * 3 + 1]);
    // Derivative check against the other ladder form psi_n' = sqrt(n/2) psi_{n-1} - sqrt((n+1)/2) psi_{n+1}.
    for (const n of [1, 10, 500]) {
      const j = 2;
      const alt = Math.sqrt(n / 2) * out[(n - 1) * 3 + j] - Math.sqrt((n + 1) / 2) * out[(n + 1) * 3 + j];
      expect(Math.abs(d1[n * 3 + j] - alt)).toBeLessThan(1e-12);
    }
  });
});
