/**
 * Mixed states against outside sources: the thermal occupation and its purity, the displaced thermal
 * populations (Laguerre closed form, computed independently in ./laguerre.ts), the energy moments of a
 * displaced thermal state, and the limits nbar -> 0 and a one-part mixture, which must give the pure
 * state's results exactly.
 */
import { describe, it, expect } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import type { AnalysisResult } from '../../server/src/analysis/types';
import { boltzmannWeights, occupationWeights } from '../../server/src/physics/thermal';
import { displacedThermal } from './laguerre';

const errors = (r: AnalysisResult) => r.diagnostics.filter((d) => d.severity === 'error');
const codes = (r: AnalysisResult) => r.diagnostics.map((d) => d.code);

describe('thermal weights', () => {
  it('p_k = nbar^k / (nbar + 1)^(k + 1) and the tail (nbar / (nbar + 1))^K', () => {
    // Any quantum optics text, e.g. Gerry & Knight (from memory; /work CHECKS list).
    for (const nbar of [0.05, 0.3, 2, 7.5]) {
      const K = 400;
      const w = occupationWeights(nbar, K);
      const tail = (nbar / (nbar + 1)) ** K;
      expect(Math.abs(w.tail - tail)).toBeLessThan(1e-14);
      for (const k of [0, 1, 2, 5, 17]) {
        const exact = nbar ** k / (nbar + 1) ** (k + 1) / (1 - tail);
        expect(Math.abs(w.weights[k]! - exact) / exact).toBeLessThan(1e-12);
      }
      let sum = 0;
      let sq = 0;
      let mean = 0;
      w.weights.forEach((p, k) => ((sum += p), (sq += p * p), (mean += k * p)));
      expect(Math.abs(sum - 1)).toBeLessThan(1e-13);
      // Mean occupation nbar and purity 1 / (2 nbar + 1) (same source).
      if (tail < 1e-15) {
        expect(Math.abs(mean - nbar)).toBeLessThan(1e-11 * (1 + nbar));
        expect(Math.abs(sq - 1 / (2 * nbar + 1))).toBeLessThan(1e-13);
      }
    }
  });

  it('Boltzmann weights of equally spaced levels are the occupation with nbar = 1 / (e^(Q/kT) - 1)', () => {
    // Bose-Einstein mean occupation of an oscillator of quantum Q at temperature T (common practice).
    const Q = 1;
    const kT = 0.8;
    const nbar = 1 / Math.expm1(Q / kT);
    const E = Float64Array.from({ length: 60 }, (_, k) => Q * (k + 0.5));
    const b = boltzmannWeights(E, 60, kT);
    const o = occupationWeights(nbar, 60);
    // Equal spacing: the tail estimate is exact (geometric series).
    expect(Math.abs(b.tail - o.tail) / o.tail).toBeLessThan(1e-9);
    for (let k = 0; k < 30; k++) expect(Math.abs(b.weights[k]! - o.weights[k]!)).toBeLessThan(1e-15);
  });
});

