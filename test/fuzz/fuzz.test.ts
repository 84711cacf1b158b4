/**
 * Runs the fuzz harness at CI size and replays every case that once failed (test/fixtures/fuzz/*.json,
 * saved by `npm run fuzz`). The promises checked are listed in harness.ts; a failure prints the case.
 */
import { describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkCase, diagnosticProblems, generateCases, isTimeCase, messageProblems, mutate, REPLAY_LIMITS, REPLAY_MS_PER_OP, rng, runFuzz, type FuzzCase } from './harness';
import { workClock } from '../../server/src/physics/budget';
import { checkOutputProblems } from './hostile';

const root = join(__dirname, '..', '..');
const examplesDir = join(root, 'examples');
const examples = readdirSync(examplesDir)
  .filter((f) => f.endsWith('.qstate'))
  .map((f) => ({ name: f, text: readFileSync(join(examplesDir, f), 'utf8') }));
const fixturesDir = join(root, 'test', 'fixtures', 'fuzz');
const fixtures = existsSync(fixturesDir) ? readdirSync(fixturesDir).filter((f) => f.endsWith('.json')).sort() : [];

// This file guards against regressions (exceptions, ranges, messages, numbers, hangs) in a loaded CI run.
// Nothing in it is timed: a hang fails by the runner's time-out of the test, and the per-case time budget
// is off here (Infinity). `npm run fuzz` (scripts/fuzz.mjs) is the measuring run: it holds every case to
// 2 s on its own machine share (the analyses run under a 1.5 s time limit there) and reports the slowest.
const CI_BUDGET_MS = Infinity;

function describeFailure(c: FuzzCase, problems: string[]): string {
  return `${c.kind} (${c.origin}):\n  ${problems.join('\n  ')}\n--- text ---\n${c.text}`;
}

describe('the checks of the harness can fail', () => {
  it('flags messages that are not sentences', () => {
    expect(messageProblems('The state is zero everywhere.')).toEqual([]);
    expect(messageProblems("'NaN' is not allowed; write a finite number.")).toEqual([]);
    expect(messageProblems('the state is zero')).toHaveLength(2);
    expect(messageProblems('The value is undefined.')).toHaveLength(1);
    expect(messageProblems('The state is NaN at x = 0.5.')).toHaveLength(1);
    expect(messageProblems('Oops [object Object].')).toHaveLength(1);
    expect(messageProblems('Failed: TypeError: x is not a function\n    at f (a.ts:1:2).').length).toBeGreaterThan(0);
  });

  it('flags ranges outside the document', () => {
    const d = { start: 3, end: 12, severity: 'error' as const, code: 'syntax' as const, message: 'A problem.' };
    expect(diagnosticProblems(d, 12)).toEqual([]);
    expect(diagnosticProblems(d, 11)).toHaveLength(1);
    expect(diagnosticProblems({ ...d, start: -1 }, 12)).toHaveLength(1);
  });

  it('flags raw control characters, a missing summary and forged lines in check output', () => {
    const ok = 'a.qstate:2:3: error[name]: Unknown name \\x1B[2K.\n';
    expect(checkOutputProblems(1, ok, 'eigenspan check: 1 file, 1 error, 0 warnings.\n')).toEqual([]);
    expect(checkOutputProblems(1, ok.replace('\\x1B', '\u001b'), 'eigenspan check: 1 file, 1 error, 0 warnings.\n')).toHaveLength(1);
    expect(checkOutputProblems(1, ok, '')).toHaveLength(1);
    expect(checkOutputProblems(1, ok + 'forged\n', 'eigenspan check: 1 file, 1 error, 0 warnings.\n')).toHaveLength(1);
  });

  it('generates the hostile classes of issue 14', () => {
    const origins = new Set(generateCases({ cases: 1000, seed: 20261201, examples, shares: [['static', 90], ['cli-tree', 10]], frames: true }).map((c) => c.origin));
    for (const o of ['hostile:long-names', 'hostile:many-names', 'hostile:controls', 'hostile:tree', 'hostile:frames']) expect(origins.has(o), o).toBe(true);
  });

  it('mutates deterministically for a seed', () => {
    const t = examples[0]!.text;
    expect(mutate(t, rng(3))).toBe(mutate(t, rng(3)));
    expect(mutate(t, rng(3))).not.toBe(t);
  });
});

describe('saved fuzz cases', () => {
  it.each(fixtures.length > 0 ? fixtures : ['(none yet)'])('%s keeps every promise', (name) => {
    if (name === '(none yet)') return;
    const c = JSON.parse(readFileSync(join(fixturesDir, name), 'utf8')) as FuzzCase & { problems?: string[] };
    // A saved time overrun replays as a whole analysis on a clock of counted work (cheap, and the same on
    // any machine): it must stop within a small overshoot of its limit and say so.
    const time = isTimeCase(c) && c.kind !== 'lsp-frames' && c.kind !== 'cli-tree';
    const { problems } = time ? checkCase({ ...c, kind: 'analyse' }, CI_BUDGET_MS, REPLAY_LIMITS, workClock(REPLAY_MS_PER_OP)) : checkCase(c, CI_BUDGET_MS);
    expect(problems, describeFailure(c, problems)).toEqual([]);
  });
});

describe('fuzzing at CI size', () => {
  it('runs 1,000 cases through the parser, the analysis and the command line with no broken promise', () => {
    // Cheap front doors weigh more and whole analyses get a 200 ms limit of counted work, to keep this file
    // near 30 s; the full `npm run fuzz` uses the default mix and a 1.5 s limit on the machine's clock.
    const report = runFuzz({
      cases: 1000,
      seed: 20261201,
      budgetMs: CI_BUDGET_MS,
      examples,
      maxFailures: 10,
      shares: [['parse', 35], ['static', 35], ['analyse', 23], ['cli-check', 3], ['cli-json', 3], ['cli-tree', 1]],
      limits: { maxMillis: 200 },
      // On a clock of counted work: the same cases stop at the same place on a loaded machine or an idle one.
      clock: () => workClock(REPLAY_MS_PER_OP),
    });
    const text = report.failures.map((f) => describeFailure(f.case, f.problems)).join('\n\n');
    expect(report.failures, text).toEqual([]);
    expect(report.cases).toBe(1000);
    // Every front door was used.
    for (const k of ['parse', 'static', 'analyse', 'cli-check', 'cli-json'] as const) expect(report.byKind[k]).toBeGreaterThan(10);
    expect(report.byKind['cli-tree']).toBeGreaterThan(3);
    console.log(`fuzz: ${report.cases} cases in ${(report.totalMs / 1000).toFixed(1)} s; slowest ${report.slowest.ms.toFixed(0)} ms (${report.slowest.case?.kind}, ${report.slowest.case?.origin})`);
  }, 240_000);
});

// Broken frames of the language server's stream: each case spawns dist/server.js and must be answered after
// the broken frame, or end the server with a logged reason.
describe('broken frames', () => {
  it('the server answers after, or exits with a reason on, 30 generated broken frames', () => {
    const cases = generateCases({ cases: 1500, seed: 20261201, examples, shares: [['parse', 1]], frames: true }).filter((c) => c.kind === 'lsp-frames').slice(0, 30);
    expect(cases.length).toBe(30);
    const failed = cases.map((c) => ({ c, p: checkCase(c, CI_BUDGET_MS).problems })).filter((x) => x.p.length > 0);
    expect(failed.map((x) => `${JSON.stringify(x.c.frames)}: ${x.p.join('; ')}`)).toEqual([]);
  }, 600_000);
});
