/**
 * Number formatting for hovers, lenses and hints, on top of the shared number formatter.
 */
import { formatNumber } from '../shared/numbers';

/** The one number formatter (server/src/shared/numbers.ts), under the short name the features use. */
export const fmt = formatNumber;

/** A complex value; the imaginary part is shown only when it is not negligible. */
export function fmtComplex(re: number, im: number, digits = 6): string {
  if (Math.abs(im) <= 1e-12 * Math.max(1, Math.abs(re))) return fmt(re, digits);
  if (Math.abs(re) <= 1e-12 * Math.abs(im)) return `${fmt(im, digits)} i`;
  return `${fmt(re, digits)} ${im < 0 ? '-' : '+'} ${fmt(Math.abs(im), digits)} i`;
}

/** The phase of c = re + i im as a multiple of π, in (-1, 1]. */
export function fmtPhase(re: number, im: number): string {
  if (re === 0 && im === 0) return '—';
  const p = Math.atan2(im, re) / Math.PI;
  if (Math.abs(p) < 5e-7) return '0';
  if (Math.abs(Math.abs(p) - 1) < 5e-7) return p > 0 ? 'π' : '-π';
  return `${fmt(p, 4)}π`;
}

/** ` unit` or an empty string. */
export function withUnit(unit: string | null | undefined): string {
  return unit ? ` ${unit}` : '';
}