describe('a thermal oscillator state displaced by d', () => {
  // hbar = m = omega = 1: alpha = d / sqrt(2), so d = sqrt(2) is alpha = 1 (the CHECKS case).
  const file = (nbar: string, d: string, extra = '') => `system oscillator(omega = 1)\nstate thermal(nbar = ${nbar}) of oscillator(omega = 1, center = ${d})\n${extra}`;

  it('P_0..P_3 for nbar = 0.5, alpha = 1 are the CHECKS values', () => {
    const r = analyse(file('0.5', 'sqrt(2)'));
    expect(errors(r)).toEqual([]);
    // The published check values for mixed states (thermal nbar = 0.5 displaced by alpha = 1): summed to k = 120 in 40-digit arithmetic.
    const published = [0.342278079355061, 0.266216283942825, 0.17325186732787, 0.1021982559757];
    published.forEach((p, n) => expect(Math.abs(r.levels[n]!.weight - p)).toBeLessThan(1e-10));
    // P_0 = e^(-|alpha|^2 / (nbar + 1)) / (nbar + 1) (same source).
    expect(Math.abs(r.levels[0]!.weight - Math.exp(-1 / 1.5) / 1.5)).toBeLessThan(1e-10);
    expect(r.levels.every((l) => l.re === null && l.im === null)).toBe(true);
  });

  it('the first 20 populations agree with the Laguerre closed form to 1e-10 (two cases)', () => {
    const cases: { nbar: [bigint, bigint]; a: [bigint, bigint]; text: string }[] = [
      { nbar: [1n, 2n], a: [1n, 1n], text: file('0.5', 'sqrt(2)') },
      // nbar = 0.3, |alpha|^2 = 9/4: d = 1.5 sqrt(2).
      { nbar: [3n, 10n], a: [9n, 4n], text: file('0.3', '1.5 sqrt(2)', 'basis 60\n') },
    ];
    for (const c of cases) {
      const r = analyse(c.text);
      expect(errors(r)).toEqual([]);
      const exact = displacedThermal(c.nbar, c.a, 20, 90);
      let sum = 0;
      exact.forEach((p, n) => {
        expect(Math.abs(r.levels[n]!.weight - p), `n = ${n}`).toBeLessThan(1e-10);
        sum += p;
      });
      expect(sum).toBeLessThan(1);
    }
  });

  it('its purity is 1 / (2 nbar + 1), its energy nbar + 1/2 + |alpha|^2 and its spread^2 nbar (nbar + 1) + (2 nbar + 1) |alpha|^2', () => {
    // Purity: Gerry & Knight (from memory), unchanged by the displacement (a unitary).
    // Moments derived in this comment: with n -> n + alpha* a + alpha a^dagger + |alpha|^2 under D, and a
    // thermal state invariant under phase rotations, Var = nbar(nbar + 1) + |alpha|^2 <a a^dagger + a^dagger a>.
    for (const [nbar, a2, d] of [
      [0.5, 1, 'sqrt(2)'],
      [0.3, 2.25, '1.5 sqrt(2)'],
    ] as const) {
      const r = analyse(file(String(nbar), d, 'basis 60\n'));
      expect(Math.abs(r.purity! - 1 / (2 * nbar + 1))).toBeLessThan(1e-10);
      expect(Math.abs(r.energy!.mean! - (nbar + 0.5 + a2))).toBeLessThan(1e-8);
      expect(Math.abs(r.energy!.spread! ** 2 - (nbar * (nbar + 1) + (2 * nbar + 1) * a2))).toBeLessThan(1e-7);
      expect(Math.abs(r.captured! - 1)).toBeLessThan(1e-9);
      expect(r.mixture!.kind).toBe('thermal');
      expect(r.mixture!.omitted).toBeLessThan(1e-12);
    }
  });

  it('nbar -> 0 gives the pure ground state of the old oscillator exactly', () => {
    const pure = analyse('system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1, center = 0.7)\nevolve to 6 steps 30\n');
    for (const nbar of ['0', '1e-20']) {
      const r = analyse(file(nbar, '0.7', 'evolve to 6 steps 30\n'));
      expect(r.levels.map((l) => l.weight)).toEqual(pure.levels.map((l) => l.weight));
      expect(r.energy).toEqual(pure.energy);
      expect(r.captured).toBe(pure.captured);
      expect(r.purity).toBe(1);
      expect(r.evolution!.meanX).toEqual(pure.evolution!.meanX);
      expect(r.evolution!.survival).toEqual(pure.evolution!.survival);
      expect(r.evolution!.revival).toBe(pure.evolution!.revival);
      expect(codes(r)).toEqual(codes(pure));
    }
    expect(pure.purity).toBe(1);
  });
});

