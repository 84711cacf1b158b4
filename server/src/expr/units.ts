/**
 * Unit systems: the `units` line, conversion between SI and the engine's internal units, and dimension
 * names for messages.
 * Internal units (see `UnitSystem`): length = the file's length unit L, energy = the file's energy unit E,
 * hbar = 1. Hence time T = hbar / E, mass M = hbar^2 / (E L^2); charge is counted in elementary charges.
 */
import type { Span } from '../language/ast';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import { didYouMean, editDistance } from '../language/suggest';
import { CONSTANTS, H_SI, HBAR_SI, QE_SI, UNITS, type UnitKind } from './constants';
import type { Dimension, Prepared, Scope, ScopeValue, UnitSystem } from './types';

/** The natural unit system: hbar = 1, mass = 1 by default, and no value carries a unit. */
export const NATURAL: UnitSystem = { mode: 'natural' };

/** Names allowed on a `units` line, by kind. */
function displayUnitNames(): string[] {
  const out: string[] = [];
  for (const [name, info] of UNITS) if (info.kind === 'length' || info.kind === 'energy' || info.kind === 'time' || info.kind === 'frequency') out.push(name);
  return out;
}

/**
 * The role a unit plays on a `units` line. A frequency stands for the energy h f (CODATA 2018: h exact),
 * so `units um, MHz` shows energies as E / h in MHz.
 */
function lineRole(kind: UnitKind): 'length' | 'energy' | 'time' | null {
  if (kind === 'frequency') return 'energy';
  return kind === 'length' || kind === 'energy' || kind === 'time' ? kind : null;
}

/** The time unit that is one over a frequency unit (MHz: us), or null; the default time unit of a frequency-unit file. */
export function reciprocalTime(frequencySI: number): { name: string; si: number } | null {
  for (const [name, info] of UNITS)
    if (info.kind === 'time' && /^[a-z]+$/.test(name) && Math.abs(info.si * frequencySI - 1) < 1e-12) return { name, si: info.si };
  return null;
}

/**
 * " Did you mean ...?" for a unit name. Among names equal up to case (mev: meV or MeV) the one closest
 * with case counted wins; otherwise the shared suggestion rule applies.
 */
function unitSuggestion(word: string): string {
  const names = displayUnitNames();
  const same = names.filter((n) => n.toLowerCase() === word.toLowerCase() && n !== word);
  if (same.length > 0) {
    same.sort((a, b) => editDistance(word, a) - editDistance(word, b) || (a < b ? -1 : 1));
    return ` Did you mean '${same[0]}'?`;
  }
  return didYouMean(word, names);
}

/**
 * Validates a `units` line and builds the unit system.
 * `null` (no `units` line) gives natural units. Otherwise exactly one length unit and one energy unit
 * are required, at most one time unit, in any order; unknown names, units of other kinds and repeats
 * are `units` errors on the name's span.
 */
