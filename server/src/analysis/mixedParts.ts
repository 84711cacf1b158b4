/**
 * The pure parts of a mixed state, each a state function with its probability: the parts of a
 * `mixture(...)` as written, or the levels of the system of a `thermal(...)` with their thermal weights.
 * A thermal sum takes levels until the share of its weight beyond them is below THERMAL_CUT (far below
 * the captured-weight floor TOL); a sum stopped earlier by the cap on parts, by the solver or by a
 * finite well's last bound state leaves out more, and that is a finding, never a silent truncation.
 */
import type { EngineDiagnostic } from '../language/catalogue';
import type { Span } from '../language/ast';
import type { Eigenbasis } from '../physics/types';
import { boltzmannWeights, occupationLevels, occupationWeights, type ThermalWeights } from '../physics/thermal';
import { MAX_PARTS, type MixtureModel, type ThermalModel } from './mixedModel';
import { buildBasis, buildState, eigenState, type BuildOptions, type StateFunction } from './systems';
import { charged, tableOps } from './charged';
import { TOL } from './measure';
import { fmt, pct, plural, warn } from './findings';

/** The share of a thermal sum's weight below which the levels beyond are left out. */
export const THERMAL_CUT = 1e-12;
/** The most levels a thermal sum takes (each is projected like a pure state). */
export const MAX_THERMAL_PARTS = MAX_PARTS;

/** One pure part of a mixed state. */
export interface MixedPart {
  weight: number;
  state: StateFunction;
  /** Where findings about this part go. */
  span: Span;
}

/** The parts of a mixed state, with what was left out. */
export interface MixedParts {
  kind: 'thermal' | 'mixture';
  parts: MixedPart[];
  /** Thermal: the share of the thermal sum beyond the levels taken; 0 for a mixture. */
  omitted: number;
  /** True when the parts are orthonormal by construction (levels of one system), so Tr rho^2 = sum p_k^2 exactly. */
  orthonormal: boolean;
}

/** What building the parts needs. */
export interface PartsInput {
  model: ThermalModel | MixtureModel;
  target: Eigenbasis;
  mass: number;
  out: EngineDiagnostic[];
  options: BuildOptions;
  maxBasis: number;
}

/** The parts, or null (with a finding) when one cannot be built. */
export function mixedParts(input: PartsInput): MixedParts | null {
  return input.model.kind === 'mixture' ? mixtureParts(input.model, input) : thermalParts(input.model, input);
}

function mixtureParts(model: MixtureModel, input: PartsInput): MixedParts | null {
  const parts: MixedPart[] = [];
  for (const p of model.parts) {
    const state = buildState(p.model, input.target, input.mass, input.out, input.options);
    if (!state) return null;
    parts.push({ weight: p.weight, state, span: p.span });
  }
  if (Math.abs(model.total - 1) > TOL) {
    input.out.push(warn('norm', model.span, `The weights of the mixture add up to ${fmt(model.total)}, not 1; each is used divided by their sum.`));
  }
  return { kind: 'mixture', parts, omitted: 0, orthonormal: false };
}

/**
 * The levels of the old system with their thermal weights: nbar's occupation (oscillator) or the
 * Boltzmann weights at k_B T, over as many levels as leave less than THERMAL_CUT out (doubling the old
 * basis from 16 levels), at most MAX_THERMAL_PARTS and the basis cap.
 */
function thermalParts(model: ThermalModel, input: PartsInput): MixedParts | null {
  const cap = Math.max(1, Math.min(MAX_THERMAL_PARTS, input.maxBasis));
  let n = model.nbar !== null ? Math.min(cap, occupationLevels(model.nbar, THERMAL_CUT)) : Math.min(cap, 16);
  for (;;) {
    const built = buildBasis(model.system, input.mass, n, input.out, input.options);
    if (!built) return null;
    const old = built.basis;
    const taken = Math.min(n, old.count);
    const w: ThermalWeights = model.nbar !== null ? occupationWeights(model.nbar, taken) : boltzmannWeights(old.energies, taken, model.kT!);
    const grow = model.nbar === null && w.tail > THERMAL_CUT && taken === n && n < cap && !input.options.budget.expired();
    if (grow) {
      n = Math.min(cap, 2 * n);
      continue;
    }
    // Trailing levels whose weight underflows add nothing.
    let k = w.weights.length;
    while (k > 1 && w.weights[k - 1] === 0) k--;
    const parts: MixedPart[] = [];
    for (let j = 0; j < k; j++) parts.push({ weight: w.weights[j]!, state: charged(eigenState(old, j), input.options.budget, tableOps(old, j + 1, j)), span: model.span });
    cutFindings(model, old, w, taken, cap, input.out);
    return { kind: 'thermal', parts, omitted: w.tail, orthonormal: true };
  }
}

/** A thermal sum cut before its weight beyond is below the floor, or a well hot enough to reach its continuum. */
function cutFindings(model: ThermalModel, old: Eigenbasis, w: ThermalWeights, taken: number, cap: number, out: EngineDiagnostic[]): void {
  if (model.system.kind === 'well' && model.kT !== null && model.kT > 0) {
    // The Boltzmann factor at the top of the well, relative to the sum over the bound levels.
    let z = 0;
    for (let k = 0; k < old.count; k++) z += Math.exp(-(old.energies[k]! - old.energies[0]!) / model.kT);
    const top = Math.exp(-(model.system.depth - old.energies[0]!) / model.kT) / z;
    if (top > TOL) {
      out.push(warn('continuum', model.argSpan, `At this temperature the top of the well is thermally reached (exp(-(D - E_1)/k_B T) is ${fmt(top)} of the bound levels' sum): a thermal state would also populate the unbound states, which are left out; only the ${plural(old.count, 'bound level')} are mixed.`));
    }
    return;
  }
  if (!(w.tail > TOL)) return;
  const why = taken >= cap ? `the cap of ${cap} levels` : `the ${plural(taken, 'level')} the solver provides`;
  out.push(
    warn('limits', model.argSpan, `The thermal sum stops at ${why}; the levels beyond hold about ${pct(w.tail)} of its weight, more than the floor of 1e-6, so the populations leave that out. Lower the temperature or nbar.`),
  );
}
