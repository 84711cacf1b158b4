/**
 * A mixed state rho = sum_k p_k |psi_k><psi_k| measured from its pure parts: each part goes through the
 * pure-state measurement (measure.ts) and the numbers are combined here. Pure numbers, no wording.
 *
 * - Populations P_n = <phi_n|rho|phi_n> = sum_k p_k |<phi_n|psi_k>|^2 (the levels' `weight`); coefficients
 *   have no meaning for a mixture, so `re` and `im` are null.
 * - <H> = sum_k p_k <H>_k, and the spread by the law of total variance,
 *   Delta H^2 = sum_k p_k <H^2>_k - <H>^2 = sum_k p_k Delta H_k^2 + sum_k p_k (<H>_k - <H>)^2
 *   (the second form is the one computed: no cancellation, and one part gives its own spread exactly).
 * - Purity Tr rho^2 = sum_kl p_k p_l |<psi_k|psi_l>|^2. For a thermal state the parts are levels of one
 *   system, orthonormal by construction, so it is sum_k p_k^2 exactly. For a `mixture` the overlaps
 *   are taken in the new basis, <psi_k|psi_l> = sum_n conj(c_n^k) c_n^l over the levels computed, each
 *   part's projection normalised to 1; that is accurate to about the weight the levels fail to capture
 *   (the `basis` finding reports it).
 */
import type { LevelResult } from './types';
import { levelsFor, type StateMeasurements, type ParityMeasurements, type WallMeasurements } from './measure';
import { decayOf } from './expand';

/** One measured part. */
export interface MeasuredPart {
  weight: number;
  m: StateMeasurements;
}

/** The combined measurement and the purity. */
export interface MixedMeasurements {
  m: StateMeasurements;
  purity: number;
}

/** Combines the parts' measurements (at least one, all in the same basis with the same level count); `omitted` is the share of a thermal sum left out. */
export function combineParts(parts: readonly MeasuredPart[], orthonormal: boolean, omitted = 0): MixedMeasurements {
  const first = parts[0]!.m;
  const count = Math.min(...parts.map((p) => p.m.levels.length));
  const levels: LevelResult[] = [];
  const weights = new Float64Array(count);
  for (let n = 0; n < count; n++) {
    let w = 0;
    for (const p of parts) w += p.weight * p.m.levels[n]!.weight;
    weights[n] = w;
    const lv: LevelResult = { n: first.levels[n]!.n, energy: first.levels[n]!.energy, re: null, im: null, weight: w };
    if (first.levels[n]!.uncertainty !== undefined) lv.uncertainty = first.levels[n]!.uncertainty;
    levels.push(lv);
  }
  let captured = 0;
  for (const p of parts) captured += p.weight * p.m.captured;
  const energy = combineEnergy(parts);
  // Populations below the share of a thermal sum left out are not resolved: no decay law is read from them.
  const decay = decayOf(first.basis, weights, omitted);
  const jumps = union(parts.map((p) => p.m.jumps));
  const kinks = union(parts.map((p) => p.m.kinks));
  if (decay) decay.at = jumps[0] ?? kinks[0] ?? null;
  const singularPart = parts.find((p) => p.m.singular !== null)?.m ?? null;
  const m: StateMeasurements = {
    basis: first.basis,
    built: first.built,
    window: [Math.min(...parts.map((p) => p.m.window[0])), Math.max(...parts.map((p) => p.m.window[1]))],
    stopped: parts.find((p) => p.m.stopped !== null)?.m.stopped ?? null,
    // Tr rho = 1: each part is normalised before mixing.
    norm: 1,
    levels,
    captured,
    levelsFor999: levelsFor(weights, 0.999),
    singular: singularPart?.singular ?? null,
    closest: singularPart?.closest ?? 0,
    unresolvedNearSpike: singularPart?.unresolvedNearSpike ?? 0,
    walls: combineWalls(parts),
    jumps,
    kinks,
    ...energy,
    decay,
    parity: combineParity(parts),
    continuum: first.basis.kind === 'well' ? Math.max(0, 1 - captured) : null,
    needed: combineNeeded(parts),
    projected: first.projected,
  };
  return { m, purity: orthonormal ? sumOfSquares(parts) : purityFromCoefficients(parts, count) };
}

