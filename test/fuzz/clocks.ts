/**
 * The clocks and limits of the fuzz harness (harness.ts re-exports them): the whole analyses' time limit,
 * the replay of saved time overruns on a clock of counted work, and the process's CPU time that
 * `npm run fuzz` times its cases by.
 */
import type { AnalyseOptions } from '../../server/src/analysis/index';
import type { Clock } from '../../server/src/physics/budget';
import type { FuzzCase } from './harness';

/** Whole analyses run under a time limit below the case budget: the engine must stop itself in time. */
export const FUZZ_LIMITS: NonNullable<AnalyseOptions['limits']> = { maxMillis: 1500 };
/**
 * The sweep's own time limit in the command-line cases (`--sweep-time-limit`): a sweep runs after the
 * file's analysis under a budget of its own (docs/format.md, Sweeps), so a case whose text has a `sweep`
 * line may take this much longer than the others (its budget grows by as much).
 */
export const FUZZ_SWEEP_MS = 300;

/**
 * Replays of saved time overruns run on a clock of counted work (`workClock`: a machine doing one counted
 * operation per nanosecond, about this engine's speed) under a 30 ms limit, so each costs tens of
 * milliseconds and never depends on the machine. The promise checked: the analysis stops within
 * `REPLAY_OVERSHOOT_MS` of counted work past its limit (one poll of the budget, 2^20 operations, plus the
 * largest single charge, a Householder column of the largest grid, 4 x 2290^2 operations), and reports it.
 */
export const REPLAY_MS_PER_OP = 1e-6;
export const REPLAY_LIMITS: NonNullable<AnalyseOptions['limits']> = { maxMillis: 30 };
export const REPLAY_OVERSHOOT_MS = 25;

/**
 * The process's CPU time in milliseconds (user and system, all threads): a clock that stands still while
 * the process waits for a core, so a loaded machine does not make a case look slow.
 */
export const CPU_CLOCK: Clock = {
  now(): number {
    const u = process.cpuUsage();
    return (u.user + u.system) / 1000;
  },
};

/** True for a saved case that failed by time (took longer than its budget, or hung). */
export function isTimeCase(c: FuzzCase & { problems?: string[] }): boolean {
  return (c.problems ?? []).some((p) => /^took \d+ ms|^hung/.test(p));
}
