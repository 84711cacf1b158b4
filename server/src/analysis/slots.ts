/**
 * What every expression slot of a statement must be, other than the constructor arguments (whose home
 * is their parameter in language/signatures.ts): the kind of value (its dimension, analysis/
 * dimensions.ts) and the words findings name it with. The full analysis (model.ts, mixedModel.ts,
 * sweep/plan.ts) and the untrusted pipeline (untrusted.ts, sweep/untrusted.ts) both read each slot
 * from here, so the two cannot disagree on what a slot must be; test/analysis/slots.test.ts tries a
 * wrong dimension in every slot in both.
 */
import type { ExprText, SweepSpec } from '../language/ast';
import type { Dimension, UnitSystem } from '../expr/types';
import { dimensionOf, type ValueKind } from './dimensions';

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
  /** `sweep NAME from A to B steps K`: the number of steps. */
  sweepSteps: slot('dimensionless', 'the number of steps'),
} satisfies Record<string, SlotSpec>);

/** The tolerance of a comparison (`V +- T`): the value's kind, named as the tolerance. */
export function toleranceSlot(value: SlotSpec): SlotSpec {
  return slot(value.kind, 'the tolerance');
}

/**
 * A slot whose dimension is no fixed kind but that of a `let`: a sweep's range takes the swept let's
 * dimension (sweepLineSlots), the range of `expect window covers A..B` the first sweep's (windowSlots).
 * `what` words it with that let's name.
 */
export interface LikeSlotSpec {
  readonly what: (name: string) => string;
}

const like = (what: (name: string) => string): LikeSlotSpec => Object.freeze({ what });

/** The slots whose dimension is a let's. */
export const LIKE_SLOTS = Object.freeze({
  /** `sweep NAME from A to B ...`: A and B. */
  sweepFrom: like((n) => `the first value of the sweep of '${n}'`),
  sweepTo: like((n) => `the last value of the sweep of '${n}'`),
  /** `expect window covers A..B`: A and B, values of the first sweep's let. */
  windowFrom: like((n) => `the first value of the window of '${n}'`),
  windowTo: like((n) => `the last value of the window of '${n}'`),
} satisfies Record<string, LikeSlotSpec>);

/** One expression of a sweep or window line, what it must be (a dimension) and its words. */
export interface SweepSlot {
  readonly src: ExprText;
  readonly dimension: Dimension;
  readonly what: string;
}

/**
 * The expressions of a `sweep` line in the order they are checked, each with the dimension it must
 * have: the range the swept let's (`letDimension`), the number of steps that of `SLOTS.sweepSteps`.
 */
export function sweepLineSlots(spec: SweepSpec, letDimension: Dimension, units: UnitSystem): SweepSlot[] {
  return [
    { src: spec.from, dimension: letDimension, what: LIKE_SLOTS.sweepFrom.what(spec.name) },
    { src: spec.to, dimension: letDimension, what: LIKE_SLOTS.sweepTo.what(spec.name) },
    { src: spec.steps, dimension: dimensionOf(SLOTS.sweepSteps.kind, units), what: SLOTS.sweepSteps.what },
  ];
}

/** The range of an `expect window covers A..B` line: values of the first sweep's let `name`, of dimension `letDimension`. */
export function windowSlots(range: { from: ExprText; to: ExprText }, name: string, letDimension: Dimension): SweepSlot[] {
  return [
    { src: range.from, dimension: letDimension, what: LIKE_SLOTS.windowFrom.what(name) },
    { src: range.to, dimension: letDimension, what: LIKE_SLOTS.windowTo.what(name) },
  ];
}
