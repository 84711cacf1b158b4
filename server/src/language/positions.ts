/**
 * The one place where document offsets (UTF-16 code units, half-open [start, end)) become lines and
 * columns, and back. Lines end at `\n`, `\r\n` or a lone `\r`, as the scanner and LSP 3.17 define;
 * columns count UTF-16 code units, which is what JavaScript strings index by and LSP uses by default.
 * The command line and the language server both convert through here.
 */

/** A zero-based line and column. */
export interface LineColumn {
  line: number;
  character: number;
}

/** A line table for one text: offsets where each line starts. */
export interface LineTable {
  text: string;
  starts: Uint32Array;
}

/** Builds the line table of `text`. */
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

/** The zero-based line and column of `offset` (clamped to the text), by binary search over line starts. */
export function positionAt(table: LineTable, offset: number): LineColumn {
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

/** The offset of a zero-based line and column, clamped to its line (past the end means its end). */
export function offsetAt(table: LineTable, position: LineColumn): number {
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
