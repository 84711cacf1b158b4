/**
 * The box transform's error estimate (analysis/boxTransform.ts: the coefficient tail of one transform of
 * the level count's power of two, and the samples' interpolant checked between samples) bounds the true
 * error of every coefficient, checked against closed forms and against an independent quadrature written
 * in this test: Gaussian packets of several widths, momenta and centres, packets at and near a wall,
 * content just above the levels and content that aliases onto a level inside, and the box examples.
 */
import { describe, expect, it } from 'vitest';
import { expandState } from '../../server/src/analysis/expand';
import { eigenState, gaussianState, type StateFunction } from '../../server/src/analysis/systems';
import { boxTransform } from '../../server/src/analysis/boxTransform';
import { boxBasis } from '../../server/src/physics/box';
import { createBudget } from '../../server/src/physics/budget';
import { packetAliasBound } from '../../server/src/analysis/packetPremise';

/**
 * Gauss-Legendre nodes and weights on [-1, 1] by Newton's method on the Legendre recurrence (common
 * practice; Numerical Recipes' gauleg from memory), written here so the reference shares no code with the engine.
 */
function legendre(n: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < (n + 1) >> 1; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p1 = 1;
      let p2 = 0;
      for (let j = 1; j <= n; j++) {
        const p3 = p2;
        p2 = p1;
        p1 = ((2 * j - 1) * z * p2 - (j - 1) * p3) / j;
      }
      dp = (n * (z * p1 - p2)) / (z * z - 1);
      const z1 = z;
      z = z1 - p1 / dp;
      if (Math.abs(z - z1) < 1e-16) break;
    }
    x[i] = -z;
    x[n - 1 - i] = z;
    w[i] = w[n - 1 - i] = 2 / ((1 - z * z) * dp * dp);
  }
  return { x, w };
}

/**
 * The first `levels` coefficients sqrt(2/L) integral sin(n pi (x - a)/L) psi dx on [a, b] by a composite
 * 24-point rule of `panels` panels split at `cuts` (psi from the state itself), with the sum of |terms|
 * (its rounding is a few eps of that).
 */
function reference(state: StateFunction, a: number, b: number, levels: number, panels: number, cuts: number[] = []) {
  const g = legendre(24);
  const edges = [a, ...cuts, b];
  const xs: number[] = [];
  const ws: number[] = [];
  for (let p = 0; p + 1 < edges.length; p++) {
    const [lo, hi] = [edges[p]!, edges[p + 1]!];
    const m = Math.max(1, Math.round((panels * (hi - lo)) / (b - a)));
    for (let q = 0; q < m; q++) {
      const c = lo + ((q + 0.5) * (hi - lo)) / m;
      const h = (hi - lo) / (2 * m);
      for (let j = 0; j < 24; j++) {
        xs.push(c + h * g.x[j]!);
        ws.push(h * g.w[j]!);
      }
    }
  }
  const x = Float64Array.from(xs);
  const v = state.evaluate(x, 0);
  const L = b - a;
  const amp = Math.sqrt(2 / L);
  const re = new Float64Array(levels);
  const im = new Float64Array(levels);
  const abs = new Float64Array(levels);
  for (let k = 0; k < levels; k++) {
    const q = ((k + 1) * Math.PI) / L;
    let sr = 0;
    let si = 0;
    let sa = 0;
    for (let j = 0; j < x.length; j++) {
      const s = amp * ws[j]! * Math.sin(q * (x[j]! - a));
      sr += s * v.re[j]!;
      si += s * v.im[j]!;
      sa += Math.abs(s) * Math.hypot(v.re[j]!, v.im[j]!);
    }
    re[k] = sr;
    im[k] = si;
    abs[k] = sa;
  }
  return { re, im, abs };
}

/**
 * Every |c_n - exact_n| (both as written) within the stated error plus the reference's own rounding; the
 * estimate within the two-grid contract (1e-12 of sqrt(norm)). Returns the smallest ratio stated / true.
 */
function checkStated(got: { re: Float64Array; im: Float64Array; error: Float64Array }, exact: { re: ArrayLike<number>; im: ArrayLike<number> }, levels: number, norm: number, refRound: (k: number) => number = () => 0): number {
  let ratio = Infinity;
  for (let k = 0; k < levels; k++) {
    const err = Math.hypot(got.re[k]! - exact.re[k]!, got.im[k]! - exact.im[k]!);
    expect(got.error[k]! + refRound(k), `level ${k + 1}`).toBeGreaterThanOrEqual(err);
    expect(got.error[k]!).toBeLessThanOrEqual(1e-12 * Math.sqrt(norm));
    if (err > 0) ratio = Math.min(ratio, got.error[k]! / err);
  }
  return ratio;
}

