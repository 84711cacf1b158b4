/**
 * Entry of the side-by-side benchmark against numpy/scipy (bundled and run by scripts/bench-python.mjs).
 * Interleaved in one run: for every row, one untimed run of each side, then engine rep, python rep,
 * engine rep, ... Kernel rows: the engine timed here with performance.now(), python timed inside python
 * with time.perf_counter (bench/python/anchor.py serve). Whole-process rows: both sides timed from
 * node around spawnSync (node dist/cli.js expand FILE --json against bench/python/examples.py FILE).
 * Arguments: --reps N (default 9), --heavy-reps N (rows over 5 s a run, default 5), --rows id,id,...,
 * --python PATH (default /usr/bin/python3), --json OUT.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { anchorRows, type AnchorRefs } from './anchor';
import { checkExpects, formatAnchorTable, locatedDifference, type SideBySide } from './anchor-report';
import { summarise } from './stats';

const argv = process.argv.slice(2);
const opt = (name: string): string | undefined => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
};
const reps = Math.max(1, Number(opt('--reps') ?? 9));
const heavyReps = Math.max(1, Number(opt('--heavy-reps') ?? 5));
const only = opt('--rows')?.split(',').filter((s) => s !== '');
const python = opt('--python') ?? '/usr/bin/python3';
const root = process.cwd();
const pyDir = join(root, 'bench', 'python');
const log = (line: string) => process.stderr.write(`bench-python: ${line}\n`);

/** The python child's environment: this machine's OPENBLAS_CORETYPE / OPENBLAS_L2_SIZE removed. */
function pythonEnv(): NodeJS.ProcessEnv {
  const env = { ...process.env };
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  return env;
}

/** The python server: one JSON request a line, one JSON answer a line. */
function startPython() {
  const child = spawn(python, ['anchor.py', 'serve'], { cwd: pyDir, env: pythonEnv(), stdio: ['pipe', 'pipe', 'inherit'] });
  const lines = createInterface({ input: child.stdout! });
  const waiting: ((line: string) => void)[] = [];
  lines.on('line', (line) => waiting.shift()?.(line));
  const ask = (req: object): Promise<Record<string, unknown>> =>
    new Promise((resolve, reject) => {
      waiting.push((line) => {
        const out = JSON.parse(line) as Record<string, unknown>;
        if (out.error) reject(new Error(`python: ${String(out.error)}`));
        else resolve(out);
      });
      child.stdin!.write(JSON.stringify(req) + '\n');
    });
  return { ask, close: () => child.stdin!.end() };
}

async function kernelRows(py: ReturnType<typeof startPython>, refs: AnchorRefs): Promise<SideBySide[]> {
  const out: SideBySide[] = [];
  for (const row of anchorRows(false)) {
    if (only && !only.includes(row.id)) continue;
    const t0 = performance.now();
    let result = row.run();
    const first = performance.now() - t0;
    let pyRep = await py.ask({ op: 'rep', row: row.id });
    const n = first > 5000 ? heavyReps : reps;
    log(`${row.id}: ${n} reps a side (warm-up run ${first.toFixed(0)} ms engine, ${Number(pyRep.ms).toFixed(1)} ms python)`);
    const engine: number[] = [];
    const pyTimes: number[] = [];
    for (let r = 0; r < n; r++) {
      const t = performance.now();
      result = row.run();
      engine.push(performance.now() - t);
      pyRep = await py.ask({ op: 'rep', row: row.id });
      pyTimes.push(Number(pyRep.ms));
    }
    const acc = row.accuracy(result, refs);
    out.push({ id: row.id, job: row.job, engine: { method: row.method, timing: summarise(engine), accuracy: acc.value, note: acc.note }, python: { method: String(pyRep.method), timing: summarise(pyTimes), accuracy: Number(pyRep.accuracy), note: '' } });
  }
  return out;
}

