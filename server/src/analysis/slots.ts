/**
 * What every expression slot of a statement must be, other than the constructor arguments (whose home
 * is their parameter in language/signatures.ts): the kind of value (its dimension, analysis/
 * dimensions.ts) and the words findings name it with. The full analysis (model.ts, mixedModel.ts) and
 * the untrusted pipeline (untrusted.ts) both read each slot from here, so the two cannot disagree on
 * what a slot must be; test/analysis/slots.test.ts tries a wrong dimension in every slot in both.
 */
import type { ValueKind } from './dimensions';

/** One slot: the kind of value expected and how findings name it ("the evolution time"). */
export interface SlotSpec {
  readonly kind: ValueKind;
  readonly what: string;
}

const slot = (kind: ValueKind, what: string): SlotSpec => Object.freeze({ kind, what });

/** Every statement slot by name. */
export const SLOTS = Object.freeze({
  /** `mass M`. */
  mass: slot('mass', 'the mass'),
  /** `basis N`. */
  basis: slot('dimensionless', 'the basis size'),
  /** `evolve to T`. */
  evolveTime: slot('time', 'the evolution time'),
  /** `evolve to T in K steps`. */
  evolveSteps: slot('dimensionless', 'the number of steps'),
  /** `system V(x) = ... over [A, B]`: the ends of the interval. */
  intervalLeft: slot('length', "the interval's left end"),
  intervalRight: slot('length', "the interval's right end"),
  /** `system V(x) = ...`: the potential, a function of x. */
  potential: slot('energy', 'the potential'),
  /** `... with mass(x) = ...`: the mass profile, a function of x. */
  massProfile: slot('mass', 'the mass'),
  /** `state eigen(N) of ...`. */
  eigenLevel: slot('dimensionless', 'the level'),
  /** `state mixture(W1: ..., W2: ...)`: a part's weight. */
  mixtureWeight: slot('dimensionless', 'the weight'),
  /** `expect norm V` (in a file with units a value of the dimension of the integral of |psi|^2 is also accepted). */
  expectNorm: slot('dimensionless', 'the expected norm'),
  expectEnergy: slot('energy', 'the expected energy'),
  expectSpread: slot('energy', 'the expected spread'),
  /** `expect weight N..M V`: the level range and the weight. */
  expectWeightFrom: slot('dimensionless', 'the first level'),
  expectWeightTo: slot('dimensionless', 'the last level'),
  expectWeight: slot('dimensionless', 'the expected weight'),
  /** `expect level N V`. */
  expectLevel: slot('dimensionless', 'the level'),
  expectLevelEnergy: slot('energy', "the expected level's energy"),
  expectContinuum: slot('dimensionless', 'the expected continuum weight'),
  expectRevival: slot('time', 'the expected revival time'),
  /** `expect mean x at T V`, `expect mean p at T V`. */
  expectMeanTime: slot('time', 'the time'),
  expectMeanX: slot('length', 'the expected mean x'),
  expectMeanP: slot('wavenumber', 'the expected mean p'),
} satisfies Record<string, SlotSpec>);

/** The tolerance of a comparison (`V +- T`): the value's kind, named as the tolerance. */
export function toleranceSlot(value: SlotSpec): SlotSpec {
  return slot(value.kind, 'the tolerance');
}
