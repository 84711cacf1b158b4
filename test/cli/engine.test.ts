/**
 * The library entry `require('eigenspan/engine')`, used the way a user would: the package packed with
 * `npm pack`, installed from the tarball into a temporary project (offline), required from there and
 * compiled against with TypeScript. The hand-kept declarations (types/engine.d.ts) are checked
 * against the source here too: by the type checker (the assertions below) and by the exported names.
 *
 * Expected values: the parabola sqrt(30) x (1 - x) in the box (0, 1), natural units, has
 * c_1 = 8 sqrt(15) / pi^3, so |c_1|^2 = 960 / pi^6 = 0.998555..., and <H> = 5 (closed forms,
 * derived in test/cli/vcs.test.ts and from memory for c_1).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type * as Source from '../../server/src/api/engine';
import type * as Declared from '../../types/engine';

const ROOT = join(__dirname, '..', '..');

// Type-level: the declarations and the source agree both ways (tsc --noEmit checks this file).
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const agree: [
  Same<Source.EngineResult, Declared.EngineResult>,
  Same<Source.EngineOptions, Declared.EngineOptions>,
  Same<Source.EngineFinding, Declared.EngineFinding>,
  Same<typeof Source.analyse, typeof Declared.analyse>,
  Same<typeof Source.DEFAULT_LIMITS, typeof Declared.DEFAULT_LIMITS>,
  Same<typeof Source.LIMIT_RANGES, typeof Declared.LIMIT_RANGES>,
  Same<typeof Source.CODES, typeof Declared.CODES>,
] = [true, true, true, true, true, true, true];

function sh(cmd: string, args: string[], cwd: string): { code: number | null; out: string; err: string } {
  const r = spawnSync(cmd, args, { cwd, encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let project: string;
beforeAll(() => {
  if (!existsSync(join(ROOT, 'dist', 'engine.js'))) throw new Error('dist/engine.js is missing: run `npm run build` first');
  const tmp = mkdtempSync(join(tmpdir(), 'eigenspan-pack-'));
  const packed = sh('npm', ['pack', '--pack-destination', tmp, '--silent'], ROOT);
  if (packed.code !== 0) throw new Error(`npm pack: ${packed.err}`);
  const tarball = readdirSync(tmp).find((f) => f.endsWith('.tgz'))!;
  project = join(tmp, 'project');
  mkdirSync(project);
  writeFileSync(join(project, 'package.json'), JSON.stringify({ name: 'uses-eigenspan', version: '1.0.0', private: true }));
  const installed = sh('npm', ['install', '--offline', '--no-audit', '--no-fund', join(tmp, tarball)], project);
  if (installed.code !== 0) throw new Error(`npm install: ${installed.err}`);
}, 120_000);

describe('eigenspan/engine from a packed tarball', () => {
  it('declares exactly the names the bundle exports', () => {
    expect(agree.every(Boolean)).toBe(true);
    const declared = [...readFileSync(join(ROOT, 'types', 'engine.d.ts'), 'utf8').matchAll(/^export declare (?:const|function) (\w+)/gm)].map((m) => m[1]).sort();
    const script = "console.log(JSON.stringify(Object.keys(require('eigenspan/engine')).sort()))";
    const r = sh(process.execPath, ['-e', script], project);
    expect(r.err).toBe('');
    expect(JSON.parse(r.out)).toEqual(declared);
  });

  it('analyses a text through require("eigenspan/engine")', () => {
    const script = `
      const { analyse, CODES, DEFAULT_LIMITS } = require('eigenspan/engine');
      const r = analyse('system box(0, 1)\\nstate psi(x) = sqrt(30) x * (1 - x)\\nbasis 10\\nexpect energy 4 +- 0.1\\n');
      let refused = null;
      try { analyse('', { limits: { maxBasis: 0 } }); } catch (e) { refused = e.constructor.name; }
      console.log(JSON.stringify({ w1: r.levels[0].weight, mean: r.energy.mean, parity: r.parity, d: r.diagnostics, codes: CODES, basis: DEFAULT_LIMITS.maxBasis, refused }));`;
    const r = sh(process.execPath, ['-e', script], project);
    expect(r.err).toBe('');
    const j = JSON.parse(r.out);
    expect(Math.abs(j.w1 - 960 / Math.PI ** 6)).toBeLessThan(1e-9);
    expect(j.mean).toBeCloseTo(5, 6);
    expect(j.parity).toBe('even');
    const failed = j.d.find((d: { code: string }) => d.code === 'expect');
    expect(failed).toMatchObject({ line: 4, column: 1, severity: 'error' });
    expect(j.codes.expect).toBe('error');
    expect(j.codes.parity).toBe('info');
    expect(j.basis).toBeGreaterThan(0);
    expect(j.refused).toBe('RangeError');
  });

  it('ships the declarations: a TypeScript user compiles against them, and a wrong call does not compile', () => {
    const tsc = join(ROOT, 'node_modules', 'typescript', 'bin', 'tsc');
    const flags = ['--noEmit', '--strict', '--module', 'node16', '--moduleResolution', 'node16'];
    writeFileSync(join(project, 'good.ts'), [
      "import { analyse, type EngineResult } from 'eigenspan/engine';",
      "const r: EngineResult = analyse('system box(0, 1)', { defaultBasis: 8, limits: { maxMillis: 1000 } });",
      'const mean: number | null = r.energy.mean;',
      'const code: string = r.diagnostics[0]?.code ?? "none";',
      'export const shown = [mean, code];',
    ].join('\n'));
    const good = sh(process.execPath, [tsc, ...flags, 'good.ts'], project);
    expect(good.out + good.err).toBe('');
    expect(good.code).toBe(0);
    writeFileSync(join(project, 'bad.ts'), "import { analyse } from 'eigenspan/engine';\nexport const r: string = analyse(42).parity;\n");
    const bad = sh(process.execPath, [tsc, ...flags, 'bad.ts'], project);
    expect(bad.code).not.toBe(0);
    expect(bad.out).toMatch(/bad\.ts\(2,\d+\): error TS2345/);
  });
});