describe('mixtures', () => {
  it('a mixture of one state with weight 1 reproduces the pure state', () => {
    const sys = 'system box(0, 1)\n';
    const ev = 'evolve to 0.3 steps 20\n';
    const pure = analyse(`${sys}state gaussian(center = 0.4, width = 0.08, momentum = 20)\n${ev}`, { samples: true });
    const mix = analyse(`${sys}state mixture(1: gaussian(center = 0.4, width = 0.08, momentum = 20))\n${ev}`, { samples: true });
    expect(mix.levels.map((l) => l.weight)).toEqual(pure.levels.map((l) => l.weight));
    expect(mix.energy).toEqual(pure.energy);
    expect(mix.evolution!.meanX).toEqual(pure.evolution!.meanX);
    expect(mix.evolution!.meanP).toEqual(pure.evolution!.meanP);
    expect(mix.evolution!.survival).toEqual(pure.evolution!.survival);
    expect(mix.purity).toBe(1);
    expect(codes(mix)).toEqual(codes(pure));
    // The density is |psi|^2 of the pure state; the mixture has no Re/Im psi to show.
    const pd = pure.samples!.re.map((re, j) => re * re + pure.samples!.im[j]! ** 2);
    mix.samples!.density!.forEach((d, j) => expect(Math.abs(d - pd[j]!)).toBeLessThan(1e-12 * (1 + pd[j]!)));
    expect(mix.samples!.re.every((v) => v === 0)).toBe(true);
    expect(pure.samples!.density).toBeUndefined();
  });

  it('two box levels mixed half and half: P = 1/2, 1/2, purity 1/2, energies weighted, stationary', () => {
    // Box on [0, 1], hbar = m = 1: E_n = n^2 pi^2 / 2 (any textbook). The mean of E_1 and E_2 is 5 pi^2 / 4,
    // the spread (E_2 - E_1) / 2 = 3 pi^2 / 4 (two values with probability 1/2 each).
    const r = analyse('system box(0, 1)\nstate mixture(0.5: eigen(1) of box(0, 1), 0.5: eigen(2) of box(0, 1))\nevolve to 1 steps 10\n');
    expect(errors(r)).toEqual([]);
    expect(Math.abs(r.levels[0]!.weight - 0.5)).toBeLessThan(1e-12);
    expect(Math.abs(r.levels[1]!.weight - 0.5)).toBeLessThan(1e-12);
    expect(Math.abs(r.purity! - 0.5)).toBeLessThan(1e-12);
    expect(Math.abs(r.energy!.mean! - (5 * Math.PI ** 2) / 4)).toBeLessThan(1e-9);
    expect(Math.abs(r.energy!.spread! - (3 * Math.PI ** 2) / 4)).toBeLessThan(1e-9);
    // Each part is stationary: the survival stays 1 and <x> at the centre.
    for (const s of r.evolution!.survival) expect(Math.abs(s - 1)).toBeLessThan(1e-12);
    for (const x of r.evolution!.meanX) expect(Math.abs(x - 0.5)).toBeLessThan(1e-12);
    expect(r.parity).toBe('mixed');
  });

  it('the same state twice is pure; weights that do not add up to 1 are a norm finding and are normalised', () => {
    const r = analyse('system box(0, 1)\nstate mixture(0.3: gaussian(center = 0.5, width = 0.05), 0.6: gaussian(center = 0.5, width = 0.05))\n');
    expect(Math.abs(r.purity! - 1)).toBeLessThan(1e-12);
    // Two different packets: Tr rho^2 = p^2 + q^2 + 2 p q |<a|b>|^2 with |<a|b>|^2 = exp(-(dx)^2 / (4 s^2)) for
    // equal widths s (Gaussian overlap integral, derived in this comment), here dx = 0.1, s = 0.05.
    const two = analyse('system box(0, 1)\nstate mixture(0.5: gaussian(center = 0.45, width = 0.05), 0.5: gaussian(center = 0.55, width = 0.05))\n');
    expect(Math.abs(two.purity! - (0.5 + 0.5 * Math.exp(-1)))).toBeLessThan(1e-9);
    expect(codes(r)).toContain('norm');
    expect(r.mixture!.weights.map((w) => Math.round(w * 1e12) / 1e12)).toEqual([1 / 3, 2 / 3].map((w) => Math.round(w * 1e12) / 1e12));
  });
});

describe('thermal states at a temperature', () => {
  it('an oscillator at T has the Bose-Einstein occupation', () => {
    // Q = 2 meV at 20 K: nbar = 1 / (e^(Q / k_B T) - 1), with k_B = 8.617333262e-2 meV/K (CODATA 2018).
    const text = 'units nm, meV\nsystem oscillator(quantum = 2 meV)\nstate thermal(temperature = 20 K) of oscillator(quantum = 2 meV)\n';
    const r = analyse(text);
    expect(errors(r)).toEqual([]);
    const nbar = 1 / Math.expm1(2 / (8.617333262e-2 * 20));
    const p = r.mixture!.weights;
    for (let k = 0; k < 6; k++) expect(Math.abs(p[k]! - nbar ** k / (nbar + 1) ** (k + 1))).toBeLessThan(1e-10);
    // Undisplaced: the populations are the thermal weights themselves.
    for (let k = 0; k < 6; k++) expect(Math.abs(r.levels[k]!.weight - p[k]!)).toBeLessThan(1e-12);
    expect(Math.abs(r.purity! - 1 / (2 * nbar + 1))).toBeLessThan(1e-10);
  });

  it('a numerical potential at T: V = x^2/2 between far walls has the oscillator occupation', () => {
    // hbar = m = omega = 1, kT = 0.8: nbar = 1 / (e^(1/0.8) - 1) (Bose-Einstein, common practice); the walls at
    // +-12 change the low levels by far less than the tolerance (the Gaussian tails there are below e^-100).
    const r = analyse('system oscillator(omega = 1)\nstate thermal(temperature = 0.8) of V(x) = x^2 / 2 over [-12, 12]\n');
    expect(errors(r)).toEqual([]);
    const nbar = 1 / Math.expm1(1 / 0.8);
    const w = r.mixture!.weights;
    for (let k = 0; k < 8; k++) expect(Math.abs(w[k]! - nbar ** k / (nbar + 1) ** (k + 1)), `k = ${k}`).toBeLessThan(1e-7);
    for (let k = 0; k < 8; k++) expect(Math.abs(r.levels[k]!.weight - w[k]!), `n = ${k}`).toBeLessThan(1e-7);
    expect(Math.abs(r.purity! - 1 / (2 * nbar + 1))).toBeLessThan(1e-7);
  });

  it('a box at T: weights exp(-(E_n - E_1)/kT) with E_n proportional to n^2', () => {
    // Box on [0, 1], hbar = m = 1: E_n = n^2 pi^2 / 2 (any textbook); kT = 40 in natural units.
    const r = analyse('system box(0, 1)\nstate thermal(temperature = 40) of box(0, 1)\n');
    expect(errors(r)).toEqual([]);
    const w = r.mixture!.weights;
    for (let n = 2; n <= 5; n++) expect(Math.abs(w[n - 1]! / w[0]! - Math.exp(-((n * n - 1) * Math.PI ** 2) / 2 / 40))).toBeLessThan(1e-12);
    expect(r.mixture!.omitted).toBeLessThan(1e-12);
  });
});

