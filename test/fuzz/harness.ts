/**
 * The fuzz harness: generates `.qstate` texts (mutated examples, structurally valid random files with
 * extreme numbers, raw random text), runs each through the parser, the static stage, the whole analysis
 * or the command line in process, and checks the engine's promises on every result:
 *
 * - nothing throws and nothing reports an internal error;
 * - every case finishes within a time budget (default 2 s);
 * - every diagnostic and quick-fix range lies inside the document, with a catalogue code and severity;
 * - every message is a sentence a user can act on: it starts with a capital letter, a digit or a quoted
 *   name, ends with a period or question mark, and contains no "undefined", "NaN", "[object" or stack
 *   trace;
 * - numbers in the result are finite where the contract says they are (weights in [0, 1 + 1e-6], their
 *   sum at most 1 + 1e-6, finite energies and norm);
 * - the command line exits 0 or 1 (never 2 on a readable file), its `check` lines follow
 *   FILE:LINE:COL: SEVERITY[CODE]: MESSAGE, its `--json` output parses and agrees with the exit code.
 *
 * - hostile classes (test/fuzz/hostile.ts, issue 14): long names and many names finish in the budget;
 *   control characters never reach the command line's output raw; generated folders with link loops,
 *   links out of the tree and to the root, devices, FIFOs and odd names are checked without hanging,
 *   leaking a file from outside or checking a file twice; broken frames of the language server's stream
 *   (behind `frames`) are answered after or end the server with a reason.
 *
 * The harness is plain TypeScript with no test-runner imports, so `scripts/fuzz.mjs` can bundle and run it
 * outside vitest and `test/fuzz/fuzz.test.ts` can run it at CI size.
 */
import fc from 'fast-check';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyse, analyseStatic, type AnalyseOptions } from '../../server/src/analysis/index';
import type { Clock } from '../../server/src/physics/budget';
import { parse } from '../../server/src/language/parser';
import { run } from '../../server/src/cli/main';
import { CPU_CLOCK, FUZZ_LIMITS, FUZZ_SWEEP_MS, REPLAY_OVERSHOOT_MS } from './clocks';
import { diagnosticProblems, messageProblems, resultProblems } from './promises';
import { brokenFrame, checkFramesCase, checkOutputProblems, checkTreeCase, controlsText, longNamesText, manyNamesText, RAW_UNSAFE, treeEntries, type TreeEntry } from './hostile';

export { diagnosticProblems, messageProblems, resultProblems } from './promises';
export { CPU_CLOCK, FUZZ_LIMITS, isTimeCase, REPLAY_LIMITS, REPLAY_MS_PER_OP, REPLAY_OVERSHOOT_MS } from './clocks';

/** Which front door a case goes through. */
export type CaseKind = 'parse' | 'static' | 'analyse' | 'cli-check' | 'cli-json' | 'cli-tree' | 'lsp-frames';

/** One fuzz case: a document and the way it is run. Saved as JSON when it fails. */
export interface FuzzCase {
  kind: CaseKind;
  text: string;
  /** Where the text came from (for the report): 'mutation:<example>', 'generated', 'random'. */
  origin: string;
  /** Analysis options for 'analyse' cases (samples on or off). */
  samples?: boolean;
  /** The folder of a 'cli-tree' case (built in a temporary folder, checked with `check`). */
  tree?: TreeEntry[];
  /** The broken frames of an 'lsp-frames' case, sent to a spawned dist/server.js before a valid request. */
  frames?: string[];
}

/** A case that broke a promise, with the promises it broke. */
export interface FuzzFailure {
  case: FuzzCase;
  problems: string[];
  ms: number;
}

/** What a run found. */
export interface FuzzReport {
  cases: number;
  failures: FuzzFailure[];
  /** The slowest case and its time in milliseconds. */
  slowest: { ms: number; case: FuzzCase | null };
  byKind: Record<CaseKind, number>;
  totalMs: number;
  /** Each case's time in milliseconds, in order. */
  times: number[];
  /** The ten slowest cases, slowest first. */
  slow: { ms: number; case: FuzzCase }[];
}

