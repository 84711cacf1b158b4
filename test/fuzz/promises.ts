/**
 * The promises the fuzz harness checks on every result (harness.ts re-exports them): messages a user can
 * act on, ranges inside the document with catalogue codes, and finite numbers where the contract says so.
 */
import type { AnalysisResult } from '../../server/src/analysis/types';
import { CATALOGUE, type EngineDiagnostic } from '../../server/src/language/catalogue';

const STACK = /\n\s+at |\bat .*\.(ts|js):\d+|Error:|TypeError|RangeError/;

/** Problems with one message, or an empty list. */
export function messageProblems(message: string): string[] {
  const p: string[] = [];
  if (!/^([A-Z0-9]|['"`\u2018\u201c|<])/u.test(message)) p.push(`message does not start with a capital letter, digit or quoted name: ${JSON.stringify(message)}`);
  if (!/[.?]$/.test(message)) p.push(`message does not end with a period or question mark: ${JSON.stringify(message)}`);
  // Names the user wrote may be quoted back ('NaN' is not allowed); anything else raw is a leak.
  const unquoted = message.replace(/'[^']*'|`[^`]*`|"[^"]*"/g, "''");
  if (/undefined|\bNaN\b|\[object|\bnull\b/.test(unquoted)) p.push(`message shows a raw value: ${JSON.stringify(message)}`);
  if (STACK.test(message)) p.push(`message shows a stack trace or error class: ${JSON.stringify(message)}`);
  if (/internal error/i.test(message)) p.push(`internal error: ${JSON.stringify(message)}`);
  return p;
}

/** Problems with one diagnostic in a document of length `n`. */
export function diagnosticProblems(d: EngineDiagnostic, n: number): string[] {
  const p: string[] = [];
  const inside = (s: number, e: number): boolean => Number.isInteger(s) && Number.isInteger(e) && 0 <= s && s <= e && e <= n;
  if (!inside(d.start, d.end)) p.push(`range [${d.start}, ${d.end}) outside the document of length ${n} (${d.code}: ${d.message})`);
  if (!(d.code in CATALOGUE)) p.push(`code '${String(d.code)}' is not in the catalogue`);
  if (d.severity !== 'error' && d.severity !== 'warning' && d.severity !== 'info') p.push(`severity '${String(d.severity)}'`);
  p.push(...messageProblems(d.message));
  for (const f of d.fixes ?? []) {
    const ok = f.kind === 'replace' ? inside(f.start, f.end) : inside(f.at, f.at);
    if (!ok) p.push(`quick fix '${f.title}' edits outside the document`);
    if (typeof f.text !== 'string' || /undefined|NaN|\[object/.test(f.text)) p.push(`quick fix '${f.title}' inserts ${JSON.stringify(f.text)}`);
  }
  return p;
}

/** Problems with the numbers of an analysis result. */
export function resultProblems(r: AnalysisResult): string[] {
  const p: string[] = [];
  let sum = 0;
  for (const l of r.levels) {
    if (!Number.isFinite(l.energy)) p.push(`level ${l.n} has energy ${l.energy}`);
    // A mixed state has populations only: its re and im are null (docs/format.md), and only then.
    if (r.mixture ? l.re !== null || l.im !== null : !Number.isFinite(l.re) || !Number.isFinite(l.im)) p.push(`level ${l.n} has coefficient ${l.re} + ${l.im} i`);
    if (!(l.weight >= 0 && l.weight <= 1 + 1e-6)) p.push(`level ${l.n} has weight ${l.weight}`);
    sum += l.weight;
  }
  if (r.levels.length > 0) {
    if (!(sum <= 1 + 1e-6)) p.push(`weights add up to ${sum}, above 1`);
    if (!(r.norm !== null && Number.isFinite(r.norm) && r.norm > 0)) p.push(`norm is ${r.norm} while levels were computed`);
  }
  if (r.energy) {
    for (const k of ['mean', 'spread'] as const) {
      const v = r.energy[k];
      if (v !== null && !Number.isFinite(v)) p.push(`energy ${k} is ${v} (should be null when it diverges)`);
    }
  }
  if (r.continuum !== undefined && !(r.continuum >= -1e-6 && r.continuum <= 1 + 1e-6)) p.push(`continuum weight ${r.continuum}`);
  return p;
}
