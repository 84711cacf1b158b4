// Fuzzes the engine: parser, static stage, whole analysis and command line (`npm run fuzz`).
//
//   node scripts/fuzz.mjs [--cases N] [--seed S] [--budget MS] [--jobs J] [--spawn K] [--no-frames] [--wall]
//                         [--max-seconds S]
//
// Broken frames of the language server's stream are part of the mix (2 cases in 100, each spawning
// dist/server.js, which must answer after them or exit with a logged reason); --no-frames leaves them out.
// Cases are timed by the process's CPU time, and the whole analyses' 1.5 s time limit runs on it too, so
// a machine shared with other work does not fail cases that only waited for a core; --wall times them
// (and runs the limit) on the wall clock instead, as an editor or CI sees them. --max-seconds S stops the
// run after S seconds of wall time and reports the cases finished by then (marked partial): each child
// logs every case's outcome as it ends, so a run stopped early still says what failed.
// Defaults: 20,000 cases (1,000 when CI is set), seed from the clock, 2,000 ms per case, 2 jobs, 20
// spawned `dist/cli.js` runs. The harness (test/fuzz/harness.ts) is bundled with esbuild to a temporary
// file and run in child processes; each child writes the case it is on to a file first, so a case that
// hangs is caught by the watchdog here and saved like any other failure. Failing cases are saved to
// test/fixtures/fuzz/ as JSON, and test/fuzz/fuzz.test.ts replays them on every test run (a case saved for
// its time, "took N ms", replays as a whole analysis on a clock of counted work under a 30 ms limit: cheap,
// the same on any machine, and it must stop within a small overshoot of that limit).
import { build } from 'esbuild';
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const fixtures = join(root, 'test', 'fixtures', 'fuzz');

function flag(name, fallback) {
  const i = process.argv.indexOf(name);
  if (i < 0) return fallback;
  const v = Number(process.argv[i + 1]);
  if (!Number.isFinite(v)) {
    console.error(`fuzz: ${name} needs a number`);
    process.exit(2);
  }
  return v;
}

const ci = Boolean(process.env.CI);
const cases = flag('--cases', ci ? 1000 : 20000);
const seed = flag('--seed', ci ? 20261201 : Date.now() % 1e9);
const budget = flag('--budget', 2000);
const jobs = Math.max(1, flag('--jobs', 2));
const spawnRuns = flag('--spawn', ci ? 5 : 20);
const frames = !process.argv.includes('--no-frames');
const cpu = !process.argv.includes('--wall');
// A child that has not moved on to its next case for this long is hung: CPU time of the child when it
// can be read (Linux's /proc), so a loaded machine does not make a slow case look hung; wall time otherwise.
const hangMs = Math.max(30_000, 10 * budget);

/** CPU milliseconds the process `pid` has used (user and system), or null where /proc cannot say. */
function cpuMsOf(pid) {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // utime and stime are fields 14 and 15 of the line, in clock ticks (100 a second on Linux).
    return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100;
  } catch {
    return null;
  }
}

// Progress once a minute (cases started by each child), so a long run shows how far it got.
const progress = [];

const work = mkdtempSync(join(tmpdir(), 'eigenspan-fuzz-run-'));
const bundle = join(work, 'child.cjs');

// The child: runs its share of the cases, records the current case before each one, prints a report.
const childSource = `
import { runFuzz } from './test/fuzz/harness';
import { appendFileSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
const { cases, seed, budget, current, log, root, frames, cpu } = JSON.parse(process.env.EIGENSPAN_FUZZ ?? '{}');
const dir = join(root, 'examples');
const examples = readdirSync(dir).filter((f) => f.endsWith('.qstate')).map((f) => ({ name: f, text: readFileSync(join(dir, f), 'utf8') }));
const report = runFuzz({ cases, seed, budgetMs: budget, examples, frames, cpu, beforeCase: (c, i) => writeFileSync(current, JSON.stringify({ index: i, case: c })),
  afterCase: (c, i, problems, ms) => appendFileSync(log, JSON.stringify(problems.length > 0 ? { i, kind: c.kind, ms, problems, case: c } : { i, kind: c.kind, ms, origin: c.origin }) + '\\n') });
process.stdout.write(JSON.stringify(report));
`;
await build({
  stdin: { contents: childSource, resolveDir: root, loader: 'ts', sourcefile: 'fuzz-child.ts' },
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  outfile: bundle,
  logLevel: 'warning',
});