/** Options of `runFuzz`. */
export interface FuzzOptions {
  /** Number of cases (default 1000). */
  cases?: number;
  /** Seed of the pseudo-random choices and of fast-check's generators (default 20261201). */
  seed?: number;
  /** A case slower than this many milliseconds fails (default 2000). */
  budgetMs?: number;
  /** Texts to mutate (normally examples/*.qstate), by name. */
  examples: { name: string; text: string }[];
  /** Called before each case (the script writes it to disk so a hang can be traced). */
  beforeCase?: (c: FuzzCase, index: number) => void;
  /** Called after each case with the promises it broke (the script logs them, so a run stopped early still reports). */
  afterCase?: (c: FuzzCase, index: number, problems: string[], ms: number) => void;
  /** Stop after this many failures (default 50): one bug tends to fail many cases. */
  maxFailures?: number;
  /** Limits of the whole-analysis cases (default `FUZZ_LIMITS`). */
  limits?: AnalyseOptions['limits'];
  /**
   * A fresh clock for each whole-analysis case (default: the machine's). A clock of counted work
   * (`workClock`) makes a run the same on any machine, and each case is held to `REPLAY_OVERSHOOT_MS`
   * past its limit (see `checkCase`).
   */
  clock?: () => Clock;
  /**
   * Time cases by the process's CPU time (`CPU_CLOCK`), and run the whole analyses' time limit on it,
   * instead of the wall clock (default false). On a machine shared with other work the wall clock also
   * counts the time the process waited for a core, which says nothing about the engine.
   */
  cpu?: boolean;
  /** Shares of the kinds of case, out of 100 (default: 20 parse, 20 static, 47 analyse, 5 + 5 command line, 3 trees). */
  shares?: [CaseKind, number][];
  /**
   * Also send broken frames to a spawned language server ('lsp-frames', 2 in 100 cases; default off: each
   * case spawns dist/server.js, and the server's reader is fixed on its own branch).
   */
  frames?: boolean;
}

// ---------------------------------------------------------------------------------------------------
// Pseudo-random choices (mulberry32): fast, seedable, enough for picking mutations.

/** A seeded generator of floats in [0, 1). */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function pick<T>(r: () => number, xs: readonly T[]): T {
  return xs[Math.floor(r() * xs.length)]!;
}

// ---------------------------------------------------------------------------------------------------
// Vocabulary for mutations and generated files.

/** Numbers at the edges of double precision and of common sense, as they would be written. */
export const EDGE_NUMBERS = [
  '0', '-0', '1', '-1', '0.5', '2', '1e308', '-1e308', '1.7976931348623157e308', '1e309', '-1e309', '1e400',
  '5e-324', '4.9e-324', '2.2250738585072014e-308', '1e-320', '1e-300', '1e-30', '9007199254740993',
  '1e20', '1e-9', '123456789012345678901234567890', '0.000', '1e+5', '3.', '.5', '00001', '1e-400',
  'NaN', 'Infinity', '-Infinity', 'inf', '1/0', '0/0', '(-1)^0.5', 'sqrt(-1)', 'log(0)', '10^400',
] as const;

const KEYWORDS = ['units', 'mass', 'let', 'system', 'state', 'basis', 'expect', 'evolve', 'to', 'steps', 'over', 'of'];
const FRAGMENTS = [
  ...KEYWORDS, 'box(', 'well(', 'oscillator(', 'V(x) =', 'psi(x) =', 'eigen(', 'gaussian(', 'phi(', 'x', 'nm', 'meV', 'ps',
  'm_e', 'u', 'eV', 'MHz', 'depth =', 'width =', 'center =', 'omega =', 'frequency =', 'quantum =', 'momentum =',
  '+-', '\u00b1', '>=', '<=', '..', '?', ':', '[', ']', '(', ')', ',', '=', '#', '\n', '\n  ', '\t', '\r\n', '"', "'", '`',
  '\u0000', '\ufeff', '\u2028', '\ud83d\ude00', '\ud800', 'é', 'exp(', 'sin(', 'sqrt(', 'abs(', 'i', 'pi', 'e', '^', '*', '/',
  'import(', 'evaluate(', 'x.constructor', '__proto__', 'norm', 'parity even', 'weight 1..3 >= 0.9', 'energy', 'spread',
];

