/**
 * Hostile classes of the fuzz harness (issue 14): texts with long names, many names and control
 * characters; file trees with link loops, links out, devices, FIFOs and odd names, and hostile data files
 * named by `samples("PATH")` (issue 17); and broken frames of
 * the language server's stream. Each case is plain data (saved as JSON when it fails) and is checked
 * against the promises of docs/format.md: bounded work, file rules, escaped output, a stream that recovers.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from '../../server/src/cli/main';

/** A seeded source of floats in [0, 1) (the harness's `rng`). */
type Rand = () => number;

function pick<T>(r: Rand, xs: readonly T[]): T {
  return xs[Math.floor(r() * xs.length)]!;
}

function int(r: Rand, lo: number, hi: number): number {
  return lo + Math.floor(r() * (hi - lo + 1));
}

// ---------------------------------------------------------------------------------------------------
// Texts

/** Control characters and their look-alikes that must never reach a terminal raw. */
export const CONTROLS = [
  '\u001b[2K', '\u001b[32mall good\u001b[0m', '\u001b]0;title\u0007', '\r', '\u0008', '\u007f', '\u0085', '\u009b31m', '\u2028', '\u2029',
  '\u202e', '\u2066', '\u200f', '\u061c', '\u0000', '\u000b', '\n', '\nforged.qstate:1:1: error[syntax]: Planted.\n',
] as const;

/** Characters that must print as they are. */
const PRINTABLE = ['µ', 'Å', 'ℏ', 'é', 'Ω', '\u00a0'] as const;

/** A text with long `let` names and long unknown names (the edit distance's worst case). */
export function longNamesText(r: Rand): string {
  const len = pick(r, [65, 200, 5_000, 40_000, 120_000]);
  const unknown = pick(r, [10, 64, 65, 3_000, 9_000]);
  const c = pick(r, ['a', 'q', 'ab', 'x_']);
  const name = c.repeat(Math.ceil(len / c.length)).slice(0, len);
  const typo = (c.repeat(Math.ceil(unknown / c.length)).slice(0, unknown - 1) + 'z').replace(/^[0-9]/, 'n');
  return `system box(0, 1)\nlet ${name} = 1\nstate psi(x) = ${typo} * x * (1 - x)\nbasis ${pick(r, [typo, name.slice(0, 70), '4'])}\n`;
}

/** A text with many `let` names and many near-miss unknown names. */
export function manyNamesText(r: Rand): string {
  const n = pick(r, [200, 1_000, 2_500]);
  const width = pick(r, [1, 8, 40]);
  const lines = ['system box(0, 1)'];
  for (let i = 0; i < n; i++) lines.push(`let ${'q'.repeat(width)}${i} = 1`);
  const refs = Array.from({ length: n }, (_, i) => `${'q'.repeat(Math.max(0, width - 1))}z${i}`);
  // Unknown names in one long expression and spread over statements.
  lines.push(`let sum = ${refs.slice(0, 300).join(' + ')}`);
  for (let i = 300; i < n; i += 1) lines.push(`let u${i} = ${refs[i]}`);
  lines.push('state psi(x) = x * (1 - x)');
  return lines.join('\n') + '\n';
}

/** A text with control characters in formulas, names, comments and numbers. */
export function controlsText(r: Rand, base: string): string {
  let t = base.length > 0 ? base : 'system box(0, 1)\nstate psi(x) = x * (1 - x)\n';
  const k = int(r, 1, 4);
  for (let i = 0; i < k; i++) {
    const at = Math.floor(r() * (t.length + 1));
    const piece = r() < 0.8 ? pick(r, CONTROLS) : pick(r, PRINTABLE);
    t = t.slice(0, at) + piece + t.slice(at);
  }
  // Always one in a place that is quoted back: an unknown name next to a control sequence.
  return `${t}\nlet w = ${pick(r, ['foo', 'µ', 'Å'])}${pick(r, CONTROLS)}bar\n`;
}

// ---------------------------------------------------------------------------------------------------
// Trees