function runChild(j) {
  const share = Math.floor(cases / jobs) + (j < cases % jobs ? 1 : 0);
  const current = join(work, `current-${j}.json`);
  const log = join(work, `log-${j}.jsonl`);
  return new Promise((resolve) => {
    // Loaded with -e, not as the main module: the bundled command line runs itself when it is main.
    const env = { ...process.env, EIGENSPAN_ROOT: root, EIGENSPAN_FUZZ: JSON.stringify({ cases: share, seed: seed + j * 7919, budget, current, log, root, frames, cpu }) };
    const child = spawn(process.execPath, ['-e', `require(${JSON.stringify(bundle)})`], { stdio: ['ignore', 'pipe', 'inherit'], env });
    let out = '';
    let last = '';
    const clockOf = () => cpuMsOf(child.pid) ?? Date.now();
    let lastChange = clockOf();
    let lastWall = Date.now();
    child.stdout.on('data', (d) => (out += d));
    const watch = setInterval(() => {
      let now = '';
      try {
        now = readFileSync(current, 'utf8');
      } catch {
        // Not started yet.
      }
      if (now !== last) {
        last = now;
        lastChange = clockOf();
        lastWall = Date.now();
        try {
          progress[j] = JSON.parse(now).index + 1;
        } catch {
          // Half written.
        }
      } else if (clockOf() - lastChange > hangMs || Date.now() - lastWall > 20 * hangMs) {
        // (A child blocked without using the CPU, on a read say, is caught by the wall clock, 20 times later.)
        child.kill('SIGKILL');
      }
    }, 1000);
    children.push(child);
    child.on('close', (code, signal) => {
      clearInterval(watch);
      if (stopping) {
        resolve(partialReport(log));
        return;
      }
      if (code === 0) {
        resolve(JSON.parse(out));
        return;
      }
      // The child died or hung: the case it was on is the failure.
      let c = null;
      let done = 0;
      try {
        const cur = JSON.parse(readFileSync(current, 'utf8'));
        c = cur.case;
        done = cur.index;
      } catch {
        // No case recorded.
      }
      const why = signal === 'SIGKILL' ? `hung for more than ${hangMs} ms${cpuMsOf(process.pid) !== null ? ' of CPU time (or 20 times that of wall time)' : ''}` : `the process died (exit ${code}, signal ${signal})`;
      // The cases before the one it stopped on ran; their own failures went down with the worker.
      resolve({ cases: done, failures: c ? [{ case: c, problems: [why], ms: hangMs }] : [], slowest: { ms: 0, case: null }, slow: [], times: [], byKind: {}, totalMs: 0, died: `${why} after ${done} cases` });
    });
  });
}

/** The report of a child stopped by --max-seconds, from the outcomes it logged. */
function partialReport(log) {
  const r = { cases: 0, failures: [], slowest: { ms: 0, case: null }, slow: [], times: [], byKind: {}, totalMs: 0 };
  let lines = [];
  try {
    lines = readFileSync(log, 'utf8').split('\n').filter((l) => l.length > 0);
  } catch {
    // Nothing logged yet.
  }
  for (const line of lines) {
    let x;
    try {
      x = JSON.parse(line);
    } catch {
      continue;
    }
    r.cases++;
    r.times.push(x.ms);
    r.byKind[x.kind] = (r.byKind[x.kind] ?? 0) + 1;
    const c = x.case ?? { kind: x.kind, origin: x.origin, text: '' };
    if (x.ms > r.slowest.ms) r.slowest = { ms: x.ms, case: c };
    r.slow.push({ ms: x.ms, case: c });
    if (x.problems) r.failures.push({ case: x.case, problems: x.problems, ms: x.ms });
  }
  r.slow = r.slow.sort((a, b) => b.ms - a.ms).slice(0, 10);
  return r;
}

const children = [];
let stopping = false;
const maxSeconds = flag('--max-seconds', Infinity);
const started = Date.now();
const stopper = Number.isFinite(maxSeconds)
  ? setTimeout(() => {
      stopping = true;
      for (const c of children) c.kill('SIGKILL');
    }, maxSeconds * 1000)
  : null;
const ticker = setInterval(() => {
  const done = progress.reduce((a, x) => a + (x ?? 0), 0);
  console.log(`fuzz: ${done} of ${cases} cases started after ${((Date.now() - started) / 1000).toFixed(0)} s, load average ${loadavg()[0].toFixed(1)}`);
}, 60_000);
const reports = await Promise.all(Array.from({ length: jobs }, (_, j) => runChild(j)));
clearInterval(ticker);
if (stopper) clearTimeout(stopper);

