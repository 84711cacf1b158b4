/**
 * Nodes of the built-in functions and of the logical and piecewise forms: holomorphic functions through
 * their table kernels, piecewise-flat results (comparisons, steps), selection (`?:`, min, max), abs, the
 * real and imaginary parts, atan2 and the eigenfunctions `phi(n, x)`.
 */
import { chypot } from './complex';
import { alloc, finish, type CNode, type Ctx, type F64, type Jet } from './jet';
import { KERNEL_BUFFER } from '../builtins/kernels';
import type { Builtin } from '../builtins/table';

/**
 * A holomorphic built-in applied to a node's values, with the chain rule y' = f'(u) u',
 * y'' = f''(u) u'^2 + f'(u) u''. `k` is the node's own kernel buffer.
 */
function applyHolomorphic(c: Ctx, u: Jet, f: Builtin, k: F64, key: object): Jet {
  const y = alloc(c, key);
  const n = c.n;
  const o = c.order;
  const rk = f.real!;
  if (!c.cx) {
    const uv = u.v;
    for (let i = 0; i < n; i++) {
      rk(uv[i]!, k);
      y.v[i] = k[0]!;
      if (o >= 1) {
        const u1 = u.d1![i]!;
        y.d1![i] = k[1]! * u1;
        if (o === 2) y.d2![i] = k[2]! * u1 * u1 + k[1]! * u.d2![i]!;
      }
    }
    return y;
  }
  const ck = f.complex!;
  // On real arguments inside the real domain the real kernel runs, as mathjs uses its number functions.
  const [lo, hi] = f.realDomain ?? [-Infinity, Infinity];
  for (let i = 0; i < n; i++) {
    const ar = u.v[i]!;
    if (u.vi![i] === 0 && ar >= lo && ar <= hi) {
      rk(ar, k);
      k[4] = k[2]!;
      k[2] = k[1]!;
      k[1] = 0;
      k[3] = 0;
      k[5] = 0;
    } else ck(ar, u.vi![i]!, k);
    y.v[i] = k[0]!;
    y.vi![i] = k[1]!;
    if (o >= 1) {
      const f1r = k[2]!;
      const f1i = k[3]!;
      const u1r = u.d1![i]!;
      const u1i = u.d1i![i]!;
      y.d1![i] = f1r * u1r - f1i * u1i;
      y.d1i![i] = f1r * u1i + f1i * u1r;
      if (o === 2) {
        const sqr = u1r * u1r - u1i * u1i;
        const sqi = 2 * u1r * u1i;
        const u2r = u.d2![i]!;
        const u2i = u.d2i![i]!;
        y.d2![i] = k[4]! * sqr - k[5]! * sqi + f1r * u2r - f1i * u2i;
        y.d2i![i] = k[4]! * sqi + k[5]! * sqr + f1r * u2i + f1i * u2r;
      }
    }
  }
  return y;
}

/** A real-valued, piecewise-flat result (comparisons, floor, sign...): value only, zero derivatives. */
export function flat(args: CNode[], f: (vals: Jet[], i: number) => number, nonneg: boolean): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: false,
      nonneg,
      run(c) {
        const js = args.map((a) => a.run(c));
        const y = alloc(c, key);
        for (let i = 0; i < c.n; i++) y.v[i] = f(js, i);
        return y;
      },
    },
    args,
  );
}

const re0 = (j: Jet, i: number) => j.v[i]!;
export const truthy = (j: Jet, i: number) => j.v[i]! !== 0 || (j.vi !== null && j.vi[i]! !== 0);

export function compare(op: string, a: CNode, b: CNode): CNode {
  const t: Record<string, (p: number, q: number) => boolean> = {
    '<': (p, q) => p < q,
    '<=': (p, q) => p <= q,
    '>': (p, q) => p > q,
    '>=': (p, q) => p >= q,
    '==': (p, q) => p === q,
    '!=': (p, q) => p !== q,
  };
  const f = t[op]!;
  if (op === '==' || op === '!=') {
    // Equality compares both parts.
    const eq = op === '==';
    return flat([a, b], ([u, w], i) => (((u!.v[i] === w!.v[i]) && (u!.vi ? u!.vi[i] : 0) === (w!.vi ? w!.vi[i] : 0)) === eq ? 1 : 0), true);
  }
  return flat([a, b], ([u, w], i) => (f(re0(u!, i), re0(w!, i)) ? 1 : 0), true);
}

/** Picks between two jets per point: out = sel ? p : q (all parts and derivatives). */
function select(c: Ctx, key: object, sel: (i: number) => boolean, p: Jet, q: Jet): Jet {
  const y = alloc(c, key);
  const keys = ['v', 'vi', 'd1', 'd1i', 'd2', 'd2i'] as const;
  for (const k of keys) {
    const out = y[k];
    if (!out) continue;
    const a = p[k]!;
    const b = q[k]!;
    for (let i = 0; i < c.n; i++) out[i] = sel(i) ? a[i]! : b[i]!;
  }
  return y;
}

export function conditional(t: CNode, a: CNode, b: CNode): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: a.complex || b.complex,
      nonneg: a.nonneg && b.nonneg,
      run(c) {
        const tj = t.run(c);
        return select(c, key, (i) => truthy(tj, i), a.run(c), b.run(c));
      },
    },
    [t, a, b],
  );
}

