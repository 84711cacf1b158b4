/**
 * Data-driven checks for the parser.
 *
 * A fixture is `.qstate` text with annotation lines under the lines they describe:
 *
 * ```text
 * sytem box(0, 1)
 * ^^^^^ name
 * ```
 *
 * An annotation line holds only white space, a run of `^` and a diagnostic code; the carets mark the
 * exact columns of the expected range on the nearest line above that is not an annotation.
 * Annotation lines (and one leading line break) are removed before parsing. Ranges that span lines are given separately as the
 * exact text they cover.
 */
import { expect } from 'vitest';
import type { Code } from '../../server/src/language/catalogue';
import { parse, type ParseResult } from '../../server/src/language/parser';

/** An expected diagnostic: its code and exact document range. */
export interface Expected {
  code: Code;
  start: number;
  end: number;
}

const ANNOTATION = /^([ \t]*)(\^+)[ \t]+([a-z]+)[ \t]*$/;

/** Strips annotation lines from `source` (lines joined by `eol`) and returns the text and expected ranges. */
export function annotated(source: string, eol = '\n'): { text: string; expected: Expected[] } {
  const out: string[] = [];
  const offsets: number[] = [];
  const expected: Expected[] = [];
  let offset = 0;
  // A fixture written as a template literal starts with a line break; it is not part of the text.
  const body = source.startsWith('\n') ? source.slice(1) : source;
  for (const line of body.split('\n')) {
    const a = ANNOTATION.exec(line);
    if (a !== null) {
      const target = out.length - 1;
      if (target < 0) throw new Error(`annotation with no line above: ${line}`);
      const col = a[1]!.length;
      const start = offsets[target]! + col;
      const end = start + a[2]!.length;
      if (col + a[2]!.length > out[target]!.length) throw new Error(`annotation past the end of its line: ${line}`);
      expected.push({ code: a[3] as Code, start, end });
      continue;
    }
    offsets.push(offset);
    out.push(line);
    offset += line.length + eol.length;
  }
  return { text: out.join(eol), expected };
}

/** Extra expected ranges given as the exact text they cover (its first occurrence). */
export interface ExpectedText {
  code: Code;
  text: string;
}

/**
 * Parses an annotated fixture and asserts that the diagnostics are exactly the annotated ones
 * (codes and ranges, not wording). Returns the parse result for further checks.
 */
export function check(source: string, options: { eol?: string; extra?: ExpectedText[] } = {}): ParseResult & { text: string } {
  const { text, expected } = annotated(source, options.eol ?? '\n');
  for (const e of options.extra ?? []) {
    const start = text.indexOf(e.text);
    if (start < 0) throw new Error(`expected text not found: ${e.text}`);
    expected.push({ code: e.code, start, end: start + e.text.length });
  }
  const result = parse(text);
  const got = result.diagnostics.map((d) => ({ code: d.code, start: d.start, end: d.end }));
  const order = (a: Expected, b: Expected) => a.start - b.start || a.end - b.end || a.code.localeCompare(b.code);
  const show = (list: Expected[]) => list.sort(order).map((d) => `${d.code} ${JSON.stringify(text.slice(d.start, d.end))} @${d.start}-${d.end}`);
  expect(show(got), result.diagnostics.map((d) => d.message).join('\n')).toEqual(show([...expected]));
  return { ...result, text };
}

/**
 * Checks each statement of an annotated fixture on its own: a case starts at every line that is
 * neither an annotation nor indented, so statements allowed once per file can be listed together.
 */
export function checkEach(source: string, options: { eol?: string } = {}): void {
  const body = source.startsWith('\n') ? source.slice(1) : source;
  const cases: string[][] = [];
  for (const line of body.split('\n')) {
    const starts = line.length > 0 && !ANNOTATION.test(line) && !/^[ \t]/.test(line);
    if (starts || cases.length === 0) cases.push([]);
    cases[cases.length - 1]!.push(line);
  }
  for (const c of cases) check(c.join('\n'), options);
}

/** Parses text that must have no diagnostics and returns its statements. */
export function clean(text: string): ParseResult['file']['statements'] {
  const r = parse(text);
  expect(r.diagnostics.map((d) => `${d.code}: ${d.message}`)).toEqual([]);
  return r.file.statements;
}

/** The text of a span. */
export function at(text: string, span: { start: number; end: number }): string {
  return text.slice(span.start, span.end);
}