function processRows(): SideBySide[] {
  const cli = join(root, 'dist', 'cli.js');
  const dir = join(root, 'examples');
  if (!existsSync(cli)) {
    log('dist/cli.js is missing (npm run build): no whole-process rows');
    return [];
  }
  const out: SideBySide[] = [];
  const bare = startRow();
  if (bare) out.push(bare);
  const jobs = JSON.parse(spawnSync(python, [join(pyDir, 'examples.py'), '--jobs'], { encoding: 'utf8', env: pythonEnv() }).stdout) as string[];
  for (const name of readdirSync(dir).filter((f) => f.endsWith('.qstate')).sort()) {
    const id = `process:${name.replace(/\.qstate$/, '')}`;
    if (only && !only.includes(id) && !only.includes('process')) continue;
    if (!jobs.includes(name.replace(/\.qstate$/, ''))) {
      log(`${id}: not timed (bench/python/examples.py has no job for it)`);
      continue;
    }
    const file = join('examples', name);
    const runNode = () => spawnSync(process.execPath, [cli, 'expand', file, '--json'], { cwd: root, encoding: 'utf8', maxBuffer: 1 << 28 });
    const runPy = () => spawnSync(python, [join(pyDir, 'examples.py'), file], { cwd: root, encoding: 'utf8', env: pythonEnv(), maxBuffer: 1 << 28 });
    let a = runNode();
    let b = runPy();
    if (b.status !== 0) throw new Error(`bench/python/examples.py ${file} failed: ${b.stderr}`);
    const engine: number[] = [];
    const pyTimes: number[] = [];
    for (let r = 0; r < reps; r++) {
      let t = performance.now();
      a = runNode();
      engine.push(performance.now() - t);
      t = performance.now();
      b = runPy();
      pyTimes.push(performance.now() - t);
    }
    const text = readFileSync(join(root, file), 'utf8');
    const ej = JSON.parse(a.stdout) as Record<string, unknown>;
    const pj = JSON.parse(b.stdout) as Record<string, unknown>;
    const ec = checkExpects(text, ej);
    const pc = checkExpects(text, pj);
    const diff = weightDifference(ej, pj);
    const loc = locatedDifference(ej, pj);
    const sweepNote = loc ? `; sweep: ${loc.count} places located, worst relative distance between the sides ${loc.worst.toExponential(1)}, ${loc.unmatched} unmatched` : '';
    log(`${id}: done`);
    out.push({
      id,
      job: `whole process, ${name}`,
      engine: { method: 'node dist/cli.js expand FILE --json', timing: summarise(engine), accuracy: diff, note: `expect lines met ${ec.met}/${ec.checked}${sweepNote}` },
      python: { method: 'python3 bench/python/examples.py FILE', timing: summarise(pyTimes), accuracy: diff, note: `expect lines met ${pc.met}/${pc.checked}` },
    });
  }
  return out;
}

/** Bare start of each side, interleaved: `node -e 0` against python importing what every example imports. */
function startRow(): SideBySide | null {
  const id = 'process:start';
  if (only && !only.includes(id) && !only.includes('process')) return null;
  const imports = 'import numpy, numpy.polynomial.legendre, scipy.fft, scipy.linalg'; // what every example imports (common.py)
  const runNode = () => spawnSync(process.execPath, ['-e', '0']);
  const runPy = () => spawnSync(python, ['-c', imports], { env: pythonEnv() });
  runNode();
  runPy();
  const engine: number[] = [];
  const pyTimes: number[] = [];
  for (let r = 0; r < reps; r++) {
    let t = performance.now();
    runNode();
    engine.push(performance.now() - t);
    t = performance.now();
    runPy();
    pyTimes.push(performance.now() - t);
  }
  const side = (method: string, times: number[]) => ({ method, timing: summarise(times), accuracy: NaN, note: '' });
  return { id, job: 'bare start (no work)', engine: side('node -e 0', engine), python: side(`python3 -c "${imports}"`, pyTimes) };
}

/** max |w_engine - w_python| over the levels both report (the accuracy column of the process rows). */
function weightDifference(a: Record<string, unknown>, b: Record<string, unknown>): number {
  const wa = new Map(((a.levels as { n: number; weight: number }[]) ?? []).map((l) => [l.n, l.weight]));
  let worst = 0;
  for (const l of (b.levels as { n: number; weight: number }[]) ?? []) {
    const w = wa.get(l.n);
    if (w !== undefined) worst = Math.max(worst, Math.abs(w - l.weight));
  }
  return worst;
}

async function main(): Promise<void> {
  const py = startPython();
  try {
    const info = await py.ask({ op: 'info' });
    const header = [
      `Side-by-side benchmark, ${new Date().toISOString()}, node ${process.version}, python ${String(info.python)}, numpy ${String(info.numpy)}, scipy ${String(info.scipy)}`,
      `${cpus().length} x ${cpus()[0]?.model ?? 'unknown'}, load average at start ${loadavg().map((v) => v.toFixed(1)).join(' ')}`,
      `python BLAS (OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE unset for python): ${String(info.blas)}`,
    ];
    log(`started; ${header[2]}`);
    const quartic = only && !only.includes('quartic') ? undefined : ((await py.ask({ op: 'ref', row: 'quartic' })).energies as number[]);
    const rows = [...(await kernelRows(py, { quartic })), ...processRows()];
    header.push(`load average at end ${loadavg().map((v) => v.toFixed(1)).join(' ')}`);
    const report = formatAnchorTable(header, rows);
    process.stdout.write(report + '\n');
    const jsonOut = opt('--json');
    if (jsonOut) writeFileSync(jsonOut, JSON.stringify({ header, rows }, null, 2) + '\n');
  } finally {
    py.close();
  }
}

main().catch((err: unknown) => {
  process.stderr.write(`bench-python: ${(err as Error).stack ?? String(err)}\n`);
  process.exit(1);
});
