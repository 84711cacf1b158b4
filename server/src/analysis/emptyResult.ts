/**
 * The result with nothing measured yet: what `analyse` returns when a stage fails early, and what
 * the numerical stage fills in (also for each point of a sweep).
 */
import type { QFile } from '../language/ast';
import type { EngineDiagnostic } from '../language/catalogue';
import type { AnalysisResult } from './types';

/** An empty result for `file` with `diagnostics` (the fields `numericStage` fills are null). */
export function emptyResult(file: QFile | null, diagnostics: EngineDiagnostic[]): AnalysisResult {
  return {
    file,
    diagnostics,
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
    elapsedMs: 0,
  };
}
