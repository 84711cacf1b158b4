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

// Scratch outputs of the scalar kernels: no allocation per point.
const S = new Float64Array(6);
let R = 0;
let I = 0;

// ---------------------------------------------------------------------------------------------------
// Complex scalar helpers, following the formulas of complex.js (the complex type mathjs uses) so that
// results agree with mathjs to rounding. They write their result to R, I.

function logHypot(a: number, b: number): number {
  const aa = Math.abs(a);
  const bb = Math.abs(b);
  if (a === 0) return Math.log(bb);
  if (b === 0) return Math.log(aa);
  if (aa < 3000 && bb < 3000) return Math.log(a * a + b * b) * 0.5;
  const ha = a * 0.5;
  const hb = b * 0.5;
  return 0.5 * Math.log(ha * ha + hb * hb) + Math.LN2;
}
/** |a + ib| as complex.js computes it (plain formula below 3000, scaled above). */
function chypot(x: number, y: number): number {
  let a = Math.abs(x);
  let b = Math.abs(y);
  if (a < 3000 && b < 3000) return Math.sqrt(a * a + b * b);
  if (a < b) {
    a = b;
    b = x / y;
  } else b = y / x;
  return a * Math.sqrt(1 + b * b);
}
function cmul(a: number, b: number, c: number, d: number): void {
  R = a * c - b * d;
  I = a * d + b * c;
}
function cdiv(a: number, b: number, c: number, d: number): void {
  if (d === 0) {
    R = a / c;
    I = b / c;
  } else if (Math.abs(c) < Math.abs(d)) {
    const x = c / d;
    const t = c * x + d;
    R = (a * x + b) / t;
    I = (b * x - a) / t;
  } else {
    const x = d / c;
    const t = d * x + c;
    R = (a + b * x) / t;
    I = (b - a * x) / t;
  }
}
function cexp(a: number, b: number): void {
  const t = Math.exp(a);
  if (b === 0) {
    R = t;
    I = 0;
  } else {
    R = t * Math.cos(b);
    I = t * Math.sin(b);
  }
}
function clog(a: number, b: number): void {
  if (b === 0 && a > 0) {
    R = Math.log(a);
    I = 0;
  } else {
    R = logHypot(a, b);
    I = Math.atan2(b, a);
  }
}
function csqrt(a: number, b: number): void {
  const r = chypot(a, b);
  let re: number;
  let im: number;
  if (a >= 0) {
    if (b === 0) {
      R = Math.sqrt(a);
      I = 0;
      return;
    }
    re = 0.5 * Math.sqrt(2 * (r + a));
  } else re = Math.abs(b) / Math.sqrt(2 * (r - a));
  if (a <= 0) im = 0.5 * Math.sqrt(2 * (r - a));
  else im = Math.abs(b) / Math.sqrt(2 * (r + a));
  R = re;
  I = b < 0 ? -im : im;
}
/** Principal power a^b for complex a and b, with complex.js's special cases for real exponents. */
function cpow(a: number, b: number, p: number, q: number): void {
  if (p === 0 && q === 0) {
    R = 1;
    I = 0;
    return;
  }
  if (q === 0) {
    if (b === 0 && a >= 0) {
      R = Math.pow(a, p);
      I = 0;
      return;
    }
    if (b === 0 && Number.isInteger(p)) {
      // Real base, integer exponent: mathjs stays with real numbers here.
      R = Math.pow(a, p);
      I = 0;
      return;
    }
    if (a === 0) {
      const t = Math.pow(b, p);
      switch (((p % 4) + 4) % 4) {
        case 0:
          R = t;
          I = 0;
          return;
        case 1:
          R = 0;
          I = t;
          return;
        case 2:
          R = -t;
          I = 0;
          return;
        case 3:
          R = 0;
          I = -t;
          return;
      }
    }
  }
  if (a === 0 && b === 0 && p > 0 && q >= 0) {
    R = 0;
    I = 0;
    return;
  }
  const arg = Math.atan2(b, a);
  const loh = logHypot(a, b);
  const m = Math.exp(p * loh - q * arg);
  const ph = q * loh + p * arg;
  R = m * Math.cos(ph);
  I = m * Math.sin(ph);
}

