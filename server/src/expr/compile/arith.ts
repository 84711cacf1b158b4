/**
 * Sums, differences, products, quotients and negation of nodes, with the product and quotient rules for
 * the exact derivatives. The quotient's complex helpers write into the node's own two-slot buffer.
 */
import { cdiv, cmul } from './complex';
import { alloc, finish, type CNode, type F64 } from './jet';

export function addSub(a: CNode, b: CNode, sign: number): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: a.complex || b.complex,
      nonneg: sign > 0 && a.nonneg && b.nonneg,
      run(c) {
        const u = a.run(c);
        const w = b.run(c);
        const y = alloc(c, key);
        const n = c.n;
        const pairs: [F64 | null, F64 | null, F64 | null][] = [
          [y.v, u.v, w.v],
          [y.vi, u.vi, w.vi],
          [y.d1, u.d1, w.d1],
          [y.d1i, u.d1i, w.d1i],
          [y.d2, u.d2, w.d2],
          [y.d2i, u.d2i, w.d2i],
        ];
        for (const [out, p, q] of pairs) {
          if (!out) continue;
          if (sign > 0) for (let i = 0; i < n; i++) out[i] = p![i]! + q![i]!;
          else for (let i = 0; i < n; i++) out[i] = p![i]! - q![i]!;
        }
        return y;
      },
    },
    [a, b],
  );
}

export function mul(a: CNode, b: CNode): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: a.complex || b.complex,
      nonneg: a.nonneg && b.nonneg,
      run(c) {
        const u = a.run(c);
        const w = b.run(c);
        const y = alloc(c, key);
        const n = c.n;
        const o = c.order;
        if (!c.cx) {
          for (let i = 0; i < n; i++) {
            const p = u.v[i]!;
            const q = w.v[i]!;
            y.v[i] = p * q;
            if (o >= 1) {
              const p1 = u.d1![i]!;
              const q1 = w.d1![i]!;
              y.d1![i] = p1 * q + p * q1;
              if (o === 2) y.d2![i] = u.d2![i]! * q + 2 * p1 * q1 + p * w.d2![i]!;
            }
          }
          return y;
        }
        for (let i = 0; i < n; i++) {
          const pr = u.v[i]!;
          const pi = u.vi![i]!;
          const qr = w.v[i]!;
          const qi = w.vi![i]!;
          if (pi === 0 && qi === 0) {
            y.v[i] = pr * qr;
            y.vi![i] = 0;
          } else {
            y.v[i] = pr * qr - pi * qi;
            y.vi![i] = pr * qi + pi * qr;
          }
          if (o >= 1) {
            const p1r = u.d1![i]!;
            const p1i = u.d1i![i]!;
            const q1r = w.d1![i]!;
            const q1i = w.d1i![i]!;
            y.d1![i] = p1r * qr - p1i * qi + pr * q1r - pi * q1i;
            y.d1i![i] = p1r * qi + p1i * qr + pr * q1i + pi * q1r;
            if (o === 2) {
              const p2r = u.d2![i]!;
              const p2i = u.d2i![i]!;
              const q2r = w.d2![i]!;
              const q2i = w.d2i![i]!;
              y.d2![i] = p2r * qr - p2i * qi + 2 * (p1r * q1r - p1i * q1i) + pr * q2r - pi * q2i;
              y.d2i![i] = p2r * qi + p2i * qr + 2 * (p1r * q1i + p1i * q1r) + pr * q2i + pi * q2r;
            }
          }
        }
        return y;
      },
    },
    [a, b],
  );
}

export function div(a: CNode, b: CNode): CNode {
  // Output slots of the complex helpers, owned by this node.
  const t = new Float64Array(2);
  const key = {};
  return finish(
    {
      cst: null,
      complex: a.complex || b.complex,
      nonneg: a.nonneg && b.nonneg,
      run(c) {
        const u = a.run(c);
        const w = b.run(c);
        const y = alloc(c, key);
        const n = c.n;
        const o = c.order;
        // y = u/w; y' = (u' - y w')/w; y'' = (u'' - 2 y' w' - y w'')/w.
        if (!c.cx) {
          for (let i = 0; i < n; i++) {
            const q = w.v[i]!;
            const v = u.v[i]! / q;
            y.v[i] = v;
            if (o >= 1) {
              const q1 = w.d1![i]!;
              const v1 = (u.d1![i]! - v * q1) / q;
              y.d1![i] = v1;
              if (o === 2) y.d2![i] = (u.d2![i]! - 2 * v1 * q1 - v * w.d2![i]!) / q;
            }
          }
          return y;
        }
        for (let i = 0; i < n; i++) {
          const qr = w.v[i]!;
          const qi = w.vi![i]!;
          cdiv(u.v[i]!, u.vi![i]!, qr, qi, t, 0);
          const vr = t[0]!;
          const vi = t[1]!;
          y.v[i] = vr;
          y.vi![i] = vi;
          if (o >= 1) {
            const q1r = w.d1![i]!;
            const q1i = w.d1i![i]!;
            cmul(vr, vi, q1r, q1i, t, 0);
            cdiv(u.d1![i]! - t[0]!, u.d1i![i]! - t[1]!, qr, qi, t, 0);
            const v1r = t[0]!;
            const v1i = t[1]!;
            y.d1![i] = v1r;
            y.d1i![i] = v1i;
            if (o === 2) {
              cmul(v1r, v1i, q1r, q1i, t, 0);
              const tr = 2 * t[0]!;
              const ti = 2 * t[1]!;
              cmul(vr, vi, w.d2![i]!, w.d2i![i]!, t, 0);
              cdiv(u.d2![i]! - tr - t[0]!, u.d2i![i]! - ti - t[1]!, qr, qi, t, 0);
              y.d2![i] = t[0]!;
              y.d2i![i] = t[1]!;
            }
          }
        }
        return y;
      },
    },
    [a, b],
  );
}

export function neg(a: CNode): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: a.complex,
      nonneg: false,
      run(c) {
        const u = a.run(c);
        const y = alloc(c, key);
        const n = c.n;
        const pairs: [F64 | null, F64 | null][] = [
          [y.v, u.v],
          [y.vi, u.vi],
          [y.d1, u.d1],
          [y.d1i, u.d1i],
          [y.d2, u.d2],
          [y.d2i, u.d2i],
        ];
        for (const [out, p] of pairs) if (out) for (let i = 0; i < n; i++) out[i] = -p![i]!;
        return y;
      },
    },
    [a],
  );
}