const LENGTHS = ['nm', 'pm', 'angstrom', 'um', 'bohr', 'm', 'fm'];
const ENERGIES = ['meV', 'eV', 'ueV', 'keV', 'Ha', 'Ry', 'J', 'MeV'];
const TIMES = ['ps', 'fs', 'ns', 'us', 's', 'as'];

// ---------------------------------------------------------------------------------------------------
// Mutation of an existing text.

/** Applies 1-4 random edits to `text`: characters, fragments, numbers at the edges, lines. */
export function mutate(text: string, r: () => number): string {
  let t = text;
  const edits = 1 + Math.floor(r() * 4);
  for (let k = 0; k < edits; k++) {
    const at = Math.floor(r() * (t.length + 1));
    const op = Math.floor(r() * 11);
    switch (op) {
      case 0: // delete a short run
        t = t.slice(0, at) + t.slice(at + 1 + Math.floor(r() * 6));
        break;
      case 1: // insert a fragment
        t = t.slice(0, at) + pick(r, FRAGMENTS) + t.slice(at);
        break;
      case 2: // replace one character
        t = t.slice(0, at) + String.fromCharCode(32 + Math.floor(r() * 95)) + t.slice(at + 1);
        break;
      case 3:
      case 4: {
        // replace a number by one at the edges
        const nums = [...t.matchAll(/\d+(\.\d*)?(e[+-]?\d+)?/g)];
        if (nums.length === 0) break;
        const m = pick(r, nums);
        t = t.slice(0, m.index!) + pick(r, EDGE_NUMBERS) + t.slice(m.index! + m[0].length);
        break;
      }
      case 5: {
        // duplicate, delete or swap lines
        const lines = t.split('\n');
        const i = Math.floor(r() * lines.length);
        const j = Math.floor(r() * lines.length);
        const how = Math.floor(r() * 3);
        if (how === 0) lines.splice(j, 0, lines[i]!);
        else if (how === 1) lines.splice(i, 1);
        else [lines[i], lines[j]] = [lines[j]!, lines[i]!];
        t = lines.join('\n');
        break;
      }
      case 6: // truncate
        t = t.slice(0, at);
        break;
      case 7: {
        // swap a unit for another (often the wrong dimension)
        const units = [...t.matchAll(/\b(nm|meV|ps|fs|eV|angstrom|MHz|m_e|u|ueV|us)\b/g)];
        if (units.length === 0) break;
        const m = pick(r, units);
        t = t.slice(0, m.index!) + pick(r, [...LENGTHS, ...ENERGIES, ...TIMES, 'MHz', 'm_e', 'kg', '']) + t.slice(m.index! + m[0].length);
        break;
      }
      case 8: // negate something
        t = t.slice(0, at) + '-' + t.slice(at);
        break;
      case 9: {
        // set or grow the basis
        const n = pick(r, ['0', '1', '2', '7', '100', '600', '4999', '5000', '5001', '1e6', '2.5', '-3', 'x']);
        t = /^basis .*$/m.test(t) ? t.replace(/^basis .*$/m, `basis ${n}`) : `${t}\nbasis ${n}`;
        break;
      }
      default: {
        // append an expect or evolve line
        t += '\n' + pick(r, [
          'expect norm 1 +- 1e-6', 'expect parity odd', 'expect weight 1..3 >= 0.5', 'expect weight 2 <= 0.1',
          'expect energy 1 +- 0.1', 'expect spread 0 +- 1', `evolve to ${pick(r, EDGE_NUMBERS)} steps ${pick(r, ['1', '10', '0', '100000', '1e9', '-2'])}`,
          `let q = ${pick(r, EDGE_NUMBERS)}`,
        ]);
      }
    }
  }
  return t;
}

