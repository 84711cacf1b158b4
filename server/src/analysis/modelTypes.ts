/**
 * The checked model's types (what `buildModel` in model.ts returns), kept apart so the builder stays small.
 */
import type { ExprText, Span, Statement } from '../language/ast';
import type { Complex, CompiledFunction, Dimension, UnitSystem } from '../expr/types';
import type { NarrowPeak } from './narrow';
import type { SamplesModel } from './samples';
import type { MixtureModel, ThermalModel } from './mixedModel';
import type { DataFile } from './options';

/** A system with its parameters evaluated (internal units). */
export type SystemModel =
  | { kind: 'box'; a: number; b: number; span: Span }
  | { kind: 'well'; depth: number; width: number; center: number; span: Span; barrierMass?: number }
  | { kind: 'oscillator'; omega: number; center: number; span: Span }
  | {
      kind: 'potential';
      V: CompiledFunction;
      a: number;
      b: number;
      span: Span;
      exprSpan: Span;
      /**
       * Identifies V: its text, the unit system and the values of the names it uses. Equal keys give
       * equal potentials, so a solved basis can be reused (systems.ts keeps a small memo).
       */
      key?: string;
      /** Which ends the file declares hard (`walls hard open`); absent: both open, truncating the line. */
      hard?: [boolean, boolean];
      /** `with mass(x) = ...`: the compiled mass (internal units) and the span of its formula. */
      massFn?: CompiledFunction;
      massSpan?: Span;
    };

/** A state with its parameters evaluated or compiled. */
export type StateModel =
  | { kind: 'psi'; fn: CompiledFunction; expr: ExprText; usesPhi: boolean; dimension?: Dimension; peaks?: NarrowPeak[] }
  | { kind: 'eigen'; level: number; levelSpan: Span; system: SystemModel }
  | { kind: 'gaussian'; center: number; width: number; momentum: number }
  | SamplesModel
  | ThermalModel
  | MixtureModel;

/** A checked `expect` line. */
export type ExpectModel =
  | { kind: 'norm' | 'energy' | 'spread'; stmt: Statement; comparison: ComparisonModel; unit?: string }
  | { kind: 'parity'; stmt: Statement; value: 'even' | 'odd' | 'mixed' }
  | { kind: 'weight'; stmt: Statement; from: number; to: number; comparison: ComparisonModel }
  | { kind: 'level'; stmt: Statement; level: number; comparison: ComparisonModel }
  | { kind: 'continuum' | 'revival'; stmt: Statement; comparison: ComparisonModel }
  | { kind: 'mean'; stmt: Statement; observable: 'x' | 'p'; time: number; comparison: ComparisonModel };

/** A comparison with its numbers in internal units. */
export interface ComparisonModel {
  kind: 'tolerance' | 'atLeast' | 'atMost';
  value: number;
  tolerance: number;
  /** The written value, to be replaced by a quick fix. */
  valueText: ExprText;
}

/** Everything the numerical stage needs. */
export interface Model {
  units: UnitSystem;
  mass: number;
  system: { model: SystemModel; stmt: Statement } | null;
  state: { model: StateModel; stmt: Statement } | null;
  basis: { value: number; stmt: Statement | null };
  expects: ExpectModel[];
  evolve: { to: number; steps: number; stmt: Statement } | null;
  /** Names defined by `let`, with their values (internal units) and where they are defined. */
  lets: Map<string, { value: Complex; dimension: Dimension; span: Span; valueSpan: Span }>;
  /** True when no error-severity diagnostic was found. */
  ok: boolean;
}

/** Options of `buildModel`. */
export interface ModelOptions {
  defaultBasis: number;
  maxBasis: number;
  maxEvolveSteps: number;
  /** Longest expression and deepest bracket nesting the sandbox parses (its own defaults when absent). */
  maxExpressionLength?: number;
  maxNesting?: number;
  /** The data files a front end read (`samples("PATH")`); absent, a samples state is left out silently (the quick stage). */
  data?: ReadonlyMap<string, DataFile>;
  /** The grid cap, which caps the rows of a data file (NODES_PER_SAMPLE nodes a row). */
  maxGridPoints?: number;
}