/** One entry of a generated tree, relative to its root (kept as data so a failing case can be saved). */
export type TreeEntry =
  | { kind: 'file'; path: string; text: string }
  | { kind: 'dir'; path: string }
  | { kind: 'link'; path: string; target: string }
  | { kind: 'fifo'; path: string };

/** The marker written outside the tree: it must never appear in the output. */
export const OUTSIDE_MARKER = 'leaked_secret_line';

const GOOD = 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n';
const BAD = 'system box(0, 1)\nstate psi(x) = y\n';

/** A random tree: files, folders, links up, sideways, out, to the root and to devices, FIFOs, odd names. */
export function treeEntries(r: Rand): TreeEntry[] {
  const out: TreeEntry[] = [{ kind: 'dir', path: 'sub' }, { kind: 'file', path: 'a.qstate', text: GOOD }];
  const names = ['b.qstate', 'sub/c.qstate', `odd${pick(r, CONTROLS)}.qstate`, 'sub/d.qstate', 'e.qstate'];
  const n = int(r, 2, 8);
  for (let i = 0; i < n; i++) {
    const path = `${pick(r, ['', 'sub/'])}${pick(r, ['l', 'x', 'p'])}${i}${r() < 0.6 ? '.qstate' : ''}`;
    const what = int(r, 0, 9);
    if (what === 0) out.push({ kind: 'link', path, target: '.' });
    else if (what === 1) out.push({ kind: 'link', path, target: '..' });
    else if (what === 2) out.push({ kind: 'link', path, target: '/' });
    else if (what === 3) out.push({ kind: 'link', path, target: pick(r, ['/dev/zero', '/dev/null', '/dev/urandom']) });
    else if (what === 4) out.push({ kind: 'link', path, target: '@outside/secret.qstate' });
    else if (what === 5) out.push({ kind: 'link', path, target: '@outside' });
    else if (what === 6) out.push({ kind: 'fifo', path: path.endsWith('.qstate') ? path : `${path}.qstate` });
    else if (what === 7) out.push({ kind: 'link', path, target: `missing${i}` });
    else if (what === 8) out.push({ kind: 'link', path, target: 'a.qstate' });
    else out.push({ kind: 'file', path: pick(r, names), text: r() < 0.5 ? GOOD : BAD });
  }
  if (r() < 0.5) out.push(...dataEntries(r));
  return out;
}

/** Sampled sqrt(2) sin(pi x) on the box (0, 1): a good data file. */
const GOOD_DATA = ['x, re', ...Array.from({ length: 17 }, (_, i) => `${i / 16}, ${Math.SQRT2 * Math.sin((Math.PI * i) / 16)}`)].join('\n') + '\n';

/**
 * Hostile data files (issue 17): `.qstate` files naming data paths that are absolute, lead out of the
 * tree (by `..` or a link), are devices, FIFOs or folders, or hold binary, ragged or NaN rows. The file
 * outside the tree holds the marker, so reading it would show in the output.
 */
export function dataEntries(r: Rand): TreeEntry[] {
  const out: TreeEntry[] = [{ kind: 'dir', path: 'data' }];
  const k = int(r, 1, 4);
  for (let i = 0; i < k; i++) {
    const choice = int(r, 0, 10);
    let path = `data/d${i}.csv`;
    if (choice === 0) out.push({ kind: 'link', path, target: pick(r, ['/dev/zero', '/dev/urandom', '/dev/null']) });
    else if (choice === 1) out.push({ kind: 'link', path, target: '@outside/secret.csv' });
    else if (choice === 2) path = pick(r, ['../outside/secret.csv', 'data/../../outside/secret.csv', '/etc/passwd', '..']);
    else if (choice === 3) out.push({ kind: 'fifo', path });
    else if (choice === 4) out.push({ kind: 'link', path, target: '.' });
    else if (choice === 5) out.push({ kind: 'file', path, text: 'x, re\n0, 0\n\u0000\u00ff\u0001, 1\n' });
    else if (choice === 6) out.push({ kind: 'file', path, text: 'x, re, im\n0, 0, 0\n0.5, NaN, 0\n0.75, 1\n1, , 0\n' });
    else if (choice === 7) out.push({ kind: 'file', path, text: `x${pick(r, CONTROLS)}, re\n0, 0\n0.5, 1\n0.4, 1\n1, 0\n` });
    else if (choice === 8) out.push({ kind: 'link', path, target: `missing${i}.csv` });
    else out.push({ kind: 'file', path, text: GOOD_DATA });
    out.push({ kind: 'file', path: `samples${i}.qstate`, text: `system box(0, 1)\nstate samples("${path}")\n` });
  }
  return out;
}

