/**
 * Thermal (Gibbs) weights of a system's levels, with the weight the levels left out would carry.
 * Pure numbers: the analysis (analysis/mixedParts.ts) decides how many levels to take and words the
 * findings.
 */

/** Weights of the first levels of a thermal state and the share of the whole sum beyond them. */
export interface ThermalWeights {
  /** p_k for the levels taken, divided by their sum (so they add up to 1). */
  weights: Float64Array;
  /** The share of the full thermal sum carried by the levels beyond those taken (0 when there are none). */
  tail: number;
}

/**
 * The thermal occupation of an oscillator with mean occupation `nbar`:
 * p_k = nbar^k / (nbar + 1)^(k + 1), so the share beyond the first K levels is (nbar / (nbar + 1))^K
 * (a geometric series; any quantum optics text, e.g. Gerry & Knight, ch. 2 (from memory)).
 * The weights are computed as (1 - q) q^k with q = nbar / (nbar + 1), in log space for large k.
 */
export function occupationWeights(nbar: number, count: number): ThermalWeights {
  const weights = new Float64Array(count);
  if (nbar === 0) {
    weights[0] = 1;
    return { weights, tail: 0 };
  }
  const lq = Math.log(nbar) - Math.log1p(nbar);
  const l0 = -Math.log1p(nbar);
  let sum = 0;
  for (let k = 0; k < count; k++) sum += weights[k] = Math.exp(l0 + k * lq);
  for (let k = 0; k < count; k++) weights[k]! /= sum;
  return { weights, tail: Math.exp(count * lq) };
}

/** The number of levels after which the occupation's share beyond them is below `cut` (at least 1). */
export function occupationLevels(nbar: number, cut: number): number {
  if (nbar === 0) return 1;
  const lq = Math.log(nbar) - Math.log1p(nbar);
  return Math.max(1, Math.ceil(Math.log(cut) / lq));
}

/**
 * Boltzmann weights exp(-(E_k - E_0) / kT) of the given levels, normalised over them, with an estimate
 * of the share of the full sum beyond the last one. The estimate continues the spectrum with the last
 * spacing D = E_{N-1} - E_{N-2}: the levels beyond then carry w_{N-1} r / (1 - r) with r = exp(-D / kT)
 * (a geometric series; derived in this comment). It is exact for equally spaced levels (the oscillator)
 * and an upper bound where the spacings do not shrink (the box, a potential between hard walls at high
 * levels). A single level gets no estimate (tail 0: a finite well's one bound state, whose continuum
 * the caller judges). `kT` = 0 gives the lowest level alone.
 */
export function boltzmannWeights(energies: ArrayLike<number>, count: number, kT: number): ThermalWeights {
  const n = Math.min(count, energies.length);
  const weights = new Float64Array(n);
  if (n === 0) return { weights, tail: 0 };
  const e0 = energies[0]!;
  if (!(kT > 0)) {
    weights[0] = 1;
    return { weights, tail: 0 };
  }
  let sum = 0;
  for (let k = 0; k < n; k++) sum += weights[k] = Math.exp(-(energies[k]! - e0) / kT);
  let tail = 0;
  if (n >= 2) {
    const r = Math.exp(-(energies[n - 1]! - energies[n - 2]!) / kT);
    const beyond = r < 1 ? (weights[n - 1]! * r) / (1 - r) : Infinity;
    tail = beyond / (sum + beyond);
  }
  for (let k = 0; k < n; k++) weights[k]! /= sum;
  return { weights, tail: Number.isFinite(tail) ? tail : 1 };
}