// ---------------------------------------------------------------------------------------------------
// Unary function kernels: value, first and second derivative with respect to the argument.

type RealKernel = (u: number) => void; // writes S[0..2]
type ComplexKernel = (a: number, b: number) => void; // writes S[0..5] as re/im pairs

const LN10 = Math.LN10;

const REAL: Record<string, RealKernel> = {
  exp: (u) => {
    const e = Math.exp(u);
    S[0] = e;
    S[1] = e;
    S[2] = e;
  },
  log: (u) => {
    S[0] = Math.log(u);
    S[1] = 1 / u;
    S[2] = -1 / (u * u);
  },
  log10: (u) => {
    S[0] = Math.log10(u);
    S[1] = 1 / (u * LN10);
    S[2] = -1 / (u * u * LN10);
  },
  sqrt: (u) => {
    const s = Math.sqrt(u);
    S[0] = s;
    S[1] = 0.5 / s;
    S[2] = -0.25 / (s * u);
  },
  sin: (u) => {
    const s = Math.sin(u);
    S[0] = s;
    S[1] = Math.cos(u);
    S[2] = -s;
  },
  cos: (u) => {
    const c = Math.cos(u);
    S[0] = c;
    S[1] = -Math.sin(u);
    S[2] = -c;
  },
  tan: (u) => {
    const t = Math.tan(u);
    S[0] = t;
    S[1] = 1 + t * t;
    S[2] = 2 * t * (1 + t * t);
  },
  asin: (u) => {
    const w = 1 - u * u;
    S[0] = Math.asin(u);
    S[1] = 1 / Math.sqrt(w);
    S[2] = u / (w * Math.sqrt(w));
  },
  acos: (u) => {
    const w = 1 - u * u;
    S[0] = Math.acos(u);
    S[1] = -1 / Math.sqrt(w);
    S[2] = -u / (w * Math.sqrt(w));
  },
  atan: (u) => {
    const w = 1 + u * u;
    S[0] = Math.atan(u);
    S[1] = 1 / w;
    S[2] = (-2 * u) / (w * w);
  },
  sinh: (u) => {
    const s = Math.sinh(u);
    S[0] = s;
    S[1] = Math.cosh(u);
    S[2] = s;
  },
  cosh: (u) => {
    const c = Math.cosh(u);
    S[0] = c;
    S[1] = Math.sinh(u);
    S[2] = c;
  },
  tanh: (u) => {
    const t = Math.tanh(u);
    S[0] = t;
    S[1] = 1 - t * t;
    S[2] = -2 * t * (1 - t * t);
  },
  sech: (u) => {
    const s = 1 / Math.cosh(u);
    const t = Math.tanh(u);
    S[0] = s;
    S[1] = -s * t;
    S[2] = s * t * t - s * s * s;
  },
};

