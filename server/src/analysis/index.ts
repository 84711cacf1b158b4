/**
 * The one function every front end calls: text in, expansion and diagnostics out.
 * (Contract stub: the implementation lands with the core engine.)
 */
import type { AnalysisResult } from './types';
import type { EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';

/** Options of `analyse`, with their defaults. */
export interface AnalyseOptions {
  /** Levels to project on when the file has no `basis` line (default 40). */
  defaultBasis?: number;
  /** When false, only syntax, name and unit checks run (untrusted workspaces). Default true. */
  evaluate?: boolean;
  /** Include plot samples (`samples`, `evolution.density`) for the panel. Default false. */
  samples?: boolean;
  /** Polled between stages; when it returns true the analysis stops early and returns what it has. */
  cancelled?: () => boolean;
  /** Caps (defaults in `DEFAULT_LIMITS`). */
  limits?: Partial<Limits>;
}

/** Resource caps; each exceeded cap is a `limits` diagnostic. */
export interface Limits {
  maxBasis: number;
  maxGridPoints: number;
  maxExpressionLength: number;
  maxNesting: number;
  maxFileBytes: number;
  maxStatements: number;
  maxEvolveSteps: number;
}

/** Safe defaults for `Limits`. */
export const DEFAULT_LIMITS: Limits = {
  maxBasis: 5000,
  maxGridPoints: 1 << 17,
  maxExpressionLength: 10_000,
  maxNesting: 200,
  maxFileBytes: 256 * 1024,
  maxStatements: 2000,
  maxEvolveSteps: 10_000,
};

/** Syntax, name and unit checks only: cheap enough to run on every keystroke. */
export function analyseStatic(text: string, options: AnalyseOptions = {}): { file: QFile; diagnostics: EngineDiagnostic[] } {
  void options;
  return { file: { text, statements: [] }, diagnostics: [] };
}

/** Parses, checks and expands a `.qstate` file. Never throws. */
export function analyse(text: string, options: AnalyseOptions = {}): AnalysisResult {
  const started = performance.now();
  const s = analyseStatic(text, options);
  return {
    file: s.file,
    diagnostics: s.diagnostics,
    units: { length: null, energy: null, time: null },
    system: null,
    levels: [],
    norm: null,
    captured: null,
    energy: null,
    parity: null,
    decay: null,
    levelsFor999: null,
    evolution: null,
    samples: null,
    elapsedMs: performance.now() - started,
  };
}
