/** Helpers of the hardening tests: find a diagnostic by code and the text it covers. */
import { expect } from 'vitest';
import { analyse, type AnalyseOptions } from '../../server/src/analysis/index';
import type { Code, EngineDiagnostic } from '../../server/src/language/catalogue';

/** Analyses `text` and returns the result with each diagnostic's covered text. */
export function findings(text: string, options: AnalyseOptions = {}) {
  const r = analyse(text, options);
  return { r, all: r.diagnostics.map((d) => ({ ...d, covered: text.slice(d.start, d.end) })) };
}

/** Asserts a diagnostic with `code` covers exactly `covered` (and, if given, its message matches `like`). */
export function expectFinding(text: string, code: Code, covered: string, like?: RegExp, options: AnalyseOptions = {}): EngineDiagnostic {
  const { all } = findings(text, options);
  const hit = all.find((d) => d.code === code && d.covered === covered && (!like || like.test(d.message)));
  expect(hit, `no ${code} finding on ${JSON.stringify(covered)}${like ? ` like ${like}` : ''}; got:\n${all.map((d) => `${d.code} ${JSON.stringify(d.covered)}: ${d.message}`).join('\n')}`).toBeDefined();
  return hit!;
}
