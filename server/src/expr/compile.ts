/**
 * Compilation of checked expressions into plain JavaScript closures over typed arrays.
 *
 * - Every subtree that does not depend on x is folded at compile time to one complex number in internal
 *   units (units and constants become their internal-unit values, see `units.ts`).
 * - Evaluation is vectorised: each node allocates its output arrays once per call and fills them in one
 *   loop; no allocation happens per point.
 * - Derivatives are exact forward-mode jets: each node carries value, d/dx and d2/dx2, propagated with the
 *   chain rule y' = f'(u) u', y'' = f''(u) u'^2 + f'(u) u'' and the product and quotient rules.
 * - Real or complex: a function is compiled complex when any node may produce a non-real value from real
 *   x: the imaginary unit or a complex name, `sqrt`, `log`, `log10` of an argument not provably
 *   non-negative, `asin`/`acos` of a non-constant, a power with a non-integer exponent whose base is not
 *   provably non-negative. Otherwise the real fast path runs and the imaginary parts are zero. In
 *   complex mode sqrt, log and powers of negative numbers give the principal value, as mathjs does.
 * - Comparisons are exact (mathjs compares with a relative tolerance of 1e-12) and use real parts;
 *   floor, ceil, round, sign, min, max and atan2 act on real parts in complex mode and have zero
 *   derivative where they are flat.
 * - Evaluation problems are not thrown: NaN and ±Infinity appear in the output arrays (log 0, 1/0,
 *   overflow); `findBadPoint` finds the first such x.
 */
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import { didYouMean } from '../language/suggest';
import { candidateNames, checkExpression } from './check';
import { BUILTIN_NUMBERS } from './constants';
import { lookupPhysical, toInternal } from './units';
import { builtin, type Builtin } from './builtins/table';
import { KERNEL_BUFFER, signOf } from './builtins/kernels';
import { chypot, cdiv, clog, cmul, cpow } from './compile/complex';
import type { CompiledFunction, Complex, Dimension, Expr, GridValues, PhiProvider, Prepared, Scope } from './types';

type F64 = Float64Array;

/** Values of one node on the grid: real and (in complex mode) imaginary parts with derivatives. */
interface Jet {
  v: F64;
  vi: F64 | null;
  d1: F64 | null;
  d1i: F64 | null;
  d2: F64 | null;
  d2i: F64 | null;
}

interface Ctx {
  /** Buffers of each node, kept between calls of one compiled function and reused when the size fits. */
  cache: Map<object, Jet>;
  n: number;
  xs: F64;
  order: 0 | 1 | 2;
  cx: boolean;
  phi: PhiProvider | undefined;
}

/** A compiled node. `cst` is its value when it does not depend on x. */
interface CNode {
  cst: Complex | null;
  /** May produce a non-real value for real x. */
  complex: boolean;
  /** Provably real and >= 0 for real x. */
  nonneg: boolean;
  run(c: Ctx): Jet;
}

/** Where a piecewise feature may switch: the subtree to evaluate and the discrete indicator of its value. */
interface Switch {
  node: CNode;
  indicator: (re: number, im: number) => number;
}

/**
 * The output buffers of the node identified by `key`: reused from the previous call when the grid size,
 * order and mode are the same (each node always writes the same arrays, so unwritten ones stay zero),
 * otherwise allocated once for this grid.
 */
function alloc(c: Ctx, key: object): Jet {
  const n = c.n;
  const o = c.order;
  const old = c.cache.get(key);
  if (old && old.v.length === n && (old.vi !== null) === c.cx && (old.d1 !== null) === o >= 1 && (old.d2 !== null) === o >= 2) return old;
  const j: Jet = {
    v: new Float64Array(n),
    vi: c.cx ? new Float64Array(n) : null,
    d1: o >= 1 ? new Float64Array(n) : null,
    d1i: c.cx && o >= 1 ? new Float64Array(n) : null,
    d2: o >= 2 ? new Float64Array(n) : null,
    d2i: c.cx && o >= 2 ? new Float64Array(n) : null,
  };
  c.cache.set(key, j);
  return j;
}

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

