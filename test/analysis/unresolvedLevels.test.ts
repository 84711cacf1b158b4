/**
 * Levels the potential solver leaves unresolved: the `limits` finding names exactly which (from the first
 * unresolved label to the last asked for), why (the time limit or the cap, with the grid reached) and what
 * raises it; the result and the JSON mark the same levels. Small analogues of the 3,200-level oscillator:
 * a lowered grid cap, and time limits on a clock that runs on counted work (never real time).
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import type { AnalysisResult } from '../../server/src/analysis/types';
import { manualClock, workClock } from '../../server/src/physics/budget';
import { toJson } from '../../server/src/cli/render';
import { raiseHint } from '../../server/src/shared/limits';

/** p^2 + x^2 (m = 1/2): E = 2 n - 1 for label n (closed form); walls far outside the top turning points. */
const oscillator = (wall: number, basis: number): string => `mass 0.5\nsystem V(x) = x^2 over [-${wall}, ${wall}]\nstate gaussian(center = 1, width = 1)\nbasis ${basis}\n`;

/** The solver's finding on the system line (the one that starts `Level`). */
function solverFinding(r: AnalysisResult): string | undefined {
  return r.diagnostics.find((d) => d.code === 'limits' && /^Levels? \d/.test(d.message))?.message;
}

/** The finding, `system.unresolvedFrom`, the levels' marks and the JSON agree on the range from..asked. */
function checkMarks(r: AnalysisResult, text: string, asked: number): number {
  const from = r.system!.unresolvedFrom!;
  expect(from).toBeGreaterThanOrEqual(1);
  expect(solverFinding(r)).toContain(`Levels ${from} to ${asked} are not resolved to 1e-9`);
  for (const l of r.levels) expect(l.unresolved === true).toBe(l.n >= from);
  const json = toJson(r, text) as { levels: Record<string, unknown>[]; system: Record<string, unknown> };
  expect(json.system.unresolvedFrom).toBe(from);
  for (const l of json.levels) expect(l.unresolved === true).toBe((l.n as number) >= from);
  return from;
}

describe('unresolved levels of a numerical system', () => {
  it('a lowered grid cap: the finding names the levels, the cap and both ways to raise it', () => {
    // maxGridPoints 32768 is 1/8 of the default: the solver's work cap falls by 8^3 (docs/format.md, `--limit`).
    const text = oscillator(40, 600);
    const r = analyse(text, { clock: manualClock(), limits: { maxGridPoints: 32768 } });
    const from = checkMarks(r, text, 600);
    const message = solverFinding(r)!;
    expect(message).toMatch(/the work cap of [^ ]+ flops \(\d+ points\) stopped the solver's refinement at \d+ grid intervals/);
    expect(message).toMatch(/want a first grid of about \d+ intervals/);
    expect(message).toContain(raiseHint('time'));
    expect(message).toContain(raiseHint('maxGridPoints'));
    // The levels below the range meet the tolerance against the closed form.
    for (const l of r.levels.filter((x) => x.n < from)) expect(Math.abs(l.energy - (2 * l.n - 1))).toBeLessThanOrEqual(1e-9 * (2 * l.n - 1));
    // The default cap resolves them all, with no finding and no marks.
    const full = analyse(oscillator(40, 120), { clock: manualClock() });
    expect(solverFinding(full)).toBeUndefined();
    expect(full.system!.unresolvedFrom).toBeUndefined();
    expect(full.levels.some((l) => l.unresolved)).toBe(false);
  });

  it('time limits on a work clock: every stop names its range, and a stop before any check names them all', () => {
    const text = oscillator(20, 100);
    const seen: number[] = [];
    // 1e-5 ms per counted operation: the limits below end the analysis inside the first grid, during and after the solver's climb.
    for (let ms = 8; ms <= 4096; ms *= 2) {
      const r = analyse(text, { clock: workClock(1e-5), limits: { maxMillis: ms } });
      const message = solverFinding(r);
      if (message === undefined) {
        expect(r.system?.unresolvedFrom).toBeUndefined();
        continue;
      }
      if (!r.system) {
        // Stopped inside the first grid: no levels at all, and the finding says all are unresolved.
        expect(message).toMatch(new RegExp(`^Levels 1 to 100 are not resolved: the time limit of ${ms} ms stopped the solver inside its first grid of \\d+ intervals`));
        expect(r.levels).toEqual([]);
        seen.push(0);
        continue;
      }
      const from = checkMarks(r, text, 100);
      seen.push(from);
      expect(message).toContain(`the time limit of ${ms} ms stopped the solver's refinement at`);
      expect(message).toContain(raiseHint('time'));
      // Every level unresolved: the time ran out after the first grid, before any second grid checked it.
      if (from === 1) expect(message).toContain('before a second grid checked that one');
    }
    expect(seen).toContain(1);
    expect(seen).toContain(0);
  });
});