// ---------------------------------------------------------------------------------------------------
// Structurally valid files (fast-check arbitraries).

const arbNumber = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom('0.5', '1', '2', '3', '0.25', '10', '1.5', '4') },
  { weight: 2, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e3, max: 1e3 }).map((v) => String(Number(v.toPrecision(4)))) },
  { weight: 1, arbitrary: fc.constantFrom(...EDGE_NUMBERS) },
);

function withUnit(n: fc.Arbitrary<string>, units: readonly string[], physical: boolean): fc.Arbitrary<string> {
  if (!physical) return n;
  // Usually the right dimension, sometimes another one or none: those must be `units` findings.
  return fc.tuple(n, fc.oneof({ weight: 6, arbitrary: fc.constantFrom(...units) }, { weight: 1, arbitrary: fc.constantFrom('', 'ps', 'MHz', 'meV', 'nm', 'm_e') })).map(([v, u]) => (u ? `${v} ${u}` : v));
}

function arbSystem(physical: boolean, L: string, E: string): fc.Arbitrary<string> {
  const len = withUnit(arbNumber, [L], physical);
  const en = withUnit(arbNumber, [E], physical);
  const freq = physical ? withUnit(arbNumber, ['MHz', 'GHz', 'THz'], true) : arbNumber;
  const x = physical ? `x / (1 ${L})` : 'x';
  const scaleV = physical ? ` * (1 ${E})` : '';
  return fc.oneof(
    fc.tuple(len, len).map(([a, b]) => `box(${a}, ${b})`),
    fc.tuple(en, len, fc.option(len)).map(([d, w, c]) => `well(depth = ${d}, width = ${w}${c ? `, center = ${c}` : ''})`),
    fc.tuple(fc.constantFrom('omega', 'frequency', 'quantum'), freq, en, fc.option(len)).map(([k, f, q, c]) =>
      `oscillator(${k} = ${k === 'quantum' ? q : f}${c ? `, center = ${c}` : ''})`,
    ),
    fc.tuple(fc.constantFrom(`(${x})^2`, `(${x})^4 - 2 * (${x})^2`, `abs(${x})`, `-1 / cosh(${x})^2`, `${x} > 0 ? 1 : 0`, `exp(${x})`, '0', `1 / ${x}`, `log(abs(${x}))`), len, len).map(
      ([v, a, b]) => `V(x) = (${v})${scaleV} over [${a}, ${b}]`,
    ),
  );
}

