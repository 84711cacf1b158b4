/**
 * No production export exists only for a test: scripts/export-check.mjs lists the exports of server/ and
 * client/ that no production source imports and that their own module never uses, yet tests, the bench
 * or scripts import. Each one left is named here with why it stays in production code; a new one fails
 * this test until it moves into test/ (or production uses it) or is added here with its reason.
 */
import { describe, expect, it } from 'vitest';
// @ts-expect-error: a plain ES module script without declarations.
import { exportReport } from '../../scripts/export-check.mjs';

const ALLOWED: Record<string, string> = {
  // Cold-start measurements (bench/suite.ts, bench/sweep.ts, test/bench) empty the memo of solved bases.
  'server/src/analysis/systems.ts: clearBasisMemo': 'the memo is module state; only its module can empty it',
  // The quick stage's meter hook: counting the parser's work needs the module's private context.
  'server/src/language/meter.ts: withWorkMeter': "needs the module's private quick-stage context",
  'server/src/language/meter.ts: workCounter': 'the plain counter the meter hook takes',
  // Clocks injected through AnalyseOptions.clock: deterministic time limits in tests and the fuzzer's replay.
  'server/src/physics/budget.ts: manualClock': 'a Clock of the engine API, beside the interface it implements',
  'server/src/physics/budget.ts: workClock': "uses the budget's attach hook of the Clock interface",
  // Reference methods the bench and the tests compare the engine with (finite differences, Hermite functions).
  'server/src/physics/fd.ts: fdLevels': 'the baseline of bench item 4 (spectral solver against finite differences)',
  'server/src/physics/hermite.ts: hermiteFunction': 'the direct evaluation bench item 2 and the tests check the tables against',
};

describe('production exports', () => {
  it('none runs only in tests, the bench or scripts, except the ones named with their reason', () => {
    const { testOnly } = exportReport() as { testOnly: string[] };
    expect(testOnly.filter((l) => !(l in ALLOWED))).toEqual([]);
    // An allowance whose export production now uses (or that is gone) is removed from the list.
    expect(Object.keys(ALLOWED).filter((l) => !testOnly.includes(l))).toEqual([]);
  });
});
