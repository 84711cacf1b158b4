// Are two engines' results the same? Bundles analyse() from this checkout and from another tree (a
// `git archive` of an older commit, say), runs both on a corpus of texts (the examples, the diagnostics
// fixtures, with --fuzz the analyse fixtures of the fuzzer (slow), the one-line texts quoted in test/analysis, and the
// texts of --extra FILE, one a line with \n for newlines) and prints every difference: fields that
// differ, and for numbers the largest relative difference. elapsedMs and the work counters are left out
// (a speed-only change is meant to move them). Exit 1 when any result differs.
// Usage: node scripts/results-equal.mjs OLD_TREE [--max-ms 3000] [--extra FILE] [--tolerance 0] [--fuzz]
import { build } from 'esbuild';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const args = process.argv.slice(2);
const opt = (name, dflt) => {
  const i = args.indexOf(name);
  return i >= 0 && args[i + 1] !== undefined ? args[i + 1] : dflt;
};
const oldTree = args[0] && !args[0].startsWith('--') ? resolve(args[0]) : null;
if (!oldTree || !existsSync(join(oldTree, 'server/src/analysis/index.ts'))) {
  console.error('usage: node scripts/results-equal.mjs OLD_TREE (a tree holding server/src) [--max-ms 3000] [--extra FILE] [--tolerance 0]');
  process.exit(2);
}
const maxMs = Number(opt('--max-ms', 3000));
const tolerance = Number(opt('--tolerance', 0));

const dir = mkdtempSync(join(tmpdir(), 'eigenspan-equal-'));
async function bundle(root, name) {
  const out = join(dir, name);
  await build({
    stdin: {
      contents: "export { analyse } from './server/src/analysis/index';\nexport { clearBasisMemo } from './server/src/analysis/systems';\n",
      resolveDir: root,
      loader: 'ts',
    },
    bundle: true,
    platform: 'node',
    format: 'esm',
    outfile: out,
    nodePaths: [join(process.cwd(), 'node_modules')],
    logLevel: 'warning',
  });
  return import(pathToFileURL(out).href);
}
const fresh = await bundle(process.cwd(), 'new.mjs');
const old = await bundle(oldTree, 'old.mjs');
rmSync(dir, { recursive: true, force: true });

const corpus = [];
const add = (name, text) => corpus.push({ name, text });
for (const d of ['examples', 'test/fixtures/diagnostics']) {
  for (const f of readdirSync(d).filter((f) => f.endsWith('.qstate')).sort()) add(`${d}/${f}`, readFileSync(join(d, f), 'utf8'));
}
for (const f of args.includes('--fuzz') ? readdirSync('test/fixtures/fuzz').filter((f) => f.startsWith('analyse-')).sort() : []) {
  const c = JSON.parse(readFileSync(join('test/fixtures/fuzz', f), 'utf8'));
  if (typeof c.text === 'string') add(`fuzz/${f}`, c.text);
}
const quoted = new Set();
for (const f of readdirSync('test/analysis').filter((f) => f.endsWith('.ts')).sort()) {
  for (const m of readFileSync(join('test/analysis', f), 'utf8').matchAll(/'(system [^'\\]*(?:\\.[^'\\]*)*)'/g)) {
    const text = m[1].replace(/\\n/g, '\n').replace(/\\'/g, "'");
    if (!quoted.has(text)) {
      quoted.add(text);
      add(`test/analysis/${f}#${quoted.size}`, text);
    }
  }
}
const extra = opt('--extra', null);
if (extra) readFileSync(extra, 'utf8').split('\n').filter((l) => l.trim() !== '').forEach((l, i) => add(`extra#${i + 1}`, l.replace(/\\n/g, '\n')));

/** Paths where a and b differ, with the largest relative difference of numbers. */
function diff(a, b, path, out) {
  if (typeof a === 'number' && typeof b === 'number') {
    if (Object.is(a, b)) return;
    const rel = Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);
    if (!(rel <= tolerance)) out.push({ path, a, b, rel });
    return;
  }
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') {
    if (a !== b) out.push({ path, a, b, rel: Infinity });
    return;
  }
  const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
  for (const k of keys) {
    if (path === '' && (k === 'elapsedMs' || k === 'work')) continue;
    diff(a[k], b[k], path ? `${path}.${k}` : k, out);
  }
}

const opts = { limits: { maxMillis: 600_000 } };
let differing = 0;
let compared = 0;
let skipped = 0;
for (const { name, text } of corpus) {
  old.clearBasisMemo();
  const t0 = performance.now();
  const a = old.analyse(text, opts);
  if (performance.now() - t0 > maxMs) {
    skipped++;
    continue;
  }
  fresh.clearBasisMemo();
  const b = fresh.analyse(text, opts);
  compared++;
  const out = [];
  diff(JSON.parse(JSON.stringify(a)), JSON.parse(JSON.stringify(b)), '', out);
  if (out.length === 0) continue;
  differing++;
  const worst = out.reduce((p, q) => (q.rel > p.rel ? q : p));
  console.log(`${name}: ${out.length} field(s) differ, largest at ${worst.path}: ${JSON.stringify(worst.a)?.slice(0, 120)} -> ${JSON.stringify(worst.b)?.slice(0, 120)} (relative ${worst.rel.toExponential(1)})`);
  for (const d of out.slice(0, 4)) if (d !== worst) console.log(`    ${d.path}: ${JSON.stringify(d.a)?.slice(0, 80)} -> ${JSON.stringify(d.b)?.slice(0, 80)}`);
}
console.log(`results-equal: ${compared} texts compared, ${differing} differ, ${skipped} skipped (over ${maxMs} ms on the old tree)`);
process.exit(differing ? 1 : 0);
