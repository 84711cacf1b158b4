/**
 * Item 9 of the benchmark suite: a design sweep of 50 points over a numerical potential, the barrier
 * height of the double-well example (basis 30), where the system changes at every point. Timed in one
 * thread through the engine (`runSweep`, memo of solved bases emptied first), and as the product runs
 * it, `node dist/cli.js sweep FILE --json` with its two worker threads (wall clock of the process).
 * Target: 10 s for the 50 points on the benchmark machine; reported, never asserted.
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep } from '../server/src/analysis/sweep/index';
import { clearBasisMemo } from '../server/src/analysis/systems';
import { measure, summarise } from './stats';
import type { Row } from './suite';

/** The double-well example with its barrier height as a swept `let` (natural units). */
export function doubleWellSweep(points: number): string {
  return [
    '# Benchmark: the double well of examples/double-well-tunnelling.qstate with its barrier height swept.',
    'let barrier = 1',
    'system V(x) = barrier * (x^2 - 4)^2 / 16 over [-6, 6]',
    'state gaussian(center = -2, width = 0.5)',
    'basis 30',
    'expect weight 1..2 >= 0.88',
    `sweep barrier from 0.5 to 2 steps ${points - 1}`,
    '',
  ].join('\n');
}

/** The sweep row: engine time in one thread, command-line time with its worker threads. */
export function benchSweep(root: string, tiny: boolean, reps: number): Row {
  const points = tiny ? 4 : 50;
  const text = doubleWellSweep(points);
  const m = measure(
    () => {
      clearBasisMemo();
      return runSweep(text, {}, { maxMillis: 600_000 });
    },
    { reps, warmup: tiny ? 0 : 1, minSampleMs: 0 },
  );
  const s = m.result?.result ?? null;
  // The sum of the weights over 30 levels is the invariant the points can be checked against.
  let worst: number | null = null;
  for (const p of s?.points ?? []) if (p?.captured != null) worst = Math.max(worst ?? 0, Math.abs(1 - p.captured));
  const row: Row = {
    item: 9,
    job: `sweep of the double well's barrier height, ${points} points`,
    method: 'runSweep(text) in one thread: a solve and a projection per point, refinement between points',
    size: `${points} points, basis 30`,
    timing: m.timing,
    accuracy: { value: worst, measure: 'max over the points of |1 - captured| (30 levels)', reference: 'sum of weights (invariant)' },
    baseline: null,
    ratio: null,
    target: { text: `${points} points <= 10 s (command line, two threads)`, met: null },
    notes: [`finished ${s?.finished ?? 0} of ${s?.total ?? points} points, ${s?.probes ?? 0} refinement probes, ${s?.located.length ?? 0} located changes`],
  };
  const cli = join(root, 'dist', 'cli.js');
  if (!existsSync(cli)) {
    row.notes.push('dist/cli.js is missing (run npm run build): the command-line time is not measured');
    return row;
  }
  const dir = mkdtempSync(join(tmpdir(), 'eigenspan-bench-sweep-'));
  try {
    const file = join(dir, 'double-well-sweep.qstate');
    writeFileSync(file, text);
    const times: number[] = [];
    for (let r = 0; r < Math.max(1, Math.min(reps, 3)); r++) {
      const t0 = performance.now();
      const p = spawnSync(process.execPath, [cli, 'sweep', file, '--json', '--sweep-time-limit', '600000'], { encoding: 'utf8' });
      times.push(performance.now() - t0);
      if (p.status !== 0 && p.status !== 1) row.notes.push(`eigenspan sweep exited ${p.status}`);
    }
    const t = summarise(times);
    row.target!.met = tiny ? null : t.median <= 10_000;
    row.notes.push(`command line with two worker threads: median ${t.median.toFixed(0)} ms [${t.q1.toFixed(0)}-${t.q3.toFixed(0)}] over ${t.runs} runs`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return row;
}