function arbState(physical: boolean, L: string, E: string): fc.Arbitrary<string> {
  const len = withUnit(arbNumber, [L], physical);
  const k = physical ? withUnit(arbNumber, [`/ ${L}`], true).map((s) => s.replace(/ \/ /, ' / ')) : arbNumber;
  const x = physical ? `(x / (1 ${L}))` : 'x';
  return fc.oneof(
    fc.constantFrom(
      `psi(x) = ${x} * (1 - ${x})`, `psi(x) = exp(-${x}^2)`, `psi(x) = sin(pi * ${x})^3`, `psi(x) = 1`, `psi(x) = 0`, `psi(x) = 0 * ${x}`,
      `psi(x) = 1 / ${x}`, `psi(x) = 1 / (${x} - 0.5)`, `psi(x) = ${x} < 0.5 ? 1 : 0`, `psi(x) = exp(i * ${x})`, `psi(x) = sqrt(${x})`,
      `psi(x) = log(${x})`, `psi(x) = 1e308 * ${x}`, `psi(x) = 5e-324 * ${x}`, `psi(x) = phi(1, x) + phi(2, x)`, `psi(x) = phi(9999, x)`,
      `psi(x) = exp(1000 * ${x})`, `psi(x) = ${x}^-1`, `psi(x) = (${x} - 0.5)^0`, `psi(x) = abs(${x} - 0.5)^0.5`,
    ),
    fc.tuple(fc.constantFrom('0', '1', '2', '3', '-1', '4.5', '1e9'), arbSystem(physical, L, E)).map(([n, s]) => `eigen(${n}) of ${s}`),
    fc.tuple(len, len, fc.option(k)).map(([c, w, m]) => `gaussian(center = ${c}, width = ${w}${m ? `, momentum = ${m}` : ''})`),
    // Mixed states, with occupations and temperatures low enough that a thermal sum stays short.
    fc.tuple(fc.constantFrom('nbar = 0', 'nbar = 0.3', 'nbar = -1', 'nbar = 1e-300', 'temperature = 0', `temperature = ${physical ? '1e-3 K' : '0.01'}`, 'temperature = 1 nm'), arbSystem(physical, L, E)).map(
      ([a, s]) => `thermal(${a}) of ${s}`,
    ),
    fc.tuple(fc.constantFrom('0.5', '1', '-0.1', '0', '1e308'), arbSystem(physical, L, E)).map(([w, s]) => `mixture(${w}: eigen(1) of ${s}, 0.5: psi(x) = 1)`),
  );
}

/** A structurally valid file: optional units and mass, lets, a system, a state, basis, expects, evolve. */
export const arbFile: fc.Arbitrary<string> = fc
  .record({
    physical: fc.boolean(),
    L: fc.constantFrom(...LENGTHS),
    E: fc.constantFrom(...ENERGIES),
    T: fc.option(fc.constantFrom(...TIMES)),
    mass: fc.option(fc.constantFrom('1', '0.067 m_e', '2 m_e', '1 u', '-1 m_e', '0 m_e', '1e308 u', '5e-324 m_e', '1 kg', '1 nm')),
    seed: fc.integer(),
  })
  .chain(({ physical, L, E, T, mass, seed }) =>
    fc
      .tuple(
        arbSystem(physical, L, E),
        fc.option(arbState(physical, L, E), { freq: 8 }),
        fc.option(fc.constantFrom('1', '2', '5', '20', '60', '200', '0', '5001', '2.5')),
        fc.array(fc.constantFrom('norm 1 +- 1e-6', 'parity even', 'parity mixed', 'weight 1..3 >= 0.5', 'weight 0 <= 0.2', 'energy 1 +- 10', 'spread 1 +- 10'), { maxLength: 3 }),
        fc.option(fc.tuple(arbNumber, fc.constantFrom('10', '50', '1', '0'))),
      )
      .map(([system, state, basis, expects, ev]) => {
        const lines: string[] = [`# generated case ${seed}`];
        if (physical) lines.push(`units ${[L, E, ...(T ? [T] : [])].join(', ')}`);
        if (mass) lines.push(`mass ${physical ? mass : mass.replace(/ .*/, '')}`);
        lines.push(`system ${system}`);
        if (state) lines.push(`state ${state}`);
        if (basis) lines.push(`basis ${basis}`);
        for (const e of expects) lines.push(`expect ${physical && /energy|spread/.test(e) ? e.replace(/(\d+)( \+- )(\d+)/, `$1 ${E}$2$3 ${E}`) : e}`);
        if (ev) lines.push(`evolve to ${physical && T ? `${ev[0]} ${T}` : ev[0]} steps ${ev[1]}`);
        return lines.join('\n') + '\n';
      }),
  );

/** Raw random text: unicode strings and strings over the file's own alphabet. */
const arbRandomText: fc.Arbitrary<string> = fc.oneof(
  fc.string({ unit: 'binary', maxLength: 200 }),
  fc.array(fc.constantFrom(...FRAGMENTS, ' ', ' ', '1', '0.5', 'x'), { maxLength: 60 }).map((xs) => xs.join(' ')),
);

