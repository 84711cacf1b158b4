import { describe, it, expect } from 'vitest';
import { boxCoefficientsFromSamples } from '../../server/src/physics/dst';
import { fftInPlace } from '../../server/src/physics/fft';

/** Samples psi at x_j = a + j L / N, j = 0..N. */
function samples(N: number, a: number, b: number, f: (x: number) => number): Float64Array {
  return Float64Array.from({ length: N + 1 }, (_, j) => f(a + ((b - a) * j) / N));
}

describe('fftInPlace', () => {
  it('matches a direct DFT and refuses lengths that are not powers of two', () => {
    const n = 64;
    const re = Float64Array.from({ length: n }, (_, j) => Math.cos(0.3 * j * j) + 0.1 * j);
    const im = Float64Array.from({ length: n }, (_, j) => Math.sin(1.7 * j));
    const r2 = re.slice();
    const i2 = im.slice();
    expect(fftInPlace(r2, i2)).toBe(true);
    for (const k of [0, 1, 5, 31, 63]) {
      let sr = 0;
      let si = 0;
      for (let j = 0; j < n; j++) {
        const ang = (-2 * Math.PI * j * k) / n;
        sr += re[j] * Math.cos(ang) - im[j] * Math.sin(ang);
        si += re[j] * Math.sin(ang) + im[j] * Math.cos(ang);
      }
      // The definition of the DFT (common practice).
      expect(Math.abs(r2[k] - sr)).toBeLessThan(1e-12);
      expect(Math.abs(i2[k] - si)).toBeLessThan(1e-12);
    }
    expect(fftInPlace(new Float64Array(6), new Float64Array(6))).toBe(false);
  });
});

