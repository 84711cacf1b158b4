/**
 * One `limits` finding at most when a sweep and the file's own analysis both hit a limit
 * (analysis/sweep/merge.ts), in the engine's merge that the command line and the editor share.
 */
import { describe, expect, it } from 'vitest';
import { diagnostic } from '../../server/src/language/catalogue';
import { mergeSweepFindings } from '../../server/src/analysis/sweep/merge';
import { analyseWithSweep } from '../../server/src/analysis/sweep/index';
import { manualClock } from '../../server/src/physics/budget';

describe('mergeSweepFindings', () => {
  const own = diagnostic('limits', 10, 20, 'The grid cap stopped refinement.', { severity: 'error', fixes: [{ kind: 'insert', title: 'raise', at: 0, text: 'x' }] });
  const cut = diagnostic('limits', 40, 50, 'The sweep finished 3 of 9 points.', { severity: 'warning', fixes: [{ kind: 'replace', title: "Sweep 'a' in 2 steps", start: 45, end: 46, text: '2' }] });
  const other = diagnostic('boundary', 0, 5, 'A wall.');

  it('keeps both lists as they are when only one side has a limits finding', () => {
    expect(mergeSweepFindings([own, other], [])).toEqual([other, own]);
    expect(mergeSweepFindings([other], [cut])).toEqual([other, cut]);
  });

  it("makes the sweep's own limits findings one", () => {
    const atPoints = diagnostic('limits', 40, 50, 'The grid cap was met at 2 of 3 points.', { severity: 'warning' });
    const m = mergeSweepFindings([other], [cut, atPoints]);
    expect(m.map((d) => d.code)).toEqual(['boundary', 'limits']);
    expect(m[1]!.message).toBe('The sweep finished 3 of 9 points. The grid cap was met at 2 of 3 points.');
  });

  it('makes one finding on the sweep line naming both, the worse severity and both fixes, the coarser step first', () => {
    const m = mergeSweepFindings([own, other], [cut]);
    expect(m.map((d) => d.code)).toEqual(['boundary', 'limits']);
    const lim = m[1]!;
    expect([lim.start, lim.end, lim.severity]).toEqual([40, 50, 'error']);
    expect(lim.message).toBe("The sweep finished 3 of 9 points. The analysis of the file's own values also hit a limit: The grid cap stopped refinement.");
    expect(lim.fixes!.map((f) => f.title)).toEqual(["Sweep 'a' in 2 steps", 'raise']);
  });

  it('is what a result with its sweep carries', () => {
    // The grid cap stops the numerical solve of the file's own analysis (a limits finding) and of each
    // point; the manual clock (1 ms a reading) cuts the sweep part way, a limits finding of the sweep.
    const text = 'let k = 1\nsystem V(x) = k x^4 over [-4, 4]\nstate gaussian(center = 0.3, width = 0.5)\nbasis 30\nsweep k from 1 to 3 steps 40\n';
    const r = analyseWithSweep(text, { limits: { maxGridPoints: 1024 } }, { maxMillis: 100, clock: manualClock(1) });
    const lim = r.diagnostics.filter((d) => d.code === 'limits');
    expect(lim).toHaveLength(1);
    expect(lim[0]!.message).toMatch(/The sweep finished \d+ of 41 points/);
    expect(lim[0]!.message).toMatch(/also hit (a|that) limit/);
  });

  it("names the file's own limit without repeating it when the sweep's message already states it", () => {
    const same = diagnostic('limits', 40, 50, 'Levels 1 to 30 are not resolved.', { severity: 'warning' });
    const atPoint = diagnostic('limits', 40, 50, 'The sweep finished 3 of 9 points. At k = 1: Levels 1 to 30 are not resolved.', { severity: 'warning' });
    const m = mergeSweepFindings([same], [atPoint]);
    expect(m).toHaveLength(1);
    expect(m[0]!.message).toBe("The sweep finished 3 of 9 points. At k = 1: Levels 1 to 30 are not resolved. The analysis of the file's own values also hit that limit.");
  });
});
