/**
 * Powers: a constant exponent (real or complex), and the general u^w = exp(w log u) with both operands
 * depending on x. Each loop writes the value and, by the chain rule, the exact first and second
 * derivatives; the complex helpers write into the node's own two-slot buffer `t`.
 */
import { cdiv, clog, cmul, cpow } from './complex';
import { alloc, finish, type CNode, type F64, type Jet } from './jet';
import type { Complex } from '../types';

/** Real u^p with g1 = p u^(p-1), g2 = p (p-1) u^(p-2): y' = g1 u', y'' = g2 u'^2 + g1 u''. */
function powConstReal(u: Jet, y: Jet, n: number, o: number, pr: number): void {
  const pm = pr - 1;
  const c1 = pr * (pr - 1);
  for (let i = 0; i < n; i++) {
    const b = u.v[i]!;
    y.v[i] = Math.pow(b, pr);
    if (o >= 1) {
      const u1 = u.d1![i]!;
      const g1 = pr === 0 ? 0 : pr * Math.pow(b, pm);
      y.d1![i] = g1 * u1;
      if (o === 2) {
        const g2 = c1 === 0 ? 0 : c1 * Math.pow(b, pr - 2);
        y.d2![i] = g2 * u1 * u1 + g1 * u.d2![i]!;
      }
    }
  }
}

/** The complex counterpart of `powConstReal`, principal values throughout. */
function powConstComplex(u: Jet, y: Jet, n: number, o: number, pr: number, pi: number, t: F64): void {
  for (let i = 0; i < n; i++) {
    const br = u.v[i]!;
    const bi = u.vi![i]!;
    cpow(br, bi, pr, pi, t, 0);
    y.v[i] = t[0]!;
    y.vi![i] = t[1]!;
    if (o < 1) continue;
    let g1r = 0;
    let g1i = 0;
    if (pr !== 0 || pi !== 0) {
      cpow(br, bi, pr - 1, pi, t, 0);
      cmul(pr, pi, t[0]!, t[1]!, t, 0);
      g1r = t[0]!;
      g1i = t[1]!;
    }
    const u1r = u.d1![i]!;
    const u1i = u.d1i![i]!;
    cmul(g1r, g1i, u1r, u1i, t, 0);
    y.d1![i] = t[0]!;
    y.d1i![i] = t[1]!;
    if (o < 2) continue;
    let g2r = 0;
    let g2i = 0;
    cmul(pr, pi, pr - 1, pi, t, 0);
    const kr = t[0]!;
    const ki = t[1]!;
    if (kr !== 0 || ki !== 0) {
      cpow(br, bi, pr - 2, pi, t, 0);
      cmul(kr, ki, t[0]!, t[1]!, t, 0);
      g2r = t[0]!;
      g2i = t[1]!;
    }
    cmul(u1r, u1i, u1r, u1i, t, 0);
    cmul(g2r, g2i, t[0]!, t[1]!, t, 0);
    const ar = t[0]!;
    const ai = t[1]!;
    cmul(g1r, g1i, u.d2![i]!, u.d2i![i]!, t, 0);
    y.d2![i] = ar + t[0]!;
    y.d2i![i] = ai + t[1]!;
  }
}

/** Power with a constant exponent p (real or complex). */
export function powConst(a: CNode, p: Complex): CNode {
  const t = new Float64Array(2);
  const key = {};
  const integer = p.im === 0 && Number.isInteger(p.re);
  const even = integer && p.re % 2 === 0;
  return finish(
    {
      cst: null,
      complex: a.complex || p.im !== 0 || (!integer && !a.nonneg),
      nonneg: !a.complex && p.im === 0 && (a.nonneg || even),
      run(c) {
        const u = a.run(c);
        const y = alloc(c, key);
        if (!c.cx) powConstReal(u, y, c.n, c.order, p.re);
        else powConstComplex(u, y, c.n, c.order, p.re, p.im, t);
        return y;
      },
    },
    [a],
  );
}

/*
 * The general power y = u^w: with L = log u and g = w' L + w u'/u, y' = y g and y'' = y' g + y g',
 * g' = w'' L + 2 w' u'/u + w (u''/u - (u'/u)^2).
 */