export function makeUnitSystem(units: { name: string; span: Span }[] | null): Prepared<UnitSystem> {
  if (units === null) return { result: NATURAL, diagnostics: [] };
  const diagnostics: EngineDiagnostic[] = [];
  const found: Partial<Record<'length' | 'energy' | 'time', { name: string; si: number; frequency?: number }>> = {};
  for (const u of units) {
    const info = UNITS.get(u.name);
    if (!info) {
      diagnostics.push(
        diagnostic('units', u.span.start, u.span.end, `Unknown unit '${u.name}'.${unitSuggestion(u.name)}`),
      );
      continue;
    }
    const kind = lineRole(info.kind);
    if (kind === null) {
      diagnostics.push(
        diagnostic('units', u.span.start, u.span.end, `'${u.name}' is a ${info.kind} unit; the units line lists a length, an energy (or a frequency standing for h f) and optionally a time.`),
      );
      continue;
    }
    if (found[kind]) {
      diagnostics.push(
        diagnostic('units', u.span.start, u.span.end, `A second ${kind} unit '${u.name}'; the units line already has '${found[kind]!.name}'.`),
      );
      continue;
    }
    // A frequency unit is the energy h times one of it; `frequency` keeps its SI value for the default time unit.
    found[kind] = info.kind === 'frequency' ? { name: u.name, si: H_SI * info.si, frequency: info.si } : { name: u.name, si: info.si };
  }
  const whole =
    units.length > 0 ? { start: units[0]!.span.start, end: units[units.length - 1]!.span.end } : { start: 0, end: 0 };
  if (!found.length && !diagnostics.some((d) => d.code === 'units' && /Unknown/.test(d.message)))
    diagnostics.push(diagnostic('units', whole.start, whole.end, 'The units line needs a length unit (for example nm).'));
  if (!found.energy && !diagnostics.some((d) => d.code === 'units' && /Unknown/.test(d.message)))
    diagnostics.push(diagnostic('units', whole.start, whole.end, 'The units line needs an energy unit (for example meV).'));
  if (!found.length || !found.energy || diagnostics.length > 0) return { result: null, diagnostics };
  const { frequency, ...energy } = found.energy;
  // With a frequency for the energy and no time unit, times are shown in its reciprocal (MHz: us), not in 1/(2 pi MHz).
  const time = found.time ?? (frequency !== undefined ? reciprocalTime(frequency) : null);
  return {
    result: { mode: 'physical', length: found.length, energy: frequency !== undefined ? { ...energy, frequency: true } : energy, time },
    diagnostics,
  };
}

/**
 * SI value of one internal unit of dimension `dim`: L^a * M^b * T^c * Q^d with T = hbar/E,
 * M = hbar^2/(E L^2) and Q = the elementary charge; the internal unit of temperature is the kelvin
 * itself (so k_B is E-per-kelvin inside). 1 in natural mode.
 */
export function internalUnitSI(dim: Dimension, u: UnitSystem): number {
  if (u.mode === 'natural') return 1;
  const L = u.length.si;
  const E = u.energy.si;
  const T = HBAR_SI / E;
  const M = (HBAR_SI * HBAR_SI) / (E * L * L);
  return Math.pow(L, dim[0]) * Math.pow(M, dim[1]) * Math.pow(T, dim[2]) * Math.pow(QE_SI, dim[3]);
}

/** Converts an SI value of dimension `dim` to internal units: si / internalUnitSI(dim). Identity in natural mode. */
export function toInternal(si: number, dim: Dimension, u: UnitSystem): number {
  return u.mode === 'natural' ? si : si / internalUnitSI(dim, u);
}

/** Converts an internal-unit value of dimension `dim` back to SI: value * internalUnitSI(dim). Identity in natural mode. */
export function fromInternal(value: number, dim: Dimension, u: UnitSystem): number {
  return u.mode === 'natural' ? value : value * internalUnitSI(dim, u);
}

/**
 * A time in internal units (hbar / E) expressed in the file's time unit: t * (hbar / E) / timeUnit.
 * Without a time unit (and in natural mode) the internal value is returned unchanged.
 */
export function timeToDisplay(t: number, u: UnitSystem): number {
  if (u.mode === 'natural' || u.time === null) return t;
  return (t * HBAR_SI) / u.energy.si / u.time.si;
}

/** The label of the unit `timeToDisplay` returns: the file's time unit, `hbar/<energy unit>`, or '' in natural mode. */
export function timeUnitName(u: UnitSystem): string {
  if (u.mode === 'natural') return '';
  return u.time === null ? `hbar/${u.energy.name}` : u.time.name;
}

/**
 * The scope every expression of a file starts from: in physical mode the dimensional constants (hbar, h,
 * q_e, m_e, m_p, u, a0) in internal units; in natural mode no values (units and dimensional constants are
 * refused there). `let` names are added by the caller.
 */
