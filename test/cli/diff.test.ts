/**
 * The pure comparison of `eigenspan diff` (cli/diff.ts): two results in, the change list out.
 * Closed forms (natural units, box (0, 1), derived in test/cli/vcs.test.ts): the parabola
 * sqrt(30) x (1 - x) has <H> = 5; a constant state (nonzero at the walls) has a divergent <H>,
 * as its coefficients fall only like 1/n (common practice).
 */
import { describe, expect, it } from 'vitest';
import { analyseBounded } from '../../server/src/cli/options';
import { comparePhysics } from '../../server/src/cli/diff';

const parabola = (basis: number): string => `system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis ${basis}\n`;

describe('comparePhysics', () => {
  it('finds nothing between a result and itself, whatever the tolerance', () => {
    const a = analyseBounded(parabola(10));
    expect(comparePhysics(a, a, 0)).toEqual([]);
  });

  it('reports a divergent mean turning finite, and the findings that went', () => {
    const flat = analyseBounded('system box(0, 1)\nstate psi(x) = 1\nbasis 10\n');
    const changes = comparePhysics(flat, analyseBounded(parabola(10)));
    expect(changes).toContainEqual({ kind: 'mean', old: 'diverges', new: expect.closeTo(5, 6) });
    expect(changes.some((c) => c.kind === 'finding' && c.change === 'disappeared' && c.finding.startsWith('warning[boundary]'))).toBe(true);
    expect(changes.some((c) => c.kind === 'finding' && c.change === 'appeared')).toBe(false);
  });

  it('marks levels computed on one side only as missing, and compares weights absolutely', () => {
    // With 3 levels the parabola keeps 1 - w_5 - w_7 - ... of its weight; levels 4..10 exist only on the right.
    const changes = comparePhysics(analyseBounded(parabola(3)), analyseBounded(parabola(10)), 1e-6);
    const w5 = changes.find((c) => c.kind === 'weight' && c.n === 5);
    expect(w5).toMatchObject({ old: null });
    // Even levels vanish by symmetry on both sides: no change listed for them.
    expect(changes.some((c) => c.kind === 'weight' && c.n === 4)).toBe(false);
    expect(comparePhysics(analyseBounded(parabola(3)), analyseBounded(parabola(10)), 0.01).some((c) => c.kind === 'weight')).toBe(false);
  });
});