/** Writes f(z), f'(z), f''(z) of a holomorphic f given f and g = f' via complex helpers. */
const COMPLEX: Record<string, ComplexKernel> = {
  exp: (a, b) => {
    cexp(a, b);
    S[0] = S[2] = S[4] = R;
    S[1] = S[3] = S[5] = I;
  },
  log: (a, b) => {
    clog(a, b);
    S[0] = R;
    S[1] = I;
    cdiv(1, 0, a, b);
    S[2] = R;
    S[3] = I;
    cmul(R, I, R, I);
    S[4] = -R;
    S[5] = -I;
  },
  log10: (a, b) => {
    clog(a, b);
    S[0] = R / LN10;
    S[1] = I / LN10;
    cdiv(1, 0, a, b);
    S[2] = R / LN10;
    S[3] = I / LN10;
    cmul(R, I, R, I);
    S[4] = -R / LN10;
    S[5] = -I / LN10;
  },
  sqrt: (a, b) => {
    csqrt(a, b);
    const sr = R;
    const si = I;
    S[0] = sr;
    S[1] = si;
    cdiv(0.5, 0, sr, si);
    S[2] = R;
    S[3] = I;
    cmul(sr, si, a, b);
    cdiv(-0.25, 0, R, I);
    S[4] = R;
    S[5] = I;
  },
  sin: (a, b) => {
    const sa = Math.sin(a);
    const ca = Math.cos(a);
    const chb = Math.cosh(b);
    const shb = Math.sinh(b);
    S[0] = sa * chb;
    S[1] = ca * shb;
    S[2] = ca * chb;
    S[3] = -sa * shb;
    S[4] = -S[0]!;
    S[5] = -S[1]!;
  },
  cos: (a, b) => {
    const sa = Math.sin(a);
    const ca = Math.cos(a);
    const chb = Math.cosh(b);
    const shb = Math.sinh(b);
    S[0] = ca * chb;
    S[1] = -sa * shb;
    S[2] = -sa * chb;
    S[3] = -ca * shb;
    S[4] = -S[0]!;
    S[5] = -S[1]!;
  },
  sinh: (a, b) => {
    const sh = Math.sinh(a);
    const ch = Math.cosh(a);
    const cb = Math.cos(b);
    const sb = Math.sin(b);
    S[0] = sh * cb;
    S[1] = ch * sb;
    S[2] = ch * cb;
    S[3] = sh * sb;
    S[4] = S[0]!;
    S[5] = S[1]!;
  },
  cosh: (a, b) => {
    const sh = Math.sinh(a);
    const ch = Math.cosh(a);
    const cb = Math.cos(b);
    const sb = Math.sin(b);
    S[0] = ch * cb;
    S[1] = sh * sb;
    S[2] = sh * cb;
    S[3] = ch * sb;
    S[4] = S[0]!;
    S[5] = S[1]!;
  },
  tan: (a, b) => {
    // tan z = sin z / cos z; tan' = 1 + tan^2; tan'' = 2 tan (1 + tan^2).
    // Value as complex.js: (sin 2a, sinh 2b) / (cos 2a + cosh 2b).
    const d = Math.cos(2 * a) + Math.cosh(2 * b);
    setFromDerivativePolynomial(Math.sin(2 * a) / d, Math.sinh(2 * b) / d, 1);
  },
  tanh: (a, b) => {
    // Value as complex.js: (sinh 2a, sin 2b) / (cosh 2a + cos 2b).
    const d = Math.cosh(2 * a) + Math.cos(2 * b);
    setFromDerivativePolynomial(Math.sinh(2 * a) / d, Math.sin(2 * b) / d, -1);
  },
  sech: (a, b) => {
    COMPLEX['cosh']!(a, b);
    const cr = S[0]!;
    const ci = S[1]!;
    const shr = S[2]!;
    const shi = S[3]!;
    // Value as complex.js: 2 (cosh a cos b, -sinh a sin b) / (cos 2b + cosh 2a).
    const d = Math.cos(2 * b) + Math.cosh(2 * a);
    const sr = (2 * Math.cosh(a) * Math.cos(b)) / d;
    const si = (-2 * Math.sinh(a) * Math.sin(b)) / d;
    cdiv(shr, shi, cr, ci);
    const tr = R;
    const ti = I;
    // sech' = -sech tanh; sech'' = sech tanh^2 - sech^3.
    cmul(sr, si, tr, ti);
    S[0] = sr;
    S[1] = si;
    S[2] = -R;
    S[3] = -I;
    const str = R;
    const sti = I;
    cmul(str, sti, tr, ti);
    const a1 = R;
    const b1 = I;
    cmul(sr, si, sr, si);
    cmul(R, I, sr, si);
    S[4] = a1 - R;
    S[5] = b1 - I;
  },
  asin: (a, b) => {
    // asin z = -i log(i z + sqrt(1 - z^2)); asin' = 1/sqrt(1 - z^2); asin'' = z asin'^3.
    cmul(a, b, a, b);
    csqrt(1 - R, -I);
    const qr = R;
    const qi = I;
    clog(qr - b, qi + a);
    S[0] = I;
    S[1] = -R;
    inverseSqrtDerivatives(a, b, qr, qi, 1);
  },
  acos: (a, b) => {
    cmul(a, b, a, b);
    csqrt(1 - R, -I);
    const qr = R;
    const qi = I;
    clog(qr - b, qi + a);
    S[0] = Math.PI / 2 - I;
    S[1] = R;
    inverseSqrtDerivatives(a, b, qr, qi, -1);
  },
  atan: (a, b) => {
    // atan z = (i/2) [log(1 - i z) - log(1 + i z)]; atan' = 1/(1 + z^2); atan'' = -2 z atan'^2.
    // Value as complex.js: atan z = (i/2) log((1 - b^2 - a^2, -2a)/d), d = a^2 + (1 - b)^2.
    if (a === 0 && (b === 1 || b === -1)) {
      S[0] = 0;
      S[1] = b * Infinity;
    } else {
      const d = a * a + (1 - b) * (1 - b);
      clog((1 - b * b - a * a) / d, (-2 * a) / d);
      S[0] = -0.5 * I;
      S[1] = 0.5 * R;
    }
    cmul(a, b, a, b);
    cdiv(1, 0, 1 + R, I);
    const gr = R;
    const gi = I;
    S[2] = gr;
    S[3] = gi;
    cmul(gr, gi, gr, gi);
    cmul(R, I, a, b);
    S[4] = -2 * R;
    S[5] = -2 * I;
  },
};

