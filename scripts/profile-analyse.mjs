// Profile of the expansion path's own cost: the warm analyse() of one .qstate text many times, with a
// per-stage breakdown from an in-process CPU profile (node:inspector), and the cold first call in fresh
// processes. Bundles server/src with esbuild (as bench/solver.mjs does); the stage names are functions of
// the engine, matched on the sampled stacks (inclusive time), and the modules' self time comes from the
// bundle's module markers.
// Usage: node scripts/profile-analyse.mjs [--reps 400] [--cold 5] [--interval 50] [--file F.qstate] [--cpuprofile OUT] [--tree DIR]
// Default text: issue #15's first row (200 box coefficients of a smooth packet).
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir, loadavg, cpus } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Session } from 'node:inspector/promises';

const args = process.argv.slice(2);
const opt = (name, dflt) => {
  const i = args.indexOf(name);
  return i >= 0 && args[i + 1] !== undefined ? args[i + 1] : dflt;
};
const DEFAULT_TEXT = 'system box(0, 1)\nstate gaussian(center = 0.5, width = 0.04, momentum = 150)\nbasis 200\n';
const text = opt('--file', null) ? readFileSync(opt('--file'), 'utf8') : DEFAULT_TEXT;
const reps = Number(opt('--reps', 400));
const coldRuns = Number(opt('--cold', 5));
const interval = Number(opt('--interval', 50));
// Another tree holding server/src (a `git archive` of an older commit) to profile instead of this checkout.
const tree = resolve(opt('--tree', process.cwd()));

/** Stages of the path, by the engine function that does each (inclusive time: a stage holds its callees). */
const STAGES = [
  ['analyse', 'the whole call'],
  ['staticStage', 'quick stage: parse, model, sweeps'],
  ['parse', '  parse'],
  ['buildModel', '  model (names, units, dimensions, compile)'],
  ['letValues', 'let values'],
  ['numericStage', 'numerical stage'],
  ['buildBasis', '  basis'],
  ['checkBasisFacts', '  basis findings'],
  ['buildState', '  state function'],
  ['measureState', '  measure'],
  ['findWindow', '    window'],
  ['withPeaks', '    narrow peaks'],
  ['expandState', '    expansion'],
  ['boxTransform', '      sine transform (with its samples)'],
  ['boxCoefficientsFromSamples', '        transform kernel'],
  ['remainderSamples', '        samples and remainder'],
  ['quadratureFor', '      quadrature grid'],
  ['spotCheck', '      spot check'],
  ['projectWithin', '      projection'],
  ['coarseCheck', '      coarse check grid'],
  ['allBreakpoints', '      breakpoints'],
  ['maxWaveNumber', '      wave number'],
  ['levelsOf', '    levels'],
  ['coefficientUncertainties', '    coefficient uncertainties'],
  ['measureWalls', '    walls'],
  ['classifyBreakpoints', '    jumps and kinks'],
  ['energyOf', '    energy (grid, variance, decay)'],
  ['gridEnergy', '      grid energy'],
  ['gridVariance', '      grid variance'],
  ['decayOf', '      decay fit'],
  ['parityOf', '    parity'],
  ['levelsNeeded', '    levels needed'],
  ['maxAbs', '    max |psi|'],
  ['checkExpects', '  expects'],
  ['sortDiagnostics', 'sort diagnostics'],
];

const dir = mkdtempSync(join(tmpdir(), 'eigenspan-profile-'));
const out = join(dir, 'engine.mjs');
await build({
  stdin: {
    contents: "export { analyse } from './server/src/analysis/index';\nexport { clearBasisMemo } from './server/src/analysis/systems';\n",
    resolveDir: tree,
    loader: 'ts',
  },
  bundle: true,
  platform: 'node',
  format: 'esm',
  outfile: out,
  nodePaths: [join(process.cwd(), 'node_modules')],
  logLevel: 'warning',
});
const bundle = readFileSync(out, 'utf8');

