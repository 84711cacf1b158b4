/**
 * The server's settings (section `eigenspan` of `workspace/configuration`) and their defaults.
 */
import { readLimits, type Limits } from '../analysis/index';
import { DEFAULT_SWEEP_MILLIS, SWEEP_MILLIS_RANGE } from '../analysis/sweep/index';

/** Settings the server honours. */
export interface Settings {
  /** Quiet time after the last edit before the full analysis starts (default 100 ms). */
  debounceMs: number;
  /** Wall-clock budget of one full analysis; past it the worker is terminated (default 2000 ms). */
  timeBudgetMs: number;
  /** Levels to project on when a file has no `basis` line (default 40, as in the file format). */
  defaultBasis: number;
  /** Caps set by the user (`eigenspan.limits.*`); the rest keep the engine's defaults. */
  limits: Partial<Limits>;
  /** Why set limits were refused (out of range, unknown names), for the server's log. */
  limitProblems: string[];
  /** Time for a whole design sweep (`eigenspan/sweep`, lsp/sweep.ts), separate from the per-analysis budget (default 60000 ms). */
  sweepTimeLimitMs: number;
  /** Run a document's design sweep after each full analysis of a text with a valid sweep line (lsp/sweepRuns.ts; default true). */
  sweepInBackground: boolean;
}

/** The defaults, used when the client cannot answer `workspace/configuration`. */
export const DEFAULT_SETTINGS: Settings = Object.freeze({ debounceMs: 100, timeBudgetMs: 2000, defaultBasis: 40, limits: Object.freeze({}), limitProblems: [], sweepTimeLimitMs: DEFAULT_SWEEP_MILLIS, sweepInBackground: true });

/**
 * The accepted range of each plain number setting, the same as `minimum` and `maximum` in package.json
 * (a test holds them together); the limits' ranges are the engine's `LIMIT_RANGES`.
 */
export const SETTING_RANGES: Readonly<Record<'debounceMs' | 'timeBudgetMs' | 'defaultBasis' | 'sweepTimeLimitMs', readonly [number, number]>> = Object.freeze({
  debounceMs: [0, 5000],
  timeBudgetMs: [100, 60_000],
  defaultBasis: [1, 5000],
  sweepTimeLimitMs: SWEEP_MILLIS_RANGE,
});

/** Reads one number from an untrusted settings object, falling back when it is missing or out of range. */
function num(raw: unknown, fallback: number, [min, max]: readonly [number, number]): number {
  const v = typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : raw;
  return typeof v === 'number' && Number.isFinite(v) && v >= min && v <= max ? v : fallback;
}

/**
 * Turns whatever the client sent for section `eigenspan` into valid settings; unknown keys are ignored
 * and bad values fall back to the defaults (never throws).
 */
export function readSettings(raw: unknown): Settings {
  const o = raw !== null && typeof raw === 'object' ? (raw as Record<string, unknown>) : {};
  return {
    debounceMs: num(o.debounceMs, DEFAULT_SETTINGS.debounceMs, SETTING_RANGES.debounceMs),
    timeBudgetMs: num(o.timeBudgetMs, DEFAULT_SETTINGS.timeBudgetMs, SETTING_RANGES.timeBudgetMs),
    defaultBasis: Math.round(num(o.defaultBasis, DEFAULT_SETTINGS.defaultBasis, SETTING_RANGES.defaultBasis)),
    sweepTimeLimitMs: Math.round(num(o.sweepTimeLimitMs, DEFAULT_SETTINGS.sweepTimeLimitMs, SETTING_RANGES.sweepTimeLimitMs)),
    sweepInBackground: typeof o.sweepInBackground === 'boolean' ? o.sweepInBackground : DEFAULT_SETTINGS.sweepInBackground,
    ...(() => {
      const { limits, problems } = readLimits(o.limits);
      return { limits, limitProblems: problems };
    })(),
  };
}