// A few runs of the built command line as a separate process, on examples mutated by the harness.
const spawned = [];
if (spawnRuns > 0 && existsSync(join(root, 'dist', 'cli.js'))) {
  const pool = reports.flatMap((r) => r.failures.map((f) => f.case.text));
  const dir = join(root, 'examples');
  for (const f of readdirSync(dir).filter((n) => n.endsWith('.qstate'))) pool.push(readFileSync(join(dir, f), 'utf8'));
  for (let k = 0; k < spawnRuns; k++) {
    const text = pool[k % pool.length].slice(0, pool[k % pool.length].length - (k % 7));
    const file = join(work, `spawn-${k}.qstate`);
    writeFileSync(file, text);
    const args = k % 2 === 0 ? ['check', file, '--time-limit', '1500', '--sweep-time-limit', '300'] : ['expand', file, '--json', '--time-limit', '1500', '--sweep-time-limit', '300'];
    const t0 = Date.now();
    const r = spawnSync(process.execPath, [join(root, 'dist', 'cli.js'), ...args], { encoding: 'utf8', timeout: 30_000 });
    const ms = Date.now() - t0;
    const problems = [];
    if (r.error) problems.push(`spawned cli failed: ${r.error.message}`);
    else if (r.status !== 0 && r.status !== 1) problems.push(`spawned cli exited ${r.status}: ${r.stderr.trim()}`);
    if (args[0] === 'expand' && r.status !== null && r.status <= 1) {
      try {
        JSON.parse(r.stdout);
      } catch {
        problems.push('spawned expand --json printed something that is not JSON');
      }
    }
    spawned.push({ ms, problems, text, args: args[0] });
  }
}

rmSync(work, { recursive: true, force: true });

const failures = reports.flatMap((r) => r.failures);
for (const s of spawned) if (s.problems.length > 0) failures.push({ case: { kind: s.args === 'check' ? 'cli-check' : 'cli-json', text: s.text, origin: 'spawned' }, problems: s.problems, ms: s.ms });
const total = reports.reduce((a, r) => a + r.cases, 0);
const slowest = reports.reduce((a, r) => (r.slowest.ms > a.ms ? r.slowest : a), { ms: 0, case: null });
const byKind = {};
for (const r of reports) for (const [k, v] of Object.entries(r.byKind)) byKind[k] = (byKind[k] ?? 0) + v;

mkdirSync(fixtures, { recursive: true });
const saved = [];
for (const f of failures) {
  const hash = createHash('sha256').update(f.case.kind + '\0' + f.case.text).digest('hex').slice(0, 12);
  const path = join(fixtures, `${f.case.kind}-${hash}.json`);
  if (!existsSync(path)) {
    writeFileSync(path, JSON.stringify({ ...f.case, problems: f.problems, seed }, null, 2) + '\n');
    saved.push(path);
  }
}

const died = reports.filter((r) => r.died).map((r) => r.died);
if (stopping) console.log(`fuzz: PARTIAL RUN, stopped by --max-seconds ${maxSeconds}: ${total} of ${cases} cases finished`);
console.log(`fuzz: ${total} cases (${Object.entries(byKind).map(([k, v]) => `${k} ${v}`).join(', ')}) + ${spawned.length} spawned runs, seed ${seed}, ${((Date.now() - started) / 1000).toFixed(1)} s wall, cases timed on ${cpu ? 'CPU time' : 'the wall clock'}, load average ${loadavg().map((x) => x.toFixed(1)).join(' ')}`);
if (slowest.case) console.log(`fuzz: slowest case ${slowest.ms.toFixed(0)} ms (${slowest.case.kind}, ${slowest.case.origin}):\n${slowest.case.text.slice(0, 400)}`);
const slow = reports.flatMap((r) => r.slow ?? []).sort((a, b) => b.ms - a.ms).slice(0, 10);
console.log(`fuzz: the ten slowest: ${slow.map((x) => `${x.ms.toFixed(0)} ms (${x.case.kind}, ${x.case.origin})`).join('; ')}`);
const times = reports.flatMap((r) => r.times ?? []);
for (const t of [1000, 1500, 1700, 2000]) console.log(`fuzz: cases over ${t} ms: ${times.filter((x) => x > t).length}`);
if (spawned.length > 0) console.log(`fuzz: slowest spawned run ${Math.max(...spawned.map((s) => s.ms))} ms`);
for (const d of died) console.log(`fuzz: a worker stopped: ${d}`);
for (const f of failures.slice(0, 20)) console.log(`\nFAIL ${f.case.kind} (${f.case.origin}, ${f.ms.toFixed(0)} ms)\n  ${f.problems.join('\n  ')}\n  text: ${JSON.stringify(f.case.text.slice(0, 300))}`);
if (saved.length > 0) console.log(`\nfuzz: saved ${saved.length} new failing case(s) to test/fixtures/fuzz/`);
console.log(`${total + spawned.length - failures.length} passed, ${failures.length} failed`);
process.exitCode = failures.length > 0 ? 1 : 0;
