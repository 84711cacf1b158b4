/**
 * What a caller may set on an analysis: its options, its resource caps, the range each settable cap may
 * take, and the reader that turns untrusted settings into caps. One home for these facts: the command
 * line, the language server's settings and the engine all read them from here.
 */
import type { Clock } from '../physics/budget';

/** Options of `analyse`, with their defaults. */
export interface AnalyseOptions {
  /** Levels to project on when the file has no `basis` line (default `DEFAULT_BASIS`, 40). */
  defaultBasis?: number;
  /**
   * When false, the untrusted pipeline runs instead (`analyseUntrusted`): syntax, name and dimension
   * checks, and nothing is evaluated. Default true.
   */
  evaluate?: boolean;
  /** Include plot samples (`samples`, `evolution.density`) for the panel. Default false. */
  samples?: boolean;
  /** Polled with the time limit; when it returns true the analysis stops early and returns what it has. */
  cancelled?: () => boolean;
  /** Caps (defaults in `DEFAULT_LIMITS`). */
  limits?: Partial<Limits>;
  /** The clock the time limit is measured on (default the machine's monotonic clock; tests inject one). */
  clock?: Clock;
  /**
   * The data files the text names (`state samples("PATH")`, listed by `dataPaths`), keyed by the path
   * as written: the text a front end read under its file rules, or why it refused to. The engine reads
   * no file itself. A path missing from the map is reported as not read; without the map at all,
   * `analyseStatic` says nothing about data files and `analyse` treats it as empty.
   */
  data?: ReadonlyMap<string, DataFile>;
  /**
   * The grid of the plot samples (with `samples: true`): given `points`, that many equally spaced points
   * over the walls or the integration window (the command line's `--samples` export); without it, a
   * pure state's panel grid (viewGrid.ts: 400 points over where the state lives, a coarse grid over the
   * rest, exact points at jumps and kinks). With the eigenfunctions of the first `levels` levels on it
   * (default 100; the export asks for all of them).
   */
  plot?: { points?: number; levels?: number };
}

/** A data file as a front end hands it to the engine: its text, or the sentence saying why it was not read. */
export type DataFile = { text: string } | { refused: string };

/** Resource caps; each exceeded cap is a `limits` diagnostic. */
export interface Limits {
  maxBasis: number;
  maxGridPoints: number;
  maxExpressionLength: number;
  maxNesting: number;
  /** Longest file, in bytes of its UTF-8 encoding. */
  maxFileBytes: number;
  maxStatements: number;
  maxEvolveSteps: number;
  /** Time per analysis in milliseconds: past it the stages stop with what they have and a `limits` diagnostic. */
  maxMillis: number;
}

/** Safe defaults for `Limits`. */
export const DEFAULT_LIMITS: Limits = {
  maxBasis: 5000,
  maxGridPoints: 1 << 18,
  maxExpressionLength: 10_000,
  maxNesting: 200,
  maxFileBytes: 256 * 1024,
  maxStatements: 2000,
  maxEvolveSteps: 10_000,
  maxMillis: 10_000,
};

/** Default number of levels when a file has no `basis` line. */
export const DEFAULT_BASIS = 40;

/** The caps a user may set (editor settings `eigenspan.limits.*`, `--limit NAME=VALUE`), the time limit apart. */
export type SettableLimit = Exclude<keyof Limits, 'maxMillis'>;

/**
 * The range each settable cap may take. The upper ends keep the engine safe whatever is set: the
 * expression parser recurses deeply for each bracket (measured: about 260 nested brackets fit Node's
 * default stack on the main thread, where the command line and the editor's quick stage parse; a
 * deeper text is still refused cleanly), grids of 2^21 points with two derivatives take about 100 MB,
 * and the time limit bounds the rest.
 */
export const LIMIT_RANGES: Readonly<Record<SettableLimit, readonly [number, number]>> = Object.freeze({
  maxBasis: [1, 20_000],
  maxGridPoints: [1024, 1 << 21],
  maxExpressionLength: [100, 1_000_000],
  maxNesting: [10, 250],
  maxFileBytes: [1024, 16 * 1024 * 1024],
  maxStatements: [10, 100_000],
  maxEvolveSteps: [1, 100_000],
});

/** The caps of one analysis: the defaults with the caller's caps laid over them. */
export function resolveLimits(options: AnalyseOptions): Limits {
  return { ...DEFAULT_LIMITS, ...options.limits };
}

/**
 * Reads settable caps from an untrusted object ({ maxBasis: 8000, ... }): whole numbers inside
 * `LIMIT_RANGES` are kept, anything else is left at its default and named in `problems`
 * (unknown names too). Never throws.
 */
export function readLimits(raw: unknown): { limits: Partial<Limits>; problems: string[] } {
  const limits: Partial<Limits> = {};
  const problems: string[] = [];
  if (raw === undefined || raw === null) return { limits, problems };
  if (typeof raw !== 'object' || Array.isArray(raw)) return { limits, problems: ['the limits must be an object of names and numbers'] };
  for (const [name, value] of Object.entries(raw as Record<string, unknown>)) {
    if (!Object.prototype.hasOwnProperty.call(LIMIT_RANGES, name)) {
      problems.push(`'${name}' is not a limit (known: ${Object.keys(LIMIT_RANGES).join(', ')})`);
      continue;
    }
    const [lo, hi] = LIMIT_RANGES[name as SettableLimit];
    const v = typeof value === 'string' && value.trim() !== '' ? Number(value) : value;
    if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi) {
      problems.push(`${name} must be a whole number from ${lo} to ${hi}`);
      continue;
    }
    limits[name as SettableLimit] = v;
  }
  return { limits, problems };
}
