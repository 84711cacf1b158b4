import { describe, it, expect } from 'vitest';
import { project } from '../../server/src/physics/project';
import { boxBasis } from '../../server/src/physics/box';
import { oscillatorBasis } from '../../server/src/physics/oscillator';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';

describe('project', () => {
  it('gives the same coefficients however the table is chunked', () => {
    const b = oscillatorBasis(1, 0, 1, 120);
    const q = compositeGaussLegendre(-25, 25, { panels: 50, order: 20 });
    const re = Float64Array.from(q.x, (x) => Math.exp(-((x - 1) ** 2) / 3) * Math.cos(2 * x));
    const im = Float64Array.from(q.x, (x) => Math.exp(-((x + 0.5) ** 2) / 2) * x);
    const whole = project(b, q, re, im, 120);
    const chunked = project(b, q, re, im, 120, { maxTable: 1000 });
    for (let k = 0; k < 120; k++) {
      expect(Math.abs(whole.re[k] - chunked.re[k])).toBeLessThan(1e-14);
      expect(Math.abs(whole.im[k] - chunked.im[k])).toBeLessThan(1e-14);
    }
    // Invariant (Parseval, common practice): weights add up to the norm for a state the basis captures.
    let norm = 0;
    for (let j = 0; j < q.x.length; j++) norm += q.w[j] * (re[j] ** 2 + im[j] ** 2);
    let sum = 0;
    for (let k = 0; k < 120; k++) sum += whole.re[k] ** 2 + whole.im[k] ** 2;
    expect(Math.abs(sum - norm)).toBeLessThan(1e-12 * norm);
  });

  it('reproduces a complex combination of box levels and pads levels beyond the basis with zeros', () => {
    const b = boxBasis(0, 3, 1, 5);
    const q = compositeGaussLegendre(0, 3, { panels: 4, order: 20 });
    const phi = (n: number, x: number) => Math.sqrt(2 / 3) * Math.sin((n * Math.PI * x) / 3);
    const re = Float64Array.from(q.x, (x) => 0.6 * phi(1, x));
    const im = Float64Array.from(q.x, (x) => -0.8 * phi(4, x));
    const c = project(b, q, re, im, 8);
    // Orthonormality of the box levels (common practice): the coefficients are the ones put in.
    expect(Math.abs(c.re[0] - 0.6)).toBeLessThan(1e-14);
    expect(Math.abs(c.im[3] + 0.8)).toBeLessThan(1e-14);
    expect(c.re.length).toBe(8);
    expect(c.re[6]).toBe(0);
    expect(c.im[7]).toBe(0);
  });
});