const budget = () => createBudget();

/**
 * The packet's box coefficients when its tails beyond the walls are negligible (below 1e-40 at 14 widths):
 * c_n = sqrt 2 A sqrt(4 pi) s / (2i) [e^{i(k+q)x0 - (k+q)^2 s^2} - e^{i(k-q)x0 - (k-q)^2 s^2}], q = n pi, on
 * [0, 1] (the Gaussian Fourier integral; derived in test/analysis/coefficientBounds.test.ts).
 */
function packetExact(x0: number, s: number, kk: number, levels: number) {
  const pref = Math.SQRT2 * Math.pow(2 * Math.PI * s * s, -0.25) * Math.sqrt(4 * Math.PI) * s * 0.5;
  const re = new Float64Array(levels);
  const im = new Float64Array(levels);
  for (let k = 0; k < levels; k++) {
    const q = (k + 1) * Math.PI;
    const gp = Math.exp(-((kk + q) ** 2) * s * s);
    const gm = Math.exp(-((kk - q) ** 2) * s * s);
    const ar = gp * Math.cos((kk + q) * x0) - gm * Math.cos((kk - q) * x0);
    const ai = gp * Math.sin((kk + q) * x0) - gm * Math.sin((kk - q) * x0);
    re[k] = pref * ai;
    im[k] = -pref * ar;
  }
  return { re, im };
}

describe('one transform of the level count\'s power of two, its error from the tail (closed forms)', () => {
  // [centre, width, momentum, levels]: at least 12.5 widths from either wall.
  const packets: [number, number, number, number][] = [
    [0.5, 0.04, 150, 200],
    [0.3, 0.015, -420, 300],
    [0.62, 0.025, 0, 100],
    [0.45, 0.02, 800, 400],
    [0.55, 0.008, 2000, 1000],
  ];
  for (const [x0, s, kk, levels] of packets) {
    it(`packet at ${x0}, width ${s}, momentum ${kk}, ${levels} levels`, () => {
      const state = gaussianState(x0, s, kk);
      const basis = boxBasis(0, 1, 1, levels);
      const exact = packetExact(x0, s, kk, levels);
      // Rounding of the closed form and of the state's own phase: a few eps of the prefactor, and the phases
      // (k +- q) x, up to |k| + q on [0, 1], are rounded at eps of their size (Math.PI and the products), which
      // moves c_n by that times |c_n| (derived in this comment).
      const refRound = (k: number): number => 8 * Number.EPSILON + 4 * Number.EPSILON * (Math.abs(kk) + (k + 1) * Math.PI) * Math.hypot(exact.re[k]!, exact.im[k]!);
      const fast = boxTransform(state, basis, levels, [], 1 << 18, budget())!;
      expect(fast).not.toBeNull();
      checkStated(fast, exact, levels, 1, refRound);
      // With the packet's closed form as the premise (no midpoint check) the contract holds the same.
      const proven = boxTransform(state, basis, levels, [], 1 << 18, budget(), { center: x0, width: s, momentum: kk })!;
      expect(packetAliasBound({ center: x0, width: s, momentum: kk }, [0, 1], levels, proven.samples - 1)).toBeLessThan(1e-14);
      checkStated(proven, exact, levels, 1, refRound);
      const ex = expandState(state, basis, levels, [0, 1], { maxGridPoints: 1 << 18, budget: budget() });
      expect(ex.stopped).toBeNull();
      checkStated(ex, exact, levels, ex.norm, refRound);
      // The norm 1 (the packet is normalised on the line and its tails are negligible).
      expect(Math.abs(ex.norm - 1)).toBeLessThan(1e-13);
    });
  }

  it('200 levels of the side-by-side packet take 256 intervals, one transform', () => {
    const b = budget();
    const fast = boxTransform(gaussianState(0.5, 0.04, 150), boxBasis(0, 1, 1, 200), 200, [], 1 << 18, b)!;
    // The smallest power of two with 16 tail coefficients between 201 and 0.85 N: 256 (217 - 201 + 1 = 17).
    expect(fast.samples).toBe(257);
    // The transform (6 N log2 N) and the interpolant at six points (4 N each) for N = 256, counted once.
    expect(b.work.ops).toBeLessThanOrEqual(6 * 256 * 8 + 6 * 4 * 256);
  });
});

