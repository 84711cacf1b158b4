/**
 * `check --junit PATH`: the run as JUnit XML (the `testsuites` / `testsuite` / `testcase` / `failure`
 * layout CI servers read). One test suite a file; each `expect` line is a test case that fails with the
 * finding's message (which states the measured value); every other error is a failing test case too. A
 * file with neither is one passing case, so every checked file shows up.
 *
 * Text is escaped twice: first as everything the command line prints (escape.ts: controls, line breaks
 * and bidirectional controls become `\n`, `\xHH`, `\uHHHH`), which also removes the C0 controls XML 1.0
 * forbids; then for XML (`&`, `<`, `>`, `"`, `'`), with lone surrogates and U+FFFE/U+FFFF, also
 * forbidden in XML 1.0, written as `\uHHHH`.
 */
import { escapeText } from './escape';
import type { FileRecord } from './records';
import type { LocatedDiagnostic } from './render';

const XML_ENTITY: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' };
const NOT_XML = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]|[\ufffe\uffff]/g;

/** `s` made safe for an XML 1.0 attribute or text node. */
export function escapeXml(s: string): string {
  return escapeText(s)
    .replace(NOT_XML, (c) => `\\u${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`)
    .replace(/[&<>"']/g, (c) => XML_ENTITY[c]!);
}

interface Case {
  name: string;
  line: number;
  failure: LocatedDiagnostic | null;
}

function casesOf(r: FileRecord): Case[] {
  const cases: Case[] = r.expects.map((x) => ({ name: `line ${x.line}: ${x.text}`, line: x.line, failure: x.failure }));
  const counted = new Set(r.expects.map((x) => x.failure).filter((f) => f !== null));
  for (const d of r.findings) {
    if (d.severity !== 'error' || counted.has(d)) continue;
    cases.push({ name: `line ${d.line}: error[${d.code}]`, line: d.line, failure: d });
  }
  if (cases.length === 0) cases.push({ name: 'analysis without errors', line: 1, failure: null });
  return cases;
}

function attrs(pairs: Record<string, string | number>): string {
  return Object.entries(pairs).map(([k, v]) => ` ${k}="${escapeXml(String(v))}"`).join('');
}

function renderCase(file: string, c: Case): string {
  const head = `    <testcase${attrs({ name: c.name, classname: file, file, line: c.line })}`;
  if (c.failure === null) return head + '/>';
  const d = c.failure;
  const body = escapeXml(`${file}:${d.line}:${d.column}: ${d.severity}[${d.code}]: ${d.message}`);
  return `${head}>\n      <failure${attrs({ message: d.message, type: d.code })}>${body}</failure>\n    </testcase>`;
}

/** The JUnit XML text of one `check` run. */
export function renderJunit(records: readonly FileRecord[]): string {
  const out: string[] = ['<?xml version="1.0" encoding="UTF-8"?>'];
  const suites = records.map((r) => ({ file: r.file, cases: casesOf(r) }));
  const count = (cs: Case[]): number => cs.filter((c) => c.failure !== null).length;
  const tests = suites.reduce((n, s) => n + s.cases.length, 0);
  const failures = suites.reduce((n, s) => n + count(s.cases), 0);
  out.push(`<testsuites${attrs({ name: 'eigenspan check', tests, failures, errors: 0 })}>`);
  for (const s of suites) {
    out.push(`  <testsuite${attrs({ name: s.file, tests: s.cases.length, failures: count(s.cases), errors: 0, skipped: 0 })}>`);
    for (const c of s.cases) out.push(renderCase(s.file, c));
    out.push('  </testsuite>');
  }
  out.push('</testsuites>');
  return out.join('\n') + '\n';
}
