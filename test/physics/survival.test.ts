import { describe, expect, it } from 'vitest';
import { fastestBeatPeriod, fineSurvival } from '../../server/src/physics/survival';
import { analyse } from '../../server/src/analysis/index';

describe('survival on its own fine grid', () => {
  it('two equal levels: S(t) = cos^2((E_2 - E_1) t / 2) on every fine time, and the grid holds every evolve time', () => {
    // Two-level beat, derived in this comment: |(e^{-i E1 t} + e^{-i E2 t})/2|^2 = cos^2(dE t / 2).
    const E = Float64Array.of(0.5, 1.75);
    const c = Float64Array.of(Math.SQRT1_2, Math.SQRT1_2);
    const dE = E[1] - E[0];
    const r = fineSurvival(E, c, new Float64Array(2), 20, 4);
    expect(r.stopped).toBeNull();
    expect(r.beatPeriod).toBeCloseTo((2 * Math.PI) / dE, 12);
    // 16 samples a period over 20 time units, in whole intervals per evolve step: ceil(16 * 20 / (T * 4)).
    expect(r.refine).toBe(Math.ceil((16 * 20) / (((2 * Math.PI) / dE) * 4)));
    expect(r.times.length).toBe(4 * r.refine + 1);
    for (let j = 0; j < r.times.length; j++) expect(r.survival[j]).toBeCloseTo(Math.cos((dE * r.times[j]) / 2) ** 2, 12);
    for (let s = 0; s <= 4; s++) expect(r.times[s * r.refine]).toBeCloseTo((20 * s) / 4, 12);
    // Sampled finely enough, the first minimum (0 at t = pi / dE) is met within one fine step's curvature.
    const dt = r.times[1];
    const nearMin = Math.min(...Array.from(r.survival).filter((_, j) => r.times[j] < (2 * Math.PI) / dE));
    expect(nearMin).toBeLessThan(((dE * dt) / 2) ** 2);
  });

  it('a level of tiny weight does not set the beat; a single level needs no refinement', () => {
    const E = Float64Array.of(1, 2, 1000);
    const p = Float64Array.of(0.5, 0.4999, 1e-4);
    expect(fastestBeatPeriod(E, p, 0.999)).toBeCloseTo(2 * Math.PI, 12);
    expect(fastestBeatPeriod(Float64Array.of(3), Float64Array.of(1), 0.999)).toBeNull();
    const one = fineSurvival(Float64Array.of(3), Float64Array.of(1), Float64Array.of(0), 10, 5);
    expect(one.refine).toBe(1);
    expect(one.survival.length).toBe(6);
    for (const s of one.survival) expect(s).toBeCloseTo(1, 14);
  });

  it('caps the grid at maxPoints, still holding the evolve times', () => {
    const E = Float64Array.of(0, 100);
    const c = Float64Array.of(0.6, 0.8);
    const r = fineSurvival(E, c, new Float64Array(2), 100, 10, { maxPoints: 101 });
    expect(r.times.length).toBe(101);
    expect(r.refine).toBe(10);
  });

  it('the analysis reports survivalTimes and survivalFine beside the evolve arrays, which keep one entry a time', () => {
    // (phi_1 + phi_2)/sqrt 2 in a unit box (hbar = m = 1): E_n = n^2 pi^2 / 2, S(t) = cos^2(3 pi^2 t / 4)
    // (Griffiths, Introduction to Quantum Mechanics, ch. 2 (from memory)); 10 evolve steps over 2 beats undersample it.
    const dE = (3 * Math.PI ** 2) / 2;
    const r = analyse(`system box(0, 1)\nstate psi(x) = phi(1, x) + phi(2, x)\nbasis 4\nevolve to ${(4 * Math.PI) / dE} steps 3\n`);
    const ev = r.evolution!;
    expect(ev.times.length).toBe(4);
    expect(ev.survival.length).toBe(4);
    expect(ev.meanX.length).toBe(4);
    expect(ev.survivalTimes!.length).toBe(ev.survivalFine!.length);
    expect(ev.survivalTimes!.length).toBeGreaterThanOrEqual(33);
    ev.survivalTimes!.forEach((t, j) => expect(ev.survivalFine![j]).toBeCloseTo(Math.cos((dE * t) / 2) ** 2, 9));
    expect(Math.min(...ev.survivalFine!)).toBeLessThan(0.01);
    expect(Math.min(...ev.survival)).toBeGreaterThan(0.2);
  });

  it('many levels on the longest grid: the phases by rotation agree with the direct sum to 1e-13 at every time', () => {
    // Oscillator-like spectrum E_k = k + 1/2 with Poisson weights (a coherent state, |alpha|^2 = 9;
    // Glauber, Phys. Rev. 131, 2766 (1963)) plus an irrational shift so no two phases stay in step.
    const n = 40;
    const E = new Float64Array(n);
    const c = new Float64Array(n);
    let logFact = 0;
    for (let k = 0; k < n; k++) {
      if (k > 0) logFact += Math.log(k);
      E[k] = k + 0.5 + Math.SQRT2 * 1e-3 * k * k;
      c[k] = Math.exp(0.5 * (-9 + k * Math.log(9) - logFact));
    }
    const r = fineSurvival(E, c, new Float64Array(n), 300, 8, { maxPoints: 4097 });
    expect(r.times.length).toBe(4097);
    let total = 0;
    for (let k = 0; k < n; k++) total += c[k] * c[k];
    let worst = 0;
    for (let j = 0; j < r.times.length; j++) {
      let sr = 0;
      let si = 0;
      for (let k = 0; k < n; k++) {
        sr += c[k] * c[k] * Math.cos(E[k] * r.times[j]);
        si += c[k] * c[k] * Math.sin(E[k] * r.times[j]);
      }
      worst = Math.max(worst, Math.abs((sr * sr + si * si) / (total * total) - r.survival[j]));
    }
    expect(worst).toBeLessThan(1e-13);
  });
});
