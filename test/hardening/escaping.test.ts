/**
 * Escaping in every printed output of the command line (issue 14): a file name with a line break, an
 * escape sequence and a bidirectional override, and a formula carrying escape sequences, go through
 * every command and every writer (check with SARIF and JUnit, expand as table, CSV, JSON and samples,
 * summary, diff, sweep as table, CSV and JSON, plot to standard output and to a file, demo). Nothing raw
 * may reach a terminal or a file, and no printed line may begin with the forged prefix.
 * The command-line tests run the built dist/cli.js (`npm run build`).
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempDir } from './tree';

const cli = join(__dirname, '..', '..', 'dist', 'cli.js');

function runCli(args: string[]): { code: number | null; out: string; err: string } {
  expect(existsSync(cli), 'dist/cli.js is missing: run npm run build').toBe(true);
  const r = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout: 120_000, maxBuffer: 64 * 1024 * 1024 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** What may never be printed raw: C0 controls but the line feed, DEL, C1, the separators and the bidi controls (escape.ts). */
const RAW = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/;
const ESC = '\u001b';
/** A name that, printed raw, would forge a finding line, clear the line and turn the text around. */
const NAME = `w\nforged.qstate:1:1: error[syntax]: Planted.${ESC}[2K\u202e.qstate`;

// A valid file with a sweep (so sweep and plot have something to draw) and one with escape sequences in a formula.
const VALID = 'units nm, meV\nmass 0.067 m_e\nlet width = 4 nm\nsweep width from 2 nm to 6 nm steps 2\nsystem well(depth = 220 meV, width = width)\nstate gaussian(center = 0 nm, width = 1 nm)\nbasis 4\n';
const HOSTILE = `system box(0, 1)\nstate psi(x) = x * (1 - x) ${ESC}[2K${ESC}[32mall good${ESC}]0;owned\u0007 + \u202e\u2028q\n`;

function problems(where: string, text: string): string[] {
  const p: string[] = [];
  const m = RAW.exec(text);
  if (m) p.push(`${where}: raw U+${m[0].charCodeAt(0).toString(16).padStart(4, '0')} near ${JSON.stringify(text.slice(Math.max(0, m.index - 40), m.index + 10))}`);
  if (text.split('\n').some((l) => l.startsWith('forged.qstate'))) p.push(`${where}: a line begins with the forged prefix`);
  return p;
}

describe('every output of the command line is escaped', () => {
  it('file names and formulas with controls, through every command and writer', () => {
    const d = tempDir();
    const dir = join(d, 'in');
    mkdirSync(dir);
    const good = join(dir, NAME);
    const bad = join(dir, `h${ESC}]0;t\u0007.qstate`);
    writeFileSync(good, VALID);
    writeFileSync(bad, HOSTILE);
    const out = (name: string): string => join(d, name);
    const runs: [string, string[], string[]][] = [
      ['check', ['check', dir, '--sarif', out('log.sarif'), '--junit', out('log.xml')], ['log.sarif', 'log.xml']],
      ['expand table', ['expand', good], []],
      ['expand table (formula)', ['expand', bad], []],
      ['expand csv', ['expand', bad, '--csv'], []],
      ['expand json', ['expand', bad, '--json'], []],
      ['expand samples', ['expand', good, '--samples', out('s.csv'), '--out', out('e.txt')], ['s.csv', 'e.txt']],
      ['summary', ['summary', good], []],
      ['summary (formula)', ['summary', bad], []],
      ['diff', ['diff', good, bad], []],
      ['sweep table', ['sweep', good, '--threads', '1'], []],
      ['sweep csv', ['sweep', good, '--csv', '--threads', '1'], []],
      ['sweep json', ['sweep', good, '--json', '--threads', '1', '--out', out('sw.json')], ['sw.json']],
      ['plot stdout', ['plot', good], []],
      ['plot (formula)', ['plot', bad, '--view', 'state'], []],
      ['plot sweep', ['plot', good, '--view', 'sweep', '--svg', out('p.svg')], ['p.svg']],
      ['demo', ['demo', dir], []],
    ];
    const found: string[] = [];
    for (const [what, args, files] of runs) {
      const r = runCli(args);
      if (r.code !== 0 && r.code !== 1) found.push(`${what}: exit ${r.code}: ${r.err.slice(0, 300)}`);
      found.push(...problems(`${what} (stdout)`, r.out), ...problems(`${what} (stderr)`, r.err));
      for (const f of files) found.push(...problems(`${what} (${f})`, readFileSync(out(f), 'utf8')));
    }
    expect(found).toEqual([]);
    // The escapes are visible, not dropped: the check lines name both files escaped.
    const checked = runCli(['check', dir]).out;
    expect(checked).toContain('\\nforged.qstate');
    expect(checked).toContain('\\x1B[2K');
    // The JSON writers stay JSON.
    expect(() => JSON.parse(readFileSync(out('log.sarif'), 'utf8'))).not.toThrow();
    expect(() => JSON.parse(readFileSync(out('sw.json'), 'utf8'))).not.toThrow();
    expect(readdirSync(dir)).toHaveLength(2);
  }, 300_000);
});