function combineEnergy(parts: readonly MeasuredPart[]): { mean: number | null; spread: number | null; meanFromLevels: number } {
  let meanFromLevels = 0;
  for (const p of parts) meanFromLevels += p.weight * p.m.meanFromLevels;
  if (parts.some((p) => p.m.mean === null)) return { mean: null, spread: null, meanFromLevels };
  let mean = 0;
  for (const p of parts) mean += p.weight * p.m.mean!;
  if (parts.length === 1) return { mean: parts[0]!.m.mean, spread: parts[0]!.m.spread, meanFromLevels };
  if (parts.some((p) => p.m.spread === null)) return { mean, spread: null, meanFromLevels };
  let variance = 0;
  for (const p of parts) variance += p.weight * (p.m.spread! ** 2 + (p.m.mean! - mean) ** 2);
  return { mean, spread: Math.sqrt(variance), meanFromLevels };
}

/** The walls as the mixture meets them: the worst part's values, the weighted share outside and near them. */
function combineWalls(parts: readonly MeasuredPart[]): WallMeasurements | null {
  const withWalls = parts.filter((p) => p.m.walls !== null);
  if (withWalls.length === 0) return null;
  const worst = withWalls.find((p) => p.m.walls!.broken) ?? withWalls[0]!;
  let outside = 0;
  for (const p of withWalls) outside += p.weight * p.m.walls!.outside;
  return { ...worst.m.walls!, outside, broken: withWalls.some((p) => p.m.walls!.broken) };
}

/**
 * Parity of a mixture: even (odd) when every part is; otherwise mixed, with the minor share the
 * weighted even or odd weight of the parts (a thermal state of a symmetric system is half and half, so
 * it is not reported as "almost symmetric").
 */
function combineParity(parts: readonly MeasuredPart[]): ParityMeasurements | null {
  if (parts.some((p) => p.m.parity === null)) return null;
  let even = 0;
  for (const p of parts) {
    const q = p.m.parity!;
    even += p.weight * (q.major === 'even' ? 1 - q.minor : q.minor);
  }
  const odd = 1 - even;
  const first = parts[0]!.m.parity!;
  const common = parts.every((p) => p.m.parity!.parity === first.parity) ? first.parity : 'mixed';
  return { center: first.center, parity: common, minor: Math.max(0, Math.min(even, odd)), major: odd < even ? 'even' : 'odd' };
}

/** Levels that capture all but TOL of every part short of it (null when one part's search found none). */
function combineNeeded(parts: readonly MeasuredPart[]): number | null {
  let need = 0;
  for (const p of parts) {
    if (p.m.needed === null) {
      // A part lighter than the floor was not searched (mixedStage.ts); a heavier one that found no basis decides.
      if (p.m.captured < 1 - 1e-6 && p.weight > 1e-6) return null;
      continue;
    }
    need = Math.max(need, p.m.needed);
  }
  return need > 0 ? need : null;
}

function sumOfSquares(parts: readonly MeasuredPart[]): number {
  let s = 0;
  for (const p of parts) s += p.weight * p.weight;
  return s;
}

/**
 * sum_kl p_k p_l |<psi_k|psi_l>|^2 with the overlaps from the coefficients in the new basis, each part's
 * projection normalised by its captured weight (so <psi_k|psi_k> = 1 and a part mixed with itself is pure).
 */
function purityFromCoefficients(parts: readonly MeasuredPart[], count: number): number {
  let s = 0;
  for (let a = 0; a < parts.length; a++) {
    s += parts[a]!.weight ** 2;
    for (let b = a + 1; b < parts.length; b++) {
      let re = 0;
      let im = 0;
      for (let n = 0; n < count; n++) {
        const x = parts[a]!.m.levels[n]!;
        const y = parts[b]!.m.levels[n]!;
        // conj(x) y
        re += x.re! * y.re! + x.im! * y.im!;
        im += x.re! * y.im! - x.im! * y.re!;
      }
      const norms = parts[a]!.m.captured * parts[b]!.m.captured;
      s += 2 * parts[a]!.weight * parts[b]!.weight * Math.min(1, norms > 0 ? (re * re + im * im) / norms : 0);
    }
  }
  return Math.min(1, s);
}

function union(lists: number[][]): number[] {
  return [...new Set(lists.flat())].sort((a, b) => a - b);
}
