import { describe, it, expect } from 'vitest';
import { parityOf, nearlySymmetric } from '../../server/src/physics/parity';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { analyse } from '../../server/src/analysis/index';

const c = 1.25;
const q = compositeGaussLegendre(c - 8, c + 8, { panels: 32, order: 20 });

/** Samples psi at the nodes and at their mirror images about c. */
function sample(re: (x: number) => number, im: (x: number) => number = () => 0) {
  return {
    re: Float64Array.from(q.x, re),
    im: Float64Array.from(q.x, im),
    mirrorRe: Float64Array.from(q.x, (x) => re(2 * c - x)),
    mirrorIm: Float64Array.from(q.x, (x) => im(2 * c - x)),
    w: q.w,
  };
}

describe('parityOf', () => {
  it('classifies even, odd and mixed states, with parts adding up to the norm', () => {
    const g = (x: number) => Math.exp(-((x - c) ** 2));
    const even = parityOf(sample(g, (x) => 0.3 * g(x) * (x - c) ** 2));
    expect(even.classification).toBe('even');
    expect(even.odd).toBeLessThan(1e-15);
    const odd = parityOf(sample((x) => (x - c) * g(x)));
    expect(odd.classification).toBe('odd');
    // Mixed: g + (x - c) g has even weight sqrt(pi/2) and odd weight sqrt(pi/2)/4 (Gaussian moments, common practice).
    const mixed = parityOf(sample((x) => g(x) + (x - c) * g(x)));
    expect(mixed.classification).toBe('mixed');
    expect(mixed.major).toBe('even');
    expect(Math.abs(mixed.minor - 0.2)).toBeLessThan(1e-13); // (1/4) / (1 + 1/4)
    expect(Math.abs(mixed.even - Math.sqrt(Math.PI / 2))).toBeLessThan(1e-13);
    expect(Math.abs(mixed.odd - Math.sqrt(Math.PI / 2) / 4)).toBeLessThan(1e-13);
    let norm = 0;
    for (let j = 0; j < q.x.length; j++) norm += q.w[j] * (g(q.x[j]) + (q.x[j] - c) * g(q.x[j])) ** 2;
    expect(Math.abs(mixed.total - norm)).toBeLessThan(1e-13);
  });

  it('flags a slightly off-centre state as almost even, and not an exact or a clearly mixed one', () => {
    const shifted = (x: number) => Math.exp(-((x - c - 1e-3) ** 2));
    const p = parityOf(sample(shifted));
    expect(p.classification).toBe('mixed');
    const near = nearlySymmetric(p);
    expect(near?.almost).toBe('even');
    // Odd part of a Gaussian shifted by s holds about s^2 of the weight for small s (derived, Taylor expansion).
    expect(Math.abs((near?.fraction ?? 0) / 1e-6 - 1)).toBeLessThan(1e-2);
    expect(nearlySymmetric(parityOf(sample((x) => Math.exp(-((x - c) ** 2)))))).toBeNull();
    expect(nearlySymmetric(parityOf(sample((x) => Math.exp(-((x - c - 1) ** 2)))))).toBeNull();
  });

  it('honours the tolerance option and handles a zero state', () => {
    const s = sample((x) => Math.exp(-((x - c - 1e-3) ** 2)));
    expect(parityOf(s, { tolerance: 1e-5 }).classification).toBe('even');
    const z = parityOf(sample(() => 0));
    expect(z.total).toBe(0);
    expect(z.classification).toBe('even');
    expect(z.minor).toBe(0);
    expect(nearlySymmetric(z)).toBeNull();
  });
});

describe('the analysis measures parity here', () => {
  // A box centred on 0: an even packet, the same packet off by 1e-3 (odd share about 1e-6, as above) and one off by 1.
  const file = (shift: string) => `system box(-10, 10)\nstate psi(x) = exp(-(x - ${shift})^2)\nbasis 80\n`;
  const findings = (shift: string) => {
    const text = file(shift);
    const r = analyse(text);
    // On the formula of psi(x).
    const at = text.indexOf('exp(');
    return { parity: r.parity, found: r.diagnostics.filter((d) => d.code === 'parity').map((d) => [d.severity, d.start === at && d.end === text.indexOf('\nbasis')]) };
  };

  it('an even state is an info, a slightly shifted one a warning, a clearly mixed one nothing', () => {
    expect(findings('0')).toEqual({ parity: 'even', found: [['info', true]] });
    expect(findings('0.001')).toEqual({ parity: 'mixed', found: [['warning', true]] });
    expect(findings('1')).toEqual({ parity: 'mixed', found: [] });
  });

  it('names only the levels of the other parity that the basis holds', () => {
    // A finite well of width 1 and depth V0 (m = hbar = 1) has z0 = sqrt(2 V0) / 2 and ceil(2 z0 / pi)
    // bound levels (the standard square-well count, any quantum mechanics text): depth 2 gives z0 = 1,
    // one level (even); depth 10 gives z0 = 2.24, two levels; a box of 40 levels names n = 2, 4, 6, ...
    const levelsNamed = (system: string) => {
      const r = analyse(`system ${system}\nstate gaussian(center = 0, width = 0.3)\nbasis 40\n`);
      const d = r.diagnostics.find((x) => x.code === 'parity');
      expect(d?.severity).toBe('info');
      const list = /n = ([0-9, ]+)(, \.\.\.)?\)? (vanish|would vanish)/.exec(d!.message);
      return { count: r.levels.length, named: list![1]!.split(', ').map(Number), more: list![2] !== undefined, would: list![3] === 'would vanish' };
    };
    expect(levelsNamed('well(depth = 2, width = 1)')).toEqual({ count: 1, named: [2, 4], more: true, would: true });
    expect(levelsNamed('well(depth = 10, width = 1)')).toEqual({ count: 2, named: [2], more: false, would: false });
    expect(levelsNamed('box(-0.5, 0.5)')).toEqual({ count: 40, named: [2, 4, 6], more: true, would: false });
  });
});
