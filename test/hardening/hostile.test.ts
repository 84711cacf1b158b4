/**
 * Hostile inputs of issue 14, one test per class, each failing before its fix: names that blow up the
 * "did you mean" search, file trees that loop, leak or block, and output that forges terminal lines.
 * The command-line tests run the built dist/cli.js (`npm run build`).
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyseStatic } from '../../server/src/analysis/index';
import { withQuickStage, workCounter } from '../../server/src/language/meter';
import { SUGGEST_CAPS } from '../../server/src/language/suggest';
import { tempDir, writeTemp } from './tree';

const cli = join(__dirname, '..', '..', 'dist', 'cli.js');

/** Runs the built command line, optionally with a capped heap; never waits more than a minute. */
export function runCli(args: string[], heapMb?: number): { code: number | null; out: string; err: string; signal: NodeJS.Signals | null } {
  expect(existsSync(cli), 'dist/cli.js is missing: run npm run build').toBe(true);
  const node = heapMb === undefined ? [] : [`--max-old-space-size=${heapMb}`];
  const r = spawnSync(process.execPath, [...node, cli, ...args], { encoding: 'utf8', timeout: 60_000, maxBuffer: 64 * 1024 * 1024 });
  return { code: r.status, out: r.stdout, err: r.stderr, signal: r.signal };
}

describe('names that blow up the "did you mean" search', () => {
  it('a 240,000-character let name and a 9,000-character unknown name check in a 256 MB heap', () => {
    // Before the caps the full distance table (240,001 x 9,001 cells) took the process past 4 GB.
    const text = `system box(0, 1)\nlet ${'a'.repeat(240_000)} = 1\nstate psi(x) = ${'a'.repeat(9_000)}\n`;
    const file = writeTemp('long-names.qstate', text);
    const r = runCli(['check', file], 256);
    expect(r.signal).toBeNull();
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/:3:16: error\[name\]: /);
  });

  it('1,000 long let names and 1,000 unknown names cost bounded suggestion work', () => {
    let text = 'system box(0, 1)\n';
    for (let i = 0; i < 1000; i++) text += `let ${'q'.repeat(40)}${i} = 1\n`;
    for (let i = 0; i < 1000; i++) text += `let u${i} = ${'q'.repeat(38)}z${i}\n`;
    const meter = workCounter();
    const r = withQuickStage({ meter }, () => analyseStatic(text, { limits: { maxStatements: 5000 } }));
    expect(r.diagnostics.filter((d) => d.code === 'name').length).toBeGreaterThanOrEqual(1000);
    // Per unknown name (asked twice: by the checker and by the compiler) at most the candidates looked at,
    // one per distance computed, and the cell cap plus one band; plus the scanner's and parser's steps.
    expect(meter.ops).toBeLessThanOrEqual(2 * 1000 * (2 * SUGGEST_CAPS.maxCandidates + SUGGEST_CAPS.maxCellsPerCall + 64 * 43) + 20 * text.length);
  });
});

const OK = 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n';
const findingLine = /^.+:\d+:\d+: (error|warning|info)\[[a-z]+\]: .*$/;

