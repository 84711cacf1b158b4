/**
 * `eigenspan diff` and `eigenspan summary` through the built command line (dist/cli.js), on two files and
 * in a real temporary git repository (summary as git's textconv, `diff --rev`).
 *
 * Expected values are closed forms for a particle in the box (0, 1) in natural units (hbar = m = 1),
 * derived in this comment: E_n = n^2 pi^2 / 2, so E_1 = 4.9348022.
 * PARABOLA psi = sqrt(30) x (1 - x): <H> = (1/2) int |psi'|^2 = 5, <H^2> = (1/4) int |psi''|^2 = 30,
 *   spread sqrt(30 - 25) = 2.2360680; even about x = 1/2.
 * SKEWED psi = sqrt(105) x (1 - x)^2: psi' = sqrt(105) (1 - x)(1 - 3x), int_0^1 (1-x)^2 (1-3x)^2 = 2/15,
 *   so <H> = 7; psi'' = sqrt(105) (6x - 4), int (6x - 4)^2 = 4, <H^2> = 105, spread sqrt(56) = 7.4833148;
 *   no symmetry about x = 1/2 (mixed parity).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const CLI = join(__dirname, '..', '..', 'dist', 'cli.js');
const PARABOLA = 'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\n';
// The same physics written differently (a comment, another spelling of the product).
const PARABOLA_AGAIN = '# the same state\nsystem box(0, 1)\nstate psi(x) = sqrt(30) * (x - x^2)\nbasis 10\n';
const SKEWED = 'system box(0, 1)\nstate psi(x) = sqrt(105) x * (1 - x)^2\nbasis 10\nexpect parity even\n';

function run(args: string[], cwd: string): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', cwd });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let dir: string;
beforeAll(() => {
  if (!existsSync(CLI)) throw new Error('dist/cli.js is missing: run `npm run build` first');
  dir = mkdtempSync(join(tmpdir(), 'eigenspan-vcs-'));
  writeFileSync(join(dir, 'parabola.qstate'), PARABOLA);
  writeFileSync(join(dir, 'again.qstate'), PARABOLA_AGAIN);
  writeFileSync(join(dir, 'skewed.qstate'), SKEWED);
});

describe('eigenspan summary', () => {
  it('prints the rounded physics, the same every run', () => {
    const r = run(['summary', 'parabola.qstate'], dir);
    expect(r.code).toBe(0);
    const lines = r.out.split('\n');
    expect(lines).toContain('system: box');
    expect(lines).toContain('level 1: energy 4.9348, weight 0.9986');
    expect(lines).toContain('energy mean: 5');
    expect(lines).toContain('energy spread: 2.23607');
    expect(lines).toContain('parity: even');
    expect(run(['summary', 'parabola.qstate'], dir).out).toBe(r.out);
    // Different text, the same physics: the same summary.
    expect(run(['summary', 'again.qstate'], dir).out).toBe(r.out);
  });

  it('exits 0 even when the file has errors (git treats a failing textconv as an error), 2 on usage errors', () => {
    writeFileSync(join(dir, 'broken.qstate'), 'system box(0, 1)\nstate psi(x) = foo(x)\n');
    const r = run(['summary', 'broken.qstate'], dir);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^finding: error\[syntax\]: /m);
    expect(run(['summary'], dir).code).toBe(2);
    expect(run(['summary', 'missing.qstate'], dir).code).toBe(2);
  });
});

describe('escaping', () => {
  it('escapes controls and bidirectional characters in summary and diff like check', () => {
    writeFileSync(join(dir, 'odd\x1b.qstate'), 'system box(0, 1)\nstate psi(x) = f\u202eoo * x\n');
    const s = run(['summary', 'odd\x1b.qstate'], dir);
    expect(s.out).not.toMatch(/[\x00-\x09\x0b-\x1f\u202e]/);
    expect(s.out).toContain('\\u202E');
    const d = run(['diff', 'parabola.qstate', 'odd\x1b.qstate'], dir);
    expect(d.out).not.toMatch(/[\x00-\x09\x0b-\x1f\u202e]/);
    expect(d.out).toContain('-> odd\\x1B.qstate');
  });
});

describe('eigenspan diff OLD NEW', () => {
  it('prints the physics that moved and the findings that appeared or disappeared; exit 1', () => {
    const r = run(['diff', 'parabola.qstate', 'skewed.qstate'], dir);
    expect(r.code).toBe(1);
    const lines = r.out.split('\n').map((l) => l.trim());
    expect(lines).toContain('energy mean: 5 -> 7 (+2)');
    expect(lines).toContain('energy spread: 2.23607 -> 7.48331 (+5.24725)');
    expect(lines).toContain('parity: even -> mixed');
    expect(lines.some((l) => /^level 1 weight: 0\.998555 -> 0\.87\d+ \(-0\.12\d+\)$/.test(l))).toBe(true);
    // Level 2 vanishes by symmetry for the parabola, not for the skewed state.
    expect(lines.some((l) => /^level 2 weight: 0 -> 0\.1\d+/.test(l))).toBe(true);
    expect(lines).toContain('+ error[expect]: Expected parity even, measured mixed.');
    expect(lines.some((l) => l.startsWith('- info[parity]: '))).toBe(true);
  });

  it('shows no change for the same physics written differently; exit 0', () => {
    const r = run(['diff', 'parabola.qstate', 'again.qstate'], dir);
    expect(r.code).toBe(0);
    expect(r.out).toContain('no changes beyond the tolerance');
  });

  it('honours --tolerance: weights absolute, energies relative', () => {
    const r = run(['diff', 'parabola.qstate', 'skewed.qstate', '--tolerance', '0.5'], dir);
    const lines = r.out.split('\n').map((l) => l.trim());
    // |dw_1| = 0.125 and (7 - 5) / 7 = 0.29 are inside 0.5; (7.483 - 2.236) / 7.483 = 0.70 is not.
    expect(lines.some((l) => l.startsWith('level 1 weight'))).toBe(false);
    expect(lines.some((l) => l.startsWith('energy mean'))).toBe(false);
    expect(lines.some((l) => l.startsWith('energy spread: 2.23607 -> 7.48331'))).toBe(true);
    expect(r.out).toContain('(tolerance 0.5)');
    expect(run(['diff', 'parabola.qstate', 'skewed.qstate', '--tolerance', '-1'], dir).code).toBe(2);
    expect(run(['diff', 'parabola.qstate'], dir).code).toBe(2);
  });
});

describe('in a git repository', () => {
  function git(repo: string, args: string[]): string {
    // No user or system configuration leaks in: HOME is the temporary folder, the system file is off.
    const env = { PATH: process.env.PATH ?? '', HOME: repo, GIT_CONFIG_NOSYSTEM: '1', GIT_PAGER: 'cat', LC_ALL: 'C' };
    const r = spawnSync('git', args, { cwd: repo, encoding: 'utf8', env });
    if (r.status !== 0) throw new Error(`git ${args.join(' ')}: ${r.stderr}`);
    return r.stdout;
  }

  it('shows the physics in git diff and git log -p through the textconv, and diff --rev reads a revision', () => {
    const repo = mkdtempSync(join(tmpdir(), 'eigenspan-git-'));
    git(repo, ['init', '-q']);
    git(repo, ['config', 'user.name', 'Test Author']);
    git(repo, ['config', 'user.email', 'author@example.invalid']);
    git(repo, ['config', 'commit.gpgsign', 'false']);
    // The lines README.md documents, with the built CLI in place of `npx eigenspan`.
    git(repo, ['config', 'diff.qstate.textconv', `"${process.execPath}" "${CLI}" summary`]);
    writeFileSync(join(repo, '.gitattributes'), '*.qstate diff=qstate\n');
    writeFileSync(join(repo, 'setup.qstate'), PARABOLA);
    git(repo, ['add', '.']);
    git(repo, ['commit', '-q', '-m', 'parabola']);
    writeFileSync(join(repo, 'setup.qstate'), SKEWED);
    git(repo, ['commit', '-q', '-a', '-m', 'skewed']);

    const d = git(repo, ['diff', 'HEAD~1', 'HEAD']).split('\n');
    expect(d).toContain('-energy mean: 5');
    expect(d).toContain('+energy mean: 7');
    expect(d).toContain('+energy spread: 7.48331');
    expect(d).toContain('-parity: even');
    expect(d).toContain('+parity: mixed');
    const log = git(repo, ['log', '-p', '--format=commit %s']).split('\n');
    expect(log).toContain('+finding: error[expect]: Expected parity even, measured mixed.');
    // The first commit's patch adds every line of the parabola's summary.
    expect(log).toContain('+energy spread: 2.23607');
    // Without the textconv git shows only the text.
    expect(git(repo, ['diff', '--no-textconv', 'HEAD~1', 'HEAD'])).not.toContain('energy mean');

    const r = run(['diff', 'setup.qstate', '--rev', 'HEAD~1'], repo);
    expect(r.code).toBe(1);
    expect(r.out).toContain('physics of setup.qstate@HEAD~1 -> setup.qstate');
    expect(r.out).toContain('energy mean: 5 -> 7 (+2)');
    expect(run(['diff', 'setup.qstate', '--rev', 'HEAD'], repo).code).toBe(0);
    const bad = run(['diff', 'setup.qstate', '--rev', '--output=x'], repo);
    expect(bad.code).toBe(2);
    expect(run(['diff', 'setup.qstate', '--rev', 'no-such-rev'], repo).code).toBe(2);
  });
});