export function createScope(u: UnitSystem): Scope {
  const values = new Map<string, ScopeValue>();
  if (u.mode === 'physical') {
    for (const [name, c] of CONSTANTS) values.set(name, { value: { re: toInternal(c.si, c.dimension, u), im: 0 }, dimension: c.dimension });
    for (const name of ['m_e', 'm_p', 'u', 'a0']) {
      const info = UNITS.get(name)!;
      values.set(name, { value: { re: toInternal(info.si, info.dimension, u), im: 0 }, dimension: info.dimension });
    }
  }
  return { units: u, values, hasX: false, hasPhi: false };
}

/** The SI value and dimension of a unit or dimensional constant name, or null. */
export function lookupPhysical(name: string): { si: number; dimension: Dimension; doc: string } | null {
  const unit = UNITS.get(name);
  if (unit) return { si: unit.si, dimension: unit.dimension, doc: unit.doc };
  const c = CONSTANTS.get(name);
  if (c) return c;
  return null;
}

/** Every unit and dimensional constant name (for suggestions and completion). */
export function physicalNames(): string[] {
  return [...UNITS.keys(), ...CONSTANTS.keys()];
}

/** True when two dimensions are equal (exponents compared to 1e-9 so halves and thirds compare cleanly). */
export function sameDimension(a: Dimension, b: Dimension): boolean {
  for (let k = 0; k < 4; k++) if (Math.abs(a[k]! - b[k]!) > 1e-9) return false;
  return Math.abs((a[4] ?? 0) - (b[4] ?? 0)) <= 1e-9;
}

/** True for the dimensionless [0, 0, 0, 0]. */
export function isDimensionless(d: Dimension): boolean {
  return sameDimension(d, [0, 0, 0, 0]);
}

function exponentText(p: number): string {
  if (Number.isInteger(p)) return p === 1 ? '' : `^${p}`;
  for (const q of [2, 3, 4, 6]) {
    const n = Math.round(p * q);
    if (Math.abs(n - p * q) < 1e-9) return `^(${n}/${q})`;
  }
  return `^${p}`;
}

function product(parts: [string, number][]): string {
  const num = parts.filter(([, p]) => p > 1e-9).map(([w, p]) => w + exponentText(p));
  const den = parts.filter(([, p]) => p < -1e-9).map(([w, p]) => w + exponentText(-p));
  const top = num.length > 0 ? num.join('·') : '1';
  if (den.length === 0) return top;
  return `${top}/${den.length === 1 ? den[0] : '(' + den.join('·') + ')'}`;
}

/**
 * Words for a dimension: "dimensionless", "length", "energy", "time", "1/length", "mass", "length^2",
 * "energy·time", "1/length^(1/2)". Chooses between a mass-based and an energy-based spelling, whichever
 * needs fewer factors (energy = mass·length^2/time^2).
 */
export function formatDimension(dim: Dimension): string {
  if (isDimensionless(dim)) return 'dimensionless';
  const [l, m, t, q] = dim;
  const th = dim[4] ?? 0;
  const massParts: [string, number][] = [
    ['length', l],
    ['mass', m],
    ['time', t],
    ['charge', q],
    ['temperature', th],
  ];
  const energyParts: [string, number][] = [
    ['energy', m],
    ['length', l - 2 * m],
    ['time', t + 2 * m],
    ['charge', q],
    ['temperature', th],
  ];
  const count = (ps: [string, number][]) => ps.filter(([, p]) => Math.abs(p) > 1e-9).length;
  return product(count(energyParts) < count(massParts) ? energyParts : massParts);
}

/** "a length", "an energy": the dimension's words with an indefinite article. */
export function withArticle(dim: Dimension): string {
  const w = formatDimension(dim);
  if (w === 'dimensionless') return 'a dimensionless number';
  return (/^[aeiou]/.test(w) ? 'an ' : 'a ') + w;
}