describe('file trees from an untrusted repository', () => {
  it('l1 -> . and l2 -> . do not loop, and self -> . checks each file once', () => {
    // Before the file rules this hung with growing memory (the spawn's time-out would end it).
    const d = tempDir();
    writeFileSync(join(d, 'bad.qstate'), 'system box(0, 1)\nstate psi(x) = y\n');
    symlinkSync('.', join(d, 'l1'));
    symlinkSync('.', join(d, 'l2'));
    symlinkSync('.', join(d, 'self'));
    const r = runCli(['check', d]);
    expect(r.signal).toBeNull();
    expect(r.code).toBe(1);
    expect(r.out.split('\n').filter((l) => l.includes('error[name]'))).toHaveLength(1);
    expect(r.err).toMatch(/^eigenspan check: 1 file, 1 error, 0 warnings\.\n$/);
  });

  it('a link to the file-system root and a folder link out of the tree are not followed', () => {
    const d = tempDir();
    const outside = tempDir();
    writeFileSync(join(outside, 'other.qstate'), 'system box(0, 1)\nstate psi(x) = y\n');
    writeFileSync(join(d, 'ok.qstate'), OK);
    symlinkSync('/', join(d, 'root'));
    symlinkSync(outside, join(d, 'elsewhere'));
    const r = runCli(['check', d]);
    expect(r.code).toBe(0);
    expect(r.out).not.toContain('other.qstate');
    expect(r.out.split('\n').filter((l) => /warning\[limits\]: Not checked: a link to a folder outside/.test(l))).toHaveLength(2);
    expect(r.err).toMatch(/^eigenspan check: 1 file, 0 errors, 2 warnings\.\n$/);
  });

  it('a link to a file outside the tree does not leak its lines', () => {
    const d = tempDir();
    const outside = tempDir();
    writeFileSync(join(outside, 'passwd'), 'root:x:0:0:root:/root:/bin/sh\n');
    symlinkSync(join(outside, 'passwd'), join(d, 'leak.qstate'));
    const r = runCli(['check', d]);
    expect(r.out).not.toMatch(/root/);
    expect(r.out).toMatch(/leak\.qstate:1:1: warning\[limits\]: /);
    expect(r.code).toBe(0);
  });

  it('a .qstate link to the zero device is refused, not read (it would stream without end)', () => {
    const d = tempDir();
    symlinkSync('/dev/zero', join(d, 'zero.qstate'));
    const inTree = runCli(['check', d], 256);
    expect(inTree.signal).toBeNull();
    expect(inTree.out).toMatch(/zero\.qstate:1:1: warning\[limits\]: /);
    // Named directly it is still not a regular file.
    const named = runCli(['check', join(d, 'zero.qstate')], 256);
    expect(named.signal).toBeNull();
    expect(named.out).toMatch(/zero\.qstate:1:1: warning\[limits\]: /);
    expect(runCli(['expand', join(d, 'zero.qstate')], 256).code).toBe(2);
  });

  it('a FIFO never blocks check', () => {
    const d = tempDir();
    execFileSync('mkfifo', [join(d, 'pipe.qstate')]);
    writeFileSync(join(d, 'ok.qstate'), OK);
    const r = runCli(['check', d]);
    expect(r.signal).toBeNull();
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/pipe\.qstate:1:1: warning\[limits\]: /);
    const named = runCli(['check', join(d, 'pipe.qstate')]);
    expect(named.signal).toBeNull();
  });
});

describe('output that forges or hijacks a terminal', () => {
  it('an ANSI sequence in a formula is printed escaped, in check, the table and the JSON', () => {
    const esc = '\u001b';
    const text = `system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x) ${esc}[2K${esc}[32mall good${esc}]0;owned\u0007 + \u202e\u2028q\n`;
    const file = writeTemp('ansi.qstate', text);
    for (const args of [['check', file], ['expand', file], ['expand', file, '--csv']]) {
      const r = runCli(args);
      expect(r.out + r.err).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069\u2028\u2029]/);
    }
    const checked = runCli(['check', file]).out;
    expect(checked).toContain('\\x1B[2K');
    const json = runCli(['expand', file, '--json']);
    expect(json.out).not.toMatch(/[\u007f-\u009f\u202a-\u202e\u2028\u2029]/);
    // Still the same JSON: the escapes decode to the characters of the file.
    const parsed = JSON.parse(json.out) as { diagnostics: { message: string }[] };
    expect(parsed.diagnostics.length).toBeGreaterThan(0);
  });

  it('a file name with a newline cannot forge a FILE:LINE:COL line', () => {
    const d = tempDir();
    const name = 'x.qstate\nforged.qstate:1:1: error[syntax]: Planted.\ny.qstate';
    mkdirSync(join(d, 'sub'));
    writeFileSync(join(d, 'sub', name), 'system box(0, 1)\nstate psi(x) = y\n');
    const r = runCli(['check', d]);
    const lines = r.out.split('\n').filter((l) => l.length > 0);
    expect(lines.every((l) => findingLine.test(l))).toBe(true);
    expect(lines.some((l) => l.startsWith('forged.qstate'))).toBe(false);
    expect(lines).toHaveLength(1);
    expect(lines[0]).toContain('x.qstate\\nforged.qstate');
  });

  it('units such as µ and Å print as they are', () => {
    const file = writeTemp('units-µ.qstate', 'units Å, meV\nsystem box(0, 1 Å)\nstate psi(x) = µ\n');
    const r = runCli(['check', file]);
    expect(r.out).toContain('units-µ.qstate');
    expect(r.out).toContain("'µ'");
  });
});
