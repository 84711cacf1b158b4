// Language server latency and memory (npm run bench:lsp): types an example file into the built server
// one character at a time and measures keystroke-to-diagnostics latency for the static checks (the
// first publish of each version) and for the full analysis (the eigenspan/result of that version),
// then the server's resident memory with 20 open documents. Prints a table.
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import protocol from 'vscode-languageserver-protocol/node';

const { createProtocolConnection, StreamMessageReader, StreamMessageWriter } = protocol;

const root = resolve(import.meta.dirname, '..');
const server = resolve(process.env.EIGENSPAN_SERVER ?? join(root, 'dist', 'server.js'));
if (!existsSync(server)) {
  console.error(`${server} is missing; run npm run build`);
  process.exit(1);
}
const exampleDir = join(root, 'examples');
const examples = existsSync(exampleDir) ? readdirSync(exampleDir).filter((f) => f.endsWith('.qstate')).sort() : [];
const fallback = 'system box(0, 1)\nlet w = 0.1\nstate gaussian(center = 0.4, width = w, momentum = 30)\nbasis 80\nexpect weight 1..80 >= 0.999\n';
const chosen = process.argv[2] ?? examples.find((f) => f.includes('box')) ?? examples[0];
const text = chosen ? readFileSync(join(exampleDir, chosen), 'utf8') : fallback;
/** Full-analysis samples: waiting for each result makes every sample cost a debounce plus an analysis. */
const FULL_SAMPLES = Number(process.env.FULL_SAMPLES ?? 60);

const child = spawn(process.execPath, [server, '--stdio'], { stdio: ['pipe', 'pipe', 'inherit'] });
const conn = createProtocolConnection(new StreamMessageReader(child.stdout), new StreamMessageWriter(child.stdin));
const waiting = new Map();
function expectEvent(key) {
  let resolveP;
  const p = new Promise((r) => (resolveP = r));
  waiting.set(key, resolveP);
  return p;
}
function fire(key) {
  const r = waiting.get(key);
  if (r) {
    waiting.delete(key);
    r(performance.now());
  }
}
const stopped = new Map();
conn.onNotification('textDocument/publishDiagnostics', (p) => {
  fire(`static ${p.uri} ${p.version}`);
  // A full analysis stopped by the time budget ends with a limits finding instead of a result.
  if (p.diagnostics.some((d) => d.code === 'limits' && /time budget|stopped/.test(d.message))) {
    stopped.set(p.uri, (stopped.get(p.uri) ?? 0) + 1);
    fire(`full ${p.uri} ${p.version}`);
  }
});
conn.onNotification('eigenspan/result', (p) => fire(`full ${p.uri} ${p.version}`));
conn.onRequest('workspace/configuration', (p) => p.items.map(() => ({})));
conn.onRequest('client/registerCapability', () => null);
conn.listen();
await conn.sendRequest('initialize', {
  processId: process.pid,
  rootUri: null,
  capabilities: { workspace: { configuration: true }, textDocument: { publishDiagnostics: { versionSupport: true } } },
  // Like the VS Code client: the panel is there, so results carry plot samples.
  initializationOptions: { panel: true },
});
conn.sendNotification('initialized', {});

function rssMb() {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${child.pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : NaN;
  } catch {
    return NaN;
  }
}

function stats(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const q = (p) => s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))];
  return { n: s.length, median: q(0.5), p95: q(0.95), max: s[s.length - 1] };
}

// Warm-up: one full analysis of the whole text, so start-up cost is not counted as typing latency.
const warm = 'file:///bench/warm.qstate';
let w = expectEvent(`full ${warm} 1`);
conn.sendNotification('textDocument/didOpen', { textDocument: { uri: warm, languageId: 'qstate', version: 1, text } });
await w;
conn.sendNotification('textDocument/didClose', { textDocument: { uri: warm } });
process.stderr.write('warm-up done; typing\n');

// 1. Static latency: one keystroke, wait for its first publish, next keystroke.
const uri = 'file:///bench/typing.qstate';
conn.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'qstate', version: 0, text: '' } });
const staticMs = [];
for (let k = 1; k <= text.length; k++) {
  const got = expectEvent(`static ${uri} ${k}`);
  const t0 = performance.now();
  conn.sendNotification('textDocument/didChange', { textDocument: { uri, version: k }, contentChanges: [{ text: text.slice(0, k) }] });
  staticMs.push((await got) - t0);
}
conn.sendNotification('textDocument/didClose', { textDocument: { uri } });

// 2. Full-analysis latency (debounce included): keystrokes spread over the file, each waited for.
const uri2 = 'file:///bench/typing-full.qstate';
conn.sendNotification('textDocument/didOpen', { textDocument: { uri: uri2, languageId: 'qstate', version: 0, text: '' } });
const fullMs = [];
const stride = Math.max(1, Math.floor(text.length / FULL_SAMPLES));
let version = 0;
for (let k = stride; k <= text.length; k += stride) {
  const v = ++version;
  const got = expectEvent(`full ${uri2} ${v}`);
  const t0 = performance.now();
  conn.sendNotification('textDocument/didChange', { textDocument: { uri: uri2, version: v }, contentChanges: [{ text: text.slice(0, k) }] });
  fullMs.push((await got) - t0);
}
conn.sendNotification('textDocument/didClose', { textDocument: { uri: uri2 } });

// 3. Memory with 20 open documents (all examples in turn), after every one has been analysed.
const before = rssMb();
const sources = examples.length > 0 ? examples.map((f) => readFileSync(join(exampleDir, f), 'utf8')) : [fallback];
const opened = [];
for (let k = 0; k < 20; k++) {
  const u = `file:///bench/open-${k}.qstate`;
  opened.push(expectEvent(`full ${u} 1`));
  conn.sendNotification('textDocument/didOpen', { textDocument: { uri: u, languageId: 'qstate', version: 1, text: sources[k % sources.length] } });
}
const t20 = performance.now();
await Promise.all(opened);
const all20 = performance.now() - t20;
const after = rssMb();

const s = stats(staticMs);
const f = stats(fullMs);
const rows = [
  ['metric', 'n', 'median', 'p95', 'max'],
  ['static diagnostics (ms)', s.n, s.median, s.p95, s.max],
  ['full analysis incl. 100 ms debounce (ms)', f.n, f.median, f.p95, f.max],
];
const fmt = (v) => (typeof v === 'number' ? (Number.isInteger(v) ? String(v) : v.toFixed(1)) : String(v));
const width = rows[0].map((_, c) => Math.max(...rows.map((r) => fmt(r[c]).length)));
console.log(`file: ${chosen ?? '(built-in scenario)'} (${text.length} characters), server: ${server}`);
for (const r of rows) console.log(r.map((v, c) => (c === 0 ? fmt(v).padEnd(width[c]) : fmt(v).padStart(width[c]))).join('  '));
const budgetHits = [...stopped.values()].reduce((a, b) => a + b, 0);
if (budgetHits > 0) console.log(`analyses stopped by the time budget: ${budgetHits}`);
console.log(`server memory (RSS): ${fmt(before)} MB before, ${fmt(after)} MB with 20 open documents (all analysed in ${fmt(all20)} ms)`);

await conn.sendRequest('shutdown');
conn.sendNotification('exit');
await new Promise((r) => child.once('exit', r));
conn.dispose();
