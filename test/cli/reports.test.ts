/**
 * `eigenspan check --sarif PATH --junit PATH` through the built command line (dist/cli.js): the SARIF
 * 2.1.0 log's required properties, the JUnit XML parsed back, escaping, and the `--force` rule.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type * as Sarif from 'sarif';
import { parseXml, type XmlElement } from './xml';

const CLI = join(__dirname, '..', '..', 'dist', 'cli.js');

function run(args: string[], cwd: string): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', cwd });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let dir: string;
// The parabola state sqrt(30) x (1 - x) in the box (0, 1): norm 1 and <H> = 5 in natural units
// (hbar = m = 1; <H> = (1/2) integral |psi'|^2 = 15 * (1/3) = 5, derived in this comment).
const GOOD = 'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\nexpect norm 1 +- 1e-6\nexpect energy 4 +- 0.1\n';
// psi = 2 on (0, 1) is nonzero at the walls: a boundary warning at the state's expression, 2:16.
const FLAT = 'system box(0, 1)\nstate psi(x) = 2\n';
// An unknown function name is a syntax error at the name.
const BAD = 'system box(0, 1)\nstate psi(x) = foo(x)\n';

beforeAll(() => {
  if (!existsSync(CLI)) throw new Error('dist/cli.js is missing: run `npm run build` first');
  dir = mkdtempSync(join(tmpdir(), 'eigenspan-reports-'));
  mkdirSync(join(dir, 'setups'));
  writeFileSync(join(dir, 'setups', 'good.qstate'), GOOD);
  writeFileSync(join(dir, 'setups', 'flat.qstate'), FLAT);
  writeFileSync(join(dir, 'setups', 'bad.qstate'), BAD);
});

function child(el: XmlElement, name: string): XmlElement[] {
  return el.children.filter((c) => c.name === name);
}

describe('check --sarif', () => {
  it('writes a SARIF 2.1.0 log with the required properties and one result a finding', () => {
    const r = run(['check', 'setups', '--sarif', 'one.sarif'], dir);
    expect(r.code).toBe(1);
    const log = JSON.parse(readFileSync(join(dir, 'one.sarif'), 'utf8')) as Sarif.Log;
    // SARIF 2.1.0 (OASIS standard) sections 3.13.2 (version), 3.13.3 ($schema), 3.19.8 (driver.name),
    // 3.27.11 (message.text), 3.30 (region, 1-based lines and columns); section numbers from memory.
    expect(log.version).toBe('2.1.0');
    expect(log.$schema).toMatch(/sarif-schema-2\.1\.0\.json$/);
    expect(log.runs).toHaveLength(1);
    const run0 = log.runs[0]!;
    expect(run0.tool.driver.name).toBe('eigenspan');
    const ruleIds = (run0.tool.driver.rules ?? []).map((x) => x.id);
    expect(ruleIds).toEqual(expect.arrayContaining(['syntax', 'boundary', 'expect', 'norm']));
    const results = run0.results ?? [];
    // The findings check printed on standard output, one result each.
    expect(results).toHaveLength(r.out.trim().split('\n').length);
    for (const res of results) {
      expect(ruleIds).toContain(res.ruleId);
      expect(run0.tool.driver.rules![res.ruleIndex!]!.id).toBe(res.ruleId);
      expect(typeof res.message.text).toBe('string');
      const loc = res.locations![0]!.physicalLocation!;
      expect(loc.artifactLocation!.uri).toMatch(/^setups\/[a-z]+\.qstate$/);
      expect(Number.isInteger(loc.region!.startLine) && loc.region!.startLine! >= 1).toBe(true);
      expect(Number.isInteger(loc.region!.startColumn) && loc.region!.startColumn! >= 1).toBe(true);
      // Each result is one FILE:LINE:COL: SEVERITY[CODE] line of the standard output.
      const line = `${loc.artifactLocation!.uri}:${loc.region!.startLine}:${loc.region!.startColumn}: `;
      expect(r.out.split('\n').some((l) => l.startsWith(line) && l.includes(`[${res.ruleId}]`))).toBe(true);
    }
    const boundary = results.find((x) => x.ruleId === 'boundary')!;
    expect(boundary.level).toBe('warning');
    expect(boundary.locations![0]!.physicalLocation!.region).toMatchObject({ startLine: 2, startColumn: 16 });
    expect(results.find((x) => x.ruleId === 'syntax')!.level).toBe('error');
    expect(results.find((x) => x.ruleId === 'expect')!.message.text).toMatch(/measured 5\b/);
  });
});

describe('check --junit', () => {
  it('writes JUnit XML: each expect line a case, other errors failing cases, measured values in the failures', () => {
    const r = run(['check', 'setups', '--junit', 'one.xml'], dir);
    expect(r.code).toBe(1);
    const root = parseXml(readFileSync(join(dir, 'one.xml'), 'utf8'));
    expect(root.name).toBe('testsuites');
    const suites = child(root, 'testsuite');
    expect(suites.map((s) => s.attrs.name).sort()).toEqual(['setups/bad.qstate', 'setups/flat.qstate', 'setups/good.qstate']);
    const good = suites.find((s) => s.attrs.name === 'setups/good.qstate')!;
    const cases = child(good, 'testcase');
    expect(cases.map((c) => c.attrs.name)).toEqual(['line 4: expect norm 1 +- 1e-6', 'line 5: expect energy 4 +- 0.1']);
    expect(child(cases[0]!, 'failure')).toHaveLength(0);
    const failure = child(cases[1]!, 'failure')[0]!;
    expect(failure.attrs.type).toBe('expect');
    expect(failure.attrs.message).toMatch(/measured 5\b/);
    expect(good.attrs).toMatchObject({ tests: '2', failures: '1' });
    const bad = child(suites.find((s) => s.attrs.name === 'setups/bad.qstate')!, 'testcase');
    expect(bad).toHaveLength(1);
    expect(child(bad[0]!, 'failure')[0]!.attrs.type).toBe('syntax');
    expect(child(bad[0]!, 'failure')[0]!.attrs.message).toContain("'foo'");
    // A warning is no failure: the flat state has no errors, so one passing case.
    const flat = child(suites.find((s) => s.attrs.name === 'setups/flat.qstate')!, 'testcase');
    expect(flat.map((c) => child(c, 'failure').length)).toEqual([0]);
    expect(root.attrs).toMatchObject({ tests: '4', failures: '2' });
  });

  it('escapes controls and bidirectional characters like check, and writes only characters XML 1.0 allows', () => {
    const sub = join(dir, 'odd');
    mkdirSync(sub);
    // A file name with ESC, and a formula with a right-to-left override (U+202E) that ends in the message.
    writeFileSync(join(sub, 'a\x1bb.qstate'), 'system box(0, 1)\nstate psi(x) = f\u202eoo * x\n');
    const r = run(['check', 'odd', '--junit', 'odd.xml', '--sarif', 'odd.sarif'], dir);
    expect(r.code).toBe(1);
    const xml = readFileSync(join(dir, 'odd.xml'), 'utf8');
    expect(xml).not.toMatch(/[\x00-\x08\x0b\x0c\x0e-\x1f\u202e]/);
    const root = parseXml(xml);
    const suite = child(root, 'testsuite')[0]!;
    expect(suite.attrs.name).toBe('odd/a\\x1Bb.qstate');
    const msg = child(child(suite, 'testcase')[0]!, 'failure')[0]!.attrs.message!;
    expect(msg).toContain('\\u202E');
    expect(r.out).toContain('odd/a\\x1Bb.qstate:2:');
    const sarifText = readFileSync(join(dir, 'odd.sarif'), 'utf8');
    expect(sarifText).not.toMatch(/[\x00-\x09\x0b-\x1f\u202e]/);
    const log = JSON.parse(sarifText) as Sarif.Log;
    expect(log.runs[0]!.results![0]!.locations![0]!.physicalLocation!.artifactLocation!.uri).toBe('odd/a%1Bb.qstate');
  });
});

describe('report files and --force', () => {
  it('writes both reports in one run, keeps the standard output, and replaces files only with --force', () => {
    const plain = run(['check', 'setups'], dir);
    const both = run(['check', 'setups', '--sarif', 'two.sarif', '--junit', 'two.xml'], dir);
    expect(both.out).toBe(plain.out);
    expect(both.code).toBe(plain.code);
    const sarif = readFileSync(join(dir, 'two.sarif'), 'utf8');
    expect(readFileSync(join(dir, 'two.xml'), 'utf8')).toMatch(/^<\?xml /);
    writeFileSync(join(dir, 'two.xml'), 'keep me');
    const again = run(['check', 'setups', '--sarif', 'two.sarif', '--junit', 'two.xml'], dir);
    expect(again.code).toBe(2);
    expect(again.err).toContain('--force');
    expect(again.out).toBe('');
    expect(readFileSync(join(dir, 'two.xml'), 'utf8')).toBe('keep me');
    const forced = run(['check', 'setups', '--sarif', 'two.sarif', '--junit', 'two.xml', '--force'], dir);
    expect(forced.code).toBe(1);
    expect(readFileSync(join(dir, 'two.xml'), 'utf8')).toMatch(/<testsuites /);
    expect(readFileSync(join(dir, 'two.sarif'), 'utf8')).toBe(sarif);
  });

  it('refuses a missing path, the same path for both, and a path that is not a regular file', () => {
    expect(run(['check', 'setups', '--sarif'], dir).code).toBe(2);
    expect(run(['check', 'setups', '--junit', '--force'], dir).code).toBe(2);
    expect(run(['check', 'setups', '--sarif', 'same', '--junit', 'same'], dir).code).toBe(2);
    const r = run(['check', 'setups', '--sarif', 'setups', '--force'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toContain('not a regular file');
  });
});

describe('the test XML reader', () => {
  it('rejects what XML 1.0 rejects, so a bad report cannot pass', () => {
    expect(() => parseXml('<a><b></a>')).toThrow();
    expect(() => parseXml('<a x="1" x="2"/>')).toThrow();
    expect(() => parseXml('<a>&nope;</a>')).toThrow();
    expect(() => parseXml('<a>\x1b</a>')).toThrow();
    expect(() => parseXml('<a>1 < 2</a>')).toThrow();
    expect(parseXml('<a t="&lt;&amp;&#x41;">x<b/></a>')).toMatchObject({ name: 'a', attrs: { t: '<&A' }, text: 'x', children: [{ name: 'b' }] });
  });
});
