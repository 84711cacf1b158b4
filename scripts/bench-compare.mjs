// Old against new: the benchmark rows of two checkouts interleaved in one run (old rep, new rep, ...),
// each row's medians over the reps and the ratio new/old.
//
//   node scripts/bench-compare.mjs OLD_CHECKOUT NEW_CHECKOUT [--reps 9] [--inner-reps 3] [--warmup-ms 300] [--rows 1,4,6,cli] [--build] [--json OUT] [--partial OUT]
//
// Each checkout is driven only through its own files, so the two may have different module layouts:
// - its own bench suite: CHECKOUT/bench/suite.ts (whatever it imports inside that checkout) is bundled
//   with esbuild, resolving inside that checkout and its node_modules, into a script that runs
//   `runSuite({ reps: 3, only: [item] })` once in a fresh process; one process is one rep of the rows of
//   that item, old and new alternating item by item (a row's figure in a rep is the suite's own median of that pass after its own warm-up run: of 3
//   samples, 9 for sub-ms jobs; --inner-reps N asks the suite for N: 1 is quicker but leaves sub-ms
//   jobs barely past the JIT's warm-up); both sides are bundled with THIS tree's bench/stats.ts (one
//   stopwatch), and every job is first run untimed for --warmup-ms (default 300) milliseconds, so a
//   sub-millisecond job is timed after V8 has optimised it, not while (EIGENSPAN_BENCH_WARMUP_MS);
// - its own dist/cli.js: `node dist/cli.js expand examples/NAME --json` per example (the fixed command
//   line of FORMAT.md), timed from here around spawnSync: rows `cli ...`.
// Rows are matched by item and job text; a row only one side has is listed apart.
// --rows takes suite items (1..8) and `cli`; the suite skips the other items (a suite older than its
// `only` option gets the one skipping line put into its step helper at bundle time). Item 7 (language
// server) is always skipped: the suite sees the checkout through a folder without bench/lsp.mjs.
// --build runs `npm run build` in both checkouts first (default: use their dist/, build only when
// dist/cli.js is missing). Each checkout needs its node_modules (npm ci). Defaults: --reps 9, all rows.
// A full pass of every item takes minutes on a loaded 2-core machine: 9 reps a side of everything is
// of the order of an hour (several hours under a load of 20); --rows 1,2,4,6,cli is the quick set.
// --partial OUT writes the table of the reps finished so far to OUT after every rep (and --json its
// JSON), so a run stopped early still leaves its figures; the log names each unit's time.
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const MARK = '@@bench-compare@@';

function parseArgs(argv) {
  const out = { dirs: [], reps: 9, innerReps: 3, warmupMs: 300, rows: null, build: false, json: null, partial: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--reps') out.reps = Math.max(1, Number(argv[++i]));
    else if (a === '--inner-reps') out.innerReps = Math.max(1, Number(argv[++i]));
    else if (a === '--warmup-ms') out.warmupMs = Math.max(0, Number(argv[++i]));
    else if (a === '--rows') out.rows = argv[++i].split(',').filter((s) => s !== '');
    else if (a === '--build') out.build = true;
    else if (a === '--json') out.json = argv[++i];
    else if (a === '--partial') out.partial = argv[++i];
    else if (a.startsWith('--')) throw new Error(`unknown option ${a}`);
    else out.dirs.push(resolve(a));
  }
  if (out.dirs.length !== 2) throw new Error('usage: node scripts/bench-compare.mjs OLD_CHECKOUT NEW_CHECKOUT [--reps 9] [--inner-reps 3] [--rows 1,4,6,cli] [--build] [--json OUT] [--partial OUT]');
  if (!Number.isFinite(out.reps)) throw new Error('--reps needs a number');
  return out;
}

const log = (line) => process.stderr.write(`bench-compare: ${line}\n`);

/** Builds the checkout's dist/ when asked or when dist/cli.js is missing. */
function ensureBuilt(dir, force) {
  if (!existsSync(join(dir, 'node_modules'))) throw new Error(`${dir} has no node_modules: run npm ci there first`);
  if (!force && existsSync(join(dir, 'dist', 'cli.js'))) return;
  log(`building ${dir}`);
  const r = spawnSync('npm', ['run', 'build'], { cwd: dir, stdio: ['ignore', 'ignore', 'inherit'] });
  if (r.status !== 0) throw new Error(`npm run build failed in ${dir}`);
}

