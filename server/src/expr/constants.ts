/**
 * Physical constants and the unit table, in SI.
 * Source: CODATA 2018 recommended values (NIST); units derived from them by definition.
 * mathjs's own units are deliberately not used (its electronvolt rests on an older elementary charge).
 */
import type { Dimension } from './types';

/** Dimension exponents [length, mass, time, charge]. */
export const DIM = {
  none: [0, 0, 0, 0] as Dimension,
  length: [1, 0, 0, 0] as Dimension,
  mass: [0, 1, 0, 0] as Dimension,
  time: [0, 0, 1, 0] as Dimension,
  charge: [0, 0, 0, 1] as Dimension,
  energy: [2, 1, -2, 0] as Dimension,
  frequency: [0, 0, -1, 0] as Dimension,
  action: [2, 1, -1, 0] as Dimension,
  temperature: [0, 0, 0, 0, 1] as Dimension,
  /** Energy per temperature (the Boltzmann constant's). */
  entropy: [2, 1, -2, 0, -1] as Dimension,
} as const;

/*
 * The defining constants of the SI (exact since 2019; SI brochure, 9th edition) and the measured ones
 * as CODATA 2018 publishes them (NIST). Everything else is derived here from these in one place, the
 * way CODATA derives it, so that no truncated copy of an exact value can drift from its definition.
 */

/** Planck constant in J s (exact, a defining constant of the SI). */
export const H_SI = 6.62607015e-34;
/** Speed of light in vacuum, m/s (exact, SI 2019), for the wavenumber energy unit. */
const SPEED_OF_LIGHT_SI = 299792458;
/** Elementary charge in C (exact, a defining constant of the SI). */
export const QE_SI = 1.602176634e-19;
/** Reduced Planck constant h/(2 pi) in J s: exact, since h is (1.054571817646...e-34). */
export const HBAR_SI = H_SI / (2 * Math.PI);
/** The electronvolt in J: one elementary charge times one volt, e * 1 J/C (exact since 2019). */
export const EV_SI = QE_SI * 1;
/** Electron mass in kg (measured). Source: CODATA 2018 recommended values (NIST). */
export const ME_SI = 9.1093837015e-31;
/** Proton mass in kg (measured). Source: CODATA 2018 recommended values (NIST). */
export const MP_SI = 1.67262192369e-27;
/** Atomic mass constant m_u = m(12C)/12 in kg (measured). Source: CODATA 2018 recommended values (NIST). */
export const U_SI = 1.6605390666e-27;
/** Bohr radius in m (measured). Source: CODATA 2018 recommended values (NIST). */
export const A0_SI = 5.29177210903e-11;
/**
 * Hartree energy in J (measured). Source: CODATA 2018 recommended values (NIST). It is kept as published
 * rather than derived as 2 R_inf h c: the published R_inf is rounded, and that product misses the last
 * published digit of the hartree (4.35974472220717e-18 against 4.3597447222071e-18).
 */
export const HARTREE_SI = 4.3597447222071e-18;
/** Rydberg energy R_inf h c in J: half a hartree by definition. */
export const RYDBERG_SI = HARTREE_SI / 2;
/** Boltzmann constant in J/K (exact, a defining constant of the SI since 2019; CODATA 2018). */
export const KB_SI = 1.380649e-23;

/** Value and unit of a constant for a doc line, with 13 significant digits, e.g. "1.054571817646e-34 J s". */
function docValue(si: number, unit: string): string {
  return `${Number(si.toPrecision(13)).toExponential()} ${unit}`;
}

/** What a unit measures; `kind` decides where it may appear on a `units` line. */
export type UnitKind = 'length' | 'energy' | 'time' | 'frequency' | 'mass' | 'temperature';

/** One entry of the unit table. */
export interface UnitInfo {
  /** Value of one unit in SI. */
  si: number;
  dimension: Dimension;
  kind: UnitKind;
  /** One-line description for hover and completion. */
  doc: string;
}

function unit(si: number, kind: UnitKind, doc: string): UnitInfo {
  const dimension =
    kind === 'length' ? DIM.length : kind === 'energy' ? DIM.energy : kind === 'time' ? DIM.time : kind === 'mass' ? DIM.mass : kind === 'temperature' ? DIM.temperature : DIM.frequency;
  return { si, dimension, kind, doc };
}

/**
 * Every unit an expression may use, keyed by spelling. The micro prefix is accepted as `u`, the micro
 * sign U+00B5 and the Greek letter mu U+03BC; the angstrom as `angstrom`, U+00C5 and U+212B.
 */
