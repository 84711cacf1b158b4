/**
 * The physical dimensions the analysis expects of each kind of value.
 * Exponents of length, mass, time and charge; in natural units every value is dimensionless.
 */
import type { Dimension, UnitSystem } from '../expr/types';

/** The kinds of value a statement argument can be. */
export type ValueKind =
  | 'length'
  | 'energy'
  | 'mass'
  | 'time'
  | 'angularFrequency'
  | 'frequency'
  | 'wavenumber'
  | 'dimensionless'
  | 'temperature';

const TABLE: Record<ValueKind, Dimension> = {
  length: [1, 0, 0, 0],
  energy: [2, 1, -2, 0],
  mass: [0, 1, 0, 0],
  time: [0, 0, 1, 0],
  angularFrequency: [0, 0, -1, 0],
  frequency: [0, 0, -1, 0],
  wavenumber: [-1, 0, 0, 0],
  dimensionless: [0, 0, 0, 0],
  temperature: [0, 0, 0, 0, 1],
};

/** The dimensionless dimension. */
export const DIMENSIONLESS: Dimension = TABLE.dimensionless;

/** The dimension a value of `kind` must have in a file with unit system `units`. */
export function dimensionOf(kind: ValueKind, units: UnitSystem): Dimension {
  return units.mode === 'natural' ? DIMENSIONLESS : TABLE[kind];
}
