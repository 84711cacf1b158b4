/**
 * Fixed-point arithmetic with 50 decimal digits on BigInt, for reference values the tests compute
 * independently of the double-precision code under test: pi by Machin's formula, sin and cos by their
 * Taylor series, square roots by integer Newton steps (all common practice). Only what the tests need.
 */

/** One unit: values are BigInts scaled by 10^50. */
export const ONE = 10n ** 50n;

/** A decimal string such as '9.1093837015e-31' or '0.067' as a scaled value. */
export function fromDecimal(text: string): bigint {
  const m = /^(-?)(\d+)(?:\.(\d*))?(?:e([+-]?\d+))?$/.exec(text.trim());
  if (!m) throw new Error(`not a decimal: ${text}`);
  const digits = BigInt((m[2] ?? '') + (m[3] ?? ''));
  const exp = BigInt(m[4] ?? '0') - BigInt((m[3] ?? '').length);
  const v = exp >= 0n ? digits * 10n ** exp * ONE : (digits * ONE) / 10n ** -exp;
  return m[1] === '-' ? -v : v;
}

export const fromInt = (n: number | bigint): bigint => BigInt(n) * ONE;
export const mul = (a: bigint, b: bigint): bigint => (a * b) / ONE;
export const div = (a: bigint, b: bigint): bigint => (a * ONE) / b;

/** The value as a double (for comparisons at double precision). */
export function toNumber(a: bigint): number {
  const neg = a < 0n;
  const s = (neg ? -a : a).toString().padStart(51, '0');
  const v = Number(`${s.slice(0, s.length - 50)}.${s.slice(s.length - 50)}`);
  return neg ? -v : v;
}

/** Integer square root (floor) by Newton's method. */
function isqrt(n: bigint): bigint {
  if (n < 0n) throw new Error('negative');
  if (n < 2n) return n;
  let x = BigInt(Math.floor(Math.sqrt(Number(n))));
  if (x === 0n) x = 1n;
  for (;;) {
    const y = (x + n / x) >> 1n;
    if (y >= x && y - x <= 1n && x * x <= n && (x + 1n) * (x + 1n) > n) return x;
    if (y === x) return x;
    x = y;
  }
}

export const sqrt = (a: bigint): bigint => isqrt(a * ONE);

/** atan(1/n) = sum (-1)^k / ((2k+1) n^(2k+1)). */
function atanInverse(n: bigint): bigint {
  let power = ONE / n;
  let sum = 0n;
  const n2 = n * n;
  for (let k = 0n; power !== 0n; k++) {
    const term = power / (2n * k + 1n);
    sum += k % 2n === 0n ? term : -term;
    power /= n2;
  }
  return sum;
}

/** pi = 16 atan(1/5) - 4 atan(1/239) (Machin, 1706). */
export const PI = 16n * atanInverse(5n) - 4n * atanInverse(239n);

/** sin x and cos x by their Taylor series (|x| up to a few units). */
export function sinCos(x: bigint): { sin: bigint; cos: bigint } {
  let s = 0n;
  let c = 0n;
  let term = ONE; // x^n / n!
  for (let n = 0n; n < 400n && term !== 0n; n++) {
    const r = n % 4n;
    if (r === 0n) c += term;
    else if (r === 1n) s += term;
    else if (r === 2n) c -= term;
    else s -= term;
    term = mul(term, x) / (n + 1n);
  }
  return { sin: s, cos: c };
}

/** A root of f in [lo, hi] where f changes sign, by 200 bisections (far below one unit of 10^-50). */
export function bisect(f: (x: bigint) => bigint, lo: bigint, hi: bigint): bigint {
  let flo = f(lo);
  for (let i = 0; i < 200 && hi - lo > 1n; i++) {
    const mid = (lo + hi) / 2n;
    const fm = f(mid);
    if (fm === 0n) return mid;
    if (fm > 0n === flo > 0n) {
      lo = mid;
      flo = fm;
    } else {
      hi = mid;
    }
  }
  return (lo + hi) / 2n;
}

/** erf x = (2/sqrt(pi)) sum (-1)^n x^(2n+1) / (n! (2n+1)) (Abramowitz & Stegun 7.1.5), for |x| up to a few units. */
export function erf(x: bigint): bigint {
  const x2 = mul(x, x);
  let power = x; // (-1)^n x^(2n+1) / n!
  let sum = 0n;
  for (let n = 0n; n < 2000n && power !== 0n; n++) {
    sum += power / (2n * n + 1n);
    power = -mul(power, x2) / (n + 1n);
  }
  return div(2n * sum, sqrt(PI));
}
