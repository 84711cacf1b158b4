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
  re: number;
  im: number;
  weight: number;
  uncertainty?: number;
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
  } | null;
  decay: { exponent: number | null; classification: 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown'; at: number | null } | null;
  levelsFor999: number | null;
  evolution?: { times: number[]; meanX: number[]; meanP: number[]; survival: number[]; revival: number | null };
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