// ---------------------------------------------------------------------------------------------------
// The promises checked on every result live in promises.ts; here, the front doors that produce results.

const CHECK_LINE = /^(.+):(\d+):(\d+): (error|warning|info)\[([a-z]+)\]: (.*)$/;
/** The built language server; EIGENSPAN_ROOT names the checkout when the harness runs bundled elsewhere (scripts/fuzz.mjs). */
const serverPath = (): string => join(process.env.EIGENSPAN_ROOT ?? join(__dirname, '..', '..'), 'dist', 'server.js');

function runCli(argv: string[]): { code: number; out: string; err: string } {
  let out = '';
  let err = '';
  const code = run(argv, { out: (s) => (out += s), err: (s) => (err += s), isTTY: false });
  return { code, out, err };
}

let scratchDir: string | null = null;
function scratchFile(text: string): string {
  if (!scratchDir) scratchDir = mkdtempSync(join(tmpdir(), 'eigenspan-fuzz-'));
  const f = join(scratchDir, 'case.qstate');
  writeFileSync(f, text);
  return f;
}

/** Removes the scratch folder of the command-line cases. */
export function cleanUp(): void {
  if (scratchDir) rmSync(scratchDir, { recursive: true, force: true });
  scratchDir = null;
}

/**
 * Runs one case and returns the promises it broke (an empty list when it kept them all) and its time.
 * With `clock` (whole analyses only), the analysis runs on it and must end within `REPLAY_OVERSHOOT_MS`
 * of the clock past its limit, with a limits finding when it went past.
 */
