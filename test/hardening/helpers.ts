/**
 * Helpers of the hardening tests: find a diagnostic by code and the text it covers, and read the numbers
 * a message carries. Tests assert codes, ranges and values, not wording (the catalogue's promise:
 * codes are stable, wording may change).
 */
import { expect } from 'vitest';
import { analyse, type AnalyseOptions } from '../../server/src/analysis/index';
import type { Code, EngineDiagnostic } from '../../server/src/language/catalogue';

/** Analyses `text` and returns the result with each diagnostic's covered text. */
export function findings(text: string, options: AnalyseOptions = {}) {
  const r = analyse(text, options);
  return { r, all: r.diagnostics.map((d) => ({ ...d, covered: text.slice(d.start, d.end) })) };
}

/** The numbers written in `message` (plain, decimal, exponent or +-Infinity), in order. */
export function numbersIn(message: string): number[] {
  return [...message.matchAll(/[+-]?Infinity|[+-]?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?/g)].map((m) => Number(m[0]));
}

/**
 * Asserts a diagnostic with `code` covers exactly `covered` and, if given, that its message names every
 * value of `values` (a cap, a measured number); returns it.
 */
export function expectFinding(text: string, code: Code, covered: string, values: number[] = [], options: AnalyseOptions = {}): EngineDiagnostic {
  const { all } = findings(text, options);
  const names = (d: EngineDiagnostic) => values.every((v) => numbersIn(d.message).includes(v));
  const hit = all.find((d) => d.code === code && d.covered === covered && names(d));
  const want = values.length > 0 ? ` naming ${values.join(', ')}` : '';
  expect(hit, `no ${code} finding on ${JSON.stringify(covered)}${want}; got:\n${all.map((d) => `${d.code} ${JSON.stringify(d.covered)}: ${d.message}`).join('\n')}`).toBeDefined();
  return hit!;
}
