import { describe, it, expect } from 'vitest';
import { cosineMoments, interfaceGrid } from '../../server/src/physics/interfaces';

describe('interfaces: panels ending on every jump', () => {
  it('every jump is a panel edge: no node on it, and a step integrates exactly', () => {
    const jumps = [0.123456789, 0.5, Math.SQRT1_2];
    const g = interfaceGrid(0, 1, [...jumps, 1.5, -1], 64);
    expect(g.jumps).toEqual([0.123456789, 0.5, Math.SQRT1_2]);
    for (const x of g.x) for (const j of jumps) expect(x).not.toBe(j);
    // f = 1 between the first two jumps, 3 after the third: integral 0.376543211 + 3 (1 - 1/sqrt 2) (elementary).
    const f = g.x.map((x) => (x > jumps[0] && x < jumps[1] ? 1 : x > jumps[2] ? 3 : 0));
    let s = 0;
    g.x.forEach((_, i) => (s += g.w[i] * f[i]));
    expect(Math.abs(s - (0.5 - 0.123456789 + 3 * (1 - Math.SQRT1_2)))).toBeLessThan(1e-14);
  });

  it('cosine moments of a step equal the closed form', () => {
    // f = 20 on [1/2, 1] of [0, 1]: C(0) = 10, C(q) = 20 integral_{1/2}^1 cos(q pi x) dx = -20 sin(q pi / 2) / (q pi) (elementary).
    const count = 200;
    const g = interfaceGrid(0, 1, [0.5], count);
    const C = cosineMoments(g, g.x.map((x) => (x < 0.5 ? 0 : 20)), count);
    expect(Math.abs(C[0] - 10)).toBeLessThan(1e-13);
    let worst = 0;
    for (let q = 1; q < count; q++) worst = Math.max(worst, Math.abs(C[q] + (20 * Math.sin((q * Math.PI) / 2)) / (q * Math.PI)));
    expect(worst).toBeLessThan(1e-13);
  });

  it('cosine moments of a smooth function on a shifted interval', () => {
    // f = x on [1, 3]: C(q) = (1/2) integral_1^3 x cos(q pi (x - 1)/2) dx = 2 ((-1)^q - 1) / (q pi)^2 for q >= 1, C(0) = 2 (elementary).
    const g = interfaceGrid(1, 3, [], 64);
    const C = cosineMoments(g, g.x.slice(), 64);
    expect(Math.abs(C[0] - 2)).toBeLessThan(1e-14);
    for (let q = 1; q < 64; q++) expect(Math.abs(C[q] - (2 * ((-1) ** q - 1)) / (q * Math.PI) ** 2)).toBeLessThan(1e-14);
  });
});
