/**
 * The programmatic entry `require('eigenspan/engine')`: the engine without the command line, for
 * scripts and notebooks. Its names are semver-stable: they change only with a major version, and
 * fields are only added. The result is the object `eigenspan expand --json` prints (docs/api.md).
 * The declarations users compile against are types/engine.d.ts, which this file imports its types
 * from; test/cli/engine.test.ts checks that its values and functions match them.
 */
import { DEFAULT_LIMITS as LIMIT_DEFAULTS, LIMIT_RANGES as RANGES, readLimits, type Limits } from '../analysis/index';
import { CATALOGUE, type Code, type Severity } from '../language/catalogue';
import { analyseBounded } from '../cli/options';
import { toJson } from '../cli/render';

// The result's shape has one home, the declarations users compile against (types/engine.d.ts);
// this file returns exactly that shape, and test/cli/engineShape.test.ts walks real results against it.
import type { EngineOptions, EngineResult } from '../../../types/engine';
export type { EngineFinding, EngineLevel, EngineOptions, EngineResult } from '../../../types/engine';

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
