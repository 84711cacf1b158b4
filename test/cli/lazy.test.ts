/**
 * What a fresh command-line process loads, counted (never timed): a preload records every module request
 * the process makes. `expand` loads its one bundle and built-in modules only; the drawing half
 * (dist/plot.js), check's report writers (dist/reports.js) and git's process runner (node:child_process)
 * load only for the commands that need them;
 * the parser part of mathjs is all of mathjs in the bundle; and the build's code cache of the bundle is
 * one this node accepts (docs/performance.md, start-up).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { builtinModules } from 'node:module';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ROOT = join(__dirname, '..', '..');
const CLI = join(ROOT, 'dist', 'cli.js');
/** The bundle the bin (a loader, server/src/cli/loader.ts) runs through V8's code cache. */
const MAIN = join(ROOT, 'dist', 'cli-main.js');
/** The parabola state x(1 - x) in a box (closed-form coefficients; a file every command accepts). */
const PARABOLA = 'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\n';

let dir: string;
let src: string;
let preload: string;
const log = () => join(dir, 'modules.json');
beforeAll(() => {
  if (!existsSync(CLI)) throw new Error('dist/cli.js is missing: run `npm run build` first');
  dir = mkdtempSync(join(tmpdir(), 'eigenspan-lazy-'));
  src = join(dir, 'lazy.qstate');
  writeFileSync(src, PARABOLA);
  preload = join(dir, 'trace.cjs');
  writeFileSync(
    preload,
    `const M = require('module'); const seen = []; const load = M._load;
M._load = function (req, ...rest) { seen.push(req); return load.call(this, req, ...rest); };
process.on('exit', () => require('fs').writeFileSync(${JSON.stringify(log())}, JSON.stringify(seen)));\n`,
  );
});

/** Every module request of one run of the command line (the main script's own path included). */
function loaded(args: string[], code = 0): string[] {
  const r = spawnSync(process.execPath, ['--require', preload, CLI, ...args], { encoding: 'utf8', cwd: dir });
  expect(r.status, r.stderr).toBe(code);
  return JSON.parse(readFileSync(log(), 'utf8')) as string[];
}

const builtin = (req: string) => req.startsWith('node:') || builtinModules.includes(req);

describe('a fresh process loads only what its command needs', () => {
  it('expand loads its own bundle and built-in modules, nothing else', () => {
    // The loader compiles dist/cli-main.js itself (node:vm), so the one file module is the bin.
    const mods = loaded(['expand', src, '--json']);
    expect(mods.filter((m) => !builtin(m))).toEqual([CLI]);
    expect(mods).toContain('node:vm');
    // git's process runner (node:child_process, with node:net behind it) is for `diff --rev` only.
    expect(mods).not.toContain('node:child_process');
    expect(loaded(['check', src])).not.toContain('node:child_process');
  });

  it('check loads the report writers only when a report is asked for', () => {
    expect(loaded(['check', src])).not.toContain('./reports.js');
    const mods = loaded(['check', src, '--sarif', join(dir, 'out.sarif'), '--junit', join(dir, 'out.xml')]);
    expect(mods.filter((m) => m === './reports.js')).toHaveLength(1);
    expect(mods).not.toContain('./plot.js');
    expect(JSON.parse(readFileSync(join(dir, 'out.sarif'), 'utf8')).version).toBe('2.1.0');
  });

  it('plot loads the drawing bundle; summary loads neither bundle', () => {
    expect(loaded(['plot', src, '--svg', join(dir, 'lazy.svg')])).toContain('./plot.js');
    const mods = loaded(['summary', src]);
    expect(mods).not.toContain('./plot.js');
    expect(mods).not.toContain('./reports.js');
  });

  it('carries only the parser part of mathjs in the command line bundle', () => {
    // esbuild names each bundled input in a comment (development build); the full mathjs pulls in these.
    const text = readFileSync(MAIN, 'utf8');
    const full = ['decimal.js', 'complex.js', 'fraction.js', 'seedrandom', 'mathjs/lib/esm/function/arithmetic/', 'mathjs/lib/esm/function/matrix/', 'mathjs/lib/esm/type/matrix/'];
    for (const lib of full) expect(text).not.toContain(`// node_modules/${lib}`);
    expect(text).toContain('node_modules/mathjs/lib/esm/expression/parse.js');
  });

  it('ships a code cache of the bundle, named by the bundle\'s build id, that this node accepts', () => {
    // The loader's pairing: the bundle ends with its build id, the cache is dist/cli-main.ID.cache.
    const id = /\/\/ eigenspan-build ([0-9a-f]+)\s*$/.exec(readFileSync(MAIN, 'utf8'))?.[1];
    expect(id).toMatch(/^[0-9a-f]{16}$/);
    const cache = join(ROOT, 'dist', `cli-main.${id}.cache`);
    expect(existsSync(cache)).toBe(true);
    // V8's own check (Node's vm docs: cachedDataRejected): this node accepts the cache for this source.
    const probe = (tail: string) => `const { Script } = require('node:vm'); const { wrap } = require('node:module'); const fs = require('node:fs');
const s = new Script(wrap(fs.readFileSync(${JSON.stringify(MAIN)}, 'utf8')${tail}), { filename: ${JSON.stringify(MAIN)}, cachedData: fs.readFileSync(${JSON.stringify(cache)}) });
process.stdout.write(String(s.cachedDataRejected));`;
    const r = spawnSync(process.execPath, ['-e', probe('')], { encoding: 'utf8' });
    expect(r.stdout, r.stderr).toBe('false');
    // V8 compares only the source's length: longer source is refused, which is why the build id pairs them.
    expect(spawnSync(process.execPath, ['-e', probe(" + ';0'")], { encoding: 'utf8' }).stdout).toBe('true');
  });
});
