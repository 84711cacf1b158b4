/**
 * `eigenspan expand FILE --samples OUT.csv`: the state as checked and its reconstruction from the
 * expansion, on a grid, as CSV, so a simulation can start from exactly what Eigenspan checked
 * (docs/format.md, "Exporting samples"). Columns: x, the normalised state (re, im), and the sum of
 * c_n phi_n(x) over every level computed (re_expansion, im_expansion). Numbers are written in full
 * precision (shortest round trip), x in the file's length unit, psi in that unit to the power -1/2.
 */
import type { AnalysisResult } from '../analysis/types';
import { UsageError } from './options';

/** Points of the export grid by default, and the most allowed. */
export const EXPORT_POINTS = 1000;
export const MAX_EXPORT_POINTS = 100_000;
/** Most eigenfunction values (levels x points) the export tabulates. */
export const MAX_EXPORT_CELLS = 1 << 24;

/** Reads the value of `--points N`. */
export function pointsOption(value: string | undefined): number {
  const v = Number(value);
  if (value === undefined || !Number.isInteger(v) || v < 2 || v > MAX_EXPORT_POINTS) throw new UsageError(`--points needs a whole number from 2 to ${MAX_EXPORT_POINTS}`);
  return v;
}

/** The plot grid `analyse` needs for the export of a file with up to `maxBasis` levels. */
export function exportGrid(points: number, maxBasis: number): { points: number; levels: number } {
  return { points, levels: Math.max(1, Math.min(maxBasis, Math.floor(MAX_EXPORT_CELLS / points))) };
}

/** The CSV text, or null when the analysis produced no state on a grid (its findings say why). */
export function renderSamplesCsv(result: AnalysisResult, file: string): string | null {
  const s = result.samples;
  if (!s || result.levels.length === 0) return null;
  const length = result.units.length ?? 'natural units';
  if (result.mixture) return mixtureCsv(result, file, length);
  const used = Math.min(s.phi.length, result.levels.length);
  const rows = [
    `# eigenspan expand ${file} --samples: the normalised state and its expansion on ${s.x.length} points`,
    `# x in ${length}; psi in ${result.units.length ? `${length}^-1/2` : 'natural units'}; expansion over ${used} of ${result.levels.length} levels, captured weight ${String(result.captured)}`,
    'x,re,im,re_expansion,im_expansion',
  ];
  for (let j = 0; j < s.x.length; j++) {
    let er = 0;
    let ei = 0;
    for (let k = 0; k < used; k++) {
      const p = s.phi[k]![j]!;
      er += (result.levels[k]!.re ?? 0) * p;
      ei += (result.levels[k]!.im ?? 0) * p;
    }
    rows.push([s.x[j]!, s.re[j]!, s.im[j]!, er, ei].map((v) => String(v)).join(','));
  }
  return rows.join('\n') + '\n';
}

/**
 * A mixed state has no wave function: the export is its density <x|rho|x> = sum_k p_k |psi_k(x)|^2 on
 * the grid. No expansion column: the populations alone leave out rho's off-diagonal part in the new basis.
 */
function mixtureCsv(result: AnalysisResult, file: string, length: string): string | null {
  const s = result.samples!;
  if (!s.density || s.density.length !== s.x.length) return null;
  const rows = [
    `# eigenspan expand ${file} --samples: the density of the mixed state on ${s.x.length} points (purity ${String(result.purity)})`,
    `# x in ${length}; density in ${result.units.length ? `${length}^-1` : 'natural units'}`,
    'x,density',
  ];
  for (let j = 0; j < s.x.length; j++) rows.push(`${String(s.x[j]!)},${String(s.density[j]!)}`);
  return rows.join('\n') + '\n';
}
