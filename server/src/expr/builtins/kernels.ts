/**
 * Scalar kernels of the built-in functions: the value and the first and second derivative with respect
 * to the argument, written into a buffer the caller passes (no allocation, no module-level scratch).
 * A real kernel `(u, o)` writes f(u), f'(u), f''(u) to o[0..2]. A complex kernel `(a, b, o)` writes
 * f(z), f'(z), f''(z) of z = a + ib as re/im pairs to o[0..5] and may use o[6..9] as scratch, so its
 * buffer holds at least `KERNEL_BUFFER` numbers. Values follow complex.js (the complex type of mathjs)
 * so that results agree with mathjs to rounding.
 */
import { cdiv, cexp, clog, cmul, csqrt } from '../compile/complex';

type F64 = Float64Array;
/** f, f', f'' of a real argument into o[0..2]. */
export type RealKernel = (u: number, o: F64) => void;
/** f, f', f'' of a complex argument a + ib into o[0..5] as re/im pairs; o[6..9] is scratch. */
export type ComplexKernel = (a: number, b: number, o: F64) => void;
/** Length of the buffer a kernel writes into. */
export const KERNEL_BUFFER = 10;

const LN10 = Math.LN10;

export const realExp: RealKernel = (u, o) => {
  const e = Math.exp(u);
  o[0] = e;
  o[1] = e;
  o[2] = e;
};
export const realLog: RealKernel = (u, o) => {
  o[0] = Math.log(u);
  o[1] = 1 / u;
  o[2] = -1 / (u * u);
};
export const realLog10: RealKernel = (u, o) => {
  o[0] = Math.log10(u);
  o[1] = 1 / (u * LN10);
  o[2] = -1 / (u * u * LN10);
};
export const realSqrt: RealKernel = (u, o) => {
  const s = Math.sqrt(u);
  o[0] = s;
  o[1] = 0.5 / s;
  o[2] = -0.25 / (s * u);
};
export const realSin: RealKernel = (u, o) => {
  const s = Math.sin(u);
  o[0] = s;
  o[1] = Math.cos(u);
  o[2] = -s;
};
export const realCos: RealKernel = (u, o) => {
  const c = Math.cos(u);
  o[0] = c;
  o[1] = -Math.sin(u);
  o[2] = -c;
};
export const realTan: RealKernel = (u, o) => {
  const t = Math.tan(u);
  o[0] = t;
  o[1] = 1 + t * t;
  o[2] = 2 * t * (1 + t * t);
};
export const realAsin: RealKernel = (u, o) => {
  const w = 1 - u * u;
  o[0] = Math.asin(u);
  o[1] = 1 / Math.sqrt(w);
  o[2] = u / (w * Math.sqrt(w));
};
export const realAcos: RealKernel = (u, o) => {
  const w = 1 - u * u;
  o[0] = Math.acos(u);
  o[1] = -1 / Math.sqrt(w);
  o[2] = -u / (w * Math.sqrt(w));
};
export const realAtan: RealKernel = (u, o) => {
  const w = 1 + u * u;
  o[0] = Math.atan(u);
  o[1] = 1 / w;
  o[2] = (-2 * u) / (w * w);
};
export const realSinh: RealKernel = (u, o) => {
  const s = Math.sinh(u);
  o[0] = s;
  o[1] = Math.cosh(u);
  o[2] = s;
};
export const realCosh: RealKernel = (u, o) => {
  const c = Math.cosh(u);
  o[0] = c;
  o[1] = Math.sinh(u);
  o[2] = c;
};
export const realTanh: RealKernel = (u, o) => {
  const t = Math.tanh(u);
  o[0] = t;
  o[1] = 1 - t * t;
  o[2] = -2 * t * (1 - t * t);
};
export const realSech: RealKernel = (u, o) => {
  const s = 1 / Math.cosh(u);
  const t = Math.tanh(u);
  o[0] = s;
  o[1] = -s * t;
  o[2] = s * t * t - s * s * s;
};

