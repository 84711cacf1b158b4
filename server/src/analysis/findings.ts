/**
 * The wording side of the engine's findings: numbers and percentages in messages (through the one
 * formatter in shared/numbers.ts), diagnostics on spans, replacement fixes, and the words for how a
 * state grows at a singularity. Nothing here computes physics.
 */
import { diagnostic, type Code, type EngineDiagnostic, type FixData, type Severity } from '../language/catalogue';
import type { Span } from '../language/ast';
import { formatDecimals, formatNumber, formatPercent, formatRounded } from '../shared/numbers';
import { distanceText, type Singularity } from './singular';

/** A number in a message (6 significant digits; see `formatNumber`). */
export function fmt(v: number): string {
  return formatNumber(v);
}

/** A fraction as a percentage in a message (see `formatPercent`). */
export function pct(f: number): string {
  return formatPercent(f);
}

/** A diagnostic on a span, with the catalogue's severity unless one is given. */
export function warn(code: Code, span: Span, message: string, fixes?: FixData[], severity?: Severity): EngineDiagnostic {
  return diagnostic(code, span.start, span.end, message, { fixes, severity });
}

/** Quick fix: replace a span's text. */
export function replaceFix(title: string, span: Span, text: string): FixData {
  return { kind: 'replace', title, start: span.start, end: span.end, text };
}

/** `s` with its first letter in capitals. */
export function capital(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** `n thing` or `n things`. */
export function plural(n: number, thing: string): string {
  return `${n} ${thing}${n === 1 ? '' : 's'}`;
}

/** The growth law of a singularity for a message: |x - 0.3|^-0.25, or log(1/|x|). */
export function growthText(g: Singularity): string {
  if (g.logarithmic) return `log(1/${distanceText(g.x, fmt)})`;
  return `${distanceText(g.x, fmt)}^-${formatDecimals(g.power, 2)}`;
}

/** The finding's text for a state whose |psi|^2 cannot be integrated across a point. */
export function notSquareIntegrable(g: Singularity): string {
  return `The state is not square-integrable: near x = ${fmt(g.x)} it grows like ${growthText(g)}, so the integral of |psi|^2 diverges there and no normalisation exists. Remove the singularity or move it outside the system.`;
}

/** A captured fraction with enough digits to show how far from 1 it is. */
export function captureText(f: number): string {
  const short = 1 - f;
  const digits = short > 0 ? Math.min(15, Math.max(3, Math.ceil(-Math.log10(short)) + 2)) : 6;
  return formatRounded(f, digits);
}

/** A normalising factor as text, exact to 12 significant digits (it is written into the file by a fix). */
export function formatFactor(f: number): string {
  return formatRounded(f, 12);
}
