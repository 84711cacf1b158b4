import { describe, it, expect } from 'vitest';
import { fitDecay } from '../../server/src/physics/decay';
import { boxBasis } from '../../server/src/physics/box';
import { project } from '../../server/src/physics/project';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { boxCoefficientsFromSamples } from '../../server/src/physics/dst';

const L = 1.3;
const labels = (n: number) => Float64Array.from({ length: n }, (_, k) => k + 1);

/** Box weights |c_n|^2, n = 1..count, of psi (not normalised) by the sine transform of 2^14 samples. */
function dstWeights(psi: (x: number) => number, count: number): Float64Array {
  const N = 1 << 14;
  const s = Float64Array.from({ length: N + 1 }, (_, j) => psi((L * j) / N));
  const c = boxCoefficientsFromSamples(s, null, 0, L, count);
  return Float64Array.from(c.re, (v) => v * v);
}

/** Box weights by quadrature split at the given breakpoints. */
function quadWeights(psi: (x: number) => number, count: number, breakpoints: number[] = []): Float64Array {
  const b = boxBasis(0, L, 1, count);
  const q = compositeGaussLegendre(0, L, { breakpoints, panels: 64, order: 24 });
  const c = project(b, q, Float64Array.from(q.x, psi), null, count);
  return Float64Array.from(c.re, (v) => v * v);
}

describe('fitDecay', () => {
  it('constant state: p = 1, a jump (nonzero at the walls)', () => {
    const f = fitDecay(labels(200), quadWeights(() => 1, 200));
    // Boyd, Chebyshev and Fourier Spectral Methods, ch. 2 (from memory): a jump gives 1/n.
    expect(Math.abs((f.exponent ?? 0) - 1)).toBeLessThan(1e-3);
    expect(f.classification).toBe('jump');
    expect(f.derivativeJump).toBe(0);
    // Half the levels are parity zeros and were skipped.
    expect(Math.abs(f.density - 0.5)).toBeLessThan(0.02);
  });

  it('triangle state: p = 2, a kink', () => {
    const f = fitDecay(labels(400), dstWeights((x) => Math.min(x, L - x), 400));
    // Boyd, Chebyshev and Fourier Spectral Methods, ch. 2 (from memory): a kink gives 1/n^2.
    expect(Math.abs((f.exponent ?? 0) - 2)).toBeLessThan(1e-3);
    expect(f.classification).toBe('kink');
  });

  it('kink at a generic point: p = 2 from the block envelope', () => {
    const x0 = 0.3137 * L;
    const psi = (x: number) => (x < x0 ? x / x0 : (L - x) / (L - x0));
    const f = fitDecay(labels(400), quadWeights(psi, 400, [x0]), { block: 6 });
    // Same source: 1/n^2, modulated by |sin(n pi x0/L)|.
    expect(Math.abs((f.exponent ?? 0) - 2)).toBeLessThan(0.1);
    expect(f.classification).toBe('kink');
  });

  it('parabola x(L - x): p = 3, a jump in psi" at the walls', () => {
    const f = fitDecay(labels(1000), dstWeights((x) => x * (L - x), 1000));
    // Boyd, Chebyshev and Fourier Spectral Methods, ch. 2 (from memory): a jump in psi'' gives 1/n^3.
    expect(Math.abs((f.exponent ?? 0) - 3)).toBeLessThan(1e-3);
    expect(f.classification).toBe('algebraic');
    expect(f.derivativeJump).toBe(2);
    // Amplitude of |c_n| ~ A n^-3 for psi normalised: A = 8 sqrt(15)/pi^3 (Griffiths, parabola example (from memory)).
    const norm = Math.pow(L, 5) / 30;
    expect(Math.abs(f.amplitude / Math.sqrt(norm) / ((8 * Math.sqrt(15)) / Math.PI ** 3) - 1)).toBeLessThan(1e-3);
  });

  it('a narrow Gaussian and a finite combination are smooth', () => {
    const g = fitDecay(labels(200), dstWeights((x) => Math.exp(-((x - L / 2) ** 2) / (2 * (L / 20) ** 2)), 200));
    expect(g.classification).toBe('smooth');
    const s3 = fitDecay(labels(50), dstWeights((x) => Math.sin((Math.PI * x) / L) ** 3, 50));
    expect(s3.classification).toBe('smooth');
  });

  it('tells geometric decay from a power law', () => {
    const n = 60;
    const geo = Float64Array.from(labels(n), (k) => Math.pow(0.7, 2 * k));
    const f = fitDecay(labels(n), geo);
    expect(f.exponent).toBeNull();
    expect(f.classification).toBe('smooth');
    expect(Math.abs((f.rate ?? 0) - Math.log(1 / 0.7))).toBeLessThan(1e-12);
    const pow = fitDecay(labels(n), Float64Array.from(labels(n), (k) => Math.pow(k, -2.5)));
    expect(Math.abs((pow.exponent ?? 0) - 1.25)).toBeLessThan(1e-12);
    expect(pow.classification).toBe('jump');
  });

  it('reports unknown with too few points', () => {
    expect(fitDecay(labels(4), Float64Array.of(1, 0.5, 0.2, 0.1)).classification).toBe('unknown');
    expect(fitDecay(labels(3), new Float64Array(3)).classification).toBe('unknown');
  });
});
