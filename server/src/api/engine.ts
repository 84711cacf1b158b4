/**
 * The programmatic entry `require('eigenspan/engine')`: the engine without the command line, for
 * scripts and notebooks. Its names are semver-stable: they change only with a major version, and
 * fields are only added. The result is the object `eigenspan expand --json` prints (docs/api.md).
 * The declarations users compile against are hand-kept in types/engine.d.ts; test/cli/engine.test.ts
 * checks that they match this file.
 */
import { DEFAULT_LIMITS as LIMIT_DEFAULTS, LIMIT_RANGES as RANGES, readLimits, type Limits } from '../analysis/index';
import { CATALOGUE, type Code, type Severity } from '../language/catalogue';
import { analyseBounded } from '../cli/options';
import { toJson } from '../cli/render';

/** Options of `analyse`. */
export interface EngineOptions {
  /** Levels to project on when the text has no `basis` line (default 40). */
  defaultBasis?: number;
  /** Caps and the time limit (`maxMillis`); a cap outside its range in LIMIT_RANGES is refused. */
  limits?: Partial<Limits>;
}

/** A finding, 1-based; columns count UTF-16 code units. */
export interface EngineFinding {
  line: number;
  column: number;
  endLine: number;
  endColumn: number;
  severity: Severity;
  code: Code;
  message: string;
}

/** One level of the expansion. */
export interface EngineLevel {
  n: number;
  energy: number;
  /** c_n of the normalised state; null for a mixed state (thermal, mixture), whose coefficients have no meaning. */
  re: number | null;
  im: number | null;
  /** |c_n|^2, or the population P_n of a mixed state. */
  weight: number;
  uncertainty?: number;
  /** Numerical systems: the uncertainty of re and im (twice their change between the solver's last two grids). */
  coefficientUncertainty?: number;
}

/** The result of `analyse`: the fields of `eigenspan expand --json`. */
export interface EngineResult {
  levels: EngineLevel[];
  norm: number | null;
  captured: number | null;
  energy: { mean: number | null; spread: number | null };
  parity: 'even' | 'odd' | 'mixed' | null;
  continuum?: number;
  diagnostics: EngineFinding[];
  units: { length: string | null; energy: string | null; time: string | null };
  system: {
    kind: 'box' | 'well' | 'oscillator' | 'potential';
    energies: number[];
    uncertainties?: number[];
    boundCount?: number;
    center: number | null;
    /** A mass that depends on x: the regions between its interfaces, with the smallest and largest mass in each (m_e in a physical file). */
    mass?: { regions: { from: number | null; to: number | null; min: number; max: number }[]; unit: string | null };
  } | null;
  decay: { exponent: number | null; classification: 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown'; at: number | null } | null;
  levelsFor999: number | null;
  evolution?: {
    times: number[];
    meanX: number[];
    meanP: number[];
    survival: number[];
    revival: number | null;
    /** The survival probability on its own fine time grid, independent of the evolve steps. */
    survivalTimes?: number[];
    survivalFine?: number[];
  };
  /** Tr rho^2: 1 for a pure state. */
  purity?: number;
  /** Mixed states only: the parts' probabilities as used and the share of a thermal sum left out. */
  mixture?: { kind: 'thermal' | 'mixture'; weights: number[]; omitted: number };
  /** Oscillators only: the mean quantum number <n>; null when the energy mean diverges. */
  meanQuantumNumber?: number | null;
}

/** The default caps (a copy; changing it changes nothing). */
export const DEFAULT_LIMITS: Readonly<Limits> = Object.freeze({ ...LIMIT_DEFAULTS });

/** The range of each settable cap, [lowest, highest]. */
export const LIMIT_RANGES: Readonly<Record<Exclude<keyof Limits, 'maxMillis'>, readonly [number, number]>> = RANGES;

/** Every diagnostic code with its default severity. */
export const CODES: Readonly<Record<Code, Severity>> = Object.freeze(
  Object.fromEntries(Object.entries(CATALOGUE).map(([k, v]) => [k, v.severity])) as Record<Code, Severity>,
);

/** Analyses the text of a `.qstate` file; never throws for any text. Throws a RangeError for a bad option. */
export function analyse(text: string, options: EngineOptions = {}): EngineResult {
  if (typeof text !== 'string') throw new TypeError('analyse needs the text of a .qstate file');
  const { defaultBasis, limits = {} } = options;
  if (defaultBasis !== undefined && (!Number.isInteger(defaultBasis) || defaultBasis < 1)) throw new RangeError('defaultBasis must be a whole number of at least 1');
  const { maxMillis, ...caps } = limits;
  if (maxMillis !== undefined && (!Number.isInteger(maxMillis) || maxMillis < 1)) throw new RangeError('limits.maxMillis must be a whole number of milliseconds');
  const { limits: read, problems } = readLimits(caps);
  if (problems.length > 0) throw new RangeError(`limits: ${problems[0]}`);
  if (maxMillis !== undefined) read.maxMillis = maxMillis;
  return toJson(analyseBounded(text, { defaultBasis, limits: read }), text) as unknown as EngineResult;
}
