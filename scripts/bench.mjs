// The benchmark suite: bundles bench/main.ts (TypeScript sources of the engine) with esbuild to a
// temporary .cjs and runs it. Output: a table on stdout and bench/results.json.
// Options: --tiny (tiny sizes, one run each), --reps N, --only 1,4 (items of the suite). Run after `npm run build` (see package.json).
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const args = process.argv.slice(2);
const env = { ...process.env };
if (args.includes('--tiny')) env.EIGENSPAN_BENCH_TINY = '1';
const r = args.indexOf('--reps');
if (r >= 0 && args[r + 1]) env.EIGENSPAN_BENCH_REPS = args[r + 1];
const o = args.indexOf('--only');
if (o >= 0 && args[o + 1]) env.EIGENSPAN_BENCH_ONLY = args[o + 1];

const dir = mkdtempSync(join(tmpdir(), 'eigenspan-bench-'));
const out = join(dir, 'suite.cjs');
let status = 1;
try {
  await build({
    entryPoints: ['bench/main.ts'],
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    outfile: out,
    external: ['esbuild'],
    logLevel: 'warning',
  });
  const run = spawnSync(process.execPath, [out], { stdio: 'inherit', env, cwd: process.cwd() });
  status = run.status ?? 1;
} finally {
  rmSync(dir, { recursive: true, force: true });
}
process.exit(status);
