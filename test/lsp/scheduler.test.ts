// The scheduler in process, against the built worker (dist/worker.js) and against a worker script that
// cannot load: outcomes arrive once per analysis and a broken worker does not respawn in a loop.
import { describe, it, expect } from 'vitest';
import { resolve } from 'node:path';
import { AnalysisScheduler, type Outcome } from '../../server/src/lsp/scheduler';

function harness(workerPath: string, timing = { debounceMs: 0, timeBudgetMs: 5000, defaultBasis: 40 }) {
  const outcomes: { uri: string; version: number; outcome: Outcome }[] = [];
  const waiters: (() => void)[] = [];
  const logs: string[] = [];
  const s = new AnalysisScheduler({
    workerPath,
    log: (m) => logs.push(m),
    timing: () => timing,
    samples: false,
    onOutcome: (uri, version, outcome) => {
      outcomes.push({ uri, version, outcome });
      waiters.splice(0).forEach((w) => w());
    },
  });
  const next = (count: number): Promise<void> =>
    new Promise((r) => {
      const check = (): void => (outcomes.length >= count ? r() : void waiters.push(check));
      check();
    });
  return { s, outcomes, logs, next };
}

describe('analysis scheduler', () => {
  it('analyses the latest version of each document once the debounce has passed', async () => {
    const h = harness(resolve('dist/worker.js'), { debounceMs: 20, timeBudgetMs: 10_000, defaultBasis: 40 });
    h.s.schedule('a', 1, 'system box(0, 1)\nstate psi(x) = 1\n');
    h.s.schedule('a', 2, 'system box(0, 1)\nstate psi(x) = sin(pi x)\n');
    h.s.schedule('b', 1, 'system box(0, 2)\nstate psi(x) = sin(pi x / 2)\n');
    await h.next(2);
    h.s.dispose();
    // Version 1 of `a` was replaced inside the debounce and never ran.
    expect(h.outcomes.map((o) => [o.uri, o.version, o.outcome.kind]).sort()).toEqual([['a', 2, 'done'], ['b', 1, 'done']]);
  });

  it('reports a worker that cannot load as crashed, once per analysis, without a respawn loop', async () => {
    const h = harness(resolve('dist/no-such-worker.js'));
    h.s.schedule('a', 1, 'system box(0, 1)\n');
    await h.next(1);
    h.s.schedule('a', 2, 'system box(0, 1)\n');
    await h.next(2);
    expect(h.outcomes.map((o) => o.outcome.kind)).toEqual(['crashed', 'crashed']);
    expect(h.s.workerStarts).toBeLessThanOrEqual(2);
    h.s.dispose();
  });
});
