/**
 * Hostile data files through the built command line (dist/cli.js): every data file a `.qstate` file
 * names is read only when it is a regular file inside the `.qstate` file's folder (docs/format.md,
 * "Sampled states"); anything else is one `data` error on the path, and the run carries on. The caps
 * (DATA_MAX_BYTES read, maxGridPoints / 20 - 1 rows) are the engine's.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempDir } from './tree';
import { DATA_MAX_BYTES } from '../../server/src/analysis/samples';

const cli = join(__dirname, '..', '..', 'dist', 'cli.js');

/** Sampled sqrt(2) sin(pi x) on (0, 1): a valid table of 33 rows. */
const GOOD = ['x, re', ...Array.from({ length: 33 }, (_, i) => `${i / 32}, ${Math.SQRT2 * Math.sin((Math.PI * i) / 32)}`)].join('\n') + '\n';

/** A folder with `case.qstate` naming `path`, and the extra entries `setup` makes; the CLI's finding lines. */
function checkWith(path: string, setup: (dir: string) => void, ...flags: string[]): { code: number | null; lines: string[]; dir: string } {
  expect(existsSync(cli), 'dist/cli.js is missing: run npm run build').toBe(true);
  const dir = tempDir('eigenspan-data-');
  mkdirSync(join(dir, 'data'));
  writeFileSync(join(dir, 'case.qstate'), `system box(0, 1)\nstate samples("${path}")\n`);
  setup(dir);
  const r = spawnSync(process.execPath, [cli, 'check', ...flags, join(dir, 'case.qstate')], { encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, lines: r.stdout.split('\n').filter((l) => l.length > 0), dir };
}

/** The one `data` error on the path (line 2, column 15), naming `words`. */
function refused(r: { code: number | null; lines: string[] }, words: RegExp): void {
  expect(r.code).toBe(1);
  expect(r.lines, r.lines.join('\n')).toHaveLength(1);
  expect(r.lines[0]).toMatch(/case\.qstate:2:15: error\[data\]: /);
  expect(r.lines[0]).toMatch(words);
}

describe('data files under the tree rules', () => {
  it('a good file below the folder is read', () => {
    const r = checkWith('data/good.csv', (d) => writeFileSync(join(d, 'data', 'good.csv'), GOOD));
    expect(r.lines.filter((l) => /error/.test(l))).toEqual([]);
    expect(r.code).toBe(0);
  });
  it('--no-data refuses it', () => refused(checkWith('data/good.csv', (d) => writeFileSync(join(d, 'data', 'good.csv'), GOOD), '--no-data'), /--no-data/));
  it('an absolute path', () => refused(checkWith('/etc/hostname', () => {}), /absolute/));
  it('.. out of the folder', () => refused(checkWith('../outside.csv', (d) => writeFileSync(join(d, '..', 'outside.csv'), GOOD)), /out of the folder/));
  it('.. that stays inside is fine', () => {
    const r = checkWith('data/../data/good.csv', (d) => writeFileSync(join(d, 'data', 'good.csv'), GOOD));
    expect(r.code).toBe(0);
  });
  it('a link out of the folder', () => {
    const outside = tempDir('eigenspan-data-out-');
    writeFileSync(join(outside, 'secret.csv'), GOOD);
    refused(checkWith('data/link.csv', (d) => symlinkSync(join(outside, 'secret.csv'), join(d, 'data', 'link.csv'))), /link out of the folder/);
  });
  it('a link to a device', () => refused(checkWith('data/zero.csv', (d) => symlinkSync('/dev/zero', join(d, 'data', 'zero.csv'))), /out of the folder/));
  it('a FIFO inside the folder is never opened', () => {
    const r = checkWith('data/fifo.csv', (d) => {
      const mk = spawnSync('mkfifo', [join(d, 'data', 'fifo.csv')]);
      expect(mk.status).toBe(0);
    });
    refused(r, /FIFO/);
  });
  it('a folder', () => refused(checkWith('data', () => {}), /folder/));
  it('a missing file', () => refused(checkWith('data/none.csv', () => {}), /no such file/));
  it('a dangling link', () => refused(checkWith('data/broken.csv', (d) => symlinkSync(join(d, 'nothing'), join(d, 'data', 'broken.csv'))), /broken link/));
  it('a huge file: refused by its size, never read whole', () => {
    const r = checkWith('data/huge.csv', (d) => writeFileSync(join(d, 'data', 'huge.csv'), Buffer.alloc(DATA_MAX_BYTES + 10, 0x30)));
    refused(r, new RegExp(String(DATA_MAX_BYTES)));
  });
  it('a binary file', () => refused(checkWith('data/bin.csv', (d) => writeFileSync(join(d, 'data', 'bin.csv'), Buffer.from([0x78, 0x2c, 0x00, 0xff, 0x0a]))), /binary/));
  it('too many rows: the cap of maxGridPoints / 20 - 1 rows', () => {
    const rows = (1 << 18) / 20;
    const big = ['x re', ...Array.from({ length: rows + 5 }, (_, i) => `${i} 0`)].join('\n');
    refused(checkWith('data/rows.csv', (d) => writeFileSync(join(d, 'data', 'rows.csv'), big)), new RegExp(`more than ${Math.floor(rows) - 1} rows`));
  });
  it('ragged rows and NaN: one finding naming the lines', () => {
    const bad = 'x, re\n0, 0\n0.25, 0.7\n0.5, NaN\n0.75\n1, 0\n';
    refused(checkWith('data/bad.csv', (d) => writeFileSync(join(d, 'data', 'bad.csv'), bad)), /line 4.*line 5/);
  });
});

describe('the fuzzer class of hostile data files (test/fuzz/hostile.ts)', () => {
  it('seeded trees with hostile data files keep the promises of check (nothing read outside, one line a finding)', async () => {
    const { checkTreeCase, dataEntries } = await import('../fuzz/hostile');
    // A small seeded generator (mulberry32, common practice), so the cases are the same on every run.
    let s = 17;
    const r = (): number => {
      s = (s + 0x6d2b79f5) | 0;
      let t = Math.imul(s ^ (s >>> 15), 1 | s);
      t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
      return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
    };
    for (let i = 0; i < 12; i++) {
      const entries = [{ kind: 'file' as const, path: 'a.qstate', text: 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n' }, ...dataEntries(r)];
      expect(checkTreeCase(entries), JSON.stringify(entries)).toEqual([]);
    }
  });
});
