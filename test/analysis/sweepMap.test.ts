/**
 * Two-parameter maps: refinement along both axes (analysis/sweep/locate.ts). A finite well of depth D
 * and width w (hbar = m = 1) has z0 = (w / 2) sqrt(2 D), and a new bound level appears each time z0
 * passes k pi / 2 (the standard square-well result, any quantum mechanics text): along D at fixed w at
 * D = k^2 pi^2 / (2 w^2), along w at fixed D at w = k pi / sqrt(2 D). The sweep must find every such
 * step in every row and every column, to 1e-8 relative.
 */
import { describe, expect, it } from 'vitest';
import { runSweep } from '../../server/src/analysis/sweep/index';
import { analyse } from '../../server/src/analysis/index';

const MAP = 'let D = 5\nlet w = 2\nsystem well(depth = D, width = w)\nstate gaussian(center = 0, width = 0.4)\nexpect weight 1 >= 0.97\nsweep D from 1 to 12 steps 4\nsweep w from 1.5 to 3 steps 3\n';

/** The values k c with k = 1, 2, ... strictly between a and b. */
function multiplesBetween(c: number, a: number, b: number): number[] {
  const out: number[] = [];
  for (let k = 1; k * c < Math.max(a, b); k++) if (k * c > Math.min(a, b)) out.push(k * c);
  return out;
}

describe('a depth x width map of a finite well', () => {
  const r = runSweep(MAP)!;
  const { axes, located } = r.result;

  it('locates every bound-level step along the depth in every row', () => {
    expect(r.result.stopped).toBeNull();
    for (const w of axes[1]!.values) {
      const mine = located.filter((l) => l.kind === 'bound' && l.axis === 0 && l.row === w).map((l) => l.at);
      // D_k = k^2 pi^2 / (2 w^2): the squares of multiples of pi / (w sqrt 2).
      const want = multiplesBetween(Math.PI / (w * Math.SQRT2), Math.sqrt(1), Math.sqrt(12)).map((x) => x * x);
      expect(mine).toHaveLength(want.length);
      mine.forEach((at, i) => expect(Math.abs(at - want[i]!) / want[i]!).toBeLessThan(1e-8));
    }
  });

  it('locates every bound-level step along the width in every column', () => {
    let total = 0;
    for (const D of axes[0]!.values) {
      const mine = located.filter((l) => l.kind === 'bound' && l.axis === 1 && l.row === D);
      const want = multiplesBetween(Math.PI / Math.sqrt(2 * D), 1.5, 3);
      expect(mine.map((l) => l.at)).toHaveLength(want.length);
      mine.forEach((l, i) => {
        expect(Math.abs(l.at - want[i]!) / want[i]!).toBeLessThan(1e-8);
        // Wider is deeper in z0: one more level past each step.
        expect(l.after).toBe(l.before + 1);
      });
      total += want.length;
    }
    // The map holds steps along the width at all (derived: at D = 12, pi / sqrt(24) = 0.641, so k = 3, 4 lie in 1.5..3).
    expect(total).toBeGreaterThan(0);
  });

  it('locates expect flips along the width where the ordinary analysis sits on the threshold', () => {
    const flips = located.filter((l) => l.kind === 'expect' && l.axis === 1);
    expect(flips.length).toBeGreaterThan(0);
    for (const f of flips) {
      // The file's own analysis at the located point: the ground weight is the expect's threshold.
      const text = MAP.replace('let D = 5', `let D = ${f.row}`).replace('let w = 2', `let w = ${f.at}`).replace(/sweep.*\n/g, '');
      const weight = analyse(text).levels.find((l) => l.n === 1)!.weight;
      expect(Math.abs(weight - 0.97)).toBeLessThan(1e-6);
    }
  });
});