describe('the packet premise (analysis/packetPremise.ts)', () => {
  it('bounds the side-by-side packet\'s aliases far below the tolerance and refuses near a wall or past the band', () => {
    // 0.5 / 0.04 = 12.5 widths from both walls: exp(-39.06) = 1.1e-17 times l = 150 + 156.25 + 50 over the
    // first alias q = 312 pi, squared, is about 1e-20 (derived in this comment).
    expect(packetAliasBound({ center: 0.5, width: 0.04, momentum: 150 }, [0, 1], 200, 256)).toBeLessThan(1e-18);
    // 2.5 widths from a wall: exp(-1.56) (l + 2 s^2 l^2 / d) / q^2 with l = 150 + 31.25 + 50 is about 1e-4.
    expect(packetAliasBound({ center: 0.1, width: 0.04, momentum: 150 }, [0, 1], 200, 256)).toBeGreaterThan(1e-6);
    // Momentum 960 against the first alias 312 pi = 980.2: exp(-(20.2 * 0.04)^2) = 0.52 of the packet's spectrum.
    expect(packetAliasBound({ center: 0.5, width: 0.04, momentum: 960 }, [0, 1], 200, 256)).toBeGreaterThan(0.1);
    // At or above the first alias the bound does not apply.
    expect(packetAliasBound({ center: 0.5, width: 0.04, momentum: 1000 }, [0, 1], 200, 256)).toBe(Infinity);
  });
});

describe('packets at and near a wall: an independent quadrature as the reference', () => {
  // [centre, width, momentum, levels]: the wall value is nonzero, so the boundary finding follows and the
  // remainder keeps psi'' at the wall (coefficients as n^-3).
  const packets: [number, number, number, number][] = [
    [0.06, 0.03, 120, 200],
    [0.97, 0.02, -60, 150],
    [0, 0.05, 40, 100],
    [0.15, 0.012, 300, 250],
  ];
  for (const [x0, s, kk, levels] of packets) {
    it(`packet at ${x0}, width ${s}, momentum ${kk}, ${levels} levels`, () => {
      const state = gaussianState(x0, s, kk);
      const basis = boxBasis(0, 1, 1, levels);
      // 24-point panels with k h <= 2 for the highest level: converged far below 1e-16 (common practice).
      const ref = reference(state, 0, 1, levels, 1200);
      const ex = expandState(state, basis, levels, [0, 1], { maxGridPoints: 1 << 18, budget: budget() });
      expect(ex.stopped).toBeNull();
      checkStated(ex, ref, levels, ex.norm, (k) => 8 * Number.EPSILON * ref.abs[k]!);
      const fast = boxTransform(state, basis, levels, [], 1 << 18, budget());
      if (fast) checkStated(fast, ref, levels, ex.norm, (k) => 8 * Number.EPSILON * ref.abs[k]!);
    });
  }
});