export function checkCase(c: FuzzCase, budgetMs = 2000, limits: AnalyseOptions['limits'] = FUZZ_LIMITS, clock?: Clock, timer?: Clock): { problems: string[]; ms: number } {
  const problems: string[] = [];
  const n = c.text.length;
  const now = timer ? () => timer.now() : () => performance.now();
  const started = now();
  try {
    switch (c.kind) {
      case 'parse': {
        const r = parse(c.text);
        for (const d of r.diagnostics) problems.push(...diagnosticProblems(d, n));
        for (const s of r.file.statements) if (!(0 <= s.span.start && s.span.start <= s.span.end && s.span.end <= n)) problems.push(`statement '${s.kind}' spans [${s.span.start}, ${s.span.end})`);
        break;
      }
      case 'static': {
        const r = analyseStatic(c.text);
        for (const d of r.diagnostics) problems.push(...diagnosticProblems(d, n));
        break;
      }
      case 'analyse': {
        const r = analyse(c.text, { samples: c.samples ?? false, limits, clock: clock ?? timer });
        const limit = limits?.maxMillis ?? Infinity;
        if (clock && r.elapsedMs !== undefined && r.elapsedMs > limit + REPLAY_OVERSHOOT_MS) problems.push(`ran ${r.elapsedMs.toFixed(0)} ms of counted work under a limit of ${limit} ms`);
        if (clock && r.elapsedMs !== undefined && r.elapsedMs > limit && !r.diagnostics.some((d) => d.code === 'limits')) problems.push('went past the time limit without a limits finding');
        for (const d of r.diagnostics) problems.push(...diagnosticProblems(d, n));
        problems.push(...resultProblems(r));
        if (c.samples && r.samples) {
          for (const k of ['re', 'im', 'potential'] as const) if (r.samples[k].some((v) => !Number.isFinite(v))) problems.push(`samples.${k} holds a non-finite value`);
        }
        break;
      }
      case 'cli-check': {
        const f = scratchFile(c.text);
        const { code, out, err } = runCli(['check', f, '--time-limit', String(FUZZ_LIMITS.maxMillis), '--sweep-time-limit', String(FUZZ_SWEEP_MS)]);
        problems.push(...checkOutputProblems(code, out, err));
        for (const line of out.split('\n').filter((l) => l.length > 0)) {
          const m = CHECK_LINE.exec(line);
          if (m) problems.push(...messageProblems(m[6]!));
        }
        break;
      }
      case 'cli-tree': {
        problems.push(...checkTreeCase(c.tree ?? []));
        break;
      }
      case 'lsp-frames': {
        problems.push(...checkFramesCase(c.frames ?? [], serverPath()));
        break;
      }
      case 'cli-json': {
        const f = scratchFile(c.text);
        const { code, out, err } = runCli(['expand', f, '--json', '--time-limit', String(FUZZ_LIMITS.maxMillis), '--sweep-time-limit', String(FUZZ_SWEEP_MS)]);
        if (code !== 0 && code !== 1) problems.push(`expand exited ${code}: ${err.trim()}`);
        if (RAW_UNSAFE.test(out.replace(/\n/g, '')) || RAW_UNSAFE.test(err)) problems.push(`expand --json printed a raw control character: ${JSON.stringify(out.slice(0, 200))}`);
        let j: { levels?: unknown[]; diagnostics?: { severity: string; line: number; column: number; endLine: number; endColumn: number; message: string }[] };
        try {
          j = JSON.parse(out);
        } catch {
          problems.push(`expand --json printed something that is not JSON: ${JSON.stringify(out.slice(0, 200))}`);
          break;
        }
        if (!Array.isArray(j.levels) || !Array.isArray(j.diagnostics)) {
          problems.push('expand --json lacks levels or diagnostics');
          break;
        }
        const lines = c.text.split(/\r\n|\r|\n/).length;
        for (const d of j.diagnostics) {
          if (!(d.line >= 1 && d.line <= lines && d.endLine >= d.line && d.endLine <= lines && d.column >= 1 && d.endColumn >= 1)) problems.push(`JSON diagnostic at ${d.line}:${d.column}-${d.endLine}:${d.endColumn} outside ${lines} lines`);
          problems.push(...messageProblems(d.message));
        }
        const errors = j.diagnostics.some((d) => d.severity === 'error');
        if ((code === 1) !== errors) problems.push(`expand exited ${code} but ${errors ? 'reported' : 'did not report'} an error`);
        break;
      }
    }
  } catch (e) {
    problems.push(`threw: ${e instanceof Error ? `${e.name}: ${e.message}\n${e.stack ?? ''}` : String(e)}`);
  }
  const ms = now() - started;
  // A command-line case with a sweep line also runs the sweep, under its own limit.
  if ((c.kind === 'cli-check' || c.kind === 'cli-json') && /^[ \t]*sweep\b/m.test(c.text)) budgetMs += FUZZ_SWEEP_MS;
  if (ms > budgetMs) problems.push(`took ${ms.toFixed(0)} ms${timer === CPU_CLOCK ? ' of CPU time' : ''}, above the budget of ${budgetMs} ms`);
  return { problems: [...new Set(problems)], ms };
}

// ---------------------------------------------------------------------------------------------------
// The run.

/** The share of each kind of case, out of 100. Whole analyses dominate: they reach the most code. */
const KIND_SHARES: [CaseKind, number][] = [
  ['parse', 20],
  ['static', 20],
  ['analyse', 47],
  ['cli-check', 5],
  ['cli-json', 5],
  ['cli-tree', 3],
];

function chooseKind(r: () => number, shares: [CaseKind, number][]): CaseKind {
  const total = shares.reduce((a, [, s]) => a + s, 0);
  let x = r() * total;
  for (const [k, s] of shares) {
    if (x < s) return k;
    x -= s;
  }
  return 'analyse';
}

/**
 * Generates `cases` cases from the examples and the generators, runs each, and reports every failure and
 * the slowest case. Deterministic for a given seed and example set. Never throws on a failing case.
 */