/** Builds `entries` under a fresh folder; `@outside` in a link target names a sibling folder outside the tree. */
export function buildTree(entries: readonly TreeEntry[]): { root: string; base: string } {
  const base = mkdtempSync(join(tmpdir(), 'eigenspan-fuzz-tree-'));
  const root = join(base, 'tree');
  const outside = join(base, 'outside');
  mkdirSync(root);
  mkdirSync(outside);
  writeFileSync(join(outside, 'secret.qstate'), `${OUTSIDE_MARKER} = 1\n`);
  writeFileSync(join(outside, 'secret.csv'), `x, re\n${OUTSIDE_MARKER}, 1\n`);
  for (const e of entries) {
    const p = join(root, e.path);
    try {
      if (e.kind === 'dir') mkdirSync(p, { recursive: true });
      else if (e.kind === 'file') writeFileSync(p, e.text);
      else if (e.kind === 'link') symlinkSync(e.target.replace(/^@outside/, outside), p);
      else spawnSync('mkfifo', [p]);
    } catch {
      // A name taken twice: the first entry stays.
    }
  }
  return { root, base };
}

// ---------------------------------------------------------------------------------------------------
// Promises on the command line's output

/** Characters that must never appear raw in what the command line prints (newlines apart). */
export const RAW_UNSAFE = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/;

const CHECK_LINE = /^(.+):(\d+):(\d+): (error|warning|info)\[([a-z]+)\]: (.*)$/;
const SUMMARY = /^eigenspan check: (no \.qstate files found|\d+ files?, (no errors or warnings: all clean|\d+ errors?, \d+ warnings?))[^\n]*\.\n$/;

/** Problems with the output of one `check` run. */
export function checkOutputProblems(code: number, out: string, err: string): string[] {
  const p: string[] = [];
  if (code !== 0 && code !== 1) p.push(`check exited ${code}: ${err.trim()}`);
  if (RAW_UNSAFE.test(out) || RAW_UNSAFE.test(err)) p.push(`check printed a raw control character: ${JSON.stringify((out + err).slice(0, 300))}`);
  if (code <= 1 && !SUMMARY.test(err)) p.push(`check's standard error is not one summary line: ${JSON.stringify(err)}`);
  let errors = false;
  for (const line of out.split('\n').filter((l) => l.length > 0)) {
    const m = CHECK_LINE.exec(line);
    if (!m) p.push(`check printed a line not of the form FILE:LINE:COL: SEVERITY[CODE]: MESSAGE: ${JSON.stringify(line)}`);
    else if (m[4] === 'error') errors = true;
  }
  if ((code === 1) !== errors) p.push(`check exited ${code} but ${errors ? 'printed' : 'did not print'} an error`);
  return p;
}

/** Runs `check` on a generated tree and returns the promises it broke. */
export function checkTreeCase(entries: readonly TreeEntry[]): string[] {
  const { root, base } = buildTree(entries);
  try {
    let out = '';
    let err = '';
    const code = run(['check', root, '--time-limit', '1500'], { out: (s) => (out += s), err: (s) => (err += s), isTTY: false });
    const p = checkOutputProblems(code, out, err);
    if (out.includes(OUTSIDE_MARKER) || out.includes(join(base, 'outside'))) p.push('check read a file outside the tree');
    // Each real file at most once: the files named GOOD/BAD are reported by path; no path repeats a finding.
    const seen = new Set<string>();
    for (const line of out.split('\n').filter((l) => l.length > 0)) {
      if (seen.has(line)) p.push(`check printed the same line twice (a file checked twice?): ${JSON.stringify(line)}`);
      seen.add(line);
    }
    return p;
  } finally {
    rmSync(base, { recursive: true, force: true });
  }
}