export const UNITS: ReadonlyMap<string, UnitInfo> = new Map<string, UnitInfo>([
  ['m', unit(1, 'length', 'metre')],
  ['cm', unit(1e-2, 'length', 'centimetre')],
  ['mm', unit(1e-3, 'length', 'millimetre')],
  ['um', unit(1e-6, 'length', 'micrometre')],
  ['\u00B5m', unit(1e-6, 'length', 'micrometre')],
  ['\u03BCm', unit(1e-6, 'length', 'micrometre')],
  ['nm', unit(1e-9, 'length', 'nanometre')],
  ['pm', unit(1e-12, 'length', 'picometre')],
  ['fm', unit(1e-15, 'length', 'femtometre')],
  ['\u00C5', unit(1e-10, 'length', 'angstrom, 1e-10 m')],
  ['\u212B', unit(1e-10, 'length', 'angstrom, 1e-10 m')],
  ['angstrom', unit(1e-10, 'length', 'angstrom, 1e-10 m')],
  ['bohr', unit(A0_SI, 'length', 'Bohr radius (CODATA 2018)')],
  ['a0', unit(A0_SI, 'length', 'Bohr radius (CODATA 2018)')],
  ['J', unit(1, 'energy', 'joule')],
  ['eV', unit(EV_SI, 'energy', 'electronvolt')],
  ['meV', unit(EV_SI * 1e-3, 'energy', 'millielectronvolt')],
  ['ueV', unit(EV_SI * 1e-6, 'energy', 'microelectronvolt')],
  ['neV', unit(EV_SI * 1e-9, 'energy', 'nanoelectronvolt')],
  ['\u00B5eV', unit(EV_SI * 1e-6, 'energy', 'microelectronvolt')],
  ['\u03BCeV', unit(EV_SI * 1e-6, 'energy', 'microelectronvolt')],
  ['keV', unit(EV_SI * 1e3, 'energy', 'kiloelectronvolt')],
  ['MeV', unit(EV_SI * 1e6, 'energy', 'megaelectronvolt')],
  ['Ha', unit(HARTREE_SI, 'energy', 'hartree (CODATA 2018)')],
  ['hartree', unit(HARTREE_SI, 'energy', 'hartree (CODATA 2018)')],
  ['Ry', unit(RYDBERG_SI, 'energy', 'rydberg, half a hartree')],
  // The spectroscopists' wavenumber as an energy, E = h c / lambda with 1 / lambda = 1 / cm. Its own name, so a 1/length (`1 / cm`, a `momentum`) is never taken for an energy.
  ['invcm', unit(H_SI * SPEED_OF_LIGHT_SI * 100, 'energy', 'wavenumber energy h c / (1 cm), the energy of 1 cm^-1')],
  ['s', unit(1, 'time', 'second')],
  ['ms', unit(1e-3, 'time', 'millisecond')],
  ['us', unit(1e-6, 'time', 'microsecond')],
  ['\u00B5s', unit(1e-6, 'time', 'microsecond')],
  ['\u03BCs', unit(1e-6, 'time', 'microsecond')],
  ['ns', unit(1e-9, 'time', 'nanosecond')],
  ['ps', unit(1e-12, 'time', 'picosecond')],
  ['fs', unit(1e-15, 'time', 'femtosecond')],
  ['as', unit(1e-18, 'time', 'attosecond')],
  ['Hz', unit(1, 'frequency', 'hertz')],
  ['kHz', unit(1e3, 'frequency', 'kilohertz')],
  ['MHz', unit(1e6, 'frequency', 'megahertz')],
  ['GHz', unit(1e9, 'frequency', 'gigahertz')],
  ['THz', unit(1e12, 'frequency', 'terahertz')],
  ['kg', unit(1, 'mass', 'kilogram')],
  ['g', unit(1e-3, 'mass', 'gram')],
  ['m_e', unit(ME_SI, 'mass', 'electron mass (CODATA 2018)')],
  ['m_p', unit(MP_SI, 'mass', 'proton mass (CODATA 2018)')],
  ['u', unit(U_SI, 'mass', 'atomic mass constant (CODATA 2018)')],
  ['K', unit(1, 'temperature', 'kelvin (temperatures, e.g. of a thermal state)')],
  ['mK', unit(1e-3, 'temperature', 'millikelvin')],
  ['uK', unit(1e-6, 'temperature', 'microkelvin')],
  ['\u00B5K', unit(1e-6, 'temperature', 'microkelvin')],
  ['\u03BCK', unit(1e-6, 'temperature', 'microkelvin')],
  ['nK', unit(1e-9, 'temperature', 'nanokelvin')],
]);

/** A named physical constant (not a unit: it never appears on a `units` line). */
export interface ConstantInfo {
  si: number;
  dimension: Dimension;
  doc: string;
}

/**
 * Dimensional constants an expression may use in physical mode. The particle masses and the Bohr radius
 * are also units (`UNITS`), with the same values. Source: CODATA 2018 recommended values (NIST); the SI
 * brochure, 9th edition, for the exact ones.
 */
export const CONSTANTS: ReadonlyMap<string, ConstantInfo> = new Map<string, ConstantInfo>([
  ['hbar', { si: HBAR_SI, dimension: DIM.action, doc: `reduced Planck constant h/(2 pi), ${docValue(HBAR_SI, 'J s')}... (exact)` }],
  ['h', { si: H_SI, dimension: DIM.action, doc: `Planck constant, ${docValue(H_SI, 'J s')} (exact)` }],
  ['q_e', { si: QE_SI, dimension: DIM.charge, doc: `elementary charge, ${docValue(QE_SI, 'C')} (exact)` }],
  ['k_B', { si: KB_SI, dimension: DIM.entropy, doc: `Boltzmann constant, ${docValue(KB_SI, 'J/K')} (exact)` }],
]);

/** Dimensionless built-in names, available in both modes: Euler's number, pi and the imaginary unit. */
export const BUILTIN_NUMBERS: ReadonlyMap<string, { re: number; im: number; doc: string }> = new Map([
  ['e', { re: Math.E, im: 0, doc: "Euler's number" }],
  ['pi', { re: Math.PI, im: 0, doc: 'pi, the ratio of circumference to diameter' }],
  ['i', { re: 0, im: 1, doc: 'the imaginary unit' }],
]);

/**
 * The energy in J of one unit that may name a file's energy unit: an energy unit's own value, or h f for a
 * frequency unit (a `units` line may give the energy as a frequency, E = h f). Null for other names.
 */
export function energyUnitSI(name: string): number | null {
  const info = UNITS.get(name);
  if (!info) return null;
  if (info.kind === 'energy') return info.si;
  return info.kind === 'frequency' ? H_SI * info.si : null;
}
