/**
 * `eigenspan summary FILE`: the physics of a setup as deterministic, line-oriented text, rounded
 * (physics.ts) so that only real changes show when two versions are compared line by line. Made for
 * git's textconv: `git diff` and `git log -p` then show the physics beside the text.
 */
import type { AnalysisResult } from '../analysis/types';
import { ENERGY_DIGITS, physicsFacts, WEIGHT_DECIMALS } from './physics';
import { formatFixed } from '../shared/numbers';

function value(v: number | 'diverges' | null, unit: string): string {
  if (v === null) return 'none';
  if (v === 'diverges') return 'diverges';
  return `${v}${unit}`;
}

/** The summary text of one analysis result (the caller escapes it on output). */
export function renderSummary(result: AnalysisResult): string {
  const f = physicsFacts(result);
  const unit = f.energyUnit ? ` ${f.energyUnit}` : '';
  const lines: string[] = [];
  lines.push(`eigenspan summary: weights to ${WEIGHT_DECIMALS} decimals, energies to ${ENERGY_DIGITS} significant digits`);
  lines.push(`system: ${f.system ?? 'none'}`);
  lines.push(`energy unit: ${f.energyUnit ?? 'natural'}`);
  lines.push(`levels computed: ${f.levelCount}`);
  for (const l of f.levels) lines.push(`level ${l.n}: energy ${l.energy}${unit}, weight ${formatFixed(l.weight, WEIGHT_DECIMALS)}`);
  lines.push(`captured weight: ${f.captured === null ? 'none' : formatFixed(f.captured, WEIGHT_DECIMALS)}`);
  lines.push(`energy mean: ${value(f.mean, unit)}`);
  lines.push(`energy spread: ${value(f.spread, unit)}`);
  lines.push(`parity: ${f.parity ?? 'none'}`);
  // A mixed state only (pure states keep their summary unchanged): Tr rho^2, rounded like a weight.
  if (result.mixture && result.purity !== undefined) lines.push(`purity: ${formatFixed(result.purity, WEIGHT_DECIMALS)}`);
  for (const k of f.findings) lines.push(`finding: ${k}`);
  return lines.join('\n') + '\n';
}