describe('findings of mixed states', () => {
  it('a thermal sum the cap cuts above the floor is a limits finding on its argument', () => {
    const text = 'system oscillator(omega = 1)\nstate thermal(nbar = 3) of oscillator(omega = 1)\nbasis 20\n';
    const r = analyse(text, { limits: { maxBasis: 20 } });
    const d = r.diagnostics.find((x) => x.code === 'limits')!;
    expect(d).toBeDefined();
    expect(text.slice(d.start, d.end)).toBe('nbar = 3');
    // (3/4)^20 of the sum is left out (geometric tail).
    expect(r.mixture!.omitted).toBeCloseTo(0.75 ** 20, 12);
  });

  it('a mixture of more than 200 parts is refused before anything is projected', () => {
    const parts = Array.from({ length: 201 }, () => '1: eigen(1) of box(0, 1)').join(', ');
    const text = `system box(0, 1)\nstate mixture(${parts})\n`;
    const r = analyse(text);
    const d = r.diagnostics.find((x) => x.code === 'limits')!;
    expect(text.slice(d.start, d.end)).toBe('mixture');
    expect(r.levels).toEqual([]);
    expect(r.work!.ops).toBe(0);
  });

  it('a well hot enough to reach its top is a continuum finding', () => {
    const text = 'system well(depth = 10, width = 2)\nstate thermal(temperature = 5) of well(depth = 10, width = 2)\n';
    const r = analyse(text);
    expect(codes(r)).toContain('continuum');
    const cold = analyse('system well(depth = 10, width = 2)\nstate thermal(temperature = 0.05) of well(depth = 10, width = 2)\n');
    expect(codes(cold)).not.toContain('continuum');
  });

  it('nbar of a box, a negative weight, a temperature in nm and a nested mixture are refused where written', () => {
    const cases: [string, string, string][] = [
      ['system box(0, 1)\nstate thermal(nbar = 0.2) of box(0, 1)\n', 'evaluation', 'nbar = 0.2'],
      ['system box(0, 1)\nstate mixture(-0.2: eigen(1) of box(0, 1), 1.2: eigen(2) of box(0, 1))\n', 'evaluation', '-0.2'],
      ['units nm, meV\nsystem box(0 nm, 1 nm)\nstate thermal(temperature = 3 nm) of box(0 nm, 1 nm)\n', 'units', '3 nm'],
      ['system box(0, 1)\nstate mixture(1: thermal(nbar = 1) of oscillator(omega = 1))\n', 'syntax', 'thermal'],
      ['system box(0, 1)\nstate mixture(0.5 eigen(1) of box(0, 1))\n', 'syntax', '0.5 eigen(1) of box(0, 1)'],
      ['system box(0, 1)\nstate thermal(nbar = 1, temperature = 2) of box(0, 1)\n', 'syntax', 'temperature'],
      ['system box(0, 1)\nstate thermal(nbar = -1) of oscillator(omega = 1)\n', 'evaluation', '-1'],
    ];
    for (const [text, code, at] of cases) {
      // Syntax and units are checked without evaluating too (untrusted workspaces); values only by the analysis.
      const runs = code === 'evaluation' ? [analyse(text)] : [analyse(text), analyse(text, { evaluate: false })];
      for (const r of runs) {
        const d = r.diagnostics.find((x) => x.code === code);
        expect(d, text).toBeDefined();
        expect(text.slice(d!.start, d!.end), text).toBe(at);
      }
    }
  });
});
