/**
 * The physics of one analysis as plain data, for `summary` and `diff`: the levels that hold weight, the
 * captured weight, the energy mean and spread, the parity and the findings. Numbers are rounded once,
 * here, so that noise of the numerics (last digits of a quadrature) never shows as a change.
 */
import type { AnalysisResult } from '../analysis/types';
import type { LocatedDiagnostic } from './render';

/** Significant digits kept for energies, means and spreads. */
export const ENERGY_DIGITS = 6;
/** Decimal places kept for weights (populations and the captured weight). */
export const WEIGHT_DECIMALS = 4;
/** Significant digits kept for numbers inside finding messages. */
const MESSAGE_DIGITS = 4;

/** One level that holds weight. */
export interface LevelFact {
  n: number;
  energy: number;
  weight: number;
}

/** The rounded physics of one setup. */
export interface PhysicsFacts {
  system: string | null;
  energyUnit: string | null;
  levelCount: number;
  /** Levels whose weight rounds to more than zero, in order of n. */
  levels: LevelFact[];
  captured: number | null;
  /** null: no state; 'diverges': the series does not converge. */
  mean: number | 'diverges' | null;
  spread: number | 'diverges' | null;
  parity: string | null;
  /** `SEVERITY[CODE]: MESSAGE` with the message's numbers rounded; without positions, which move with any edit. */
  findings: string[];
}

/** `v` rounded to `digits` significant digits (0 stays 0; -0 becomes 0). */
export function roundSig(v: number, digits = ENERGY_DIGITS): number {
  if (!Number.isFinite(v) || v === 0) return v === 0 ? 0 : v;
  return Number(v.toPrecision(digits)) + 0;
}

/** `w` rounded to WEIGHT_DECIMALS places. */
export function roundWeight(w: number): number {
  const f = 10 ** WEIGHT_DECIMALS;
  return Math.round(w * f) / f + 0;
}

/** A finding with the numbers of its message rounded to MESSAGE_DIGITS significant digits. */
export function findingKey(d: Pick<LocatedDiagnostic, 'severity' | 'code' | 'message'>): string {
  const message = d.message.replace(/\s*[\r\n\u2028\u2029]\s*/g, ' ').replace(/-?\d+\.\d+(?:e[+-]?\d+)?|-?\d+e[+-]?\d+/gi, (m) => String(roundSig(Number(m), MESSAGE_DIGITS)));
  return `${d.severity}[${d.code}]: ${message}`;
}

function energyOf(result: AnalysisResult, which: 'mean' | 'spread'): number | 'diverges' | null {
  if (!result.energy) return null;
  const v = result.energy[which];
  return v === null || !Number.isFinite(v) ? 'diverges' : roundSig(v);
}

/** The rounded physics of `result`. */
export function physicsFacts(result: AnalysisResult): PhysicsFacts {
  return {
    system: result.system?.kind ?? null,
    energyUnit: result.units.energy,
    levelCount: result.levels.length,
    levels: result.levels.map((l) => ({ n: l.n, energy: roundSig(l.energy), weight: roundWeight(l.weight) })).filter((l) => l.weight > 0),
    captured: result.captured === null ? null : roundWeight(result.captured),
    mean: energyOf(result, 'mean'),
    spread: energyOf(result, 'spread'),
    parity: result.parity,
    findings: result.diagnostics.map(findingKey).sort(),
  };
}