/** For f = tan (s = 1) or tanh (s = -1) with value t: f' = 1 + s t^2, f'' = 2 s t f'. */
function setFromDerivativePolynomial(tr: number, ti: number, s: number): void {
  cmul(tr, ti, tr, ti);
  const fr = 1 + s * R;
  const fi = s * I;
  S[0] = tr;
  S[1] = ti;
  S[2] = fr;
  S[3] = fi;
  cmul(tr, ti, fr, fi);
  S[4] = 2 * s * R;
  S[5] = 2 * s * I;
}

/** For asin (sign 1) and acos (sign -1): f' = sign/q with q = sqrt(1 - z^2), f'' = sign z/q^3. */
function inverseSqrtDerivatives(a: number, b: number, qr: number, qi: number, sign: number): void {
  cdiv(1, 0, qr, qi);
  const gr = R;
  const gi = I;
  S[2] = sign * gr;
  S[3] = sign * gi;
  cmul(gr, gi, gr, gi);
  cmul(R, I, gr, gi);
  cmul(R, I, a, b);
  S[4] = sign * R;
  S[5] = sign * I;
}

function applyHolomorphic(c: Ctx, u: Jet, name: string, key: object): Jet {
  const y = alloc(c, key);
  const n = c.n;
  const o = c.order;
  if (!c.cx) {
    const k = REAL[name]!;
    const uv = u.v;
    for (let i = 0; i < n; i++) {
      k(uv[i]!);
      y.v[i] = S[0]!;
      if (o >= 1) {
        const u1 = u.d1![i]!;
        y.d1![i] = S[1]! * u1;
        if (o === 2) y.d2![i] = S[2]! * u1 * u1 + S[1]! * u.d2![i]!;
      }
    }
    return y;
  }
  const k = COMPLEX[name]!;
  const rk = REAL[name]!;
  // On real arguments inside the real domain the real kernel runs, as mathjs uses its number functions.
  const lo = name === 'asin' || name === 'acos' ? -1 : name === 'sqrt' || name === 'log' || name === 'log10' ? 0 : -Infinity;
  const hi = name === 'asin' || name === 'acos' ? 1 : Infinity;
  for (let i = 0; i < n; i++) {
    const ar = u.v[i]!;
    if (u.vi![i] === 0 && ar >= lo && ar <= hi) {
      rk(ar);
      S[3] = S[4];
      S[4] = S[2]!;
      S[2] = S[1]!;
      S[1] = 0;
      S[3] = 0;
      S[5] = 0;
    } else k(ar, u.vi![i]!);
    y.v[i] = S[0]!;
    y.vi![i] = S[1]!;
    if (o >= 1) {
      const f1r = S[2]!;
      const f1i = S[3]!;
      const u1r = u.d1![i]!;
      const u1i = u.d1i![i]!;
      y.d1![i] = f1r * u1r - f1i * u1i;
      y.d1i![i] = f1r * u1i + f1i * u1r;
      if (o === 2) {
        const sqr = u1r * u1r - u1i * u1i;
        const sqi = 2 * u1r * u1i;
        const u2r = u.d2![i]!;
        const u2i = u.d2i![i]!;
        y.d2![i] = S[4]! * sqr - S[5]! * sqi + f1r * u2r - f1i * u2i;
        y.d2i![i] = S[4]! * sqi + S[5]! * sqr + f1r * u2i + f1i * u2r;
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
          cdiv(u.v[i]!, u.vi![i]!, qr, qi);
          const vr = R;
          const vi = I;
          y.v[i] = vr;
          y.vi![i] = vi;
          if (o >= 1) {
            const q1r = w.d1![i]!;
            const q1i = w.d1i![i]!;
            cmul(vr, vi, q1r, q1i);
            cdiv(u.d1![i]! - R, u.d1i![i]! - I, qr, qi);
            const v1r = R;
            const v1i = I;
            y.d1![i] = v1r;
            y.d1i![i] = v1i;
            if (o === 2) {
              cmul(v1r, v1i, q1r, q1i);
              const tr = 2 * R;
              const ti = 2 * I;
              cmul(vr, vi, w.d2![i]!, w.d2i![i]!);
              cdiv(u.d2![i]! - tr - R, u.d2i![i]! - ti - I, qr, qi);
              y.d2![i] = R;
              y.d2i![i] = I;
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
          cpow(br, bi, pr, pi);
          y.v[i] = R;
          y.vi![i] = I;
          if (o >= 1) {
            // g1 = p b^(p-1), g2 = p (p-1) b^(p-2).
            let g1r = 0;
            let g1i = 0;
            if (pr !== 0 || pi !== 0) {
              cpow(br, bi, pr - 1, pi);
              cmul(pr, pi, R, I);
              g1r = R;
              g1i = I;
            }
            const u1r = u.d1![i]!;
            const u1i = u.d1i![i]!;
            cmul(g1r, g1i, u1r, u1i);
            y.d1![i] = R;
            y.d1i![i] = I;
            if (o === 2) {
              let g2r = 0;
              let g2i = 0;
              cmul(pr, pi, pr - 1, pi);
              const kr = R;
              const ki = I;
              if (kr !== 0 || ki !== 0) {
                cpow(br, bi, pr - 2, pi);
                cmul(kr, ki, R, I);
                g2r = R;
                g2i = I;
              }
              cmul(u1r, u1i, u1r, u1i);
              cmul(g2r, g2i, R, I);
              const ar = R;
              const ai = I;
              cmul(g1r, g1i, u.d2![i]!, u.d2i![i]!);
              y.d2![i] = ar + R;
              y.d2i![i] = ai + I;
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
        cpow(pr, pi, qr, qi);
        const vr = R;
        const vi = I;
        y.v[i] = vr;
        y.vi![i] = vi;
        if (o >= 1) {
          clog(pr, pi);
          const Lr = R;
          const Li = I;
          const p1r = u.d1![i]!;
          const p1i = u.d1i![i]!;
          const q1r = w.d1![i]!;
          const q1i = w.d1i![i]!;
          cdiv(p1r, p1i, pr, pi);
          const rr = R; // u'/u
          const ri = I;
          cmul(q1r, q1i, Lr, Li);
          const t1r = R;
          const t1i = I;
          cmul(qr, qi, rr, ri);
          const gr = t1r + R;
          const gi = t1i + I;
          cmul(vr, vi, gr, gi);
          const y1r = R;
          const y1i = I;
          y.d1![i] = y1r;
          y.d1i![i] = y1i;
          if (o === 2) {
            // (u'' u - u'^2)/u^2 = u''/u - (u'/u)^2.
            cdiv(u.d2![i]!, u.d2i![i]!, pr, pi);
            const sr = R;
            const si = I;
            cmul(rr, ri, rr, ri);
            const hr = sr - R;
            const hi = si - I;
            cmul(qr, qi, hr, hi);
            let gpr = R;
            let gpi = I;
            cmul(q1r, q1i, rr, ri);
            gpr += 2 * R;
            gpi += 2 * I;
            cmul(w.d2![i]!, w.d2i![i]!, Lr, Li);
            gpr += R;
            gpi += I;
            cmul(y1r, y1i, gr, gi);
            const ar = R;
            const ai = I;
            cmul(vr, vi, gpr, gpi);
            y.d2![i] = ar + R;
            y.d2i![i] = ai + I;
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

function roundHalfAway(u: number): number {
  return u < 0 ? -Math.round(-u) : Math.round(u);
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
    const jumps = ['sign', 'floor', 'ceil', 'round'].includes(e.name);
    const args = e.args.map((a) => (jumps ? this.inDiscrete(() => this.node(a)) : this.node(a)));
    const a = args[0]!;
    const kink = (node: CNode, indicator: (r: number, m: number) => number, sub: CNode = a): CNode => {
      if (node.cst === null) this.register(sub, indicator);
      return node;
    };
    const signOf = (r: number) => (r > 0 ? 1 : r < 0 ? -1 : 0);
    switch (e.name) {
      case 'exp':
      case 'sin':
      case 'cos':
      case 'tan':
      case 'atan':
      case 'sinh':
      case 'cosh':
      case 'tanh':
      case 'sech':
        return this.holo(e.name, a, e.name === 'exp' || e.name === 'cosh' || e.name === 'sech');
      case 'sqrt':
      case 'log':
      case 'log10':
        return this.holo(e.name, a, e.name === 'sqrt', !a.nonneg);
      case 'asin':
      case 'acos':
        return this.holo(e.name, a, e.name === 'acos', true);
      case 'abs':
        return a.complex ? absNode(a) : kink(absNode(a), signOf);
      case 'sign':
        return kink(flat([a], ([u], i) => signOf(u!.v[i]!), false), signOf);
      case 'floor':
        return kink(flat([a], ([u], i) => Math.floor(u!.v[i]!), false), Math.floor);
      case 'ceil':
        return kink(flat([a], ([u], i) => Math.ceil(u!.v[i]!), false), Math.ceil);
      case 'round':
        return kink(flat([a], ([u], i) => roundHalfAway(u!.v[i]!), false), roundHalfAway);
      case 'min':
      case 'max': {
        const b = args[1]!;
        const lt = e.name === 'min';
        const key = {};
        const node = finish(
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
        const diff = addSub(a, b, -1);
        return kink(node, signOf, diff);
      }
      case 'atan2': {
        const b = args[1]!;
        // atan2(y, x) = atan(y/x) + branch; d = (x y' - y x')/(x^2 + y^2).
        const key = {};
        const node = finish(
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
        return node;
      }
      case 're':
      case 'im':
      case 'conj':
        return partNode(a, e.name);
      case 'phi': {
        const n = args[0]!.cst;
        if (n === null || n.im !== 0 || !Number.isInteger(n.re)) return this.fail(e.args[0]!, 'syntax', 'The level number of phi must be a constant whole number.');
        if (!this.scope.hasPhi) return this.fail(e, 'name', "'phi(n, x)' is only available in psi(x) of a file with a system.");
        return phiNode(n.re, args[1]!);
      }
      default:
        return this.fail({ start: e.nameStart, end: e.nameEnd }, 'name', `Unknown function '${e.name}'.`);
    }
  }

  private holo(name: string, a: CNode, nonneg: boolean, forcesComplex = false): CNode {
    const complex = a.complex || forcesComplex;
    const key = {};
    return finish(
      {
        cst: null,
        complex,
        nonneg: nonneg && !a.complex,
        run: (c) => applyHolomorphic(c, a.run(c), name, key),
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
