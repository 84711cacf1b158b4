/**
 * The `eigenspan/sweep` request over stdio with a real client (the built dist/server.js): LSP
 * work-done progress (window/workDoneProgress/create, then $/progress begin, reports, end) and
 * cancellation from the progress (window/workDoneProgress/cancel) and from the request ($/cancelRequest).
 * Events are waited for; nothing sleeps.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { CancellationTokenSource, WorkDoneProgress } from 'vscode-languageserver-protocol/node';
import { CAPABILITIES, startClient, type TestClient } from './client';

interface Progress {
  token: string | number;
  value: { kind: 'begin' | 'report' | 'end'; percentage?: number; message?: string; cancellable?: boolean };
}

const CAPS = { ...CAPABILITIES, window: { workDoneProgress: true } };

let client: TestClient | null = null;
afterEach(async () => {
  await client?.stop();
  client = null;
});

/** A client that accepts progress tokens and records every $/progress. */
async function progressClient(settings?: Record<string, unknown>): Promise<{ c: TestClient; created: (string | number)[]; seen: Progress[]; next: (accept: (p: Progress) => boolean) => Promise<Progress> }> {
  const c = await startClient({ capabilities: CAPS, settings });
  client = c;
  const created: (string | number)[] = [];
  const seen: Progress[] = [];
  const waiters: { accept: (p: Progress) => boolean; resolve: (p: Progress) => void }[] = [];
  // The server creates its token first and only then sends $/progress on it, so the handler is in place in time.
  c.connection.onRequest('window/workDoneProgress/create', (p: { token: string | number }) => {
    created.push(p.token);
    c.connection.onProgress(WorkDoneProgress.type, p.token, (value) => {
      const got = { token: p.token, value } as Progress;
      seen.push(got);
      for (const w of [...waiters]) if (w.accept(got)) waiters.splice(waiters.indexOf(w), 1) && w.resolve(got);
    });
    return null;
  });
  const next = (accept: (p: Progress) => boolean): Promise<Progress> => {
    const done = seen.find(accept);
    return done ? Promise.resolve(done) : new Promise((resolve) => waiters.push({ accept, resolve }));
  };
  return { c, created, seen, next };
}

// A finite well whose depth is swept (natural units): level k + 1 appears at D = k^2 pi^2 / 8
// (the standard square-well result, any quantum mechanics text).
const SMALL = 'let D = 5\nsystem well(depth = D, width = 2)\nstate gaussian(center = 0, width = 0.5)\nsweep D from 1 to 12 steps 7\n';
// Many points over a numerical system that changes at every point: long enough to cancel part way.
const LONG = 'let k = 1\nsystem V(x) = k x^4 over [-4, 4]\nstate gaussian(center = 0.3, width = 0.5)\nbasis 30\nsweep k from 1 to 3 steps 5000\n';

describe('eigenspan/sweep', () => {
  it('reports work-done progress point by point and answers with the sweep', async () => {
    const { c, created, seen } = await progressClient();
    const partial: { finished: number; point: { at: number[] } }[] = [];
    c.connection.onNotification('eigenspan/sweepPoint', (p: { finished: number; point: { at: number[] } }) => void partial.push(p));
    c.open('file:///small.qstate', SMALL);
    const r = (await c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri: 'file:///small.qstate' } })) as { sweep: { finished: number; total: number; located: { kind: string; at: number }[] } };
    expect(r.sweep.finished).toBe(8);
    const steps = r.sweep.located.filter((l) => l.kind === 'bound').map((l) => l.at);
    // 1..12 holds k = 1, 2, 3 (9 pi^2 / 8 = 11.1).
    expect(steps).toHaveLength(3);
    [1, 4, 9].forEach((k2, i) => expect(Math.abs(steps[i]! - (k2 * Math.PI ** 2) / 8) / steps[i]!).toBeLessThan(1e-8));
    expect(created).toHaveLength(1);
    const mine = seen.filter((p) => p.token === created[0]);
    expect(mine[0]!.value.kind).toBe('begin');
    expect(mine[0]!.value.cancellable).toBe(true);
    expect(mine[mine.length - 1]!.value.kind).toBe('end');
    const reports = mine.filter((p) => p.value.kind === 'report');
    expect(reports).toHaveLength(8);
    expect(reports.map((p) => p.value.percentage)).toEqual([12, 25, 37, 50, 62, 75, 87, 100]);
    expect(reports[7]!.value.message).toBe('8 of 8 points');
    // Partial results: each point as it finished, before the answer (D = 1, 2.57, ..., 12).
    expect(partial.map((p) => p.finished)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    partial.forEach((p, i) => expect(Math.abs(p.point.at[0]! - (1 + (11 * i) / 7))).toBeLessThan(1e-12));
  });

  it('stops on window/workDoneProgress/cancel and keeps the points finished', async () => {
    const { c, created, next } = await progressClient();
    c.open('file:///long.qstate', LONG);
    const answer = c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri: 'file:///long.qstate' } }) as Promise<{ sweep: { finished: number; total: number; stopped: string } }>;
    await next((p) => p.value.kind === 'report');
    c.connection.sendNotification('window/workDoneProgress/cancel', { token: created[0] });
    const r = await answer;
    expect(r.sweep.stopped).toBe('cancelled');
    expect(r.sweep.finished).toBeGreaterThan(0);
    expect(r.sweep.finished).toBeLessThan(r.sweep.total);
    await next((p) => p.value.kind === 'end');
  });

  it('runs under the sweep time limit of the settings and says how many points finished', async () => {
    const { c } = await progressClient({ sweepTimeLimitMs: 100 });
    c.open('file:///long.qstate', LONG);
    const r = (await c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri: 'file:///long.qstate' } })) as { sweep: { finished: number; total: number; stopped: string }; diagnostics: { code: string; message: string }[] };
    // 5001 points of a numerical solve each cannot finish in 100 ms.
    expect(r.sweep.stopped).toBe('time');
    expect(r.sweep.finished).toBeLessThan(r.sweep.total);
    // The sweep's own finding, once; on a loaded machine the let's own analysis may add a limits finding of its own.
    const lim = r.diagnostics.filter((d) => d.code === 'limits' && / of \d+ points/.test(d.message));
    expect(lim).toHaveLength(1);
    expect(lim[0]!.message).toContain(`finished ${r.sweep.finished} of ${r.sweep.total} points`);
  });

  it('stops on $/cancelRequest', async () => {
    const { c, next } = await progressClient();
    c.open('file:///long.qstate', LONG);
    const source = new CancellationTokenSource();
    const answer = c.connection.sendRequest('eigenspan/sweep', { textDocument: { uri: 'file:///long.qstate' } }, source.token) as Promise<{ sweep: { finished: number; total: number; stopped: string } }>;
    await next((p) => p.value.kind === 'report');
    source.cancel();
    const outcome = await answer.then(
      (r) => ({ r, e: null }),
      (e: { code?: number }) => ({ r: null, e }),
    );
    // The protocol allows either the partial result or the RequestCancelled error (-32800).
    if (outcome.r) {
      expect(outcome.r.sweep.stopped).toBe('cancelled');
      expect(outcome.r.sweep.finished).toBeLessThan(outcome.r.sweep.total);
    } else expect(outcome.e!.code).toBe(-32800);
    await next((p) => p.value.kind === 'end');
  });
});
