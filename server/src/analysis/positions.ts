/**
 * The one place where document offsets become lines and columns.
 * Offsets and columns count UTF-16 code units, as LSP does by default.
 */

/** Start offsets of every line of `text` (a line ends at \n; a \r before it belongs to the line). */
export function lineIndex(text: string): number[] {
  const starts = [0];
  for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) === 10) starts.push(i + 1);
  return starts;
}

/** Zero-based line and column of an offset (clamped into the text). */
export function positionOf(lines: number[], offset: number): { line: number; character: number } {
  let lo = 0;
  let hi = lines.length - 1;
  const off = Math.max(0, offset);
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (lines[mid]! <= off) lo = mid;
    else hi = mid - 1;
  }
  return { line: lo, character: off - lines[lo]! };
}

/** The offset of a zero-based line and column (clamped to the line's end). */
export function offsetOf(lines: number[], text: string, line: number, character: number): number {
  if (line < 0) return 0;
  if (line >= lines.length) return text.length;
  const start = lines[line]!;
  let end = line + 1 < lines.length ? lines[line + 1]! - 1 : text.length;
  if (end > start && text.charCodeAt(end - 1) === 13) end--;
  return Math.min(start + Math.max(0, character), end);
}