// ---------------------------------------------------------------------------------------------------
// Node constructors.

function constNode(z: Complex): CNode {
  const key = {};
  return {
    cst: z,
    complex: z.im !== 0,
    nonneg: z.im === 0 && z.re >= 0,
    run(c) {
      // The buffer keeps its constant between calls; it is filled only when newly allocated.
      const y = alloc(c, key);
      if (y.v[0] !== z.re || (y.vi !== null && y.vi[0] !== z.im)) {
        y.v.fill(z.re);
        if (y.vi) y.vi.fill(z.im);
      }
      return y;
    },
  };
}

/** The position x; one per compiled function so that functions never share buffers. */
function makeXNode(): CNode {
  const key = {};
  return {
  cst: null,
  complex: false,
  nonneg: false,
  run(c) {
    // The grid itself is the value (nodes never write their inputs); d/dx x = 1 is kept between calls.
    const y = alloc(c, key);
    if (y.d1 && y.d1[0] !== 1) y.d1.fill(1);
    return { v: c.xs, vi: y.vi, d1: y.d1, d1i: y.d1i, d2: y.d2, d2i: y.d2i };
  },
  };
}

/** Folds a node that does not depend on x by running it on a one-point grid. */
function fold(node: CNode, cx: boolean): Complex {
  const j = node.run({ cache: new Map(), n: 1, xs: new Float64Array(1), order: 0, cx, phi: undefined });
  return { re: j.v[0]!, im: j.vi ? j.vi[0]! : 0 };
}

function finish(node: CNode, deps: CNode[]): CNode {
  if (deps.every((d) => d.cst !== null) && !(node as { usesPhi?: boolean }).usesPhi) {
    const z = fold(node, deps.some((d) => d.complex) || node.complex);
    return constNode(z);
  }
  return node;
}