export function generateCases(options: FuzzOptions): FuzzCase[] {
  const total = options.cases ?? 1000;
  const seed = options.seed ?? 20261201;
  const r = rng(seed);
  const nGen = Math.ceil(total * 0.4);
  const nRandom = Math.ceil(total * 0.1);
  const generated = fc.sample(arbFile, { numRuns: nGen, seed });
  const random = fc.sample(arbRandomText, { numRuns: nRandom, seed: seed + 1 });
  const out: FuzzCase[] = [];
  let g = 0;
  let q = 0;
  for (let i = 0; i < total; i++) {
    const which = r();
    let text: string;
    let origin: string;
    if (which < 0.4 && g < generated.length) {
      text = generated[g++]!;
      origin = 'generated';
      // Half of the generated files are mutated too: valid structure, one thing wrong.
      if (r() < 0.5) {
        text = mutate(text, r);
        origin = 'generated+mutation';
      }
    } else if (which < 0.5 && q < random.length) {
      text = random[q++]!;
      origin = 'random';
    } else if (which < 0.56) {
      // The hostile texts of issue 14: long names, many names, control characters.
      const h = Math.floor(r() * 3);
      const ex = options.examples.length > 0 ? pick(r, options.examples).text : '';
      text = h === 0 ? longNamesText(r) : h === 1 ? manyNamesText(r) : controlsText(r, ex);
      origin = `hostile:${['long-names', 'many-names', 'controls'][h]}`;
    } else if (options.examples.length > 0) {
      const ex = pick(r, options.examples);
      text = mutate(ex.text, r);
      origin = `mutation:${ex.name}`;
    } else {
      text = generated[g++ % generated.length]!;
      origin = 'generated';
    }
    const shares = options.shares ?? KIND_SHARES;
    const kind = chooseKind(r, options.frames === true ? [...shares, ['lsp-frames', 2]] : shares);
    const c: FuzzCase = { kind, text, origin };
    if (kind === 'analyse') c.samples = r() < 0.3;
    if (kind === 'cli-tree') [c.text, c.origin, c.tree] = ['', 'hostile:tree', treeEntries(r)];
    if (kind === 'lsp-frames') {
      c.frames = Array.from({ length: 1 + Math.floor(r() * 3) }, () => brokenFrame(r));
      [c.text, c.origin] = ['', 'hostile:frames'];
    }
    out.push(c);
  }
  return out;
}

/** Runs the cases of `generateCases(options)` and reports. */
export function runFuzz(options: FuzzOptions): FuzzReport {
  const budget = options.budgetMs ?? 2000;
  const maxFailures = options.maxFailures ?? 50;
  const started = performance.now();
  const cases = generateCases(options);
  const report: FuzzReport = {
    cases: 0,
    failures: [],
    slowest: { ms: 0, case: null },
    byKind: { parse: 0, static: 0, analyse: 0, 'cli-check': 0, 'cli-json': 0, 'cli-tree': 0, 'lsp-frames': 0 },
    totalMs: 0,
    times: [],
    slow: [],
  };
  try {
    cases.forEach((c, i) => {
      if (report.failures.length >= maxFailures) return;
      options.beforeCase?.(c, i);
      const { problems, ms } = checkCase(c, budget, options.limits ?? FUZZ_LIMITS, c.kind === 'analyse' ? options.clock?.() : undefined, options.cpu === true ? CPU_CLOCK : undefined);
      options.afterCase?.(c, i, problems, ms);
      report.times.push(ms);
      report.cases++;
      report.byKind[c.kind]++;
      if (ms > report.slowest.ms) report.slowest = { ms, case: c };
      if (report.slow.length < 10 || ms > report.slow[report.slow.length - 1]!.ms) {
        report.slow.push({ ms, case: c });
        report.slow.sort((a, b) => b.ms - a.ms);
        report.slow.length = Math.min(10, report.slow.length);
      }
      if (problems.length > 0) report.failures.push({ case: c, problems, ms });
    });
  } finally {
    cleanUp();
  }
  report.totalMs = performance.now() - started;
  return report;
}
