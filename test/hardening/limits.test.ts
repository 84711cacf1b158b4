/**
 * Every resource cap answers with a `limits` diagnostic on the right range, quickly, never a freeze.
 * The caps are `Limits` in server/src/analysis/index.ts; their defaults are common practice for an
 * editor that re-analyses on every keystroke.
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseStatic, DEFAULT_LIMITS, LIMIT_RANGES, type Limits } from '../../server/src/analysis/index';
import { expectFinding, numbersIn } from './helpers';
import { manualClock } from '../../server/src/physics/budget';
import { withWorkMeter, workCounter } from '../../server/src/language/meter';

const BOX = 'system box(0, 1)\nstate psi(x) = x * (1 - x)\n';

describe('resource limits', () => {
  it('caps the basis at 5,000 levels', () => {
    expect(DEFAULT_LIMITS.maxBasis).toBe(5000);
    expectFinding(`${BOX}basis 5001\n`, 'limits', '5001', [DEFAULT_LIMITS.maxBasis]);
    // A smaller cap given as an option applies too.
    expectFinding(`${BOX}basis 300\n`, 'limits', '300', [200], { limits: { maxBasis: 200 } });
  });

  it('caps the grid and says the coefficients may be inaccurate', () => {
    // The sine transform needs at least twice as many samples as levels (analysis/boxTransform.ts): 2,000
    // levels cannot settle under a 640-point cap, where 200 would (on 400 samples, no finding then).
    const text = 'system box(0, 1)\nstate psi(x) = x < 0.3 ? x : 0.3 * (1 - x) / 0.7\nbasis 2000\n';
    expectFinding(text, 'limits', 'x < 0.3 ? x : 0.3 * (1 - x) / 0.7', [640], { limits: { maxGridPoints: 640 } });
  });

  it('refuses an expression longer than 10,000 characters', () => {
    const long = Array.from({ length: 2600 }, () => 'x').join(' + ');
    expect(long.length).toBeGreaterThan(10_000);
    expectFinding(`system box(0, 1)\nstate psi(x) = ${long}\n`, 'limits', long, [DEFAULT_LIMITS.maxExpressionLength]);
  });

  it('applies smaller expression-length and nesting caps given as options', () => {
    const text = 'system box(0, 1)\nstate psi(x) = x * (1 - x) + ((x * x) * (1 - x))\n';
    expectFinding(text, 'limits', 'x * (1 - x) + ((x * x) * (1 - x))', [20], { limits: { maxExpressionLength: 20 } });
    expectFinding(text, 'limits', '(', [1], { limits: { maxNesting: 1 } });
    // The defaults let the same text through.
    expect(analyse(text).diagnostics.some((d) => d.code === 'limits')).toBe(false);
  });

  it('refuses brackets nested more than 200 deep, without overflowing the stack', () => {
    const deep = '('.repeat(1000) + 'x' + ')'.repeat(1000);
    const r = analyse(`system box(0, 1)\nstate psi(x) = ${deep}\n`);
    const d = r.diagnostics.find((x) => x.code === 'limits');
    expect(d, r.diagnostics.map((x) => x.message).join('\n')).toBeDefined();
    expect(numbersIn(d!.message)).toContain(200);
    // The range is the opening bracket past the cap, inside the expression.
    expect(d!.end - d!.start).toBe(1);
    expect(d!.start).toBeGreaterThanOrEqual('system box(0, 1)\nstate psi(x) = '.length + 200);
  });

  it('answers a 1 MB file at once with one diagnostic on its first character', () => {
    const line = 'let a = 1 # padding padding padding padding padding padding padding padding\n';
    const text = line.repeat(Math.ceil(1_048_576 / line.length));
    expect(text.length).toBeGreaterThanOrEqual(1_048_576);
    // "At once": the size cap refuses the file before the scanner reads a character, so the quick stage's
    // work meter (server/src/language/meter.ts) counts nothing and no solver work is counted either.
    const meter = workCounter();
    const r = withWorkMeter(meter, () => analyse(text));
    expect(meter.ops).toBe(0);
    expect(r.work).toEqual({ ops: 0, points: 0 });
    expect(r.diagnostics).toHaveLength(1);
    expect(r.diagnostics[0]).toMatchObject({ code: 'limits', start: 0, end: 1, severity: 'error' });
    expect(analyseStatic(text).diagnostics[0]!.code).toBe('limits');
  });

  it('ignores statements past the 2,000th and marks the first one ignored', () => {
    const lets = Array.from({ length: 2100 }, (_, i) => `let v${i} = ${i}`);
    const text = lets.join('\n') + '\n';
    const d = expectFinding(text, 'limits', 'let v2000 = 2000', [DEFAULT_LIMITS.maxStatements]);
    expect(d.severity).toBe('error');
  });

  it('caps the number of evolution steps', () => {
    expectFinding(`${BOX}evolve to 1 steps 1e9\n`, 'limits', '1e9', [DEFAULT_LIMITS.maxEvolveSteps]);
  });

  it('stops an analysis at its time limit with a limits diagnostic on the system keyword', () => {
    // An oscillator with 5,000 levels: all of them need a grid of about a million points (minutes of work).
    // The clock moves 100 ms at each reading, so the 300 ms limit runs out at the fourth poll of the
    // budget: deterministic, whatever the machine's speed.
    const text = 'system oscillator(omega = 1)\nstate gaussian(center = 3, width = 0.5)\nbasis 5000\n';
    const r = analyse(text, { limits: { maxMillis: 300 }, clock: manualClock(100) });
    const lim = r.diagnostics.filter((d) => d.code === 'limits');
    const keyword = { start: 0, end: 'system'.length };
    expect(lim.some((d) => d.start === keyword.start && d.end === keyword.end && d.severity === 'error'), r.diagnostics.map((d) => d.message).join('\n')).toBe(true);
    // No level count is sized from the clock: either the expansion finished (all levels) or none is shown.
    expect([0, 5000]).toContain(r.levels.length);
    const sum = r.levels.reduce((a, l) => a + l.weight, 0);
    expect(sum).toBeLessThanOrEqual(1 + 1e-9);
    expect(lim.some((d) => /time limit of 300 ms/.test(d.message))).toBe(true);
  });

  it('stays safe with every settable cap at the top of its range', () => {
    const top = Object.fromEntries(Object.entries(LIMIT_RANGES).map(([k, [, hi]]) => [k, hi])) as Partial<Limits>;
    const texts = [
      // Brackets as deep as the top nesting cap allows, and deeper: a value or a clean limits finding.
      `system box(0, 1)\nstate psi(x) = ${'('.repeat(top.maxNesting! - 1)}x * (1 - x)${')'.repeat(top.maxNesting! - 1)}\n`,
      `system box(0, 1)\nstate psi(x) = ${'('.repeat(top.maxNesting! + 5)}x${')'.repeat(top.maxNesting! + 5)}\n`,
      // A state that refines to the top grid cap; a basis and an evolution at the top of theirs.
      'system box(0, 1)\nstate psi(x) = log(abs(x - 0.3))\nbasis 50\n',
      `system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\nbasis ${top.maxBasis}\nevolve to 1 steps ${top.maxEvolveSteps}\n`,
    ];
    for (const text of texts) {
      const r = analyse(text, { limits: { ...top, maxMillis: 3000 } });
      expect(r.diagnostics.filter((d) => /internal error/.test(d.message)), text.slice(0, 80)).toEqual([]);
      expect(r.diagnostics.length + r.levels.length).toBeGreaterThan(0);
      for (const l of r.levels) expect(Number.isFinite(l.weight)).toBe(true);
    }
  });

  it('keeps a default time limit', () => {
    expect(DEFAULT_LIMITS.maxMillis).toBeGreaterThan(0);
    expect(Number.isFinite(DEFAULT_LIMITS.maxMillis)).toBe(true);
  });
});
