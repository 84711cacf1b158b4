/**
 * Data-driven checks for the parser, in the one marker dialect of the fixtures (test/analysis/helpers.ts):
 *
 * ```text
 * sytem box(0, 1)
 * #^^^^ name
 * ```
 *
 * Marker lines (and one leading line break) are removed before parsing, so the parsed text is exactly
 * the marked one. Ranges that span lines are given separately as the exact text they cover.
 */
import { expect } from 'vitest';
import type { Code } from '../../server/src/language/catalogue';
import { parse, type ParseResult } from '../../server/src/language/parser';
import { isMarker, readMarkers } from '../analysis/helpers';

/** An expected diagnostic: its code and exact document range. */
export interface Expected {
  code: Code;
  start: number;
  end: number;
}

/** Strips the marker lines from `source` (lines joined by `eol`) and returns the text and expected ranges. */
function annotated(source: string, eol = '\n'): { text: string; expected: Expected[] } {
  // A fixture written as a template literal starts with a line break; it is not part of the text.
  const body = source.startsWith('\n') ? source.slice(1) : source;
  const { text, expected } = readMarkers(body, { strip: true, eol });
  return {
    text,
    expected: expected.map((e) => {
      if (e.start === undefined || e.end === undefined) throw new Error(`a parser fixture needs a range for ${e.code}`);
      return { code: e.code as Code, start: e.start, end: e.end };
    }),
  };
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
    const starts = line.length > 0 && !isMarker(line) && !/^[ \t]/.test(line);
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