function addSub(a: CNode, b: CNode, sign: number): CNode {
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

function mul(a: CNode, b: CNode): CNode {
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

function div(a: CNode, b: CNode): CNode {
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

function neg(a: CNode): CNode {
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

/** Power with a constant exponent p (real or complex). */
function powConst(a: CNode, p: Complex): CNode {
  // Output slots of the complex helpers, owned by this node.
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
        const n = c.n;
        const o = c.order;
        const pr = p.re;
        const pm = p.re - 1;
        const c1 = p.re * (p.re - 1);
        if (!c.cx) {
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
          return y;
        }
        const pi = p.im;
        for (let i = 0; i < n; i++) {
          const br = u.v[i]!;
          const bi = u.vi![i]!;
          cpow(br, bi, pr, pi, t, 0);
          y.v[i] = t[0]!;
          y.vi![i] = t[1]!;
          if (o >= 1) {
            // g1 = p b^(p-1), g2 = p (p-1) b^(p-2).
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
            if (o === 2) {
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
        }
        return y;
      },
    },
    [a],
  );
}

/** General power u^w = exp(w log u) with both operands depending on x. */
function powGeneral(a: CNode, b: CNode): CNode {
  // Output slots of the complex helpers, owned by this node.
  const t = new Float64Array(2);
  const key = {};
  return {
    cst: null,
    complex: a.complex || b.complex || !a.nonneg,
    nonneg: a.nonneg && !b.complex,
    run(c) {
      const u = a.run(c);
      const w = b.run(c);
      const y = alloc(c, key);
      const n = c.n;
      const o = c.order;
      // L = log u; g = w' L + w u'/u; y' = y g; g' = w'' L + 2 w' u'/u + w (u'' u - u'^2)/u^2; y'' = y' g + y g'.
      if (!c.cx) {
        for (let i = 0; i < n; i++) {
          const p = u.v[i]!;
          const q = w.v[i]!;
          const v = Math.pow(p, q);
          y.v[i] = v;
          if (o >= 1) {
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
        return y;
      }
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
        if (o >= 1) {
          clog(pr, pi, t, 0);
          const Lr = t[0]!;
          const Li = t[1]!;
          const p1r = u.d1![i]!;
          const p1i = u.d1i![i]!;
          const q1r = w.d1![i]!;
          const q1i = w.d1i![i]!;
          cdiv(p1r, p1i, pr, pi, t, 0);
          const rr = t[0]!; // u'/u
          const ri = t[1]!;
          cmul(q1r, q1i, Lr, Li, t, 0);
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
          if (o === 2) {
            // (u'' u - u'^2)/u^2 = u''/u - (u'/u)^2.
            cdiv(u.d2![i]!, u.d2i![i]!, pr, pi, t, 0);
            const sr = t[0]!;
            const si = t[1]!;
            cmul(rr, ri, rr, ri, t, 0);
            const hr = sr - t[0]!;
            const hi = si - t[1]!;
            cmul(qr, qi, hr, hi, t, 0);
            let gpr = t[0]!;
            let gpi = t[1]!;
            cmul(q1r, q1i, rr, ri, t, 0);
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
        }
      }
      return y;
    },
  };
}

/** A real-valued, piecewise-flat result (comparisons, floor, sign...): value only, zero derivatives. */
function flat(args: CNode[], f: (vals: Jet[], i: number) => number, nonneg: boolean): CNode {
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
const truthy = (j: Jet, i: number) => j.v[i]! !== 0 || (j.vi !== null && j.vi[i]! !== 0);

function compare(op: string, a: CNode, b: CNode): CNode {
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

function conditional(t: CNode, a: CNode, b: CNode): CNode {
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
function absNode(a: CNode): CNode {
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
function partNode(a: CNode, which: 're' | 'im' | 'conj'): CNode {
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
function extremumNode(a: CNode, b: CNode, lt: boolean): CNode {
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
function atan2Node(a: CNode, b: CNode): CNode {
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

function phiNode(n: number, a: CNode): CNode {
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

// ---------------------------------------------------------------------------------------------------
// Tree to nodes.

class Compiler {
  readonly diagnostics: EngineDiagnostic[] = [];
  readonly switches: Switch[] = [];
  /** True once any node may be complex: then the whole function runs in complex mode. */
  cx = false;
  private readonly x = makeXNode();
  /**
   * Above zero while compiling operands whose value only feeds a discrete result (comparisons, tests,
   * floor...): their own kinks and jumps cannot show in the result except through the outer switch.
   */
  private discrete = 0;
  constructor(readonly scope: Scope) {}

  private register(node: CNode, indicator: (r: number, m: number) => number): void {
    if (this.discrete === 0 && node.cst === null) this.switches.push({ node, indicator });
  }

  private inDiscrete<T>(f: () => T): T {
    this.discrete++;
    try {
      return f();
    } finally {
      this.discrete--;
    }
  }

  private fail(e: { start: number; end: number }, code: 'name' | 'units' | 'syntax', message: string): CNode {
    this.diagnostics.push(diagnostic(code, e.start, e.end, message));
    return constNode({ re: NaN, im: 0 });
  }

  node(e: Expr): CNode {
    const r = this.node0(e);
    if (r.complex) this.cx = true;
    return r;
  }

  private node0(e: Expr): CNode {
    switch (e.type) {
      case 'number':
        return constNode({ re: e.value, im: 0 });
      case 'symbol':
        return this.symbol(e);
      case 'unary': {
        if (e.op === '+') return this.node(e.arg);
        if (e.op === '-') return neg(this.node(e.arg));
        const a = this.inDiscrete(() => this.node(e.arg));
        const node = flat([a], ([u], i) => (truthy(u!, i) ? 0 : 1), true);
        this.register(node, (r) => r);
        return node;
      }
      case 'binary':
        return this.binary(e);
      case 'conditional': {
        const t = this.inDiscrete(() => this.node(e.test));
        const node = conditional(t, this.node(e.then), this.node(e.otherwise));
        if (node.cst !== null) return node;
        this.register(t, (r, m) => (r !== 0 || m !== 0 ? 1 : 0));
        return node;
      }
      case 'call':
        return this.call(e);
    }
  }

  private symbol(e: Extract<Expr, { type: 'symbol' }>): CNode {
    const name = e.name;
    if (name === 'x' && this.scope.hasX) return this.x;
    const v = this.scope.values.get(name);
    if (v) return constNode(v.value);
    const b = BUILTIN_NUMBERS.get(name);
    if (b) return constNode({ re: b.re, im: b.im });
    const phys = lookupPhysical(name);
    if (phys) {
      if (this.scope.units.mode === 'natural') return this.fail(e, 'units', `'${name}' is a unit or physical constant, but the file has no units line.`);
      return constNode({ re: toInternal(phys.si, phys.dimension, this.scope.units), im: 0 });
    }
    return this.fail(e, 'name', `Unknown name '${name}'.${didYouMean(name, candidateNames(this.scope))}`);
  }

  private binary(e: Extract<Expr, { type: 'binary' }>): CNode {
    const logical = !['+', '-', '*', '/', '^'].includes(e.op);
    const a = logical ? this.inDiscrete(() => this.node(e.left)) : this.node(e.left);
    const b = logical ? this.inDiscrete(() => this.node(e.right)) : this.node(e.right);
    switch (e.op) {
      case '+':
        return addSub(a, b, 1);
      case '-':
        return addSub(a, b, -1);
      case '*':
        return mul(a, b);
      case '/':
        return div(a, b);
      case '^':
        return b.cst !== null ? powConst(a, b.cst) : finish(powGeneral(a, b), [a, b]);
      case 'and':
      case 'or': {
        const and = e.op === 'and';
        const node = flat([a, b], ([u, w], i) => ((and ? truthy(u!, i) && truthy(w!, i) : truthy(u!, i) || truthy(w!, i)) ? 1 : 0), true);
        this.register(node, (r) => r);
        return node;
      }
      default: {
        const node = compare(e.op, a, b);
        this.register(node, (r) => r);
        return node;
      }
    }
  }

  private call(e: Extract<Expr, { type: 'call' }>): CNode {
    const f = builtin(e.name);
    if (!f) return this.fail({ start: e.nameStart, end: e.nameEnd }, 'name', `Unknown function '${e.name}'.`);
    // The argument of a function that jumps only feeds a discrete result.
    const args = e.args.map((a) => (f.breaks === 'jump' ? this.inDiscrete(() => this.node(a)) : this.node(a)));
    const a = args[0]!;
    const kink = (node: CNode, indicator: (r: number, m: number) => number, sub: CNode = a): CNode => {
      if (node.cst === null) this.register(sub, indicator);
      return node;
    };
    switch (f.form) {
      case 'holomorphic':
        return this.holo(f, a);
      case 'step': {
        const g = f.step!;
        return kink(flat([a], ([u], i) => g(u!.v[i]!), f.nonneg === 'always'), g);
      }
      case 'abs':
        return a.complex ? absNode(a) : kink(absNode(a), signOf);
      case 'extremum':
        return kink(extremumNode(a, args[1]!, f.name === 'min'), signOf, addSub(a, args[1]!, -1));
      case 'atan2':
        return atan2Node(a, args[1]!);
      case 'part':
        return partNode(a, e.name as 're' | 'im' | 'conj');
      case 'phi': {
        const n = a.cst;
        if (n === null || n.im !== 0 || !Number.isInteger(n.re)) return this.fail(e.args[0]!, 'syntax', 'The level number of phi must be a constant whole number.');
        if (!this.scope.hasPhi) return this.fail(e, 'name', "'phi(n, x)' is only available in psi(x) of a file with a system.");
        return phiNode(n.re, args[1]!);
      }
    }
  }

  private holo(f: Builtin, a: CNode): CNode {
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
}

function nodeUsesX(e: Expr): boolean {
  switch (e.type) {
    case 'number':
      return false;
    case 'symbol':
      return e.name === 'x';
    case 'unary':
      return nodeUsesX(e.arg);
    case 'binary':
      return nodeUsesX(e.left) || nodeUsesX(e.right);
    case 'conditional':
      return nodeUsesX(e.test) || nodeUsesX(e.then) || nodeUsesX(e.otherwise);
    case 'call':
      return e.name === 'phi' || e.args.some(nodeUsesX);
  }
}

/**
 * A copy made with `set`: `slice` goes through the species lookup, which V8 turns into a slow generic
 * path once any loaded library has touched a constructor's species.
 */
function clone(a: F64): F64 {
  const out = new Float64Array(a.length);
  out.set(a);
  return out;
}

/**
 * Copies the root's buffers out (they are reused by the next call) into views of one fresh buffer, so a
 * call allocates once. In real mode the imaginary parts are zero arrays created on first access only
 * (reading `im` gives an ordinary Float64Array of zeros), which halves the allocation of real functions.
 */
function jetToGrid(j: Jet, n: number, order: number): GridValues {
  const real = j.vi === null;
  const count = (real ? 1 : 2) * (1 + order);
  const buffer = new ArrayBuffer(count * n * 8);
  let slot = 0;
  const copy = (a: F64): F64 => {
    const out = new Float64Array(buffer, slot++ * n * 8, n);
    out.set(a);
    return out;
  };
  const out = { re: copy(j.v) } as GridValues;
  const zeros = (key: 'im' | 'd1im' | 'd2im') =>
    Object.defineProperty(out, key, {
      configurable: true,
      enumerable: true,
      get() {
        const z = new Float64Array(n);
        Object.defineProperty(out, key, { value: z, writable: true, enumerable: true, configurable: true });
        return z;
      },
    });
  if (real) zeros('im');
  else out.im = copy(j.vi!);
  if (order >= 1) {
    out.d1re = copy(j.d1!);
    if (real) zeros('d1im');
    else out.d1im = copy(j.d1i!);
  }
  if (order >= 2) {
    out.d2re = copy(j.d2!);
    if (real) zeros('d2im');
    else out.d2im = copy(j.d2i!);
  }
  return out;
}

/** Options of `breakpoints`. */
export interface BreakpointOptions {
  /** Samples of the first scan over [a, b] (default 4096). */
  samples?: number;
  /** Relative width at which bisection stops (default 1e-14). */
  relTol?: number;
}

function findBreakpoints(switches: Switch[], cx: boolean, a: number, b: number, phi: PhiProvider | undefined, options: BreakpointOptions = {}): number[] {
  const m = Math.max(8, options.samples ?? 4096);
  const tol = options.relTol ?? 1e-14;
  if (!(b > a) || switches.length === 0) return [];
  const xs = new Float64Array(m + 1);
  for (let k = 0; k <= m; k++) xs[k] = a + ((b - a) * k) / m;
  xs[m] = b;
  const one = new Float64Array(1);
  const out: number[] = [];
  const same = (p: number, q: number) => p === q || (Number.isNaN(p) && Number.isNaN(q));
  for (const s of switches) {
    const cache = new Map<object, Jet>();
    const j = s.node.run({ cache, n: m + 1, xs, order: 0, cx, phi });
    // The scan's indicator values are copied: the one-point runs below reuse other buffers of the cache.
    const jv = clone(j.v);
    const jvi = j.vi ? clone(j.vi) : null;
    const ind = (k: number) => s.indicator(jv[k]!, jvi ? jvi[k]! : 0);
    const pointCache = new Map<object, Jet>();
    const at = (x: number) => {
      one[0] = x;
      const r = s.node.run({ cache: pointCache, n: 1, xs: one, order: 0, cx, phi });
      return s.indicator(r.v[0]!, r.vi ? r.vi[0]! : 0);
    };
    let prev = ind(0);
    for (let k = 1; k <= m; k++) {
      const cur = ind(k);
      if (!same(prev, cur)) {
        let lo = xs[k - 1]!;
        let hi = xs[k]!;
        const left = prev;
        for (let it = 0; it < 200 && hi - lo > tol * Math.max(1, Math.abs(lo), Math.abs(hi)); it++) {
          const mid = 0.5 * (lo + hi);
          if (mid <= lo || mid >= hi) break;
          if (same(at(mid), left)) lo = mid;
          else hi = mid;
        }
        out.push(0.5 * (lo + hi));
      }
      prev = cur;
    }
  }
  out.sort((p, q) => p - q);
  const merged: number[] = [];
  for (const x of out) {
    const last = merged[merged.length - 1];
    if (last === undefined || x - last > 1e-12 * Math.max(1, Math.abs(x))) merged.push(x);
  }
  return merged;
}

/**
 * Compiles an expression of x (inside `psi(x)` or `V(x)`) into a `CompiledFunction` over internal units.
 * Assumes `checkExpression` has run; names that still do not resolve give diagnostics and a null
 * result. Never throws. See the module comment for how real or complex compilation is chosen.
 */
export function compileFunction(expr: Expr, scope: Scope): Prepared<CompiledFunction> {
  try {
    const comp = new Compiler(scope);
    const root = comp.node(expr);
    if (comp.diagnostics.length > 0) return { result: null, diagnostics: comp.diagnostics };
    const cx = comp.cx || root.complex;
    const switches = comp.switches;
    const cache = new Map<object, Jet>();
    const fn: CompiledFunction = {
      complex: cx,
      evaluate(xs: Float64Array, order: 0 | 1 | 2 = 0, phi?: PhiProvider): GridValues {
        try {
          const j = root.run({ cache, n: xs.length, xs, order, cx, phi });
          return jetToGrid(j, xs.length, order);
        } catch {
          // Only a stack overflow on an extreme tree (or a throwing phi provider) lands here: the values
          // are reported as NaN, which callers detect with findBadPoint.
          const nan = constNode({ re: NaN, im: NaN }).run({ cache: new Map(), n: xs.length, xs, order, cx: true, phi });
          return jetToGrid(nan, xs.length, order);
        }
      },
      breakpoints(a: number, b: number, phi?: PhiProvider): number[] {
        return findBreakpoints(switches, cx, a, b, phi);
      },
    };
    return { result: fn, diagnostics: [] };
  } catch {
    return { result: null, diagnostics: [diagnostic('limits', expr.start, expr.end, 'The expression is nested too deeply to compile.')] };
  }
}

/**
 * Evaluates an expression that must not depend on x (a `let` value, a box end, a depth) to one complex
 * number in internal units, with its dimension. Errors: those of `checkExpression`, `name` when the
 * expression depends on x, `evaluation` when the value is NaN or infinite. Never throws.
 */
export function evaluateConstant(expr: Expr, scope: Scope): Prepared<{ value: Complex; dimension: Dimension }> {
  const checked = checkExpression(expr, { ...scope, hasX: false, hasPhi: false }, null, 'the value');
  if (checked.diagnostics.some((d) => d.severity === 'error') || checked.dimension === null)
    return { result: null, diagnostics: checked.diagnostics };
  if (nodeUsesX(expr)) return { result: null, diagnostics: [diagnostic('name', expr.start, expr.end, 'This value must not depend on x.')] };
  try {
    const comp = new Compiler({ ...scope, hasX: false, hasPhi: false });
    const root = comp.node(expr);
    if (comp.diagnostics.length > 0 || root.cst === null) return { result: null, diagnostics: comp.diagnostics };
    const value = root.cst;
    if (!Number.isFinite(value.re) || !Number.isFinite(value.im))
      return { result: null, diagnostics: [diagnostic('evaluation', expr.start, expr.end, `The value is ${Number.isNaN(value.re) || Number.isNaN(value.im) ? 'not a number' : 'infinite'}.`)] };
    return { result: { value, dimension: checked.dimension }, diagnostics: checked.diagnostics };
  } catch {
    return { result: null, diagnostics: [diagnostic('limits', expr.start, expr.end, 'The expression is nested too deeply to evaluate.')] };
  }
}

/**
 * The first x whose value (real or imaginary part, or any derivative present) is NaN or infinite, or
 * null when every value is finite. Accepts a `GridValues` or a plain array of values.
 */
export function findBadPoint(values: GridValues | Float64Array, xs: Float64Array): number | null {
  const arrays: Float64Array[] =
    values instanceof Float64Array
      ? [values]
      : ([values.re, values.im, values.d1re, values.d1im, values.d2re, values.d2im].filter(Boolean) as Float64Array[]);
  const n = xs.length;
  for (let i = 0; i < n; i++) for (const a of arrays) if (!Number.isFinite(a[i]!)) return xs[i]!;
  return null;
}
