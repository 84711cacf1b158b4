/**
 * How a front end names a result's energy unit where a reader might take a frequency or a wavenumber for
 * a plain energy: `MHz` on a `units` line means energies shown as the frequency E / h, `invcm` as the
 * wavenumber E / (h c). Pure; no dependencies, so the browser bundle can import it too.
 */

/** The unit facts these functions read (a subset of `AnalysisResult['units']`). */
interface UnitFacts {
  energy: string | null;
  energyKind?: 'energy' | 'frequency' | 'wavenumber';
}

/** The words for a natural-units file's energies. */
export const NATURAL_ENERGY = 'natural units (hbar = 1, mass = 1)';

/**
 * The energy unit with what it measures, for comment lines and notes: `meV`, `MHz (energy as the
 * frequency E/h)`, `invcm (energy as the wavenumber E/(h c) in 1/cm)`, or the natural-units words.
 */
export function energyUnitDescription(units: UnitFacts): string {
  if (units.energy === null) return NATURAL_ENERGY;
  if (units.energyKind === 'frequency') return `${units.energy} (energy as the frequency E/h)`;
  if (units.energyKind === 'wavenumber') return `${units.energy} (energy as the wavenumber E/(h c) in 1/cm)`;
  return units.energy;
}

/**
 * The symbol of an energy quantity as its column or axis names it: `E_n` stays `E_n` for an energy unit,
 * and becomes `E_n/h` (a frequency unit) or `E_n/hc` (a wavenumber), so `E_n/h [MHz]` reads right.
 */
export function energySymbol(symbol: string, units: UnitFacts): string {
  if (units.energyKind === 'frequency') return `${symbol}/h`;
  if (units.energyKind === 'wavenumber') return `${symbol}/hc`;
  return symbol;
}
