/**
 * What a fresh command-line process loads, counted (never timed): a preload records every module request
 * the process makes. `expand` loads its one bundle and built-in modules only; the drawing half
 * (dist/plot.js) and check's report writers (dist/reports.js) load only for the commands that need them;
 * and the parser part of mathjs is all of mathjs in the bundle (docs/performance.md, start-up).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { builtinModules } from 'node:module';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ROOT = join(__dirname, '..', '..');
const CLI = join(ROOT, 'dist', 'cli.js');
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
    const mods = loaded(['expand', src, '--json']);
    expect(mods.filter((m) => !builtin(m))).toEqual([CLI]);
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
    const text = readFileSync(CLI, 'utf8');
    const full = ['decimal.js', 'complex.js', 'fraction.js', 'seedrandom', 'mathjs/lib/esm/function/arithmetic/', 'mathjs/lib/esm/function/matrix/', 'mathjs/lib/esm/type/matrix/'];
    for (const lib of full) expect(text).not.toContain(`// node_modules/${lib}`);
    expect(text).toContain('node_modules/mathjs/lib/esm/expression/parse.js');
  });
});
