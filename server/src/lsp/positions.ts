/**
 * The one place where engine offsets (UTF-16 code units, half-open [start, end)) become LSP positions
 * and back. LSP 3.17 positions default to UTF-16 columns, which is what JavaScript strings index by,
 * so the conversion is a line table lookup; nothing else in the server computes lines or columns.
 */
import type { Position, Range } from 'vscode-languageserver';

/** A line table for one text: offsets where each line starts. */
export interface LineTable {
  text: string;
  starts: Uint32Array;
}

/** Builds the line table of `text` (a line ends at `\n`, `\r\n` or a lone `\r`, as LSP 3.17 defines). */
export function lineTable(text: string): LineTable {
  const starts: number[] = [0];
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 13 /* \r */) {
      if (text.charCodeAt(i + 1) === 10) i++;
      starts.push(i + 1);
    } else if (c === 10 /* \n */) {
      starts.push(i + 1);
    }
  }
  return { text, starts: Uint32Array.from(starts) };
}

/** The position of `offset` (clamped to the text), found by binary search over line starts. */
export function positionAt(table: LineTable, offset: number): Position {
  const o = Math.max(0, Math.min(Number.isFinite(offset) ? Math.floor(offset) : 0, table.text.length));
  let lo = 0;
  let hi = table.starts.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (table.starts[mid]! <= o) lo = mid;
    else hi = mid - 1;
  }
  return { line: lo, character: o - table.starts[lo]! };
}

/** The offset of `position`, clamped to its line (a character past the end of a line means its end). */
export function offsetAt(table: LineTable, position: Position): number {
  if (position.line < 0) return 0;
  if (position.line >= table.starts.length) return table.text.length;
  const start = table.starts[position.line]!;
  const next = position.line + 1 < table.starts.length ? table.starts[position.line + 1]! : table.text.length;
  // The end of a line excludes its line break.
  let end = next;
  if (end > start && table.text.charCodeAt(end - 1) === 10) end--;
  if (end > start && table.text.charCodeAt(end - 1) === 13) end--;
  return Math.min(start + Math.max(0, position.character), end);
}

/** The range of the half-open offset span [start, end). */
export function rangeOf(table: LineTable, start: number, end: number): Range {
  return { start: positionAt(table, start), end: positionAt(table, Math.max(start, end)) };
}
