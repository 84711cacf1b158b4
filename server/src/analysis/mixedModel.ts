/**
 * The static stage of the mixed states: `thermal(...) of SYSTEM` and `mixture(W: STATE, ...)` checked
 * and evaluated into a `StateModel` (model.ts calls this with its own evaluators, so the names,
 * dimensions and messages are the ones every other statement gets).
 */
import type { Arg, ExprText, Span, StateSpec, SystemSpec } from '../language/ast';
import type { Code } from '../language/catalogue';
import type { UnitSystem } from '../expr/types';
import { DIM, KB_SI } from '../expr/constants';
import { toInternal } from '../expr/units';
import type { StateModel, SystemModel } from './model';
import type { ValueKind } from './dimensions';
import { fmt } from './findings';
import { paramOf } from '../language/signatures';
import { SLOTS } from './slots';

/** The most parts a mixed state may have: each is projected like a pure state, and the purity costs their number squared. */
export const MAX_PARTS = 200;

/** What the model builder lends this module. */
export interface MixedHooks {
  units: UnitSystem;
  constant(src: ExprText, kind: ValueKind, what: string): number | null;
  system(spec: SystemSpec): SystemModel | null;
  /** A pure state of the part of a mixture. */
  state(spec: StateSpec): StateModel | null;
  error(code: Code, span: Span, message: string): void;
}

/** A thermal state's model: the old system and either nbar (oscillator) or k_B T in internal energy units. */
export type ThermalModel = { kind: 'thermal'; system: SystemModel; nbar: number | null; kT: number | null; span: Span; argSpan: Span };

/** A mixture's model: normalised weights and the written sum (checked against 1 by the numerical stage). */
export type MixtureModel = {
  kind: 'mixture';
  parts: { weight: number; model: StateModel; span: Span; weightSpan: Span }[];
  /** The sum of the weights as written (the parts are mixed with weight / sum). */
  total: number;
  span: Span;
};

/** `thermal(nbar = N) of oscillator(...)` or `thermal(temperature = T) of SYSTEM`. */
export function thermalModel(spec: Extract<StateSpec, { kind: 'thermal' }>, h: MixedHooks): ThermalModel | null {
  const named = new Map<string, Arg>();
  for (const a of spec.args) if (a.name) named.set(a.name, a);
  const n = named.get('nbar');
  const t = named.get('temperature');
  const system = h.system(spec.system);
  const given = n ?? t;
  if (!given) return null;
  // What the argument must be is its parameter's in signatures.ts.
  const param = paramOf('thermal', n ? 'nbar' : 'temperature')!;
  const value = h.constant(given.value, param.kind, param.what);
  if (value === null || system === null) return null;
  if (!(value >= 0) || !Number.isFinite(value)) {
    h.error('evaluation', given.value, `${n ? 'The mean occupation nbar' : 'The temperature'} must be zero or positive and finite, not ${fmt(value)}.`);
    return null;
  }
  if (n && system.kind !== 'oscillator') {
    h.error('evaluation', n, `'nbar' is the mean occupation of an oscillator; for a ${system.kind === 'potential' ? 'numerical potential' : system.kind} give temperature = T.`);
    return null;
  }
  const kT = n ? null : h.units.mode === 'physical' ? toInternal(KB_SI, DIM.entropy, h.units) * value : value;
  return { kind: 'thermal', system, nbar: n ? value : null, kT, span: spec.span, argSpan: given };
}

/** `mixture(W1: STATE, ...)`: every weight a finite non-negative number, at least one positive. */
export function mixtureModel(spec: Extract<StateSpec, { kind: 'mixture' }>, h: MixedHooks): MixtureModel | null {
  if (spec.parts.length > MAX_PARTS) {
    h.error('limits', spec.keywordSpan, `A mixture may have at most ${MAX_PARTS} parts; this one has ${spec.parts.length}.`);
    return null;
  }
  const parts: MixtureModel['parts'] = [];
  let ok = true;
  for (const part of spec.parts) {
    const w = h.constant(part.weight, SLOTS.mixtureWeight.kind, SLOTS.mixtureWeight.what);
    const model = h.state(part.state);
    if (w === null || model === null) {
      ok = false;
      continue;
    }
    if (!(w >= 0) || !Number.isFinite(w)) {
      h.error('evaluation', part.weight, `A weight is a probability: zero or positive and finite, not ${fmt(w)}.`);
      ok = false;
      continue;
    }
    parts.push({ weight: w, model, span: part.state.span, weightSpan: part.weight });
  }
  if (!ok) return null;
  const total = parts.reduce((s, p) => s + p.weight, 0);
  if (!(total > 0)) {
    h.error('evaluation', spec.keywordSpan, 'The weights of a mixture add up to 0; at least one must be positive.');
    return null;
  }
  return { kind: 'mixture', parts: parts.map((p) => ({ ...p, weight: p.weight / total })), total, span: spec.span };
}
