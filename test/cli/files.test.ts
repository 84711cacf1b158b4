/**
 * The file rules of server/src/cli/files.ts on real trees in a temporary folder: real symbolic links,
 * a link to the zero device, a FIFO, links out of the tree and back up it.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, realpathSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';
import { readBounded, resolveInTree, walkTree } from '../../server/src/cli/files';

const base = realpathSync(mkdtempSync(join(tmpdir(), 'eigenspan-files-')));
afterAll(() => rmSync(base, { recursive: true, force: true }));
let n = 0;
/** A fresh folder under the temporary base. */
function tree(): string {
  const d = join(base, `t${n++}`);
  mkdirSync(d);
  return d;
}
const wanted = (name: string) => name.endsWith('.qstate');
const OK = 'system box(0, 1)\n';

describe('walkTree', () => {
  it('visits each real folder once: l1 -> . and l2 -> . do not loop, self -> . checks each file once', () => {
    const d = tree();
    writeFileSync(join(d, 'a.qstate'), OK);
    mkdirSync(join(d, 'sub'));
    writeFileSync(join(d, 'sub', 'b.qstate'), OK);
    symlinkSync('.', join(d, 'l1'));
    symlinkSync('.', join(d, 'l2'));
    symlinkSync('..', join(d, 'sub', 'up'));
    const r = walkTree(d, { wanted });
    expect(r.files).toEqual([join(d, 'a.qstate'), join(d, 'sub', 'b.qstate')]);
    expect(r.refused).toEqual([]);
  });

  it('follows a link inside the tree once, and a second link to the same file not at all', () => {
    const d = tree();
    mkdirSync(join(d, 'real'));
    writeFileSync(join(d, 'real', 'c.qstate'), OK);
    symlinkSync('real', join(d, 'alias'));
    symlinkSync(join(d, 'real', 'c.qstate'), join(d, 'z-copy.qstate'));
    const r = walkTree(d, { wanted });
    // 'alias' sorts first, so the file is reached through it; 'real' and the file link are the same files.
    expect(r.files).toEqual([join(d, 'alias', 'c.qstate')]);
    expect(r.refused).toEqual([]);
  });

  it('refuses links out of the tree (a file, a folder, the root of the file system) as warnings', () => {
    const d = tree();
    const outside = tree();
    writeFileSync(join(outside, 'secret.qstate'), 'root:x:0:0\n');
    symlinkSync(join(outside, 'secret.qstate'), join(d, 'leak.qstate'));
    symlinkSync(outside, join(d, 'elsewhere'));
    symlinkSync('/', join(d, 'root'));
    writeFileSync(join(d, 'own.qstate'), OK);
    const r = walkTree(d, { wanted });
    expect(r.files).toEqual([join(d, 'own.qstate')]);
    expect(r.refused.map((x) => [x.path, x.reason])).toEqual([
      [join(d, 'elsewhere'), 'outside'],
      [join(d, 'leak.qstate'), 'outside'],
      [join(d, 'root'), 'outside'],
    ]);
  });

  it('refuses a link to the zero device and a FIFO without opening them', () => {
    const d = tree();
    symlinkSync('/dev/zero', join(d, 'zero.qstate'));
    execFileSync('mkfifo', [join(d, 'pipe.qstate')]);
    const r = walkTree(d, { wanted });
    expect(r.files).toEqual([]);
    expect(r.refused.map((x) => [x.path, x.reason])).toEqual([
      [join(d, 'pipe.qstate'), 'not-regular'],
      [join(d, 'zero.qstate'), 'outside'],
    ]);
  });

  it('reports a missing root and a dangling link, and takes a single file root as given', () => {
    const d = tree();
    expect(walkTree(join(d, 'nope'), { wanted }).refused[0]!.reason).toBe('missing');
    symlinkSync(join(d, 'gone'), join(d, 'dangling.qstate'));
    expect(walkTree(d, { wanted }).refused.map((x) => x.reason)).toEqual(['dangling']);
    writeFileSync(join(d, 'notes.txt'), OK);
    expect(walkTree(join(d, 'notes.txt'), { wanted }).files).toEqual([join(d, 'notes.txt')]);
  });
});

describe('readBounded', () => {
  it('caps the bytes actually read: the zero device, whose stat size is 0, is refused without reading', () => {
    const r = readBounded('/dev/zero', { maxBytes: 1024 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.refusal.reason).toBe('not-regular');
  });

  it('never blocks on a FIFO (nobody writes to it)', () => {
    const d = tree();
    const fifo = join(d, 'p.qstate');
    execFileSync('mkfifo', [fifo]);
    const r = readBounded(fifo, { maxBytes: 1024 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.refusal.reason).toBe('not-regular');
  });

  it('reads a file up to the cap and refuses one byte more', () => {
    const d = tree();
    writeFileSync(join(d, 'small.qstate'), 'x'.repeat(1024));
    writeFileSync(join(d, 'big.qstate'), 'x'.repeat(1025));
    const small = readBounded(join(d, 'small.qstate'), { maxBytes: 1024 });
    expect(small.ok && small.data.length).toBe(1024);
    const big = readBounded(join(d, 'big.qstate'), { maxBytes: 1024 });
    expect(!big.ok && [big.refusal.reason, big.refusal.size]).toEqual(['too-large', 1025]);
  });

  it('refuses a file whose real path leaves the folder it must stay in', () => {
    const d = tree();
    const outside = tree();
    writeFileSync(join(outside, 'x.csv'), '1,2\n');
    symlinkSync(join(outside, 'x.csv'), join(d, 'x.csv'));
    const r = readBounded(join(d, 'x.csv'), { maxBytes: 1024, inside: d });
    expect(!r.ok && r.refusal.reason).toBe('outside');
    expect(readBounded(join(outside, 'x.csv'), { maxBytes: 1024, inside: outside }).ok).toBe(true);
  });
});

describe('resolveInTree', () => {
  it('accepts relative paths that stay inside and refuses absolute ones, .. out of the tree and links out', () => {
    const d = tree();
    const outside = tree();
    mkdirSync(join(d, 'data'));
    symlinkSync(outside, join(d, 'out'));
    expect(resolveInTree(d, 'data/../data/a.csv')).toEqual({ ok: true, path: join(d, 'data', 'a.csv') });
    expect(resolveInTree(d, '..notes.csv').ok).toBe(true);
    const refused = ['/etc/passwd', '../x.csv', 'data/../../x.csv', 'out'].map((p) => {
      const r = resolveInTree(d, p);
      return r.ok ? 'ok' : r.refusal.reason;
    });
    expect(refused).toEqual(['absolute', 'outside', 'outside', 'outside']);
  });
});