describe('boxCoefficientsFromSamples', () => {
  it('reproduces the parabola coefficients from 2^14 samples, with exact parity zeros', () => {
    const L = 2.5;
    const N = 1 << 14;
    const s = samples(N, 0, L, (x) => x * (L - x) * Math.sqrt(30 / Math.pow(L, 5)));
    const c = boxCoefficientsFromSamples(s, null, 0, L, 1000);
    expect(c.ok).toBe(true);
    for (let n = 1; n <= 1000; n++) {
      // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory)
      const exact = n % 2 ? (8 * Math.sqrt(15)) / Math.pow(n * Math.PI, 3) : 0;
      if (n % 2) expect(Math.abs(c.re[n - 1] - exact)).toBeLessThan(1e-10);
      else expect(Math.abs(c.re[n - 1])).toBeLessThan(1e-14);
      expect(Math.abs(c.im[n - 1])).toBe(0);
    }
    expect(Math.abs(c.re[0] * c.re[0] - 0.998555014364018)).toBeLessThan(1e-12);
  });

  it('separates real and imaginary parts of a complex state', () => {
    const L = 1;
    const N = 256;
    // psi = phi_2 + i (phi_3 - 2 phi_5) in the box [0, 1]: exact coefficients by construction.
    const phi = (n: number, x: number) => Math.SQRT2 * Math.sin(n * Math.PI * x);
    const re = samples(N, 0, L, (x) => phi(2, x));
    const im = samples(N, 0, L, (x) => phi(3, x) - 2 * phi(5, x));
    const c = boxCoefficientsFromSamples(re, im, 0, L, 8);
    const wantRe = [0, 1, 0, 0, 0, 0, 0, 0];
    const wantIm = [0, 0, 1, 0, -2, 0, 0, 0];
    for (let k = 0; k < 8; k++) {
      // Discrete orthogonality of the sine transform (common practice).
      expect(Math.abs(c.re[k] - wantRe[k])).toBeLessThan(1e-13);
      expect(Math.abs(c.im[k] - wantIm[k])).toBeLessThan(1e-13);
    }
  });

  it('satisfies Parseval against the trapezoid norm of the grid', () => {
    const N = 1024;
    const a = -1;
    const b = 2;
    const re = samples(N, a, b, (x) => Math.exp(-((x - 0.3) ** 2) * 4) * (x - a) * (b - x));
    const im = samples(N, a, b, (x) => Math.sin(3 * x) * (x - a) * (b - x) * (x < 0.5 ? 1 : 0.2));
    const c = boxCoefficientsFromSamples(re, im, a, b, N - 1);
    let grid = 0;
    for (let j = 1; j < N; j++) grid += ((b - a) / N) * (re[j] * re[j] + im[j] * im[j]);
    let sum = 0;
    for (let k = 0; k < N - 1; k++) sum += c.re[k] ** 2 + c.im[k] ** 2;
    // Parseval for the type-I DST (common practice).
    expect(Math.abs(sum - grid)).toBeLessThan(1e-13 * grid);
  });

  it('clamps the count at N - 1 and rejects bad input', () => {
    expect(boxCoefficientsFromSamples(new Float64Array(17), null, 0, 1, 100).re.length).toBe(15);
    expect(boxCoefficientsFromSamples(new Float64Array(18), null, 0, 1, 10).ok).toBe(false);
    expect(boxCoefficientsFromSamples(new Float64Array(17), new Float64Array(3), 0, 1, 10).ok).toBe(false);
    expect(boxCoefficientsFromSamples(new Float64Array(17), null, 1, 1, 10).ok).toBe(false);
  });

  it('expands a complex state on [0, 1] into 1000 coefficients from 2^14 samples (the timing lives in bench/suite.ts)', () => {
    const N = 1 << 14;
    const re = samples(N, 0, 1, (x) => x * (1 - x));
    const im = samples(N, 0, 1, (x) => Math.sin(Math.PI * x) ** 3);
    const c = boxCoefficientsFromSamples(re, im, 0, 1, 1000);
    expect(c.ok).toBe(true);
    expect(c.re.length).toBe(1000);
    for (let n = 1; n <= 1000; n++) {
      // Derived in this comment: <sqrt(2) sin(n pi x), x (1 - x)> = 2 sqrt(2) (1 - (-1)^n) / (n pi)^3 on [0, 1].
      const wantRe = n % 2 ? (4 * Math.SQRT2) / (n * Math.PI) ** 3 : 0;
      // sin^3 t = (3 sin t - sin 3t) / 4 (common practice), so only n = 1 and n = 3 carry weight:
      // 3 / (4 sqrt 2) and -1 / (4 sqrt 2); the discrete sine transform is exact on them.
      const wantIm = n === 1 ? 3 / (4 * Math.SQRT2) : n === 3 ? -1 / (4 * Math.SQRT2) : 0;
      expect(Math.abs(c.re[n - 1] - wantRe)).toBeLessThan(1e-10);
      expect(Math.abs(c.im[n - 1] - wantIm)).toBeLessThan(1e-13);
    }
  });

  it('a call leaves nothing behind for the next of the same size (the work arrays are reused)', () => {
    const N = 256;
    const x = Float64Array.from({ length: N + 1 }, (_, j) => Math.sin((3 * Math.PI * j) / N) + 0.2 * Math.sin((7 * Math.PI * j) / N));
    const y = Float64Array.from({ length: N + 1 }, (_, j) => ((j / N) * (1 - j / N)) ** 2);
    const first = boxCoefficientsFromSamples(x, null, 0, 1, 20);
    // A complex call in between writes both work arrays; the real call after it must not see them.
    boxCoefficientsFromSamples(y, x, 0, 1, 20);
    const again = boxCoefficientsFromSamples(x, null, 0, 1, 20);
    expect(Array.from(again.re)).toEqual(Array.from(first.re));
    expect(Array.from(again.im)).toEqual(Array.from(first.im));
    // sin(3 pi x) + 0.2 sin(7 pi x) on [0, 1]: c_3 = 1/sqrt(2), c_7 = 0.2/sqrt(2), the rest 0 (orthogonality).
    expect(Math.abs(again.re[2]! - Math.SQRT1_2)).toBeLessThan(1e-14);
    expect(Math.abs(again.re[6]! - 0.2 * Math.SQRT1_2)).toBeLessThan(1e-14);
    expect(Math.max(...Array.from(again.im, Math.abs))).toBe(0);
  });
});
