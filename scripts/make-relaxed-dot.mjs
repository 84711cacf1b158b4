// Writes examples/data/relaxed-dot.csv: the ground state of an anharmonic GaAs dot found by relaxation
// in imaginary time, as another program would hand it over (a scenario for examples/relaxed-dot.qstate).
//
// Dot: V(x) = 1/2 m w^2 x^2 + 0.05 hbar w (x / x0)^4 with hbar w = 3 meV, m = 0.067 m_e, x0 = sqrt(hbar / (m w)).
// Method: psi <- psi - dtau H psi on a grid of 1025 points over [-100, 100] nm (three-point Laplacian,
// psi = 0 at the ends), renormalised every step, until the energy changes by less than 1e-12 meV a
// step; then every 8th point is written (129 samples, 1.5625 nm apart), as a coarse output would be.
// hbar^2 / m_e = 0.0761996 eV nm^2 (CODATA 2018 hbar, m_e and e, rounded).
import { writeFileSync } from 'node:fs';

const HBAR2_ME = 76.1996; // meV nm^2
const kin = HBAR2_ME / 0.067 / 2; // hbar^2 / (2 m), meV nm^2
const hw = 3; // meV
const x0 = Math.sqrt(HBAR2_ME / 0.067 / hw); // nm
const N = 1025;
const L = 100;
const h = (2 * L) / (N - 1);
const x = Float64Array.from({ length: N }, (_, i) => -L + i * h);
const V = x.map((t) => 0.5 * hw * (t / x0) ** 2 + 0.05 * hw * (t / x0) ** 4);
let psi = x.map((t) => Math.exp(-((t / x0) ** 2)));
const dtau = (0.4 * h * h) / kin;
const Hpsi = (p) => p.map((v, i) => (i === 0 || i === N - 1 ? 0 : -kin * (p[i + 1] - 2 * v + p[i - 1]) / (h * h) + V[i] * v));
const normalise = (p) => {
  const s = Math.sqrt(p.reduce((a, v) => a + v * v, 0) * h);
  return p.map((v) => v / s);
};
psi = normalise(psi);
let energy = Infinity;
for (let step = 0; step < 2_000_000; step++) {
  const hp = Hpsi(psi);
  const e = psi.reduce((a, v, i) => a + v * hp[i], 0) * h;
  if (Math.abs(e - energy) < 1e-12) break;
  energy = e;
  psi = normalise(psi.map((v, i) => v - dtau * hp[i]));
}
const rows = ['# Ground state of the anharmonic dot (scripts/make-relaxed-dot.mjs), relaxed in imaginary time', `# energy ${energy.toFixed(9)} meV on the relaxation grid; every 8th of 1025 points`, 'x [nm], re'];
for (let i = 0; i < N; i += 8) rows.push(`${x[i].toFixed(4)}, ${psi[i].toExponential(9)}`);
writeFileSync(new URL('../examples/data/relaxed-dot.csv', import.meta.url), rows.join('\n') + '\n');
console.log(`relaxed energy ${energy} meV`);
