// The side-by-side benchmark against numpy/scipy: makes sure Debian's python3-numpy and python3-scipy
// are there for /usr/bin/python3 (apt-get installs them when missing; python3-threadpoolctl too, when it
// can, to name the BLAS kernel), bundles bench/anchor-main.ts with esbuild and runs it.
// Usage: npm run build && node scripts/bench-python.mjs [--reps 9] [--heavy-reps 5] [--rows id,id] [--json OUT]
// The tests never run this (test/bench/anchor.test.ts checks the engine's side without python).
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const args = process.argv.slice(2);
const p = args.indexOf('--python');
const python = p >= 0 && args[p + 1] ? args[p + 1] : '/usr/bin/python3';

const has = (mods) => spawnSync(python, ['-c', `import ${mods}`], { stdio: 'ignore' }).status === 0;

if (!has('numpy, scipy.linalg, scipy.fft, scipy.special')) {
  process.stderr.write('bench-python: numpy/scipy missing for ' + python + '; installing python3-numpy python3-scipy with apt-get\n');
  const r = spawnSync('sh', ['-c', 'apt-get update && apt-get install -y python3-numpy python3-scipy'], { stdio: 'inherit' });
  if (r.status !== 0 || !has('numpy, scipy.linalg, scipy.fft, scipy.special')) {
    process.stderr.write(
      `bench-python: cannot run: ${python} has no numpy/scipy and 'apt-get install -y python3-numpy python3-scipy' ` +
        `failed (exit ${r.status ?? r.signal}). Install them (as root) and run again.\n`,
    );
    process.exit(3);
  }
}
if (!has('threadpoolctl')) {
  // Optional: only names the BLAS kernel; numpy.show_config() stands in without it.
  spawnSync('sh', ['-c', 'apt-get install -y python3-threadpoolctl'], { stdio: 'ignore' });
}

const dir = mkdtempSync(join(tmpdir(), 'eigenspan-bench-python-'));
const out = join(dir, 'anchor.cjs');
let status = 1;
try {
  await build({
    entryPoints: ['bench/anchor-main.ts'],
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    outfile: out,
    logLevel: 'warning',
  });
  const run = spawnSync(process.execPath, [out, ...args], { stdio: 'inherit', cwd: process.cwd() });
  status = run.status ?? 1;
} finally {
  rmSync(dir, { recursive: true, force: true });
}
process.exit(status);
