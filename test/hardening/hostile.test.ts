/**
 * Hostile inputs of issue 14, one test per class, each failing before its fix: names that blow up the
 * "did you mean" search, file trees that loop, leak or block, and output that forges terminal lines.
 * The command-line tests run the built dist/cli.js (`npm run build`).
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { analyseStatic } from '../../server/src/analysis/index';
import { withQuickStage, workCounter } from '../../server/src/language/meter';
import { SUGGEST_CAPS } from '../../server/src/language/suggest';
import { writeTemp } from './tree';

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
    expect(r.out).toMatch(/:3:16: error\[name\]: Unknown name/);
  });

  it('1,000 long let names and 1,000 unknown names cost bounded suggestion work', () => {
    let text = 'system box(0, 1)\n';
    for (let i = 0; i < 1000; i++) text += `let ${'q'.repeat(40)}${i} = 1\n`;
    for (let i = 0; i < 1000; i++) text += `let u${i} = ${'q'.repeat(38)}z${i}\n`;
    const meter = workCounter();
    const r = withQuickStage({ meter }, () => analyseStatic(text, { limits: { maxStatements: 5000 } }));
    expect(r.diagnostics.filter((d) => d.code === 'name').length).toBeGreaterThanOrEqual(1000);
    // Per unknown name at most the candidate and cell caps (twice: the checker and the compiler both ask),
    // plus the scanner's and parser's steps (a few per character).
    expect(meter.ops).toBeLessThanOrEqual(2 * 1000 * (SUGGEST_CAPS.maxCandidates + SUGGEST_CAPS.maxCellsPerCall) + 20 * text.length);
  });
});
