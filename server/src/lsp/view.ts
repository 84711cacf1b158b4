/**
 * The snapshot of one document that every feature works from.
 */
import type { AnalysisResult } from '../analysis/types';
import type { EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';
import type { LineTable } from './positions';

/** One document version as the features see it. */
export interface DocView {
  uri: string;
  version: number;
  text: string;
  lines: LineTable;
  /** The static parse of this version (always present). */
  file: QFile;
  /** The best diagnostics of this version: the full analysis when it has finished, else the static ones. */
  diagnostics: EngineDiagnostic[];
  /** The full analysis of exactly this version, or null while it is pending or when evaluation is off. */
  result: AnalysisResult | null;
  /** False in untrusted workspaces: only static checks run. */
  evaluate: boolean;
}