export const complexExp: ComplexKernel = (a, b, o) => {
  cexp(a, b, o, 0);
  o[2] = o[4] = o[0]!;
  o[3] = o[5] = o[1]!;
};
/** log and log10 (scale 1/ln 10): f = log z / s, f' = 1/(s z), f'' = -1/(s z^2). */
function logScaled(a: number, b: number, o: F64, s: number): void {
  clog(a, b, o, 0);
  cdiv(1, 0, a, b, o, 2);
  cmul(o[2]!, o[3]!, o[2]!, o[3]!, o, 4);
  o[0] = o[0]! / s;
  o[1] = o[1]! / s;
  o[2] = o[2]! / s;
  o[3] = o[3]! / s;
  o[4] = -o[4]! / s;
  o[5] = -o[5]! / s;
}
export const complexLog: ComplexKernel = (a, b, o) => logScaled(a, b, o, 1);
export const complexLog10: ComplexKernel = (a, b, o) => logScaled(a, b, o, LN10);
export const complexSqrt: ComplexKernel = (a, b, o) => {
  // sqrt' = 1/(2 s), sqrt'' = -1/(4 s z).
  csqrt(a, b, o, 0);
  const sr = o[0]!;
  const si = o[1]!;
  cdiv(0.5, 0, sr, si, o, 2);
  cmul(sr, si, a, b, o, 6);
  cdiv(-0.25, 0, o[6]!, o[7]!, o, 4);
};
export const complexSin: ComplexKernel = (a, b, o) => {
  const sa = Math.sin(a);
  const ca = Math.cos(a);
  const chb = Math.cosh(b);
  const shb = Math.sinh(b);
  o[0] = sa * chb;
  o[1] = ca * shb;
  o[2] = ca * chb;
  o[3] = -sa * shb;
  o[4] = -o[0];
  o[5] = -o[1];
};
export const complexCos: ComplexKernel = (a, b, o) => {
  const sa = Math.sin(a);
  const ca = Math.cos(a);
  const chb = Math.cosh(b);
  const shb = Math.sinh(b);
  o[0] = ca * chb;
  o[1] = -sa * shb;
  o[2] = -sa * chb;
  o[3] = -ca * shb;
  o[4] = -o[0];
  o[5] = -o[1];
};
export const complexSinh: ComplexKernel = (a, b, o) => {
  const sh = Math.sinh(a);
  const ch = Math.cosh(a);
  const cb = Math.cos(b);
  const sb = Math.sin(b);
  o[0] = sh * cb;
  o[1] = ch * sb;
  o[2] = ch * cb;
  o[3] = sh * sb;
  o[4] = o[0];
  o[5] = o[1];
};
export const complexCosh: ComplexKernel = (a, b, o) => {
  const sh = Math.sinh(a);
  const ch = Math.cosh(a);
  const cb = Math.cos(b);
  const sb = Math.sin(b);
  o[0] = ch * cb;
  o[1] = sh * sb;
  o[2] = sh * cb;
  o[3] = ch * sb;
  o[4] = o[0];
  o[5] = o[1];
};

/** For f = tan (s = 1) or tanh (s = -1) with value t: f' = 1 + s t^2, f'' = 2 s t f'. */
function fromDerivativePolynomial(tr: number, ti: number, s: number, o: F64): void {
  cmul(tr, ti, tr, ti, o, 6);
  const fr = 1 + s * o[6]!;
  const fi = s * o[7]!;
  o[0] = tr;
  o[1] = ti;
  o[2] = fr;
  o[3] = fi;
  cmul(tr, ti, fr, fi, o, 4);
  o[4] = 2 * s * o[4]!;
  o[5] = 2 * s * o[5]!;
}
export const complexTan: ComplexKernel = (a, b, o) => {
  // Value as complex.js: (sin 2a, sinh 2b) / (cos 2a + cosh 2b).
  const d = Math.cos(2 * a) + Math.cosh(2 * b);
  fromDerivativePolynomial(Math.sin(2 * a) / d, Math.sinh(2 * b) / d, 1, o);
};
export const complexTanh: ComplexKernel = (a, b, o) => {
  // Value as complex.js: (sinh 2a, sin 2b) / (cosh 2a + cos 2b).
  const d = Math.cosh(2 * a) + Math.cos(2 * b);
  fromDerivativePolynomial(Math.sinh(2 * a) / d, Math.sin(2 * b) / d, -1, o);
};
export const complexSech: ComplexKernel = (a, b, o) => {
  // tanh = sinh/cosh from the cosh kernel; sech' = -sech tanh; sech'' = sech tanh^2 - sech^3.
  complexCosh(a, b, o);
  cdiv(o[2]!, o[3]!, o[0]!, o[1]!, o, 8);
  const tr = o[8]!;
  const ti = o[9]!;
  // Value as complex.js: 2 (cosh a cos b, -sinh a sin b) / (cos 2b + cosh 2a).
  const d = Math.cos(2 * b) + Math.cosh(2 * a);
  const sr = (2 * Math.cosh(a) * Math.cos(b)) / d;
  const si = (-2 * Math.sinh(a) * Math.sin(b)) / d;
  o[0] = sr;
  o[1] = si;
  cmul(sr, si, tr, ti, o, 2);
  cmul(o[2]!, o[3]!, tr, ti, o, 6);
  cmul(sr, si, sr, si, o, 8);
  cmul(o[8]!, o[9]!, sr, si, o, 8);
  o[2] = -o[2]!;
  o[3] = -o[3]!;
  o[4] = o[6]! - o[8]!;
  o[5] = o[7]! - o[9]!;
};

