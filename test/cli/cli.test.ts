/**
 * The built command line (dist/cli.js): the JSON contract, check's output format and exit codes.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const CLI = join(__dirname, '..', '..', 'dist', 'cli.js');

function run(args: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let dir: string;
beforeAll(() => {
  if (!existsSync(CLI)) throw new Error('dist/cli.js is missing: run `npm run build` first');
  dir = mkdtempSync(join(tmpdir(), 'eigenspan-cli-'));
});

function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

describe('eigenspan expand --json', () => {
  it('prints the fixed fields for a box state', () => {
    const p = file('box.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\n');
    const r = run(['expand', p, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.levels).toHaveLength(10);
    expect(Object.keys(j.levels[0]).sort()).toEqual(['energy', 'im', 'n', 're', 'weight']);
    expect(j.levels[0].n).toBe(1);
    // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    expect(Math.abs(j.levels[0].weight - 0.998555014364018)).toBeLessThan(1e-12);
    expect(j.norm).toBeCloseTo(1, 12);
    expect(typeof j.captured).toBe('number');
    expect(j.energy.mean).toBeCloseTo(5, 9);
    expect(j.parity).toBe('even');
    expect(j.continuum).toBeUndefined();
    expect(Array.isArray(j.diagnostics)).toBe(true);
  });

  it('reports null energies when the series diverges and locates diagnostics 1-based', () => {
    const p = file('flat.qstate', 'system box(0, 1)\nstate psi(x) = 2\n');
    const j = JSON.parse(run(['expand', p, '--json']).out);
    expect(j.energy.mean).toBeNull();
    const b = j.diagnostics.find((d: { code: string }) => d.code === 'boundary');
    expect(b).toBeDefined();
    expect(b.line).toBe(2);
    expect(b.column).toBe(16);
    expect(b.severity).toBe('warning');
    expect(j.diagnostics.some((d: { code: string }) => d.code === 'norm')).toBe(true);
  });

  it('gives the continuum weight for a finite well', () => {
    const p = file('well.qstate', 'system well(depth = 2, width = 2)\nstate gaussian(center = 0, width = 0.2)\n');
    const j = JSON.parse(run(['expand', p, '--json']).out);
    expect(j.continuum).toBeGreaterThan(0);
    expect(j.continuum + j.captured).toBeCloseTo(1, 10);
  });

  it('prints CSV rows and a table', () => {
    const p = file('osc.qstate', 'system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1, center = 1)\nbasis 5\n');
    const csv = run(['expand', p, '--csv']).out.trim().split('\n');
    // The first line names the energy unit (docs/format.md), the header keeps its documented columns.
    expect(csv[0]).toMatch(/^# energy in /);
    expect(csv[1]).toBe('n,energy,re,im,weight');
    expect(csv).toHaveLength(7);
    expect(run(['expand', p, '--csv-bare']).out.trim().split('\n')[0]).toBe('n,energy,re,im,weight');
    const table = run(['expand', p, '--table']);
    expect(table.code).toBe(0);
    expect(table.out).toContain('energy mean');
  });
});

describe('eigenspan expand --out', () => {
  it('writes a new file, refuses to replace it, and replaces it with --force', () => {
    const src = file('out-src.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(2) sin(pi x)\nbasis 3\n');
    const target = join(dir, 'coefficients.csv');
    expect(run(['expand', src, '--csv', '--out', target]).code).toBe(0);
    const first = readFileSync(target, 'utf8');
    expect(first.split('\n')[1]).toBe('n,energy,re,im,weight');
    writeFileSync(target, 'keep me');
    const refused = run(['expand', src, '--csv', '--out', target]);
    expect(refused.code).toBe(2);
    expect(refused.err).toContain('--force');
    expect(readFileSync(target, 'utf8')).toBe('keep me');
    expect(run(['expand', src, '--csv', '--out', target, '--force']).code).toBe(0);
    expect(readFileSync(target, 'utf8')).toBe(first);
  });
});

describe('eigenspan --time-limit', () => {
  it('stops a slow analysis at the limit with a limits finding and partial results', () => {
    const p = file('slow.qstate', 'system V(x) = x^4 over [-6, 6]\nstate gaussian(center = 0.5, width = 0.5)\nbasis 800\n');
    const r = run(['expand', p, '--json', '--time-limit', '300']);
    const j = JSON.parse(r.out);
    // The limit fired (its finding on the first line) and the results are partial: fewer levels than the
    // 800 asked for. The full analysis takes tens of seconds; nothing here is timed.
    expect(j.diagnostics.some((d: { code: string; line: number }) => d.code === 'limits' && d.line === 1)).toBe(true);
    expect(j.levels.length).toBeLessThan(800);
    expect(r.code).toBe(1);
    expect(run(['check', p, '--time-limit', 'soon']).code).toBe(2);
  });
});

describe('eigenspan --limit', () => {
  it('raises and lowers caps for expand and check, and refuses unknown names and values out of range', () => {
    const p = file('big-basis.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\nbasis 6000\n');
    // Over the default cap of 5000: a limits error.
    const dflt = run(['check', p]);
    expect(dflt.code).toBe(1);
    expect(dflt.out).toMatch(/error\[limits\]/);
    // Raised: the 6000 levels are computed.
    const raised = JSON.parse(run(['expand', p, '--json', '--limit', 'maxBasis=8000']).out);
    expect(raised.levels).toHaveLength(6000);
    expect(raised.diagnostics.filter((d: { code: string }) => d.code === 'limits')).toEqual([]);
    // Lowered below the file's own line.
    const small = file('small.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(2) * sin(pi * x)\nbasis 30\n');
    const lowered = run(['check', small, '--limit', 'maxBasis=20']);
    expect(lowered.code).toBe(1);
    expect(lowered.out).toMatch(/error\[limits\].*20/);
    expect(run(['check', small]).code).toBe(0);
    // Usage errors: exit 2 with one line naming the problem.
    for (const bad of [['--limit', 'maxBasis=0'], ['--limit', 'maxBasis=1e9'], ['--limit', 'speed=3'], ['--limit', 'maxBasis'], ['--limit']]) {
      const r = run(['check', small, ...bad]);
      expect(r.code, bad.join(' ')).toBe(2);
      expect(r.err.trim().split('\n')).toHaveLength(1);
    }
    expect(run(['check', small, '--limit', 'speed=3']).err).toMatch(/'speed' is not a limit/);
  });
});

describe('eigenspan check', () => {
  it('prints FILE:LINE:COL: SEVERITY[CODE]: MESSAGE and exits 1 on a failed expect', () => {
    const p = file('fail.qstate', 'system box(0, 1)\nstate psi(x) = sin(pi x)\nexpect energy 7 +- 0.1\n');
    const r = run(['check', p]);
    expect(r.code).toBe(1);
    const line = r.out.split('\n').find((l) => l.includes('[expect]'));
    expect(line).toMatch(new RegExp(`^${p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:3:1: error\\[expect\\]: .+`));
  });

  it('exits 0 on a clean file and on warnings only', () => {
    expect(run(['check', file('ok.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(2) sin(pi x)\nexpect norm 1 +- 1e-9\n')]).code).toBe(0);
    expect(run(['check', file('warn.qstate', 'system box(0, 1)\nstate psi(x) = 3 sin(pi x)\n')]).code).toBe(0);
  });

  it('ends with one summary line on standard error, saying so when everything is clean (issue 13)', () => {
    const clean = run(['check', file('clean.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(2) sin(pi x)\n')]);
    expect(clean.out.split('\n').filter((l) => l.length > 0 && !l.includes(': info['))).toEqual([]);
    expect(clean.err).toBe('eigenspan check: 1 file, no errors or warnings: all clean.\n');
    const bad = file('two.qstate', 'system box(0, 1)\nstate psi(x) = 3 sin(pi x)\nexpect energy 7 +- 0.1\n');
    const r = run(['check', bad, file('three.qstate', 'system box(0, 1)\nstate psi(x) = y\n')]);
    const lines = r.out.split('\n').filter((l) => l.length > 0);
    const count = (sev: string) => lines.filter((l) => l.includes(`: ${sev}[`)).length;
    // Standard output holds only the findings; the counts on standard error are theirs.
    expect(lines.every((l) => /^.+:\d+:\d+: (error|warning|info)\[[a-z]+\]: /.test(l))).toBe(true);
    expect(r.err).toBe(`eigenspan check: 2 files, ${count('error')} error${count('error') === 1 ? '' : 's'}, ${count('warning')} warning${count('warning') === 1 ? '' : 's'}.\n`);
    expect(count('error')).toBeGreaterThanOrEqual(2);
  });

  it('checks every .qstate file of a folder and reports unreadable or binary ones', () => {
    const sub = mkdtempSync(join(tmpdir(), 'eigenspan-folder-'));
    writeFileSync(join(sub, 'a.qstate'), 'system box(0, 1)\nstate psi(x) = sqrt(2) sin(pi x)\n');
    writeFileSync(join(sub, 'b.qstate'), Buffer.from([0, 1, 2, 3]));
    writeFileSync(join(sub, 'notes.txt'), 'not a setup');
    const r = run(['check', sub]);
    expect(readdirSync(sub)).toHaveLength(3);
    expect(r.code).toBe(1);
    expect(r.out).toContain('b.qstate:1:1: error[syntax]');
    expect(r.out).not.toContain('notes.txt');
  });

  it('exits 2 with one line on usage errors', () => {
    for (const args of [['check'], ['expand'], ['expand', join(dir, 'missing.qstate')], ['expand', file('x.qstate', ''), '--bogus'], ['frobnicate']]) {
      const r = run(args);
      expect(r.code).toBe(2);
      expect(r.err.trim().split('\n')).toHaveLength(1);
      expect(r.err).not.toMatch(/\n\s+at /);
    }
    const help = run(['--help']);
    expect(help.code).toBe(0);
    expect(help.out).toContain('eigenspan expand');
  });
});

describe('the bundled examples', () => {
  it('all pass their expect lines', () => {
    const r = run(['check', join(__dirname, '..', '..', 'examples')]);
    expect(r.out.split('\n').filter((l) => l.includes('error['))).toEqual([]);
    expect(r.code).toBe(0);
  });
});
