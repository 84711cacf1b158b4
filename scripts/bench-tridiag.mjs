#!/usr/bin/env node
// The dense eigen-solver's large-grid cost, this checkout against an older tree, interleaved in one
// process: (1) the Householder reduction alone (householderTridiagonalize) on a random symmetric matrix
// of each order, (2) the back-transform alone of k = n/2 vectors, (3) potentialBasis of V = x^2 (m = 1/2,
// E_n = 2n + 1) for the lowest N levels with the walls of bench/scaling.ts (1.2 sqrt(2N + 1) + 5) and the
// caps out of the way. Each row alternates old and new run by run; medians of wall and process CPU time,
// with the load average beside each row (the machine is shared: read slow figures in that light).
// Usage: node scripts/bench-tridiag.mjs [--old REV|DIR] [--orders 400,800,1600] [--levels 400,800,1600]
//        [--reps 3] [--skip reduction,back,basis]
import { build } from 'esbuild';
import { execSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir, loadavg } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const args = process.argv.slice(2);
const opt = (name, dflt) => {
  const i = args.indexOf(name);
  return i >= 0 && args[i + 1] !== undefined ? args[i + 1] : dflt;
};
const list = (s) => (s ? s.split(',').filter(Boolean).map(Number) : []);
const orders = list(opt('--orders', '400,800,1600'));
const levelsList = list(opt('--levels', '400,800,1600'));
const reps = Number(opt('--reps', 3));
const skip = new Set(opt('--skip', '').split(','));

const work = mkdtempSync(join(tmpdir(), 'eigenspan-tridiag-'));
function oldTree() {
  const old = opt('--old', null);
  if (old && existsSync(old)) return resolve(old);
  const rev = old ?? execSync('git merge-base HEAD main', { encoding: 'utf8' }).trim();
  const dir = join(work, 'old');
  execSync(`mkdir -p ${dir} && git archive ${rev} server | tar -x -C ${dir}`);
  console.log(`old tree: ${rev}`);
  return dir;
}

async function load(root, name) {
  const out = join(work, `${name}.mjs`);
  await build({
    stdin: {
      contents:
        "export { potentialBasis } from './server/src/physics/potential';\n" +
        "export { householderTridiagonalize, backTransformAll } from './server/src/physics/tridiag';\n",
      resolveDir: root,
      loader: 'ts',
    },
    bundle: true,
    platform: 'node',
    format: 'esm',
    outfile: out,
    logLevel: 'warning',
  });
  return import(pathToFileURL(out).href);
}

const trees = { old: await load(oldTree(), 'old'), new: await load(process.cwd(), 'new') };
rmSync(work, { recursive: true, force: true });

/** Deterministic random symmetric matrix (full storage) of order n. */
function randomSymmetric(n, seed = 7) {
  let s = seed;
  const r = () => ((s = (s * 1103515245 + 12345) % 2147483648), s / 2147483648 - 0.5);
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) A[i * n + j] = A[j * n + i] = r();
  return A;
}

function timed(fn) {
  const c = process.cpuUsage();
  const t = performance.now();
  const result = fn();
  const wall = performance.now() - t;
  const d = process.cpuUsage(c);
  return { wall, cpu: (d.user + d.system) / 1000, result };
}
const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const ms = (x) => (x >= 100 ? x.toFixed(0) : x.toFixed(1));

/** Runs `make(tree)` (which returns the job) old, new, old, new, ...; prints medians and new/old. */
function row(label, make, check) {
  const runs = { old: [], new: [] };
  const results = {};
  const load0 = loadavg()[0];
  for (let r = 0; r < reps; r++) {
    for (const name of r % 2 === 0 ? ['old', 'new'] : ['new', 'old']) {
      const job = make(trees[name]);
      const t = timed(job);
      runs[name].push(t);
      results[name] = t.result;
    }
  }
  const load1 = loadavg()[0];
  const o = { wall: median(runs.old.map((t) => t.wall)), cpu: median(runs.old.map((t) => t.cpu)) };
  const w = { wall: median(runs.new.map((t) => t.wall)), cpu: median(runs.new.map((t) => t.cpu)) };
  console.log(
    `| ${label} | ${ms(o.cpu)} (${ms(o.wall)}) | ${ms(w.cpu)} (${ms(w.wall)}) | ${(w.cpu / o.cpu).toFixed(2)} | ${check(results.old, results.new)} | ${load0.toFixed(1)}-${load1.toFixed(1)} |`,
  );
}

console.log(`${reps} runs a side, interleaved; CPU ms (wall ms); load = 1-minute average before-after the row`);
console.log('| job | old | new | new/old CPU | check | load |');
console.log('|---|---|---|---|---|---|');

if (!skip.has('reduction')) {
  for (const n of orders) {
    const A = randomSymmetric(n);
    row(
      `reduction, random symmetric n = ${n}`,
      (t) => {
        const copy = A.slice();
        return () => t.householderTridiagonalize(copy, n);
      },
      (a, b) => {
        // Same spectrum: the traces of T and T^2 (sum d, sum d^2 + 2 sum e^2) agree to rounding.
        const tr2 = (r) => r.d.reduce((s, x) => s + x * x, 0) + 2 * r.e.reduce((s, x) => s + x * x, 0);
        return `tr T^2 rel. diff ${(Math.abs(tr2(a) - tr2(b)) / tr2(a)).toExponential(1)}`;
      },
    );
  }
}

if (!skip.has('back')) {
  for (const n of orders) {
    const red = trees.new.householderTridiagonalize(randomSymmetric(n), n);
    const k = Math.floor(n / 2);
    const Y = randomSymmetric(n, 11).subarray(0, k * n);
    row(
      `back-transform, n = ${n}, ${k} vectors`,
      (t) => {
        const copy = Y.slice();
        return () => (t.backTransformAll(red, copy, k), copy);
      },
      (a, b) => {
        let worst = 0;
        for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
        return `max diff ${worst.toExponential(1)}`;
      },
    );
  }
}

if (!skip.has('basis')) {
  for (const N of levelsList) {
    const wall = 1.2 * Math.sqrt(2 * N + 1) + 5;
    row(
      `potentialBasis, x^2, ${N} levels`,
      (t) => () => t.potentialBasis((xs) => xs.map((x) => x * x), -wall, wall, 0.5, N, { maxWork: 1e13, maxPoints: 1e5 }),
      (a, b) => {
        const worst = (p) => {
          let w = 0;
          for (let k = 0; k < N; k++) w = Math.max(w, Math.abs(p.basis.energies[k] - (2 * k + 1)) / (2 * k + 1));
          return w.toExponential(1);
        };
        return `grids ${a.sizes.join('+')} / ${b.sizes.join('+')}; worst rel. err vs 2n+1 ${worst(a)} / ${worst(b)}`;
      },
    );
  }
}
