// Old against new inside ONE process: both checkouts' engines bundled side by side and the same job
// timed on each in alternating blocks (old, new, new, old, ...), so the two share the machine's state,
// heap and timer, and the process-to-process spread of scripts/bench-compare.mjs drops out.
//
//   node scripts/bench-ab.mjs OLD_CHECKOUT NEW_CHECKOUT [--blocks 15] [--block-ms 20] [--warmup-ms 500] [--jobs a,b] [--json OUT]
//
// Jobs (by name; default all): box-200 and box-1000 (the sine transform of the packet of bench/suite.ts
// item 1, 2^12 and 2^14 samples), transform-N (its scaling table, N = 1,024 ... 262,144 samples), quartic-K, K = 10, 20, 50, 100 (potentialBasis of p^2 + x^4 on [-7, 7] at
// 1e-9, item 4), and for every example both checkouts have, `analyse` cold (memo of solved bases
// emptied before each call) and warm (item 6). Each job is warmed up untimed for --warmup-ms on each
// side, then each block runs it a whole number of times for about --block-ms and records the time
// per call; the table gives each side's median [q1-q3] over the blocks and new/old.
// Both checkouts need their node_modules (the engines are bundled with esbuild from their sources).
import { build } from 'esbuild';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

function parseArgs(argv) {
  const o = { dirs: [], blocks: 15, blockMs: 20, warmupMs: 500, jobs: null, json: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--blocks') o.blocks = Math.max(3, Number(argv[++i]));
    else if (a === '--block-ms') o.blockMs = Math.max(1, Number(argv[++i]));
    else if (a === '--warmup-ms') o.warmupMs = Math.max(0, Number(argv[++i]));
    else if (a === '--jobs') o.jobs = argv[++i].split(',').filter(Boolean);
    else if (a === '--json') o.json = argv[++i];
    else if (a.startsWith('--')) throw new Error(`unknown option ${a}`);
    else o.dirs.push(resolve(a));
  }
  if (o.dirs.length !== 2) throw new Error('usage: node scripts/bench-ab.mjs OLD_CHECKOUT NEW_CHECKOUT [--blocks 15] [--block-ms 20] [--warmup-ms 500] [--jobs a,b] [--json OUT]');
  return o;
}

/** One checkout's engine entry points, bundled from its own sources. */
async function engineOf(dir, tmp, name) {
  for (const f of ['server/src/analysis/index.ts', 'server/src/analysis/systems.ts', 'server/src/physics/dst.ts', 'server/src/physics/potential.ts']) {
    if (!existsSync(join(dir, f))) throw new Error(`${dir} has no ${f}`);
  }
  const contents = [
    "export { analyse } from './server/src/analysis/index';",
    "export { clearBasisMemo } from './server/src/analysis/systems';",
    "export { boxCoefficientsFromSamples } from './server/src/physics/dst';",
    "export { potentialBasis } from './server/src/physics/potential';",
  ].join('\n');
  const outfile = join(tmp, `${name}.mjs`);
  await build({ stdin: { contents, resolveDir: dir, loader: 'ts', sourcefile: `${name}-entry.ts` }, bundle: true, platform: 'node', target: 'node20', format: 'esm', outfile, logLevel: 'error' });
  return import(pathToFileURL(outfile).href);
}

/** The packet of the suite's item 1 on 2^log2N + 1 samples. */
function packetSamples(log2N) {
  const n = 1 << log2N;
  const re = new Float64Array(n + 1);
  const im = new Float64Array(n + 1);
  const s = 0.04;
  const norm = (2 * Math.PI * s * s) ** -0.25;
  for (let j = 0; j <= n; j++) {
    const x = j / n;
    const g = norm * Math.exp(-((x - 0.5) ** 2) / (4 * s * s));
    re[j] = g * Math.cos(150 * x);
    im[j] = g * Math.sin(150 * x);
  }
  return { re, im };
}