/** |u|: for real u, |u|' = sign(u) u'; for complex u, |u|' = Re(conj(u) u')/|u|, |u|'' = (|u'|^2 + Re(conj(u) u'') - |u|'^2)/|u|. */
export function absNode(a: CNode): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: false,
      nonneg: true,
      run(c) {
        const u = a.run(c);
        const y = alloc(c, key);
        const o = c.order;
        for (let i = 0; i < c.n; i++) {
          const ur = u.v[i]!;
          if (!c.cx) {
            y.v[i] = Math.abs(ur);
            const s = ur > 0 ? 1 : ur < 0 ? -1 : 0;
            if (o >= 1) y.d1![i] = s * u.d1![i]!;
            if (o === 2) y.d2![i] = s * u.d2![i]!;
            continue;
          }
          const ui = u.vi![i]!;
          const m = ui === 0 ? Math.abs(ur) : chypot(ur, ui);
          y.v[i] = m;
          if (o >= 1) {
            const u1r = u.d1![i]!;
            const u1i = u.d1i![i]!;
            const m1 = m === 0 ? 0 : (ur * u1r + ui * u1i) / m;
            y.d1![i] = m1;
            if (o === 2)
              y.d2![i] = m === 0 ? 0 : (u1r * u1r + u1i * u1i + ur * u.d2![i]! + ui * u.d2i![i]! - m1 * m1) / m;
          }
        }
        return y;
      },
    },
    [a],
  );
}

/** re, im, conj: linear, so derivatives are taken part by part. */
export function partNode(a: CNode, which: 're' | 'im' | 'conj'): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: which === 'conj' ? a.complex : false,
      nonneg: which === 'conj' ? a.nonneg : which === 're' ? a.nonneg : false,
      run(c) {
        const u = a.run(c);
        const y = alloc(c, key);
        const map: [F64 | null, F64 | null, F64 | null, F64 | null][] = [
          [y.v, y.vi, u.v, u.vi],
          [y.d1, y.d1i, u.d1, u.d1i],
          [y.d2, y.d2i, u.d2, u.d2i],
        ];
        for (const [or, oi, pr, pi] of map) {
          if (!or) continue;
          for (let i = 0; i < c.n; i++) {
            const r = pr![i]!;
            const m = pi ? pi[i]! : 0;
            if (which === 're') or[i] = r;
            else if (which === 'im') or[i] = m;
            else {
              or[i] = r;
              if (oi) oi[i] = -m;
            }
          }
        }
        return y;
      },
    },
    [a],
  );
}

/** min (lt) or max of two nodes: picks one operand per point, derivatives included. */
export function extremumNode(a: CNode, b: CNode, lt: boolean): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: a.complex || b.complex,
      nonneg: a.nonneg && b.nonneg,
      run(c) {
        const u = a.run(c);
        const w = b.run(c);
        return select(c, key, (i) => (lt ? u.v[i]! <= w.v[i]! : u.v[i]! >= w.v[i]!), u, w);
      },
    },
    [a, b],
  );
}

/** atan2(y, x) = atan(y/x) + branch; its derivative is (x y' - y x')/(x^2 + y^2). */
export function atan2Node(a: CNode, b: CNode): CNode {
  const key = {};
  return finish(
    {
      cst: null,
      complex: false,
      nonneg: false,
      run(c) {
        const p = a.run(c);
        const q = b.run(c);
        const y = alloc(c, key);
        const o = c.order;
        for (let i = 0; i < c.n; i++) {
          const yy = p.v[i]!;
          const xx = q.v[i]!;
          y.v[i] = Math.atan2(yy, xx);
          if (o >= 1) {
            const r2 = xx * xx + yy * yy;
            const y1 = p.d1![i]!;
            const x1 = q.d1![i]!;
            const num = xx * y1 - yy * x1;
            y.d1![i] = num / r2;
            if (o === 2) {
              const num1 = xx * p.d2![i]! - yy * q.d2![i]!;
              const r21 = 2 * (xx * x1 + yy * y1);
              y.d2![i] = (num1 * r2 - num * r21) / (r2 * r2);
            }
          }
        }
        return y;
      },
    },
    [a, b],
  );
}

export function phiNode(n: number, a: CNode): CNode {
  const key = {};
  const node: CNode & { usesPhi: boolean } = {
    cst: null,
    complex: a.complex,
    nonneg: false,
    usesPhi: true,
    run(c) {
      const u = a.run(c);
      const y = alloc(c, key);
      const o = c.order;
      if (!c.phi) {
        y.v.fill(NaN);
        return y;
      }
      const f1 = o >= 1 ? new Float64Array(c.n) : undefined;
      const f2 = o >= 2 ? new Float64Array(c.n) : undefined;
      c.phi(n, u.v, y.v, f1, f2);
      for (let i = 0; i < c.n && o >= 1; i++) {
        const u1 = u.d1![i]!;
        y.d1![i] = f1![i]! * u1;
        if (o === 2) y.d2![i] = f2![i]! * u1 * u1 + f1![i]! * u.d2![i]!;
      }
      return y;
    },
  };
  return node;
}

/** A holomorphic built-in applied to `a`, with its own kernel buffer. */
export function holoNode(f: Builtin, a: CNode): CNode {
  const complex = a.complex || f.forcesComplex === 'always' || (f.forcesComplex === 'negative' && !a.nonneg);
  const key = {};
  const k = new Float64Array(KERNEL_BUFFER);
  return finish(
    {
      cst: null,
      complex,
      nonneg: f.nonneg === 'real' && !a.complex,
      run: (c) => applyHolomorphic(c, a.run(c), f, k, key),
    },
    [a],
  );
}
