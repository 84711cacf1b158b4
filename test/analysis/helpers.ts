/**
 * Helpers for data-driven analysis tests.
 * A fixture marks expected diagnostics inline with comment lines under the text they point at:
 *
 *   state psi(x) = 2 sin(pi x)
 *   #              ^^^^^^^^^^^ norm
 *
 * The carets give the exact columns on the line above (the `#` is column 0; a run written right after
 * the `#`, as in `#^^^^ code`, starts at column 0 and counts the `#` as its first caret); the word
 * after them is the diagnostic code. A marker `#! code` asserts a diagnostic with that code anywhere in the file.
 */
import { analyse, type AnalyseOptions } from '../../server/src/analysis/index';
import type { AnalysisResult } from '../../server/src/analysis/types';

/** An expected diagnostic: code and range (offsets), or code only. */
export interface Expected {
  code: string;
  start?: number;
  end?: number;
}

/** Reads the inline markers of a fixture. */
export function markers(text: string): Expected[] {
  const lines = text.split('\n');
  const starts: number[] = [];
  let off = 0;
  for (const l of lines) {
    starts.push(off);
    off += l.length + 1;
  }
  const out: Expected[] = [];
  let target = -1;
  lines.forEach((line, i) => {
    const m = /^#(\s*)(\^+)\s+([a-z]+)\s*$/.exec(line);
    const anywhere = /^#!\s*([a-z]+)\s*$/.exec(line);
    if (m && target >= 0) {
      // A caret run right after the '#' starts at column 0: the '#' itself counts as its first caret.
      const col = m[1]!.length === 0 ? 0 : 1 + m[1]!.length;
      const len = m[1]!.length === 0 ? m[2]!.length + 1 : m[2]!.length;
      out.push({ code: m[3]!, start: starts[target]! + col, end: starts[target]! + col + len });
    } else if (anywhere) {
      out.push({ code: anywhere[1]! });
    } else if (!line.startsWith('#')) {
      target = i;
    }
  });
  return out;
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
