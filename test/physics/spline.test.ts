/**
 * The not-a-knot cubic spline (server/src/physics/spline.ts) against facts derived in this comment:
 * it reproduces any cubic exactly (the not-a-knot ends impose nothing a cubic breaks), and for a smooth
 * function its maximum error falls as h^4 (de Boor, "A Practical Guide to Splines", ch. IV, from memory).
 */
import { describe, expect, it } from 'vitest';
import { evaluateSpline, notAKnotSpline } from '../../server/src/physics/spline';

function grid(a: number, b: number, n: number, jitter = 0): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = a + ((b - a) * i) / (n - 1) + (i > 0 && i < n - 1 ? jitter * Math.sin(7 * i) * ((b - a) / (n - 1)) : 0);
  return x;
}

describe('not-a-knot cubic spline', () => {
  it('reproduces a cubic, its slope and its curvature exactly, on uneven knots too', () => {
    const f = (t: number): number => 2 - 3 * t + 0.5 * t * t + 1.25 * t * t * t;
    const df = (t: number): number => -3 + t + 3.75 * t * t;
    const d2f = (t: number): number => 1 + 7.5 * t;
    for (const n of [4, 5, 9, 40]) {
      const x = grid(-1, 2, n, 0.3);
      const s = notAKnotSpline(x, x.map(f));
      const ts = grid(-1, 2, 301);
      const v = new Float64Array(ts.length);
      const d1 = new Float64Array(ts.length);
      const d2 = new Float64Array(ts.length);
      evaluateSpline(s, ts, v, d1, d2);
      for (let j = 0; j < ts.length; j++) {
        expect(v[j]).toBeCloseTo(f(ts[j]!), 11);
        expect(d1[j]).toBeCloseTo(df(ts[j]!), 9);
        expect(d2[j]).toBeCloseTo(d2f(ts[j]!), 8);
      }
    }
  });

  it('is zero outside the samples', () => {
    const x = grid(0, 1, 6);
    const s = notAKnotSpline(x, x.map((t) => 1 + t));
    const out = new Float64Array(2);
    evaluateSpline(s, Float64Array.from([-0.1, 1.1]), out);
    expect([...out]).toEqual([0, 0]);
  });

  it('converges as h^4 for sin(x) (observed order between 3.8 and 4.4: it approaches 4 from above as the end intervals matter less)', () => {
    const errs: number[] = [];
    for (const n of [81, 161, 321, 641]) {
      const x = grid(0, 3, n);
      const s = notAKnotSpline(x, x.map(Math.sin));
      const ts = grid(0, 3, 8 * (n - 1) + 1);
      const v = new Float64Array(ts.length);
      evaluateSpline(s, ts, v);
      let e = 0;
      for (let j = 0; j < ts.length; j++) e = Math.max(e, Math.abs(v[j]! - Math.sin(ts[j]!)));
      errs.push(e);
    }
    for (let k = 1; k < errs.length; k++) {
      const order = Math.log2(errs[k - 1]! / errs[k]!);
      expect(order).toBeGreaterThan(3.8);
      expect(order).toBeLessThan(4.4);
    }
  });
});
