/**
 * Energies given as frequencies, E = h f: where a statement expects an energy (a well's depth, an
 * oscillator's quantum, the value and tolerance of `expect energy` and `expect spread`) a value of
 * dimension 1/time is taken as a frequency f in cycles per time and converted by E = h f. The rule is
 * driven by the slot's dimension: a value stays a frequency everywhere else (`omega = 2 pi * 1.5 MHz`
 * is an angular frequency, `let f = 1.5 MHz` a frequency), so a number is converted only where an
 * energy is expected. Formulas (`V(x)`) must still be energies.
 */
import type { Dimension, UnitSystem } from '../expr/types';
import { sameDimension } from '../expr/units';
import { dimensionOf, type ValueKind } from './dimensions';

/** Whether a value of dimension `d` in a slot of `kind` is a frequency standing for the energy h f (physical units only). */
export function frequencyAsEnergy(kind: ValueKind | null, d: Dimension, units: UnitSystem): boolean {
  return kind === 'energy' && units.mode === 'physical' && sameDimension(d, dimensionOf('frequency', units));
}

/** E = h f = 2 pi hbar f, in internal units (hbar = 1): the internal energy of an internal frequency f. */
export function energyOfFrequency(f: number): number {
  return 2 * Math.PI * f;
}