// ---------------------------------------------------------------------------------------------------
// Broken frames of the language server's stream

/** One frame that breaks the base protocol's header rules (LSP specification, "Base Protocol"). */
export function brokenFrame(r: Rand): string {
  const body = JSON.stringify({ jsonrpc: '2.0', id: 99, method: 'textDocument/hover', params: {} });
  return pick(r, [
    `Content-Length: abc\r\n\r\n${body}`,
    `\r\n\r\n${body}`,
    `Content-Length: -5\r\n\r\n${body}`,
    `Content-Length: ${body.length}\n\n${body}`,
    `Content-Length: 3\r\n\r\n${body}`,
    `Content-Length: 99999999999\r\n\r\n${body}`,
    `Content-Length: ${body.length + 40}\r\n\r\n${body}`,
    `Content-Type: application/json\r\n\r\n${body}`,
    `Content-Length: 12\r\n\r\n{"jsonrpc":`,
    `garbage \u0000\u00ff without any header\r\n\r\n`,
    `Content-Length: 1e3\r\n\r\n${body}`,
  ]);
}

/** A valid frame of `message`. */
export function frame(message: object): string {
  const body = JSON.stringify(message);
  return `Content-Length: ${Buffer.byteLength(body, 'utf8')}\r\n\r\n${body}`;
}

/**
 * A small driver run in its own process (so the harness stays synchronous): it spawns the server, writes
 * the input, keeps the stream open until an answer to request 1 or 2 arrives, the server exits, or 10 s
 * pass, and prints what happened as JSON.
 */
const DRIVER = `
const { spawn } = require('node:child_process');
const [server, input] = [process.argv[1], Buffer.from(process.argv[2], 'base64')];
const child = spawn(process.execPath, [server, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] });
let out = '', err = '', done = false;
const finish = (how, code) => { if (done) return; done = true; clearTimeout(timer); child.kill('SIGKILL'); process.stdout.write(JSON.stringify({ how, code, out: out.slice(0, 2000), err: err.slice(0, 2000) })); };
const timer = setTimeout(() => finish('timeout', null), 10000);
child.stdin.on('error', () => undefined);
child.stdout.on('data', (d) => { out += d; if (/"id":\\s*[12]\\b/.test(out)) finish('answered', null); });
child.stderr.on('data', (d) => (err += d));
child.on('exit', (code) => setTimeout(() => finish('exited', code), 50));
child.stdin.write(input);
`;

/**
 * Feeds broken frames and then a valid `initialize` and `shutdown` to a spawned dist/server.js; the
 * server must answer one of them (it recovered at the next valid header) or exit with a reason on
 * standard error.
 */
export function checkFramesCase(frames: readonly string[], serverPath: string): string[] {
  if (!existsSync(serverPath)) return [`${serverPath} is missing: run npm run build`];
  const init = frame({ jsonrpc: '2.0', id: 1, method: 'initialize', params: { processId: null, rootUri: null, capabilities: {} } });
  const input = frames.join('') + init + frame({ jsonrpc: '2.0', id: 2, method: 'shutdown' });
  const r = spawnSync(process.execPath, ['-e', DRIVER, serverPath, Buffer.from(input, 'utf8').toString('base64')], { encoding: 'utf8', timeout: 30_000 });
  let v: { how: string; code: number | null; err: string };
  try {
    v = JSON.parse(r.stdout);
  } catch {
    return [`the frame driver failed: ${r.stderr.slice(0, 300)}`];
  }
  if (v.how === 'answered') return [];
  if (v.how === 'exited' && v.code !== 0 && v.err.trim().length > 0) return [];
  return [`the server neither answered after broken frames nor exited with a reason (${v.how}, exit ${v.code}; stderr ${JSON.stringify(v.err.slice(0, 200))})`];
}
