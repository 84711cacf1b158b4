import { describe, expect, it } from 'vitest';
import { formatScaling, runScaling } from '../../bench/scaling';

// The scaling table (scripts/bench-scaling.mjs) at tiny sizes, one run a point: every series runs, each
// point reaches its closed form, and the table shows the fitted and the best known exponents. No timing
// asserted (the fitted exponent is only required to be a number).
describe('scaling table (tiny sizes)', () => {
  const series = runScaling({ tiny: true, reps: 1 });

  it('has the box, the oscillator, V(x) and the evolution, each point on its closed form', () => {
    expect(series.map((s) => s.id)).toEqual(['box-packet', 'box-kink', 'oscillator', 'potential', 'evolution-oscillator', 'evolution-box']);
    // Closed forms: box packet and triangle coefficients, coherent-state coefficients (Glauber 1963) and
    // <x>(t) = d cos t, E_n = 2n + 1 for p^2 + x^2, survival 1 at t = 0. At 20 levels the coherent state of
    // mean level 10 misses the weight beyond level 20 (about 1e-3 in <x>), hence the looser bound there.
    const bound: Record<string, number> = { 'box-packet': 1e-10, 'box-kink': 1e-10, oscillator: 1e-10, potential: 1e-8, 'evolution-oscillator': 5e-2, 'evolution-box': 1e-12 };
    for (const s of series) {
      expect(s.points).toHaveLength(2);
      for (const p of s.points) expect(p.error, `${s.id} N = ${p.n}`).toBeLessThan(bound[s.id]!);
      expect(Number.isFinite(s.p)).toBe(true);
    }
  });

  it('prints each series and the exponents beside the best known algorithm', () => {
    const text = formatScaling(['header'], series);
    for (const s of series) expect(text).toContain(`| ${s.id} | ${s.p.toFixed(2)} | ${s.pLarge.toFixed(2)} | ${s.best.how} | ${s.best.p} |`);
    expect(text).toContain('| N | 20 | 40 |');
  });
});
