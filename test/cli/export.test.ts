/**
 * `eigenspan expand FILE --samples OUT.csv` through the built command line: the normalised state and its
 * expansion on a grid, and the export read back with `samples("OUT.csv")`.
 *
 * Expected values: the parabola sqrt(30) x (1 - x) in the box (0, 1) (natural units) is normalised and
 * has c_1 = 8 sqrt(15) / pi^3 (closed form, from memory; also used in test/cli/engine.test.ts). Its
 * coefficients are c_n = 8 sqrt(15) / (n pi)^3 for odd n and the levels sqrt(2) sin(n pi x), so the
 * 40-level expansion differs from the state by at most sqrt(2) 8 sqrt(15) / pi^3 times the sum of n^-3
 * over odd n >= 41, which is below the integral of n^-3 / 2 from 40 on, 1 / (4 * 40^2): 2.21e-4
 * everywhere (derived in this comment).
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempDir } from '../hardening/tree';

const cli = join(__dirname, '..', '..', 'dist', 'cli.js');
const run = (cwd: string, ...args: string[]) => spawnSync(process.execPath, [cli, ...args], { cwd, encoding: 'utf8', timeout: 60_000 });

describe('expand --samples', () => {
  it('writes the state and its expansion, and the export reads back to the same coefficients', () => {
    const dir = tempDir('eigenspan-export-');
    writeFileSync(join(dir, 'p.qstate'), 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n');
    const r = run(dir, 'expand', 'p.qstate', '--samples', 'p.csv', '--points', '201');
    expect(r.status, r.stderr).toBe(0);
    const lines = readFileSync(join(dir, 'p.csv'), 'utf8').trim().split('\n');
    expect(lines[0]!.startsWith('#')).toBe(true);
    expect(lines[2]).toBe('x,re,im,re_expansion,im_expansion');
    const rows = lines.slice(3).map((l) => l.split(',').map(Number));
    expect(rows).toHaveLength(201);
    for (const [x, re, im, er, ei] of rows as number[][]) {
      expect(re).toBeCloseTo(Math.sqrt(30) * x! * (1 - x!), 12);
      expect(im).toBe(0);
      expect(Math.abs(er! - re!)).toBeLessThan((Math.SQRT2 * 8 * Math.sqrt(15)) / Math.PI ** 3 / (4 * 40 * 40));
      expect(ei).toBe(0);
    }
    // Read back: 200 intervals of a smooth state resolve 199 levels; c_1 to the spline's accuracy.
    writeFileSync(join(dir, 'back.qstate'), 'system box(0, 1)\nstate samples("p.csv")\n');
    const back = JSON.parse(run(dir, 'expand', 'back.qstate', '--json').stdout);
    expect(back.levels[0].re).toBeCloseTo((8 * Math.sqrt(15)) / Math.PI ** 3, 9);
  });

  it('never replaces an existing file without --force, and refuses --out and --samples on one file', () => {
    const dir = tempDir('eigenspan-export-');
    writeFileSync(join(dir, 'p.qstate'), 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n');
    writeFileSync(join(dir, 'keep.csv'), 'mine');
    expect(run(dir, 'expand', 'p.qstate', '--samples', 'keep.csv').status).toBe(2);
    expect(readFileSync(join(dir, 'keep.csv'), 'utf8')).toBe('mine');
    expect(run(dir, 'expand', 'p.qstate', '--samples', 'x.csv', '--out', 'x.csv').status).toBe(2);
    expect(run(dir, 'expand', 'p.qstate', '--samples', 'y.csv', '--points', '1').status).toBe(2);
  });

  it('writes the density of a mixed state, which has no wave function', () => {
    // rho = 0.25 |phi_1><phi_1| + 0.75 |phi_2><phi_2| in the box (0, 1): its density is
    // 0.25 * 2 sin^2(pi x) + 0.75 * 2 sin^2(2 pi x) (the box levels, closed form).
    const dir = tempDir('eigenspan-export-');
    writeFileSync(join(dir, 'm.qstate'), 'system box(0, 1)\nstate mixture(0.25: eigen(1) of box(0, 1), 0.75: eigen(2) of box(0, 1))\n');
    const r = run(dir, 'expand', 'm.qstate', '--samples', 'm.csv', '--points', '101');
    expect(r.status, r.stderr).toBe(0);
    const lines = readFileSync(join(dir, 'm.csv'), 'utf8').trim().split('\n');
    expect(lines[2]).toBe('x,density');
    const rows = lines.slice(3).map((l) => l.split(',').map(Number));
    expect(rows).toHaveLength(101);
    for (const [x, d] of rows as number[][]) {
      expect(d).toBeCloseTo(0.5 * Math.sin(Math.PI * x!) ** 2 + 1.5 * Math.sin(2 * Math.PI * x!) ** 2, 10);
    }
  });
});