function powGeneralReal(u: Jet, w: Jet, y: Jet, n: number, o: number): void {
  for (let i = 0; i < n; i++) {
    const p = u.v[i]!;
    const q = w.v[i]!;
    const v = Math.pow(p, q);
    y.v[i] = v;
    if (o < 1) continue;
    const L = Math.log(p);
    const p1 = u.d1![i]!;
    const q1 = w.d1![i]!;
    const g = q1 * L + (q * p1) / p;
    y.d1![i] = v * g;
    if (o === 2) {
      const p2 = u.d2![i]!;
      const gp = w.d2![i]! * L + (2 * q1 * p1) / p + (q * (p2 * p - p1 * p1)) / (p * p);
      y.d2![i] = v * g * g + v * gp;
    }
  }
}

/**
 * y'' of the complex general power at point i, given y = (vr, vi), y' = (y1r, y1i), g = (gr, gi),
 * L = log u = (Lr, Li) and r = u'/u = (rr, ri).
 */
function powGeneralSecond(u: Jet, w: Jet, y: Jet, i: number, t: F64, s: F64): void {
  const vr = s[0]!;
  const vi = s[1]!;
  const y1r = s[2]!;
  const y1i = s[3]!;
  const gr = s[4]!;
  const gi = s[5]!;
  const Lr = s[6]!;
  const Li = s[7]!;
  const rr = s[8]!;
  const ri = s[9]!;
  const pr = u.v[i]!;
  const pi = u.vi![i]!;
  cdiv(u.d2![i]!, u.d2i![i]!, pr, pi, t, 0);
  const sr = t[0]!;
  const si = t[1]!;
  cmul(rr, ri, rr, ri, t, 0);
  cmul(w.v[i]!, w.vi![i]!, sr - t[0]!, si - t[1]!, t, 0);
  let gpr = t[0]!;
  let gpi = t[1]!;
  cmul(w.d1![i]!, w.d1i![i]!, rr, ri, t, 0);
  gpr += 2 * t[0]!;
  gpi += 2 * t[1]!;
  cmul(w.d2![i]!, w.d2i![i]!, Lr, Li, t, 0);
  gpr += t[0]!;
  gpi += t[1]!;
  cmul(y1r, y1i, gr, gi, t, 0);
  const ar = t[0]!;
  const ai = t[1]!;
  cmul(vr, vi, gpr, gpi, t, 0);
  y.d2![i] = ar + t[0]!;
  y.d2i![i] = ai + t[1]!;
}

/** The complex counterpart of `powGeneralReal`, principal values throughout. */
function powGeneralComplex(u: Jet, w: Jet, y: Jet, n: number, o: number, t: F64, s: F64): void {
  for (let i = 0; i < n; i++) {
    const pr = u.v[i]!;
    const pi = u.vi![i]!;
    const qr = w.v[i]!;
    const qi = w.vi![i]!;
    cpow(pr, pi, qr, qi, t, 0);
    const vr = t[0]!;
    const vi = t[1]!;
    y.v[i] = vr;
    y.vi![i] = vi;
    if (o < 1) continue;
    clog(pr, pi, t, 0);
    const Lr = t[0]!;
    const Li = t[1]!;
    cdiv(u.d1![i]!, u.d1i![i]!, pr, pi, t, 0);
    const rr = t[0]!;
    const ri = t[1]!;
    cmul(w.d1![i]!, w.d1i![i]!, Lr, Li, t, 0);
    const t1r = t[0]!;
    const t1i = t[1]!;
    cmul(qr, qi, rr, ri, t, 0);
    const gr = t1r + t[0]!;
    const gi = t1i + t[1]!;
    cmul(vr, vi, gr, gi, t, 0);
    const y1r = t[0]!;
    const y1i = t[1]!;
    y.d1![i] = y1r;
    y.d1i![i] = y1i;
    if (o < 2) continue;
    s[0] = vr;
    s[1] = vi;
    s[2] = y1r;
    s[3] = y1i;
    s[4] = gr;
    s[5] = gi;
    s[6] = Lr;
    s[7] = Li;
    s[8] = rr;
    s[9] = ri;
    powGeneralSecond(u, w, y, i, t, s);
  }
}

/** General power u^w = exp(w log u) with both operands depending on x. */
export function powGeneral(a: CNode, b: CNode): CNode {
  const t = new Float64Array(2);
  // The first-derivative terms the second derivative reuses, owned by this node.
  const s = new Float64Array(10);
  const key = {};
  return {
    cst: null,
    complex: a.complex || b.complex || !a.nonneg,
    nonneg: a.nonneg && !b.complex,
    run(c) {
      const u = a.run(c);
      const w = b.run(c);
      const y = alloc(c, key);
      if (!c.cx) powGeneralReal(u, w, y, c.n, c.order);
      else powGeneralComplex(u, w, y, c.n, c.order, t, s);
      return y;
    },
  };
}
