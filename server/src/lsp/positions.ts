/**
 * Engine offsets as LSP ranges. LSP 3.17 positions default to UTF-16 columns, which is what the
 * engine's offsets count, so the conversion is the engine's own line table (language/positions.ts);
 * nothing else in the server computes lines or columns.
 */
import type { Range } from 'vscode-languageserver';
import { lineTable, offsetAt, positionAt, type LineTable } from '../language/positions';

export { lineTable, offsetAt, positionAt, type LineTable };

/** The range of the half-open offset span [start, end). */
export function rangeOf(table: LineTable, start: number, end: number): Range {
  return { start: positionAt(table, start), end: positionAt(table, Math.max(start, end)) };
}