/** For asin (sign 1) and acos (sign -1): f' = sign/q with q = sqrt(1 - z^2), f'' = sign z/q^3. */
function inverseSqrtDerivatives(a: number, b: number, qr: number, qi: number, sign: number, o: F64): void {
  cdiv(1, 0, qr, qi, o, 6);
  const gr = o[6]!;
  const gi = o[7]!;
  o[2] = sign * gr;
  o[3] = sign * gi;
  cmul(gr, gi, gr, gi, o, 8);
  cmul(o[8]!, o[9]!, gr, gi, o, 8);
  cmul(o[8]!, o[9]!, a, b, o, 8);
  o[4] = sign * o[8]!;
  o[5] = sign * o[9]!;
}
/** q = sqrt(1 - z^2) into o[8], o[9], and log(i z + q) into o[6], o[7]. */
function asinParts(a: number, b: number, o: F64): void {
  cmul(a, b, a, b, o, 8);
  csqrt(1 - o[8]!, -o[9]!, o, 8);
  clog(o[8]! - b, o[9]! + a, o, 6);
}
export const complexAsin: ComplexKernel = (a, b, o) => {
  // asin z = -i log(i z + sqrt(1 - z^2)); asin' = 1/sqrt(1 - z^2); asin'' = z asin'^3.
  asinParts(a, b, o);
  o[0] = o[7]!;
  o[1] = -o[6]!;
  inverseSqrtDerivatives(a, b, o[8]!, o[9]!, 1, o);
};
export const complexAcos: ComplexKernel = (a, b, o) => {
  asinParts(a, b, o);
  o[0] = Math.PI / 2 - o[7]!;
  o[1] = o[6]!;
  inverseSqrtDerivatives(a, b, o[8]!, o[9]!, -1, o);
};
export const complexAtan: ComplexKernel = (a, b, o) => {
  // atan z = (i/2) [log(1 - i z) - log(1 + i z)]; atan' = 1/(1 + z^2); atan'' = -2 z atan'^2.
  // Value as complex.js: atan z = (i/2) log((1 - b^2 - a^2, -2a)/d), d = a^2 + (1 - b)^2.
  if (a === 0 && (b === 1 || b === -1)) {
    o[0] = 0;
    o[1] = b * Infinity;
  } else {
    const d = a * a + (1 - b) * (1 - b);
    clog((1 - b * b - a * a) / d, (-2 * a) / d, o, 6);
    o[0] = -0.5 * o[7]!;
    o[1] = 0.5 * o[6]!;
  }
  cmul(a, b, a, b, o, 6);
  cdiv(1, 0, 1 + o[6]!, o[7]!, o, 2);
  cmul(o[2]!, o[3]!, o[2]!, o[3]!, o, 6);
  cmul(o[6]!, o[7]!, a, b, o, 6);
  o[4] = -2 * o[6]!;
  o[5] = -2 * o[7]!;
};

/** Rounds half away from zero, as mathjs's `round` does for numbers. */
export function roundHalfAway(u: number): number {
  return u < 0 ? -Math.round(-u) : Math.round(u);
}

/** The sign -1, 0 or 1 of a real number (NaN gives 0, as the piecewise indicator expects). */
export function signOf(r: number): number {
  return r > 0 ? 1 : r < 0 ? -1 : 0;
}
