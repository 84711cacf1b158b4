/**
 * `eigenspan sweep` and the sweep inside `expand` and `check`, through the built command line
 * (dist/cli.js): CSV one row a point, the JSON's `sweep` field beside the unchanged fields, the same
 * numbers on worker threads as in one thread, and `check` failing a design window that is too small.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
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
  dir = mkdtempSync(join(tmpdir(), 'eigenspan-sweep-'));
});

function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

// A finite well whose depth is swept: the system changes between points, so the points go to threads.
// Bound levels appear at V0 = k^2 pi^2 / 8 for a = 1, m = hbar = 1 (the square-well result, any text).
const WELL = 'let D = 5\nsystem well(depth = D, width = 2)\nstate gaussian(center = 0, width = 0.4)\nexpect weight 1 >= 0.9\nsweep D from 1 to 20 steps 9\n';

describe('eigenspan sweep', () => {
  it('prints one CSV row a point after the units comment and the header', () => {
    const r = run(['sweep', file('well.qstate', WELL), '--csv']);
    expect(r.code).toBe(0);
    const rows = r.out.trim().split('\n');
    expect(rows[0]).toBe('# D in natural units; energy in natural units (hbar = 1, mass = 1)');
    expect(rows[1]!.split(',').slice(0, 7)).toEqual(['D', 'valid', 'bound', 'captured', 'continuum', 'mean', 'spread']);
    expect(rows).toHaveLength(2 + 10);
    const header = rows[1]!.split(',');
    const bound = header.indexOf('bound');
    for (const row of rows.slice(2)) {
      const cells = row.split(',');
      const d = Number(cells[0]);
      expect(Number(cells[bound])).toBe(Math.max(1, Math.ceil((2 * Math.sqrt(2 * d)) / Math.PI)));
    }
    const bare = run(['sweep', file('well.qstate', WELL), '--csv-bare']);
    expect(bare.out.split('\n')[0]).toBe(rows[1]);
  });

  it('gives the same JSON on two worker threads as in one thread', () => {
    const p = file('well.qstate', WELL);
    const threaded = run(['sweep', p, '--json']);
    const single = run(['sweep', p, '--json', '--threads', '1']);
    expect(threaded.code).toBe(0);
    expect(threaded.out).toBe(single.out);
    const j = JSON.parse(threaded.out);
    expect(j.sweep.systemFixed).toBe(false);
    expect(j.sweep.finished).toBe(10);
    const steps = j.sweep.located.filter((l: { kind: string }) => l.kind === 'bound').map((l: { at: number }) => l.at);
    // k = 1..4: k^2 pi^2 / 8 (derived above); 16 pi^2 / 8 = 19.74 < 20.
    expect(steps).toHaveLength(4);
    [1, 4, 9, 16].forEach((k2, i) => expect(Math.abs(steps[i] - (k2 * Math.PI ** 2) / 8) / steps[i]).toBeLessThan(1e-8));
  });

  it('hands the data files of a samples state to its worker threads: the same JSON as in one thread', () => {
    // The oscillator's quantum is swept, so the system changes and the points go to threads; the state is
    // a table of samples of the oscillator's ground state, exp(-x^2 / 2) in natural units (any text).
    const rows = ['x, re', ...Array.from({ length: 81 }, (_, i) => {
      const x = -8 + 0.2 * i;
      return `${x.toFixed(4)}, ${Math.exp(-(x * x) / 2).toPrecision(12)}`;
    })];
    writeFileSync(join(dir, 'ground.csv'), rows.join('\n') + '\n');
    const p = file('sampled.qstate', 'let w = 1\nsystem oscillator(omega = w)\nstate samples("ground.csv")\nbasis 20\nexpect weight 0 >= 0.99\nsweep w from 0.5 to 2 steps 6\n');
    const threaded = run(['sweep', p, '--json']);
    const single = run(['sweep', p, '--json', '--threads', '1']);
    expect(threaded.code).toBe(0);
    expect(threaded.out).toBe(single.out);
    const j = JSON.parse(threaded.out);
    expect(j.sweep.systemFixed).toBe(false);
    expect(j.sweep.points.every((q: { valid: boolean }) => q.valid)).toBe(true);
    // At w = 1 (the third point) the samples are the ground state itself: |c_0|^2 = 1 to the sampling's accuracy.
    expect(j.sweep.points[2].levels[0].weight).toBeGreaterThan(0.9999);
    expect(j.diagnostics.filter((d: { code: string }) => d.code === 'data')).toEqual([]);
  });

  it('demo prints a short sweep summary for a file with a sweep, and none for one without', () => {
    const folder = mkdtempSync(join(tmpdir(), 'eigenspan-demo-'));
    writeFileSync(join(folder, 'a-well.qstate'), WELL);
    writeFileSync(join(folder, 'b-box.qstate'), 'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\n');
    const r = run(['demo', folder]);
    expect(r.code).toBe(0);
    const [well, box] = r.out.split(/^== /m).filter((x) => x.length > 0);
    expect(well).toContain('sweep of D: 1 to 20 in 9 steps (linear)\n10 of 10 points;');
    // The bound-level steps at k^2 pi^2 / 8, k = 1..4 (derived above): 1.2337, 4.9348, 11.103, 19.739.
    const steps = [...well!.matchAll(/bound levels (\d) -> (\d) at D = ([\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2]), Number(m[3])]);
    expect(steps.map(([a, b]) => [a, b])).toEqual([[1, 2], [2, 3], [3, 4], [4, 5]]);
    steps.forEach(([, , at], i) => expect(Math.abs(at! - ((i + 1) ** 2 * Math.PI ** 2) / 8) / at!).toBeLessThan(1e-7));
    expect(well).toMatch(/design window \(every expect line holds\):\n  D from /);
    expect(box).not.toContain('sweep of');
  });

  it('prints the table with the located changes and the design window', () => {
    const r = run(['sweep', file('well.qstate', WELL)]);
    expect(r.code).toBe(0);
    expect(r.out).toContain('bound levels 1 -> 2 at D = 1.23370055');
    expect(r.out).toContain('line 4 (expect weight 1 >= 0.9) starts holding at D = ');
    expect(r.out).toMatch(/design window \(every expect line holds\):\n {2}D from [\d.]+ to 20 \(the sweep's end\)/);
  });

  it('refuses a file without a sweep line as a usage error', () => {
    const r = run(['sweep', file('plain.qstate', 'system box(0, 1)\nstate psi(x) = x * (1 - x)\n')]);
    expect(r.code).toBe(2);
    expect(r.err).toContain('no `sweep` line');
  });
});

describe('the sweep in expand and check', () => {
  // A displaced oscillator ground state: P_0 = e^{-d^2/2} with m = omega = hbar = 1 (Glauber 1963);
  // P_0 >= 1/2 holds for d <= sqrt(2 ln 2) = 1.1774.
  const osc = (range: string) => `let d = 1\nsystem oscillator(omega = 1)\nstate gaussian(center = d, width = 1 / sqrt(2))\nexpect weight 0 >= 0.5\nsweep d from 0 to 2 steps 8\nexpect window covers ${range}\n`;

  it('keeps the documented fields at the let value and adds the sweep field', () => {
    const r = run(['expand', file('osc.qstate', osc('0..1')), '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    for (const k of ['levels', 'norm', 'captured', 'energy', 'parity', 'diagnostics', 'units', 'system', 'decay', 'levelsFor999']) expect(j).toHaveProperty(k);
    expect(Math.abs(j.levels[0].weight - Math.exp(-0.5))).toBeLessThan(1e-11);
    expect(j.sweep.points).toHaveLength(9);
    expect(j.sweep.windows).toHaveLength(1);
    expect(Math.abs(j.sweep.windows[0].to - Math.sqrt(2 * Math.LN2))).toBeLessThan(1e-9);
  });

  it('fails check when the window does not cover the range the file names', () => {
    const good = run(['check', file('good.qstate', osc('0..1'))]);
    expect(good.code).toBe(0);
    const bad = run(['check', file('bad.qstate', osc('0.5..1.5'))]);
    expect(bad.code).toBe(1);
    expect(bad.out).toMatch(/bad\.qstate:6:1: error\[expect\]: Expected the design window to cover 0\.5\.\.1\.5; every expect holds for 0\.\.1\.17741/);
  });
});