/** The bundle's module markers ("// server/src/x.ts" lines): line number -> module. */
const markers = [];
bundle.split('\n').forEach((line, i) => {
  const m = /^\/\/ ((?:server|node_modules)\/\S+)$/.exec(line);
  if (m) markers.push([i, m[1].replace(/^node_modules\/([^/]+)\/.*$/, 'node_modules/$1')]);
});
const moduleAt = (line) => {
  let lo = 0;
  let hi = markers.length - 1;
  let best = '(bundle prelude)';
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (markers[mid][0] <= line) {
      best = markers[mid][1];
      lo = mid + 1;
    } else hi = mid - 1;
  }
  return best;
};

const median = (xs) => {
  const s = [...xs].sort((p, q) => p - q);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

// Cold: the first call in fresh processes (import timed apart), then nine more calls (bench-python's
// reps) under the profiler: the early regime, where most code still runs unoptimised.
const coldScript = join(dir, 'cold.mjs');
writeFileSync(
  coldScript,
  `import { Session } from 'node:inspector/promises';
import { writeFileSync } from 'node:fs';
const t0 = performance.now();
const { analyse, clearBasisMemo } = await import(${JSON.stringify(pathToFileURL(out).href)});
const t1 = performance.now();
clearBasisMemo();
analyse(${JSON.stringify(text)}, { limits: { maxMillis: 600000 } });
const t2 = performance.now();
const session = new Session();
session.connect();
await session.post('Profiler.enable');
await session.post('Profiler.setSamplingInterval', { interval: ${interval} });
await session.post('Profiler.start');
const early = [];
const earlyCpu = [];
for (let i = 0; i < 9; i++) {
  const c = process.cpuUsage();
  const t = performance.now();
  clearBasisMemo();
  analyse(${JSON.stringify(text)}, { limits: { maxMillis: 600000 } });
  early.push(performance.now() - t);
  const d = process.cpuUsage(c);
  earlyCpu.push((d.user + d.system) / 1000);
}
const { profile } = await session.post('Profiler.stop');
writeFileSync(process.argv[2], JSON.stringify(profile));
console.log(JSON.stringify({ load: t1 - t0, first: t2 - t1, early, earlyCpu }));
`,
);
const cold = [];
const earlyProfiles = [];
for (let i = 0; i < coldRuns; i++) {
  const pf = join(dir, `early-${i}.json`);
  const r = spawnSync(process.execPath, [coldScript, pf], { encoding: 'utf8' });
  if (r.status === 0) {
    cold.push(JSON.parse(r.stdout.trim()));
    earlyProfiles.push(JSON.parse(readFileSync(pf, 'utf8')));
  } else process.stderr.write(r.stderr);
}

const { analyse, clearBasisMemo } = await import(pathToFileURL(out).href);
const run = () => {
  clearBasisMemo();
  return analyse(text, { limits: { maxMillis: 600_000 } });
};
const first = run();
for (let i = 0; i < Math.min(50, reps); i++) run();
const times = [];
const cpuTimes = [];
for (let i = 0; i < reps; i++) {
  const c = process.cpuUsage();
  const t0 = performance.now();
  run();
  times.push(performance.now() - t0);
  const d = process.cpuUsage(c);
  cpuTimes.push((d.user + d.system) / 1000);
}

// The profile: the same warm loop under the sampling profiler.
const session = new Session();
session.connect();
await session.post('Profiler.enable');
await session.post('Profiler.setSamplingInterval', { interval });
await session.post('Profiler.start');
for (let i = 0; i < reps; i++) run();
const { profile } = await session.post('Profiler.stop');
session.disconnect();
if (opt('--cpuprofile', null)) writeFileSync(opt('--cpuprofile'), JSON.stringify(profile));
rmSync(dir, { recursive: true, force: true });

const stageOf = (name) => {
  if (STAGES.some(([f]) => f === name)) return name;
  const base = name.replace(/\d+$/, '');
  return STAGES.some(([f]) => f === base) ? base : null;
};

/** Samples inside analyse(), by stage (inclusive) and by module (self). */
function tally(profiles) {
  const inclusive = new Map();
  const selfByModule = new Map();
  const selfByFunction = new Map();
  let total = 0;
  for (const profile of profiles) {
    const byId = new Map(profile.nodes.map((n) => [n.id, n]));
    const parent = new Map();
    for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
    const sampleCount = new Map();
    for (const s of profile.samples) sampleCount.set(s, (sampleCount.get(s) ?? 0) + 1);
    for (const [id, count] of sampleCount) {
      const frame = byId.get(id).callFrame;
      const seen = new Set();
      for (let n = id; n !== undefined; n = parent.get(n)) {
        const st = stageOf(byId.get(n).callFrame.functionName);
        if (st) seen.add(st);
      }
      if (!seen.has('analyse')) continue;
      total += count;
      for (const st of seen) inclusive.set(st, (inclusive.get(st) ?? 0) + count);
      const mod = frame.url.endsWith('engine.mjs') ? moduleAt(frame.lineNumber) : frame.url ? frame.url : `(${frame.functionName || 'native'})`;
      selfByModule.set(mod, (selfByModule.get(mod) ?? 0) + count);
      const fn = `${frame.functionName || '(anonymous)'} (${mod.replace(/^server\/src\//, '')})`;
      selfByFunction.set(fn, (selfByFunction.get(fn) ?? 0) + count);
    }
  }
  return { inclusive, selfByModule, selfByFunction, total };
}

const f = (ms) => (ms >= 1 ? ms.toFixed(2) : ms.toFixed(3));
function report(title, t, cpuMs) {
  // Shares of the samples inside analyse(), scaled to the median process CPU time of a call (the sampler
  // thread misses ticks on a loaded machine, so sample counts alone undercount).
  const scale = (c) => (cpuMs * c) / Math.max(1, t.total);
  console.log(`\n${title}: stages (inclusive; shares of ${t.total} samples at ${interval} us, scaled to the median CPU time ${f(cpuMs)} ms a call)`);
  for (const [name, label] of STAGES) {
    const c = t.inclusive.get(name) ?? 0;
    if (c === 0) continue;
    console.log(`  ${label.padEnd(46)} ${f(scale(c)).padStart(7)} ms  ${((100 * c) / t.total).toFixed(1).padStart(5)}%  (${name})`);
  }
  console.log(`${title}: self time by module`);
  for (const [mod, c] of [...t.selfByModule].sort((p, q) => q[1] - p[1]).slice(0, 14)) {
    console.log(`  ${mod.padEnd(52)} ${f(scale(c)).padStart(7)} ms  ${((100 * c) / t.total).toFixed(1).padStart(5)}%`);
  }
  console.log(`${title}: self time by function`);
  for (const [fn, c] of [...t.selfByFunction].sort((p, q) => q[1] - p[1]).slice(0, 16)) {
    console.log(`  ${fn.slice(0, 60).padEnd(60)} ${f(scale(c)).padStart(7)} ms  ${((100 * c) / t.total).toFixed(1).padStart(5)}%`);
  }
}

const warm = median(times);
console.log(`profile-analyse: ${JSON.stringify(text)}`);
console.log(`${first.levels.length} levels, ${first.diagnostics.length} diagnostic(s), work ${first.work?.ops ?? '?'} ops / ${first.work?.points ?? '?'} points`);
console.log(`warm: median ${f(warm)} ms wall (${f(median(cpuTimes))} ms process CPU), min ${f(Math.min(...times))} ms over ${reps} calls (after ${Math.min(50, reps)} warm-up calls)`);
const earlyMedian = cold.length ? median(cold.flatMap((c) => c.early)) : 0;
if (cold.length) {
  console.log(
    `cold (fresh process, ${cold.length} runs, medians): bundle import ${f(median(cold.map((c) => c.load)))} ms, ` +
      `first analyse ${f(median(cold.map((c) => c.first)))} ms, calls 2-10 (as bench-python times them) ${f(earlyMedian)} ms wall, ${f(median(cold.flatMap((c) => c.earlyCpu)))} ms process CPU`,
  );
}
report('warm', tally([profile]), median(cpuTimes));
if (earlyProfiles.length) report('early (calls 2-10 of a fresh process)', tally(earlyProfiles), median(cold.flatMap((c) => c.earlyCpu)));
console.log(`\nload average ${loadavg().map((x) => x.toFixed(2)).join(' ')} on ${cpus().length} cores, node ${process.version}`);