/** A folder that shows the checkout without bench/lsp.mjs (so the suite skips the language-server item). */
function viewWithoutLsp(dir, tmp, name) {
  const view = join(tmp, `${name}-root`);
  rmSync(view, { recursive: true, force: true });
  spawnSync('mkdir', ['-p', join(view, 'bench')]);
  for (const entry of readdirSync(dir)) if (entry !== 'bench') symlinkSync(join(dir, entry), join(view, entry));
  for (const entry of readdirSync(join(dir, 'bench'))) if (entry !== 'lsp.mjs') symlinkSync(join(dir, 'bench', entry), join(view, 'bench', entry));
  return view;
}

/**
 * Suites written before the `only` option get it at bundle time: the one line that skips an item is
 * put at the top of their `step` helper (if the helper is not found, the suite runs every item and the
 * table leaves the others out).
 */
export function injectOnly(text) {
  const step = /(const step = \(name: string, f: \(\) => void\) => \{)/;
  if (text.includes('options.only') || !step.test(text)) return text;
  return text.replace(step, '$1\n    const only = (options as { only?: number[] }).only;\n    if (only && !only.includes(Number.parseInt(name, 10))) return;');
}

const onlyPlugin = {
  name: 'bench-compare-only',
  setup(b) {
    b.onLoad({ filter: /[\\/]bench[\\/]suite\.ts$/ }, (args) => ({ contents: injectOnly(readFileSync(args.path, 'utf8')), loader: 'ts' }));
  },
};

/** This tree's timing helpers (bench/stats.ts), which both checkouts' suites are bundled with. */
export const HARNESS = fileURLToPath(new URL('../bench/stats.ts', import.meta.url));

/**
 * One stopwatch for both sides: the suite's `./stats` import resolves to this tree's bench/stats.ts
 * in both checkouts, so old and new are timed by the same warm-up, batching and summary (an older
 * stats.ts timed sub-millisecond jobs after a single warm-up run, while V8 was still optimising them).
 * The harness must export every name the older suite imports from it (it has only grown).
 */
const harnessPlugin = {
  name: 'bench-compare-harness',
  setup(b) {
    b.onResolve({ filter: /^\.\/stats(\.ts)?$/ }, (args) => (/[\\/]bench$/.test(args.resolveDir) ? { path: HARNESS } : undefined));
  },
};

/** Bundles the checkout's own bench/suite.ts into a script that runs one suite pass and prints it. */
export async function bundleWorker(dir, tmp, name) {
  if (!existsSync(join(dir, 'bench', 'suite.ts'))) return null;
  const outfile = join(tmp, `${name}-worker.cjs`);
  const contents = [
    "import { runSuite } from './bench/suite';",
    'const req = JSON.parse(process.argv[2]);',
    'let out;',
    'try { out = { result: runSuite(req) }; } catch (err) { out = { error: String((err && err.stack) || err) }; }',
    `process.stdout.write(${JSON.stringify(MARK)} + JSON.stringify(out) + "\\n");`,
  ].join('\n');
  await build({
    stdin: { contents, resolveDir: dir, loader: 'ts', sourcefile: 'bench-compare-worker.ts' },
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    outfile,
    external: ['esbuild'],
    plugins: [onlyPlugin, harnessPlugin],
    logLevel: 'error',
  });
  return outfile;
}

/** One suite pass in a fresh process (no heap or JIT state carried from pass to pass or side to side). */
export function suitePass(file, cwd, req, warmupMs = 0) {
  const env = { ...process.env, EIGENSPAN_BENCH_WARMUP_MS: String(warmupMs) };
  const r = spawnSync(process.execPath, [file, JSON.stringify(req)], { cwd, env, encoding: 'utf8', maxBuffer: 1 << 28, stdio: ['ignore', 'pipe', 'inherit'] });
  const line = (r.stdout ?? '').split('\n').find((l) => l.startsWith(MARK));
  if (!line) throw new Error(`the suite of ${cwd} printed no result (exit ${r.status ?? r.signal})`);
  const out = JSON.parse(line.slice(MARK.length));
  if (out.error) throw new Error(`the suite of ${cwd} failed: ${out.error}`);
  return out.result;
}

/** Figures of one suite pass by row key: the row's median, its warm median, each scaling point. */
export function figures(result) {
  const out = new Map();
  for (const row of result.rows ?? []) {
    const key = `[${row.item}] ${row.job}`;
    if (row.timing) out.set(key, { ms: row.timing.median, accuracy: row.accuracy?.value ?? null });
    if (row.warm) out.set(`${key} (warm)`, { ms: row.warm.median, accuracy: null });
  }
  for (const s of result.scaling ?? []) {
    s.sizes.forEach((size, i) => out.set(`[${s.item}] scaling: ${s.what}, ${s.sizeName} ${size}`, { ms: s.times[i], accuracy: null }));
  }
  return out;
}

function itemOf(key) {
  const m = /^\[(\d+)\]/.exec(key);
  return m ? Number(m[1]) : null;
}

function examplesOf(dirs) {
  const lists = dirs.map((d) => (existsSync(join(d, 'examples')) ? readdirSync(join(d, 'examples')).filter((f) => f.endsWith('.qstate')) : []));
  return lists[0].filter((f) => lists[1].includes(f)).sort();
}

/** One rep of the whole-process rows for one checkout. */
function cliPass(dir, examples) {
  const out = new Map();
  for (const name of examples) {
    const t0 = performance.now();
    const r = spawnSync(process.execPath, [join(dir, 'dist', 'cli.js'), 'expand', join('examples', name), '--json'], { cwd: dir, encoding: 'utf8', maxBuffer: 1 << 28 });
    const ms = performance.now() - t0;
    let errors = null;
    try {
      errors = JSON.parse(r.stdout).diagnostics.filter((d) => d.severity === 'error').length;
    } catch {
      errors = null;
    }
    out.set(`cli expand examples/${name} --json`, { ms, accuracy: errors });
  }
  return out;
}

function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length === 0 ? NaN : s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

function quartiles(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const q = (p) => {
    const pos = (s.length - 1) * p;
    const lo = Math.floor(pos);
    return s[lo] + (s[Math.ceil(pos)] - s[lo]) * (pos - lo);
  };
  return [q(0.25), q(0.75)];
}

const fmt = (t) => (!Number.isFinite(t) ? '-' : t >= 100 ? t.toFixed(0) : t >= 1 ? t.toFixed(2) : t.toFixed(3));
const sci = (v) => (v === null || v === undefined || !Number.isFinite(v) ? '-' : v === 0 ? '0' : Math.abs(v) >= 1 && Number.isInteger(v) ? String(v) : v.toExponential(1));

/** The table: per row old and new medians [IQR], new/old, and the accuracy (or error count) of each side. */
export function report(header, samples, keys) {
  const out = [...header, '', 'Times in ms: median [q1-q3] over the reps; ratio = new median / old median (< 1: new is faster).', ''];
  out.push('| row | old | new | new/old | old accuracy | new accuracy |', '|---|---|---|---|---|---|');
  const rows = [];
  const only = [];
  for (const key of keys) {
    const [a, b] = samples.map((s) => s.get(key));
    if (!a || !b) {
      only.push(`${key}: only in the ${a ? 'old' : 'new'} checkout`);
      continue;
    }
    const [ma, mb] = [median(a.ms), median(b.ms)];
    const [qa, qb] = [quartiles(a.ms), quartiles(b.ms)];
    const ratio = mb / ma;
    rows.push({ key, old: { median: ma, q1: qa[0], q3: qa[1], runs: a.ms.length, accuracy: a.accuracy }, new: { median: mb, q1: qb[0], q3: qb[1], runs: b.ms.length, accuracy: b.accuracy }, ratio });
    out.push(`| ${key} | ${fmt(ma)} [${fmt(qa[0])}-${fmt(qa[1])}] (${a.ms.length}) | ${fmt(mb)} [${fmt(qb[0])}-${fmt(qb[1])}] (${b.ms.length}) | ${ratio.toFixed(3)} | ${sci(a.accuracy)} | ${sci(b.accuracy)} |`);
  }
  const worst = rows.reduce((w, r) => (r.ratio > w.ratio ? r : w), { ratio: -Infinity, key: '-' });
  out.push('', `rows: ${rows.length}; largest new/old ${worst.ratio.toFixed(3)} (${worst.key}); rows over 1.1: ${rows.filter((r) => r.ratio > 1.1).length}`);
  if (only.length) out.push('', ...only);
  out.push('', 'cli rows: accuracy = number of error diagnostics in the JSON (failed expect lines count as errors).');
  return { text: out.join('\n'), rows };
}

function collect(store, pass) {
  for (const [key, v] of pass) {
    const s = store.get(key) ?? { ms: [], accuracy: v.accuracy };
    s.ms.push(v.ms);
    s.accuracy = v.accuracy;
    store.set(key, s);
  }
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  const tmp = mkdtempSync(join(tmpdir(), 'eigenspan-compare-'));
  const names = ['old', 'new'];
  const workers = [];
  try {
    args.dirs.forEach((d) => ensureBuilt(d, args.build));
    const wantCli = !args.rows || args.rows.includes('cli');
    const items = args.rows ? args.rows.filter((r) => /^\d+$/.test(r)).map(Number).filter((n) => n !== 7) : [1, 2, 3, 4, 5, 6, 8];
    for (let i = 0; i < 2; i++) {
      const file = items.length ? await bundleWorker(args.dirs[i], tmp, names[i]) : null;
      if (items.length && !file) log(`${args.dirs[i]} has no bench/suite.ts: only the cli rows for it`);
      workers.push(file);
    }
    const views = args.dirs.map((d, i) => viewWithoutLsp(d, tmp, names[i]));
    const examples = wantCli ? examplesOf(args.dirs) : [];
    const samples = [new Map(), new Map()];
    const keys = [];
    const remember = (pass) => pass.forEach((_, k) => keys.includes(k) || keys.push(k));
    const t0 = performance.now();
    // Interleaved finely: for every suite item, the old checkout's pass then the new one's, and for every
    // example, the old cli then the new, so a burst of load on the shared machine hits both sides alike.
    const units = [...items.map((item) => ({ item })), ...examples.map((name) => ({ name }))];
    const loads = [];
    const write = (done, final) => {
      const r = report(headerOf(args, items, wantCli, done, loads), samples, keys);
      if (final) process.stdout.write(r.text + '\n');
      if (args.partial && !final) writeFileSync(args.partial, r.text + '\n');
      if (args.json) writeFileSync(args.json, JSON.stringify({ header: headerOf(args, items, wantCli, done, loads), rows: r.rows }, null, 2) + '\n');
    };
    for (let rep = -1; rep < args.reps; rep++) {
      for (const unit of units) {
        if (unit.item !== undefined && rep < 0) continue; // every suite row warms itself up inside the suite
        for (let i = 0; i < 2; i++) {
          const u0 = performance.now();
          const pass = new Map();
          if (unit.item !== undefined) {
            if (!workers[i]) continue;
            for (const [k, v] of figures(suitePass(workers[i], args.dirs[i], { root: views[i], reps: args.innerReps, only: [unit.item] }, args.warmupMs))) if (itemOf(k) === unit.item) pass.set(k, v);
          } else for (const [k, v] of cliPass(args.dirs[i], [unit.name])) pass.set(k, v);
          if (rep >= 0) collect(samples[i], pass); // rep -1 warms the cli rows up and is not counted
          remember(pass);
          if (rep >= 0 && unit.item !== undefined) log(`rep ${rep + 1} item ${unit.item} ${names[i]}: ${((performance.now() - u0) / 1000).toFixed(0)} s`);
        }
      }
      if (rep >= 0) loads.push(loadavg()[0]);
      log(`${rep < 0 ? 'warm-up' : `rep ${rep + 1}/${args.reps}`} done, ${((performance.now() - t0) / 1000).toFixed(0)} s, load ${loadavg().map((v) => v.toFixed(1)).join(' ')}`);
      if (rep >= 0) write(rep + 1, false);
    }
    write(args.reps, true);
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

function headerOf(args, items, wantCli, done, loads) {
  const range = loads.length ? ` (1-minute load at the end of each rep: ${Math.min(...loads).toFixed(1)} to ${Math.max(...loads).toFixed(1)})` : '';
  return [
    `Old against new, ${new Date().toISOString()}, node ${process.version}, ${cpus().length} x ${cpus()[0]?.model ?? 'unknown'}, load average now ${loadavg().map((v) => v.toFixed(1)).join(' ')}${range}`,
    `old: ${args.dirs[0]} (${gitHead(args.dirs[0])})`,
    `new: ${args.dirs[1]} (${gitHead(args.dirs[1])})`,
    `interleaved per item and per example: old, new, old, new, ... ${done} of ${args.reps} reps each (a suite item in a fresh process, ${args.innerReps} run(s) a job inside it after ${args.warmupMs} ms of untimed warm-up, both sides timed by this tree's bench/stats.ts) after one warm-up of the cli rows; items ${items.join(', ') || 'none'}${wantCli ? ', cli' : ''}`,
  ];
}

function gitHead(dir) {
  const r = spawnSync('git', ['-C', dir, 'log', '-1', '--format=%h %s'], { encoding: 'utf8' });
  return r.status === 0 ? r.stdout.trim().slice(0, 80) : 'not a git checkout';
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((err) => {
    const usage = /^(usage|unknown option|--reps)/.test(err?.message ?? '');
    log(usage ? err.message : (err?.stack ?? String(err)));
    process.exit(usage ? 2 : 1);
  });
}