/** Every job as (engine) => () => result. */
function jobsFor(dirs) {
  const jobs = new Map();
  const small = packetSamples(12);
  const large = packetSamples(14);
  jobs.set('box-200', (e) => () => e.boxCoefficientsFromSamples(small.re, small.im, 0, 1, 200));
  jobs.set('box-1000', (e) => () => e.boxCoefficientsFromSamples(large.re, large.im, 0, 1, 1000));
  // The suite's scaling table of item 1: min(1000, N - 1) coefficients from N + 1 samples.
  for (const log2N of [10, 12, 14, 16, 18]) {
    const s = log2N === 12 ? small : log2N === 14 ? large : packetSamples(log2N);
    const count = Math.min(1000, (1 << log2N) - 1);
    jobs.set(`transform-${1 << log2N}`, (e) => () => e.boxCoefficientsFromSamples(s.re, s.im, 0, 1, count));
  }
  const quartic = (xs) => xs.map((x) => x ** 4);
  for (const k of [10, 20, 50, 100]) jobs.set(`quartic-${k}`, (e) => () => e.potentialBasis(quartic, -7, 7, 0.5, k, { tolerance: 1e-9 }));
  const lists = dirs.map((d) => readdirSync(join(d, 'examples')).filter((f) => f.endsWith('.qstate')));
  for (const name of lists[0].filter((f) => lists[1].includes(f)).sort()) {
    const text = readFileSync(join(dirs[1], 'examples', name), 'utf8');
    if (/^\s*sweep\b/m.test(text)) continue; // a sweep file's analyse is not the sweep: item 6 leaves them out too
    const base = name.replace(/\.qstate$/, '');
    jobs.set(`${base} cold`, (e) => () => {
      e.clearBasisMemo();
      return e.analyse(text);
    });
    // Warm as the suite's item 6 times it: the file after an edit that leaves the system alone.
    let edit = 0;
    jobs.set(`${base} warm`, (e) => () => e.analyse(`${text}\n# edit ${edit++}\n`));
  }
  return jobs;
}

/** Calls per block so a block lasts about blockMs (from the fastest of three single calls). */
function batchOf(f, blockMs) {
  let one = Infinity;
  for (let k = 0; k < 3; k++) {
    const t = performance.now();
    f();
    one = Math.min(one, performance.now() - t);
  }
  return Math.max(1, Math.min(100_000, Math.round(blockMs / Math.max(one, 1e-4))));
}

function warm(f, ms) {
  const t0 = performance.now();
  let n = 0;
  do {
    f();
    n++;
  } while (performance.now() - t0 < ms && n < 100_000);
}

function summary(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const q = (p) => {
    const pos = (s.length - 1) * p;
    const lo = Math.floor(pos);
    return s[lo] + (s[Math.ceil(pos)] - s[lo]) * (pos - lo);
  };
  return { median: q(0.5), q1: q(0.25), q3: q(0.75) };
}

const fmt = (t) => (t >= 100 ? t.toFixed(0) : t >= 1 ? t.toFixed(2) : t.toFixed(3));

async function main() {
  const o = parseArgs(process.argv.slice(2));
  const tmp = mkdtempSync(join(tmpdir(), 'eigenspan-ab-'));
  try {
    const engines = [await engineOf(o.dirs[0], tmp, 'old'), await engineOf(o.dirs[1], tmp, 'new')];
    const all = jobsFor(o.dirs);
    const names = o.jobs ?? [...all.keys()];
    const rows = [];
    const load0 = loadavg()[0];
    for (const name of names) {
      const make = all.get(name);
      if (!make) throw new Error(`no job ${name} (jobs: ${[...all.keys()].join(', ')})`);
      const fs = engines.map((e) => make(e));
      fs.forEach((f) => warm(f, o.warmupMs));
      const batches = fs.map((f) => batchOf(f, o.blockMs));
      const times = [[], []];
      for (let b = 0; b < o.blocks; b++) {
        for (const side of b % 2 === 0 ? [0, 1] : [1, 0]) {
          const f = fs[side];
          const t = performance.now();
          for (let k = 0; k < batches[side]; k++) f();
          times[side].push((performance.now() - t) / batches[side]);
        }
      }
      const [a, n] = times.map(summary);
      const row = { job: name, old: a, new: n, ratio: n.median / a.median, calls: batches };
      rows.push(row);
      process.stderr.write(`bench-ab: ${name}: ${fmt(a.median)} -> ${fmt(n.median)} ms (${row.ratio.toFixed(3)}), load ${loadavg()[0].toFixed(1)}\n`);
    }
    const out = [
      `Old against new in one process, ${new Date().toISOString()}, node ${process.version}, 1-minute load ${load0.toFixed(1)} at the start and ${loadavg()[0].toFixed(1)} at the end`,
      `old: ${o.dirs[0]}`,
      `new: ${o.dirs[1]}`,
      `${o.blocks} blocks a side of about ${o.blockMs} ms, alternating old/new, after ${o.warmupMs} ms of untimed warm-up a side; ms per call, median [q1-q3] over the blocks; ratio = new / old`,
      '',
      '| job | old | new | new/old |',
      '|---|---|---|---|',
      ...rows.map((r) => `| ${r.job} | ${fmt(r.old.median)} [${fmt(r.old.q1)}-${fmt(r.old.q3)}] | ${fmt(r.new.median)} [${fmt(r.new.q1)}-${fmt(r.new.q3)}] | ${r.ratio.toFixed(3)} |`),
    ];
    process.stdout.write(out.join('\n') + '\n');
    if (o.json) writeFileSync(o.json, JSON.stringify({ rows }, null, 2));
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

main().catch((e) => {
  process.stderr.write(`bench-ab: ${e.message}\n`);
  process.exit(1);
});
