/**
 * Background design sweeps over stdio with a real client (the built dist/server.js, lsp/sweepRuns.ts):
 * after the full analysis of a revision with a valid sweep line the server sweeps on its own, with
 * server-initiated work-done progress and `eigenspan/sweepPoint`, ends with `eigenspan/sweepResult`,
 * and publishes that version's diagnostics again with the sweep's findings (the window verdict, one
 * `limits` finding, its coarser-step fix); the next edit cancels it silently; an explicit
 * `eigenspan/sweep` for the same version attaches to it. Events are waited for; nothing sleeps.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { WorkDoneProgress, type PublishDiagnosticsParams } from 'vscode-languageserver-protocol/node';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { CAPABILITIES, startClient, type TestClient } from './client';

interface Progress {
  token: string | number;
  kind: 'begin' | 'report' | 'end';
}
interface SweepResultParams {
  uri: string;
  version: number;
  sweep: { finished: number; total: number; stopped: string | null; windows: unknown[]; located: { kind: string; at: number }[] } | null;
}
interface Recorder {
  c: TestClient;
  created: (string | number)[];
  progress: Progress[];
  points: { version: number; finished: number }[];
  results: SweepResultParams[];
  /** The first sweepResult for `version` (already received or future). */
  result: (version: number) => Promise<SweepResultParams>;
  /** The first progress event satisfying `accept`. */
  next: (accept: (p: Progress) => boolean) => Promise<Progress>;
}

let client: TestClient | null = null;
afterEach(async () => {
  await client?.stop();
  client = null;
});

/** Resolves when `accept` holds for something pushed into `list` (checked on every push). */
function when<T>(list: T[], hooks: (() => void)[], accept: (v: T) => boolean): Promise<T> {
  return new Promise((resolve) => {
    const check = (): boolean => {
      const hit = list.find(accept);
      if (hit !== undefined) resolve(hit);
      return hit !== undefined;
    };
    if (!check()) hooks.push(() => void check());
  });
}

async function recorder(settings: Record<string, unknown>): Promise<Recorder> {
  const c = await startClient({ capabilities: { ...CAPABILITIES, window: { workDoneProgress: true } }, settings });
  client = c;
  const hooks: (() => void)[] = [];
  const poke = (): void => hooks.forEach((h) => h());
  const r: Recorder = { c, created: [], progress: [], points: [], results: [], result: (v) => when(r.results, hooks, (x) => x.version === v), next: (a) => when(r.progress, hooks, a) };
  c.connection.onRequest('window/workDoneProgress/create', (p: { token: string | number }) => {
    r.created.push(p.token);
    c.connection.onProgress(WorkDoneProgress.type, p.token, (value) => {
      r.progress.push({ token: p.token, kind: value.kind });
      poke();
    });
    return null;
  });
  c.connection.onNotification('eigenspan/sweepPoint', (p: { version: number; finished: number }) => {
    r.points.push(p);
    poke();
  });
  c.connection.onNotification('eigenspan/sweepResult', (p: SweepResultParams) => {
    r.results.push(p);
    poke();
  });
  return r;
}

// A finite well swept over its depth (natural units, hbar = m = 1): level k + 1 binds at
// D = k^2 pi^2 / 8 for a well of width 2 (z0 = k pi / 2, the standard square-well result, any quantum
// mechanics text). The packet's ground-level weight is 0.912 at D = 1 (the table of `eigenspan sweep`
// for this file), so the weight expect fails there and the window cannot cover 1..12.
const WELL = 'let D = 5\nsystem well(depth = D, width = 2)\nstate gaussian(center = 0, width = 0.5)\nexpect weight 1 >= 0.95\nsweep D from 1 to 12 steps 7\nexpect window covers 1..12\n';
// A numerical system that changes at every point: 5001 points cannot finish in a short time limit.
const LONG = 'let k = 1\nsystem V(x) = k x^4 over [-4, 4]\nstate gaussian(center = 0.3, width = 0.5)\nbasis 30\nsweep k from 1 to 3 steps 5000\n';

const lineOf = (text: string, needle: string): number => text.slice(0, text.indexOf(needle)).split('\n').length - 1;

