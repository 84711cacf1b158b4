/**
 * Helpers for data-driven analysis tests, and the one marker dialect of every fixture in test/ (the
 * engine's fixtures under test/fixtures/diagnostics, the LSP fixture test and the parser's inline
 * fixtures in test/language/check.ts). A fixture marks expected diagnostics with comment lines under
 * the text they point at:
 *
 *   state psi(x) = 2 sin(pi x)
 *   #              ^^^^^^^^^^^ norm
 *
 * The carets give the exact columns on the nearest line above that is not a marker (the `#` is column
 * 0; a run written right after the `#`, as in `#^^^^ code`, starts at column 0 and counts the `#` as
 * its first caret); the word after them is the diagnostic code. A marker `#! code` asserts a
 * diagnostic with that code anywhere in the file.
 */
import { analyse, type AnalyseOptions } from '../../server/src/analysis/index';
import type { AnalysisResult } from '../../server/src/analysis/types';

/** An expected diagnostic: code and range (offsets), or code only. */
export interface Expected {
  code: string;
  start?: number;
  end?: number;
}

const MARKER = /^#([ \t]*)(\^+)[ \t]+([a-z]+)[ \t]*$/;
const ANYWHERE = /^#!\s*([a-z]+)\s*$/;

/** True for a marker line (a caret marker or `#! code`). */
export function isMarker(line: string): boolean {
  return MARKER.test(line) || ANYWHERE.test(line);
}

/**
 * Reads the markers of `source`. With `strip`, the marker lines are removed and the other lines joined
 * by `eol`, so the text under test is exactly the marked text; the offsets are then offsets into that
 * text. Without it the text is `source` itself (markers are comments of the format).
 */
export function readMarkers(source: string, options: { strip?: boolean; eol?: string } = {}): { text: string; expected: Expected[] } {
  const strip = options.strip === true;
  const eol = strip ? (options.eol ?? '\n') : '\n';
  const lines = source.split('\n');
  const targets: { start: number; length: number }[] = [];
  const expected: Expected[] = [];
  let offset = 0;
  for (const line of lines) {
    const m = MARKER.exec(line);
    const anywhere = ANYWHERE.exec(line);
    if (m) {
      const target = targets.at(-1);
      if (target === undefined) throw new Error(`marker with no line above: ${line}`);
      // A caret run right after the '#' starts at column 0: the '#' itself counts as its first caret.
      const col = m[1]!.length === 0 ? 0 : 1 + m[1]!.length;
      const len = m[1]!.length === 0 ? m[2]!.length + 1 : m[2]!.length;
      if (col + len > target.length) throw new Error(`marker past the end of its line: ${line}`);
      expected.push({ code: m[3]!, start: target.start + col, end: target.start + col + len });
    } else if (anywhere) {
      expected.push({ code: anywhere[1]! });
    } else {
      targets.push({ start: offset, length: line.length });
    }
    // Stripped markers take no room in the text; kept ones are comments that do.
    if (!(strip && (m || anywhere))) offset += line.length + eol.length;
  }
  return { text: strip ? lines.filter((l) => !isMarker(l)).join(eol) : source, expected };
}

/** Reads the inline markers of a fixture (the markers stay in the text, as comments). */
export function markers(text: string): Expected[] {
  return readMarkers(text).expected;
}

/**
 * Analyses a fixture and asserts that its diagnostics of the listed codes are exactly the marked ones.
 * Codes that no marker names (and `parity` info, which many states carry) are not constrained unless
 * `strict` lists them.
 */
export function check(text: string, options: AnalyseOptions = {}): { result: AnalysisResult; missing: Expected[]; unexpected: string[] } {
  const result = analyse(text, options);
  const expected = markers(text);
  const codes = new Set(expected.map((e) => e.code));
  const missing = expected.filter(
    (e) => !result.diagnostics.some((d) => d.code === e.code && (e.start === undefined || (d.start === e.start && d.end === e.end))),
  );
  const unexpected = result.diagnostics
    .filter((d) => codes.has(d.code) && !expected.some((e) => e.code === d.code && (e.start === undefined || (e.start === d.start && e.end === d.end))))
    .map((d) => `${d.code} [${d.start}, ${d.end}) ${JSON.stringify(text.slice(d.start, d.end))}: ${d.message}`);
  return { result, missing, unexpected };
}

/** The weights of a result by level label. */
export function weightOf(result: AnalysisResult, n: number): number {
  const l = result.levels.find((x) => x.n === n);
  if (!l) throw new Error(`level ${n} missing`);
  return l.weight;
}

/** Codes of a result's diagnostics. */
export function codes(result: AnalysisResult): string[] {
  return result.diagnostics.map((d) => d.code);
}
