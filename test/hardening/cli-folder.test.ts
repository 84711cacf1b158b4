/**
 * `eigenspan check FOLDER` through the built command line (dist/cli.js, made by `npm run build`): an
 * unreadable, binary, huge or dangling entry is reported on its own line and the other files are still
 * checked (the dangling link as a warning, under the file rules of docs/format.md). As root, chmod 000 does not stop reading, so a dangling link and a folder entry that
 * cannot be examined stand in for unreadable files.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { numbersIn } from './helpers';
import { DEFAULT_LIMITS } from '../../server/src/analysis/index';

const cli = join(__dirname, '..', '..', 'dist', 'cli.js');

function check(...args: string[]): { code: number | null; lines: string[]; err: string } {
  const r = spawnSync(process.execPath, [cli, 'check', ...args], { encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, lines: r.stdout.split('\n').filter((l) => l.length > 0), err: r.stderr };
}

describe('check over a folder with bad entries', () => {
  it('reports each bad entry and goes on', () => {
    expect(existsSync(cli), 'dist/cli.js is missing: run npm run build').toBe(true);
    const dir = mkdtempSync(join(tmpdir(), 'eigenspan-folder-'));
    try {
      writeFileSync(join(dir, 'a-good.qstate'), 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n');
      writeFileSync(join(dir, 'b-binary.qstate'), Buffer.from([0x73, 0x79, 0x00, 0xff, 0xfe, 0x00, 0x01]));
      writeFileSync(join(dir, 'c-huge.qstate'), '#'.repeat(1_100_000));
      symlinkSync(join(dir, 'missing-target.qstate'), join(dir, 'd-dangling.qstate'));
      const locked = join(dir, 'e-locked.qstate');
      writeFileSync(locked, 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n');
      chmodSync(locked, 0o000);
      mkdirSync(join(dir, 'f-sub'));
      writeFileSync(join(dir, 'f-sub', 'g-bad.qstate'), 'system box(0, 1)\nstate psi(x) = y\n');
      writeFileSync(join(dir, 'notes.txt'), 'not a qstate file');

      const r = check(dir);
      // The summary on standard error: five .qstate files (the dangling link is refused, not counted). Its
      // wording is the documented format (docs/format.md), so it is matched as words.
      // Finding lines are matched by FILE:LINE:COL: SEVERITY[CODE] and the values they name, not wording.
      expect(r.err).toMatch(/^eigenspan check: 5 files, \d+ errors?, \d+ warnings?\.\n$/);
      expect(r.code).toBe(1);
      const line = (name: string) => r.lines.filter((l) => l.includes(name));
      // Each bad entry on its own FILE:1:1 line, with a code.
      expect(line('b-binary.qstate')).toHaveLength(1);
      expect(line('b-binary.qstate')[0]!.startsWith(`${join(dir, 'b-binary.qstate')}:1:1: error[syntax]: `)).toBe(true);
      expect(line('c-huge.qstate')[0]).toMatch(/:1:1: error\[limits\]: /);
      // The measured size and the cap (DEFAULT_LIMITS.maxFileBytes).
      expect(numbersIn(line('c-huge.qstate')[0]!.split('error[limits]: ')[1]!)).toEqual(expect.arrayContaining([1_100_000, DEFAULT_LIMITS.maxFileBytes]));
      // A dangling link is refused by the file rules: a warning, so it alone would not fail the run.
      expect(line('d-dangling.qstate')[0]).toMatch(/:1:1: warning\[limits\]: /);
      // The readable files are still checked: the good one has no error, the bad one a name error on line 2.
      expect(line('a-good.qstate').some((l) => /error/.test(l))).toBe(false);
      expect(line('g-bad.qstate').some((l) => /:2:\d+: error\[name\]/.test(l))).toBe(true);
      // The locked file is either read (root) or reported; either way it has a line or no error of its own.
      const lockedLines = line('e-locked.qstate');
      if (lockedLines.some((l) => /error\[limits\]/.test(l))) expect(lockedLines[0]).toMatch(/e-locked\.qstate:1:1: error\[limits\]: /);
      // Nothing but .qstate files is looked at.
      expect(line('notes.txt')).toEqual([]);
      for (const l of r.lines) expect(l).toMatch(/^.+:\d+:\d+: (error|warning|info)\[[a-z]+\]: [A-Z'`|0-9].*[.?]$/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('a missing path is reported and the other arguments still checked', () => {
    expect(existsSync(cli), 'dist/cli.js is missing: run npm run build').toBe(true);
    const dir = mkdtempSync(join(tmpdir(), 'eigenspan-folder-'));
    try {
      const good = join(dir, 'ok.qstate');
      writeFileSync(good, 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n');
      const r = check(join(dir, 'nope'), good);
      expect(r.code).toBe(1);
      expect(r.lines[0]).toMatch(/nope:1:1: error\[limits\]: /);
      expect(r.lines.some((l) => l.startsWith(good))).toBe(true);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
