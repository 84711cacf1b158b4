/**
 * What `check` learnt about each file, kept for the report files (SARIF, JUnit XML): the located
 * findings and the `expect` lines. One record a checked or refused file.
 */
import type { AnalysisResult } from '../analysis/types';
import type { LineTable } from '../language/positions';
import { locate, type LocatedDiagnostic } from './render';

/** One `expect` line of a file: where it is, its text, and the finding that failed it (if any). */
export interface ExpectRecord {
  line: number;
  column: number;
  /** The statement's text, continuation lines joined by spaces. */
  text: string;
  failure: LocatedDiagnostic | null;
}

/** One file as `check` saw it (`file` as named on the command line or found in a folder). */
export interface FileRecord {
  file: string;
  findings: LocatedDiagnostic[];
  expects: ExpectRecord[];
}

/** The record of an analysed file. */
export function analysedRecord(file: string, text: string, result: AnalysisResult, lines: LineTable): FileRecord {
  const findings = result.diagnostics.map((d) => locate(d, lines));
  const expects: ExpectRecord[] = [];
  for (const s of result.file?.statements ?? []) {
    if (s.kind !== 'expect') continue;
    // A failed expect is reported on the span of its statement (analysis/expects.ts).
    const i = result.diagnostics.findIndex((d) => d.code === 'expect' && d.start >= s.span.start && d.start < Math.max(s.span.end, s.span.start + 1));
    const at = locate({ start: s.span.start, end: s.span.end, severity: 'info', code: 'expect', message: '' }, lines);
    expects.push({ line: at.line, column: at.column, text: text.slice(s.span.start, s.span.end).replace(/\s*[\r\n]+\s*/g, ' ').trim(), failure: i < 0 ? null : findings[i]! });
  }
  return { file, findings, expects };
}

/** The record of a file refused or not analysable: one finding at 1:1. */
export function refusedRecord(file: string, severity: 'error' | 'warning', code: LocatedDiagnostic['code'], message: string): FileRecord {
  return { file, findings: [{ line: 1, column: 1, endLine: 1, endColumn: 1, severity, code, message }], expects: [] };
}
