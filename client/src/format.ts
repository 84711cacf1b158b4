/**
 * Text exports of an expansion: CSV (RFC 4180), JSON and a Markdown table. Pure functions.
 */
import type { PanelResult } from './messages';
import { formatNumber } from '../../server/src/shared/numbers';

/** Options shared by the text exports. */
export interface FormatOptions {
  /** Significant digits in the Markdown table (default 6). CSV and JSON always keep full precision. */
  digits?: number;
  /** The source file's name, recorded in the JSON export (default none). */
  fileName?: string;
}

/** Phase of c = re + i im in radians, in (-pi, pi]; atan2 (ISO C / IEEE 754 convention). */
export function phaseOf(re: number, im: number): number {
  return Math.atan2(im, re);
}

/** Running sums of the weights, S_k = sum_{j<=k} |c_j|^2. */
export function cumulativeWeights(levels: PanelResult['levels']): Float64Array {
  const out = new Float64Array(levels.length);
  let s = 0;
  levels.forEach((l, k) => {
    s += l.weight ?? 0;
    out[k] = s;
  });
  return out;
}

/** Full-precision number text; null (a NaN or infinity that crossed JSON) becomes an empty field. */
function num(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '' : String(v);
}

/** Quotes a CSV field when it holds a comma, quote or line break (RFC 4180, section 2). */
function csvField(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * The coefficients as CSV (RFC 4180: CRLF line ends, a header row): n, energy (file unit), Re c_n,
 * Im c_n, |c_n|, phase (rad), |c_n|^2 and the cumulative weight.
 */
export function levelsToCsv(result: PanelResult): string {
  const unit = result.units.energy ?? 'natural';
  const header = ['n', `energy_${unit}`, 're', 'im', 'abs', 'phase_rad', 'weight', 'cumulative'];
  const cum = cumulativeWeights(result.levels);
  const rows = result.levels.map((l, k) => {
    const re = l.re ?? NaN;
    const im = l.im ?? NaN;
    return [num(l.n), num(l.energy), num(re), num(im), num(Math.hypot(re, im)), num(phaseOf(re, im)), num(l.weight), num(cum[k])];
  });
  return [header, ...rows].map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}

/** The coefficients and the summary figures as a JSON document (2-space indent). */
export function levelsToJson(result: PanelResult, options: FormatOptions = {}): string {
  const cum = cumulativeWeights(result.levels);
  const doc = {
    file: options.fileName ?? null,
    units: result.units,
    system: result.system?.kind ?? null,
    norm: result.norm,
    captured: result.captured,
    energy: result.energy,
    parity: result.parity,
    ...(result.continuum !== undefined ? { continuum: result.continuum } : {}),
    levels: result.levels.map((l, k) => ({
      n: l.n,
      energy: l.energy,
      re: l.re,
      im: l.im,
      abs: Math.hypot(l.re ?? NaN, l.im ?? NaN),
      phase: phaseOf(l.re ?? NaN, l.im ?? NaN),
      weight: l.weight,
      cumulative: cum[k],
    })),
  };
  return JSON.stringify(doc, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n';
}

/** The one number formatter of every front end (server/src/shared/numbers.ts), re-exported for the client. */
export { formatNumber } from '../../server/src/shared/numbers';

/**
 * The levels as a GitHub-flavoured Markdown table (pipes inside cells escaped, as the GFM spec asks),
 * one row per level: n, E_n, Re c_n, Im c_n, |c_n|^2, cumulative weight.
 */
export function levelsToMarkdown(result: PanelResult, options: FormatOptions = {}): string {
  const d = options.digits ?? 6;
  const unit = result.units.energy ? ` (${result.units.energy})` : '';
  const cum = cumulativeWeights(result.levels);
  const lines = [
    `| n | E_n${unit} | Re c_n | Im c_n | \\|c_n\\|² | cumulative |`,
    '|---:|---:|---:|---:|---:|---:|',
    ...result.levels.map(
      (l, k) =>
        `| ${l.n} | ${formatNumber(l.energy, d)} | ${formatNumber(l.re, d)} | ${formatNumber(l.im, d)} | ${formatNumber(l.weight, d)} | ${formatNumber(cum[k], d)} |`,
    ),
  ];
  return lines.join('\n') + '\n';
}
