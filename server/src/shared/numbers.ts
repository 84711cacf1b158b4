/**
 * The one number formatter of every front end and message: the command line, hovers, the panel and
 * the engine's findings all show numbers through these functions, so one value reads the same
 * everywhere. Pure; no dependencies, so the browser bundle can import it too.
 */

/**
 * `x` with `digits` significant digits (default 6), trailing zeros dropped, in exponent form outside
 * [1e-4, 1e6) (`1.5e-7`, never `1.5e-07` or `1.5e+7`). null and undefined give '—', NaN 'NaN',
 * infinities '∞' and '-∞'.
 */
export function formatNumber(x: number | null | undefined, digits = 6): string {
  if (x === null || x === undefined) return '—';
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : '-∞';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e6) {
    const s = x.toPrecision(digits);
    // toPrecision may still answer in exponent form (999999.5 at 6 digits); tidy both forms.
    return s.includes('e') ? tidyExponent(s) : s.includes('.') ? s.replace(/\.?0+$/, '') : s;
  }
  return tidyExponent(x.toExponential(digits - 1));
}

function tidyExponent(s: string): string {
  const [m, e] = s.split('e') as [string, string];
  const mant = m.includes('.') ? m.replace(/\.?0+$/, '') : m;
  return `${mant}e${e.replace('+', '')}`;
}

/** A fraction as a percentage with enough digits for tiny and large fractions: `12.35%`, `0.0123%`, `1.2e-5%`. */
export function formatPercent(f: number): string {
  const p = f * 100;
  if (!Number.isFinite(p)) return `${formatNumber(p)}%`;
  const a = Math.abs(p);
  if (a >= 1) return `${Number(p.toPrecision(4))}%`;
  if (a >= 1e-3) return `${Number(p.toPrecision(3))}%`;
  if (p === 0) return '0%';
  return `${formatNumber(p, 3)}%`;
}

/**
 * `x` rounded to `digits` significant digits, written as JavaScript writes the rounded number (`0.999999`,
 * `1e-7`, `1.5e+21`): a form the file's own parser reads back, for values a quick fix writes into the
 * file and measured values compared to many digits.
 */
export function formatRounded(x: number, digits: number): string {
  return String(Number(x.toPrecision(digits)));
}

/** `x` rounded to at most `decimals` decimals, trailing zeros dropped (`0.25`, `1.5`, `2`): exponents in words. */
export function formatDecimals(x: number, decimals: number): string {
  return String(Number(x.toFixed(decimals)));
}

/** `x` with exactly `decimals` decimals (`0.250000`): columns that line up and compare line by line. */
export function formatFixed(x: number, decimals: number): string {
  return x.toFixed(decimals);
}
