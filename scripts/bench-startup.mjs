// Start-up of the command line, measured: fresh processes interleaved rep by rep (bare `node -e 0`, loading
// dist/cli.js without running it, `--help`, `expand FILE --json`), then inside fresh processes the bundle's
// load time and the first analysis of each example against the same analysis run again (warm).
// Usage: npm run build && node scripts/bench-startup.mjs [--reps 11] [--cli PATH] [--files a,b]
// --cli times another build of dist/cli.js (for instance one copied from main) the same way. Never run by tests.
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { join, resolve } from 'node:path';
import { readdirSync } from 'node:fs';

const args = process.argv.slice(2);
const opt = (name) => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const reps = Math.max(3, Number(opt('--reps') ?? 11));
const cli = resolve(opt('--cli') ?? 'dist/cli.js');
const files = opt('--files')?.split(',') ?? readdirSync('examples').filter((f) => f.endsWith('.qstate')).map((f) => f.replace(/\.qstate$/, ''));
const load = () => loadavg().map((v) => v.toFixed(1)).join(' ');

const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  const q = (p) => s[Math.round((s.length - 1) * p)];
  return { median: q(0.5), q1: q(0.25), q3: q(0.75) };
};
const fmt = (t) => `${t.median.toFixed(0)} [${t.q1.toFixed(0)}-${t.q3.toFixed(0)}]`;

console.log(`Start-up of ${cli}, ${new Date().toISOString()}, node ${process.version}, ${reps} interleaved reps; load average at start ${load()}`);
const procs = [
  ['bare node -e 0', ['-e', '0']],
  ['load dist/cli.js (require, no command)', ['-e', `require(${JSON.stringify(cli)})`]],
  ['--help', [cli, '--help']],
  ['expand plucked-box --json', [cli, 'expand', 'examples/plucked-box.qstate', '--json']],
];
const times = procs.map(() => []);
for (const [, a] of procs) spawnSync(process.execPath, a); // one untimed run each (file cache)
for (let r = 0; r < reps; r++) {
  procs.forEach(([, a], i) => {
    const t = performance.now();
    const p = spawnSync(process.execPath, a, { encoding: 'utf8', maxBuffer: 1 << 28 });
    times[i].push(performance.now() - t);
    if (p.status !== 0 && p.status !== 1) throw new Error(`${a.join(' ')}: exit ${p.status}: ${p.stderr}`);
  });
}
console.log('\n| process | ms, median [q1-q3] | over bare node |\n|---|---|---|');
const bare = median(times[0]).median;
procs.forEach(([name], i) => console.log(`| ${name} | ${fmt(median(times[i]))} | ${i === 0 ? '-' : (median(times[i]).median - bare).toFixed(0)} |`));

// Inside one fresh process per rep and file: require time, first analysis, the same analysis again.
const probe = `const t0 = performance.now(); const m = require(${JSON.stringify(cli)}); const t1 = performance.now();
const io = { out: () => {}, err: () => {}, isTTY: false };
const f = process.argv[1]; const a = performance.now(); m.run(['expand', f, '--json'], io); const b = performance.now(); m.run(['expand', f, '--json'], io); const c = performance.now();
process.stdout.write(JSON.stringify([t1 - t0, b - a, c - b]));`;
console.log('\n| file | load ms | first expand ms | warm expand ms |\n|---|---|---|---|');
for (const f of files) {
  const rows = [[], [], []];
  for (let r = 0; r < Math.max(3, Math.floor(reps / 2)); r++) {
    const p = spawnSync(process.execPath, ['-e', probe, join('examples', `${f}.qstate`)], { encoding: 'utf8' });
    JSON.parse(p.stdout).forEach((v, i) => rows[i].push(v));
  }
  console.log(`| ${f} | ${rows.map((x) => fmt(median(x))).join(' | ')} |`);
}
console.log(`\nload average at end ${load()}`);
