/**
 * Results used by the client tests, built from a published closed form rather than typed in:
 * the parabola state psi ∝ x(L - x) in the box [0, 1] (natural units, hbar = m = 1), whose
 * coefficients are c_n = 8 sqrt(15)/(n pi)^3 for odd n and 0 for even n, with E_n = n^2 pi^2 / 2.
 * Source: Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
 */
import type { PanelResult } from '../../client/src/messages';

/** The parabola state's expansion over the first `levels` box levels, as the server would send it. */
export function parabolaResult(levels = 12, options: { samples?: boolean; energyUnit?: string | null } = {}): PanelResult {
  const ls = Array.from({ length: levels }, (_, k) => {
    const n = k + 1;
    const c = n % 2 === 1 ? (8 * Math.sqrt(15)) / (n * Math.PI) ** 3 : 0;
    return { n, energy: (n * n * Math.PI * Math.PI) / 2, re: c, im: 0, weight: c * c };
  });
  const captured = ls.reduce((s, l) => s + l.weight, 0);
  let samples: PanelResult['samples'] = null;
  if (options.samples) {
    const x = Array.from({ length: 101 }, (_, j) => j / 100);
    samples = {
      x,
      re: x.map((v) => Math.sqrt(30) * v * (1 - v)),
      im: x.map(() => 0),
      potential: x.map(() => 0),
      phi: ls.map((l) => x.map((v) => Math.SQRT2 * Math.sin(l.n * Math.PI * v))),
      walls: [0, 1],
    };
  }
  return {
    diagnostics: [],
    units: { length: null, energy: options.energyUnit ?? null, time: null },
    system: { kind: 'box', firstLabel: 1, energies: ls.map((l) => l.energy), center: 0.5 },
    levels: ls,
    norm: 1,
    captured,
    // <E> = (10/pi^2) E_1 = 5 for this state (same source).
    energy: { mean: 5, spread: Math.sqrt(30 / (Math.PI ** 4 / 24)) },
    parity: 'even',
    decay: { exponent: 3, classification: 'smooth', at: null },
    levelsFor999: 3,
    evolution: null,
    samples,
    elapsedMs: 1,
  };
}