describe('background sweeps', () => {
  it('sweeps after the analysis, with progress and points, then publishes the window verdict for that version', async () => {
    const r = await recorder({});
    const uri = 'file:///well.qstate';
    r.c.open(uri, WELL);
    const done = await r.result(1);
    expect(done.sweep!.finished).toBe(8);
    expect(done.sweep!.stopped).toBeNull();
    const steps = done.sweep!.located.filter((l) => l.kind === 'bound').map((l) => l.at);
    [1, 4, 9].forEach((k2, i) => expect(Math.abs(steps[i]! - (k2 * Math.PI ** 2) / 8) / steps[i]!).toBeLessThan(1e-8));
    expect(r.points.filter((p) => p.version === 1).map((p) => p.finished)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(r.created).toHaveLength(1);
    await r.next((p) => p.token === r.created[0] && p.kind === 'end');
    // The publish after the result carries the window expect's verdict on its own line.
    const windowLine = lineOf(WELL, 'expect window');
    const pub = await r.c.diagnostics(uri, (p) => p.version === 1 && p.diagnostics.some((d) => d.code === 'expect' && d.range.start.line === windowLine));
    const verdict = pub.diagnostics.filter((d) => d.range.start.line === windowLine);
    expect(verdict).toHaveLength(1);
    expect(verdict[0]!.message).toContain('Expected the design window to cover 1..12');
    // A request for the same version attaches to the finished run: same answer, no second run.
    const answer = (await r.c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri } })) as { version: number; sweep: { finished: number }; diagnostics: { code: string }[] };
    expect(answer.version).toBe(1);
    expect(answer.sweep).toEqual(done.sweep);
    expect(answer.diagnostics.filter((d) => d.code === 'expect')).toHaveLength(1);
    expect(r.created).toHaveLength(1);
    expect(r.c.logs.filter((l) => /sweep of file:\/\/\/well\.qstate .* started/.test(l))).toEqual(['sweep of file:///well.qstate (version 1) started in the background']);
  });

  it('is cancelled silently by the next edit and runs again for the new version', async () => {
    const r = await recorder({});
    const uri = 'file:///long.qstate';
    r.c.open(uri, LONG);
    await r.next((p) => p.kind === 'report');
    r.c.change(uri, 2, WELL);
    await r.c.log(/sweep of file:\/\/\/long\.qstate \(version 1\) stopped: superseded/);
    const second = await r.result(2);
    expect(second.sweep!.finished).toBe(8);
    // The first run's progress ended, and it sent no result.
    await r.next((p) => p.token === r.created[0] && p.kind === 'end');
    expect(r.results.map((x) => x.version)).toEqual([2]);
    expect(r.created).toHaveLength(2);
  });

  it('shows one limits finding naming the sweep and the analysis, with the coarser step offered', async () => {
    // The grid cap stops the file's own analysis (a limits finding of its own) and the short time limit the sweep.
    const r = await recorder({ sweepTimeLimitMs: 300, limits: { maxGridPoints: 1024 } });
    const uri = 'file:///capped.qstate';
    r.c.open(uri, LONG);
    const end = await r.result(1);
    expect(end.sweep!.stopped).toBe('time');
    const isMerged = (p: PublishDiagnosticsParams): boolean => p.version === 1 && p.diagnostics.some((d) => d.code === 'limits' && /also hit (a|that) limit/.test(String(d.message)));
    const pub = await r.c.diagnostics(uri, isMerged);
    const lim = pub.diagnostics.filter((d) => d.code === 'limits');
    expect(lim).toHaveLength(1);
    expect(lim[0]!.message).toContain(`finished ${end.sweep!.finished} of 5001 points`);
    expect(lim[0]!.message).toContain('maxGridPoints');
    expect(lim[0]!.range.start.line).toBe(lineOf(LONG, 'sweep'));
    const actions = (await r.c.connection.sendRequest('textDocument/codeAction', { textDocument: { uri }, range: lim[0]!.range, context: { diagnostics: [lim[0]] } })) as { title: string }[];
    expect(actions.some((a) => /^Sweep 'k' in \d+ steps$/.test(a.title))).toBe(true);
  });

  it('attaches a request to the run going and stops it with the progress', async () => {
    const r = await recorder({});
    const uri = 'file:///long.qstate';
    r.c.open(uri, LONG);
    await r.next((p) => p.kind === 'report');
    const answer = r.c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri } }) as Promise<{ sweep: { finished: number; stopped: string } }>;
    r.c.connection.sendNotification('window/workDoneProgress/cancel', { token: r.created[0] });
    const [a, res] = await Promise.all([answer, r.result(1)]);
    expect(a.sweep.stopped).toBe('cancelled');
    expect(res.sweep).toEqual(a.sweep);
    expect(r.created).toHaveLength(1);
    // The cancelled run's note is published for that version.
    await r.c.diagnostics(uri, (p) => p.version === 1 && p.diagnostics.some((d) => d.code === 'limits' && /cancelled after/.test(String(d.message))));
  });

  it('does not sweep on its own when eigenspan.sweepInBackground is false', async () => {
    const r = await recorder({ sweepInBackground: false, debounceMs: 0 });
    const uri = 'file:///well.qstate';
    r.c.open(uri, WELL);
    await r.c.result(uri, (x) => x.version === 1);
    // With the debounce at 0 a background run would have started before this request is read.
    const answer = (await r.c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri } })) as { sweep: { finished: number } };
    expect(answer.sweep.finished).toBe(8);
    expect(r.c.logs.filter((l) => / started /.test(l))).toEqual(['sweep of file:///well.qstate (version 1) started on request']);
  });

  it("hands the document's data files to the sweep worker", async () => {
    // Samples of the oscillator's ground state exp(-x^2 / 2) (natural units, any text), swept over omega.
    const dir = mkdtempSync(join(tmpdir(), 'eigenspan-lsp-sweep-'));
    const rows = ['x, re', ...Array.from({ length: 81 }, (_, i) => `${(-8 + 0.2 * i).toFixed(4)}, ${Math.exp(-((-8 + 0.2 * i) ** 2) / 2).toPrecision(12)}`)];
    writeFileSync(join(dir, 'ground.csv'), rows.join('\n') + '\n');
    const text = 'let w = 1\nsystem oscillator(omega = w)\nstate samples("ground.csv")\nbasis 20\nsweep w from 0.5 to 2 steps 6\n';
    const uri = pathToFileURL(join(dir, 'sampled.qstate')).href;
    writeFileSync(join(dir, 'sampled.qstate'), text);
    const r = await recorder({});
    r.c.open(uri, text);
    const end = await r.result(1);
    const points = (end.sweep as unknown as { points: { valid: boolean; levels: { weight: number }[] }[] }).points;
    expect(points.every((p) => p.valid)).toBe(true);
    // At omega = 1 (the third point) the samples are the ground state itself: |c_0|^2 = 1 to the sampling's accuracy.
    expect(points[2]!.levels[0]!.weight).toBeGreaterThan(0.9999);
  });
});
