// Benchmark of the eigen-solvers: the lowest 50 levels of H = p^2 + x^4 (m = 1/2) on [-7, 7] to 1e-9.
// The spectral solver (sine DVR, server/src/physics/potential.ts) against the plain second-order
// finite-difference baseline (server/src/physics/fd.ts). Prints points, time and accuracy for both.
// Run: node bench/solver.mjs
import { build } from 'esbuild';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir, loadavg, cpus } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

const dir = mkdtempSync(join(tmpdir(), 'eigenspan-bench-'));
const out = join(dir, 'solvers.mjs');
await build({
  stdin: {
    contents: "export { potentialBasis } from './server/src/physics/potential';\nexport { fdLevels } from './server/src/physics/fd';\n",
    resolveDir: process.cwd(),
    loader: 'ts',
  },
  bundle: true,
  platform: 'node',
  format: 'esm',
  outfile: out,
  logLevel: 'warning',
});
const { potentialBasis, fdLevels } = await import(pathToFileURL(out).href);
rmSync(dir, { recursive: true, force: true });

const V = (xs) => xs.map((x) => x ** 4);
const [a, b, mass, levels, tol] = [-7, 7, 0.5, 50, 1e-9];

// Spectral: median of several runs after the JIT has warmed up.
for (let i = 0; i < 5; i++) potentialBasis(V, a, b, mass, levels);
const runs = [];
let spectral;
for (let i = 0; i < 11; i++) {
  const t0 = performance.now();
  spectral = potentialBasis(V, a, b, mass, levels, { tolerance: tol });
  runs.push(performance.now() - t0);
}
runs.sort((p, q) => p - q);
const ref = spectral.basis.energies;
const unc = spectral.basis.uncertainty;
let worstUnc = 0;
for (let k = 0; k < levels; k++) worstUnc = Math.max(worstUnc, unc[k] / Math.abs(ref[k]));
console.log(
  `spectral (sine DVR): ${spectral.points} points (sizes ${spectral.sizes.join(', ')}), median ${runs[5].toFixed(1)} ms after 5 warm-up runs, ` +
    `worst relative uncertainty ${worstUnc.toExponential(1)}, unresolved ${spectral.unresolved}, target <= 50 ms`,
);

// Finite differences: doubling sizes until 1e-9 or a time budget; error against the spectral energies.
let N = 1000;
let last = null;
const budgetMs = 10000;
let spent = 0;
while (spent < budgetMs) {
  const t0 = performance.now();
  const fd = fdLevels(V, a, b, mass, N, levels);
  const ms = performance.now() - t0;
  spent += ms;
  let worst = 0;
  for (let k = 0; k < levels; k++) worst = Math.max(worst, Math.abs(fd.energies[k] - ref[k]) / Math.abs(ref[k]));
  console.log(`finite differences: ${N} points, ${ms.toFixed(1)} ms, worst relative error ${worst.toExponential(2)}`);
  if (last && worst > last.worst / 3) {
    // Rounding: bisection is accurate to eps ||T|| ~ eps / (m h^2), which grows as the grid refines.
    console.log(`finite differences: rounding floor reached (eps / (m h^2) ~ ${(2.2e-16 / (mass * ((b - a) / N) ** 2)).toExponential(1)} absolute); 1e-9 is out of reach in double precision`);
    last = null;
    break;
  }
  last = { N, ms, worst };
  if (worst <= tol) break;
  N *= 2;
}
if (last && last.worst > tol) {
  // Second order: the error falls as N^-2, so 1e-9 needs N (worst / tol)^(1/2) points.
  const need = Math.ceil(last.N * Math.sqrt(last.worst / tol));
  console.log(`finite differences would need about ${need} points for ${tol} (error ~ N^-2), ~${((last.ms * need) / last.N / 1000).toFixed(0)} s at the same rate`);
}
// Timings scale with the machine's load; print it so that a slow figure can be read in context.
console.log(`load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores`);