describe('content the samples could alias', () => {
  /** psi = sum of a_n phi_n, with its exact coefficients a_n (orthonormal levels). */
  function levelSum(terms: [number, number, number][], levels: number) {
    const state: StateFunction = {
      evaluate(xs, order) {
        const n = xs.length;
        const re = new Float64Array(n);
        const im = new Float64Array(n);
        for (let j = 0; j < n; j++) {
          for (const [m, ar, ai] of terms) {
            const s = Math.SQRT2 * Math.sin(m * Math.PI * xs[j]!);
            re[j] += ar * s;
            im[j] += ai * s;
          }
        }
        const out: ReturnType<StateFunction['evaluate']> = { re, im };
        if (order >= 1) {
          out.d1re = new Float64Array(n);
          out.d1im = new Float64Array(n);
          for (let j = 0; j < n; j++) {
            for (const [m, ar, ai] of terms) {
              const c = Math.SQRT2 * m * Math.PI * Math.cos(m * Math.PI * xs[j]!);
              out.d1re[j] += ar * c;
              out.d1im[j] += ai * c;
            }
          }
        }
        if (order >= 2) {
          out.d2re = new Float64Array(n);
          out.d2im = new Float64Array(n);
          for (let j = 0; j < n; j++) {
            for (const [m, ar, ai] of terms) {
              const s = -Math.SQRT2 * (m * Math.PI) ** 2 * Math.sin(m * Math.PI * xs[j]!);
              out.d2re[j] += ar * s;
              out.d2im[j] += ai * s;
            }
          }
        }
        return out;
      },
      breakpoints: () => [],
      support: null,
      window: null,
      walls: null,
    };
    const re = new Float64Array(levels);
    const im = new Float64Array(levels);
    for (const [m, ar, ai] of terms) {
      if (m <= levels) {
        re[m - 1]! += ar;
        im[m - 1]! += ai;
      }
    }
    return { state, exact: { re, im } };
  }

  it('a component at level 412 lands on level 100 of a 256-interval transform; the interpolant sees it', () => {
    // 412 = 2 * 256 - 100 and 4 * 128 - 100: it aliases alike onto level 100 in the transforms of 256 and
    // of 128 intervals, and the tail above 200 holds nothing.
    const terms: [number, number, number][] = [
      [1, 0.8, 0],
      [3, 0, 0.6],
      [412, 1e-4, 0],
    ];
    const { state, exact } = levelSum(terms, 200);
    const basis = boxBasis(0, 1, 1, 200);
    const norm = 0.64 + 0.36 + 1e-8;
    // The interpolant misses the component by about 1e-4 between the samples; the tail of 512 intervals
    // holds it, and the estimate, not falling from 256 to 512, gives up: the quadrature takes over.
    const fast = boxTransform(state, basis, 200, [], 1 << 18, budget());
    if (fast) checkStated(fast, exact, 200, norm);
    const ex = expandState(state, basis, 200, [0, 1], { maxGridPoints: 1 << 18, budget: budget() });
    expect(ex.stopped).toBeNull();
    expect(Math.abs(ex.re[99]!)).toBeLessThan(1e-12);
    checkStated(ex, exact, 200, norm);
  });

  it('content just above the levels: the tail says so and the samples double', () => {
    // Weights exp(-((n - 180)/30)^2) up to n = 320 with a phase per level, 200 levels asked.
    const terms: [number, number, number][] = [];
    for (let n = 1; n <= 320; n++) {
      const a = Math.exp(-(((n - 180) / 30) ** 2));
      terms.push([n, a * Math.cos(0.7 * n), a * Math.sin(0.7 * n)]);
    }
    const { state, exact } = levelSum(terms, 200);
    let norm = 0;
    for (const [, ar, ai] of terms) norm += ar * ar + ai * ai;
    const fast = boxTransform(state, boxBasis(0, 1, 1, 200), 200, [], 1 << 18, budget())!;
    expect(fast.samples).toBeGreaterThan(257);
    checkStated(fast, exact, 200, norm);
  });
});

describe('the box examples', () => {
  it('a level of a narrower box released into a wider one (the gate-release example, natural units)', () => {
    // phi_1 of box(2, 6) on box(0, 10): with al = pi/4, be = n pi/10, the overlap is
    // sqrt(2/4) sqrt(2/10) (1/2) [ (sin((al - be) x - 2 al) / (al - be)) - (sin((al + be) x - 2 al) / (al + be)) ] from 2 to 6
    // (the product of two sines as a difference of cosines; derived in this comment). Its weight 1 is the
    // example's expect line, 0.5440635071.
    const levels = 150;
    const exact = { re: new Float64Array(levels), im: new Float64Array(levels) };
    const al = Math.PI / 4;
    for (let k = 0; k < levels; k++) {
      const be = ((k + 1) * Math.PI) / 10;
      const f = (x: number): number => Math.sin((al - be) * x - 2 * al) / (al - be) - Math.sin((al + be) * x - 2 * al) / (al + be);
      exact.re[k] = Math.sqrt(2 / 4) * Math.sqrt(2 / 10) * 0.5 * (f(6) - f(2));
    }
    expect(exact.re[0]! ** 2).toBeCloseTo(0.5440635071, 9);
    const state = eigenState(boxBasis(2, 6, 1, 1), 0);
    const basis = boxBasis(0, 10, 1, levels);
    const fast = boxTransform(state, basis, levels, [2, 6], 1 << 18, budget())!;
    expect(fast).not.toBeNull();
    // The closed form's rounding: a few eps of its terms, each up to 1/(al - be) (derived in this comment).
    const refRound = (k: number): number => 16 * Number.EPSILON * (1 + 1 / Math.abs(al - ((k + 1) * Math.PI) / 10));
    checkStated(fast, exact, levels, 1, refRound);
    const ex = expandState(state, basis, levels, [0, 10], { maxGridPoints: 1 << 18, budget: budget() });
    checkStated(ex, exact, levels, ex.norm, refRound);
  });
});
