// The scaling table (cost against N for the box, the oscillator, V(x) and the evolution, with fitted
// exponents beside the best known algorithm's): bundles bench/scaling-main.ts with esbuild and runs it.
// Usage: node scripts/bench-scaling.mjs [--quick] [--reps N] [--only id,id] [--json OUT]
// --quick takes about a minute on a quiet machine; the full table several minutes. The tests never run it.
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const dir = mkdtempSync(join(tmpdir(), 'eigenspan-bench-scaling-'));
const out = join(dir, 'scaling.cjs');
let status = 1;
try {
  await build({ entryPoints: ['bench/scaling-main.ts'], bundle: true, platform: 'node', target: 'node20', format: 'cjs', outfile: out, logLevel: 'warning' });
  status = spawnSync(process.execPath, [out, ...process.argv.slice(2)], { stdio: 'inherit', cwd: process.cwd() }).status ?? 1;
} finally {
  rmSync(dir, { recursive: true, force: true });
}
process.exit(status);
