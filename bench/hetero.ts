/**
 * Item 9 of the benchmark suite: the solver paths of a position-dependent mass. The BenDaniel–Duke
 * finite well in closed form against the constant-mass well; a mass step in V(x) (the Galerkin solve in
 * the mass coordinate) against the same V(x) with one mass; a smooth profile with a closed form.
 */
import { wellBasis } from '../server/src/physics/well';
import { potentialBasis, type PotentialFn } from '../server/src/physics/potential';
import type { MassProfile } from '../server/src/physics/massProfile';
import { EV_SI, HBAR_SI, ME_SI } from '../server/src/expr/constants';
import { measure, ratioOf } from './stats';
import type { Row } from './suite';

/** The electron mass in the internal units of a file in nm and meV (hbar = 1). */
const M_E = (ME_SI * 1e-18 * EV_SI * 1e-3) / (HBAR_SI * HBAR_SI);
const map = (f: (x: number) => number) => (xs: Float64Array) => xs.map(f);

/** Largest residual of the BenDaniel–Duke phase equations in their bounded sine/cosine form, relative. */
function phaseResidual(w: ReturnType<typeof wellBasis>, a: number, mw: number, mb: number): number {
  let worst = 0;
  for (let i = 0; i < w.count; i++) {
    const k = Math.sqrt(2 * mw * w.energies[i]!);
    const q = Math.sqrt(2 * mb * w.binding[i]!);
    const z = k * a;
    const r = i % 2 === 0 ? (k / mw) * Math.sin(z) - (q / mb) * Math.cos(z) : -(k / mw) * Math.cos(z) - (q / mb) * Math.sin(z);
    worst = Math.max(worst, Math.abs(r) / (k / mw + q / mb));
  }
  return worst;
}

/** All bound states of a deep well with a barrier mass, against the same well with one mass. */
export function benchHeteroWell(depth: number, reps: number): Row {
  const width = 30;
  const mw = 0.067 * M_E;
  const mb = 0.092 * M_E;
  const hetero = measure(() => wellBasis(depth, width, 0, mw, { barrierMass: mb }), { reps });
  const plain = measure(() => wellBasis(depth, width, 0, mw), { reps });
  const w = hetero.result;
  return {
    item: 9,
    job: `BenDaniel–Duke well: all ${w.count} bound states (${width} nm, ${depth} meV, 0.067 / 0.092 m_e)`,
    method: 'closed-form phase equation in the bracketed angle, safeguarded Newton',
    size: `${w.count} levels`,
    timing: hetero.timing,
    accuracy: { value: phaseResidual(w, width / 2, mw, mb), measure: 'max relative residual of the phase equations', reference: 'BenDaniel & Duke, Phys. Rev. 152, 683 (1966)' },
    baseline: { method: 'the same well with one mass (constant-mass phase equation)', timing: plain.timing, accuracy: null },
    ratio: ratioOf(plain.timing, hetero.timing),
    target: null,
    notes: [],
  };
}

/** The 8 nm, 250 meV well as V(x) with a mass step, against the same V(x) with one mass. */
export function benchMassStep(tolerance: number, reps: number): Row {
  const mw = 0.067 * M_E;
  const mb = 0.092 * M_E;
  const V: PotentialFn = map((x) => (Math.abs(x) < 4 ? 0 : 250));
  const profile: MassProfile = { at: map((x) => (Math.abs(x) < 4 ? mw : mb)), slope: map(() => 0), breaks: [-4, 4] };
  const ours = measure(() => potentialBasis(V, -30, 30, mw, 2, { massProfile: profile, tolerance }), { reps });
  const plain = measure(() => potentialBasis(V, -30, 30, mw, 2, { tolerance }), { reps });
  const exact = wellBasis(250, 8, 0, mw, { barrierMass: mb });
  const exactPlain = wellBasis(250, 8, 0, mw);
  const err = (e: Float64Array, ref: Float64Array) => Math.max(...[0, 1].map((k) => Math.abs(e[k]! - ref[k]!) / ref[k]!));
  const r = ours.result;
  return {
    item: 9,
    job: 'mass step in V(x): the 8 nm, 250 meV well over [-30, 30] nm, 2 levels',
    method: 'Galerkin in the sines of the mass coordinate, panels ending on the interfaces, N^-3 jump climb',
    size: `tolerance ${tolerance}, grids ${r.sizes.join(', ')}`,
    timing: ours.timing,
    accuracy: { value: err(r.basis.energies, exact.energies), measure: 'max relative energy error', reference: 'the closed-form BenDaniel–Duke well (CHECKS.md values)' },
    baseline: { method: 'the same V(x) with one mass (sine Galerkin, interface panels)', timing: plain.timing, accuracy: err(plain.result.basis.energies, exactPlain.energies), note: `grids ${plain.result.sizes.join(', ')}` },
    ratio: ratioOf(plain.timing, ours.timing),
    target: null,
    notes: [`stated uncertainty ${Math.max(...Array.from(r.basis.uncertainty!, (u, k) => u / exact.energies[k]!)).toExponential(1)} relative`],
  };
}

/**
 * A smooth profile m = (1 + tanh(x)/2)^2 with V = y^2/2 - U, whose levels are n + 1/2 (the change of
 * variables of test/physics/massProfile.test.ts), against the constant-mass oscillator on the same
 * interval.
 */
export function benchSmoothMass(levels: number, reps: number): Row {
  const s = (x: number) => 1 + 0.5 * Math.tanh(x);
  const sx = (x: number) => 0.5 / Math.cosh(x) ** 2;
  const sxx = (x: number) => -Math.tanh(x) / Math.cosh(x) ** 2;
  const y = (x: number) => x + 0.5 * Math.log(Math.cosh(x));
  const U = (x: number) => -0.25 * (sxx(x) / s(x) ** 3) + 0.625 * (sx(x) ** 2 / s(x) ** 4);
  const V: PotentialFn = map((x) => 0.5 * y(x) ** 2 - U(x));
  const profile: MassProfile = { at: map((x) => s(x) ** 2), slope: map((x) => 2 * s(x) * sx(x)), breaks: [] };
  const ours = measure(() => potentialBasis(V, -16, 12, 1, levels, { massProfile: profile }), { reps });
  const plain = measure(() => potentialBasis(map((x) => 0.5 * x * x), -16, 12, 1, levels), { reps });
  const err = (e: Float64Array) => Math.max(...Array.from(e, (v, n) => Math.abs(v - (n + 0.5))));
  return {
    item: 9,
    job: `smooth mass profile: ${levels} levels of a tanh-graded mass mapped to the oscillator`,
    method: 'Galerkin in the sines of the Liouville coordinate y = integral sqrt(m) dx (exponential)',
    size: `${levels} levels, grids ${ours.result.sizes.join(', ')}`,
    timing: ours.timing,
    accuracy: { value: err(ours.result.basis.energies), measure: 'max |E_n - (n + 1/2)|', reference: 'closed form by a change of variables (derived in the test)' },
    baseline: { method: 'the constant-mass oscillator on [-16, 12] (sine DVR)', timing: plain.timing, accuracy: err(plain.result.basis.energies), note: `grids ${plain.result.sizes.join(', ')}` },
    ratio: ratioOf(plain.timing, ours.timing),
    target: null,
    notes: [],
  };
}
