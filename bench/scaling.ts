/**
 * The scaling table: cost against size N for the box, the oscillator, V(x) and the evolution, each with
 * the least-squares exponent p of t ~ C N^p beside the exponent of the best known algorithm for that job
 * (scripts/bench-scaling.mjs runs it; `--quick` uses four small sizes and three runs, for a re-run after
 * engine changes). Every point is checked against a closed form, so a fast wrong answer shows.
 */
import { analyse } from '../server/src/analysis/index';
import { clearBasisMemo } from '../server/src/analysis/systems';
import { boxBasis } from '../server/src/physics/box';
import { oscillatorBasis } from '../server/src/physics/oscillator';
import { potentialBasis } from '../server/src/physics/potential';
import { evolve } from '../server/src/physics/evolution';
import { boxPacketReference, coherentReference, kinkReference } from './anchor';
import { fitExponent, measure, type Timing } from './stats';

/** One series: a job at each size, its check, and the best known algorithm's exponent. */
interface Series {
  id: string;
  job: string;
  /** What N counts. */
  size: string;
  sizes: { tiny: number[]; quick: number[]; full: number[] };
  /** The best known algorithm for the job and its exponent in N. */
  best: { p: number; how: string };
  /** Runs the job at size N; returns the worst error against the closed form and a note. */
  run: (n: number) => () => { error: number; note: string };
}

export interface ScalingPoint {
  n: number;
  timing: Timing;
  error: number;
  note: string;
}

export interface ScalingSeries {
  id: string;
  job: string;
  size: string;
  points: ScalingPoint[];
  /** Fitted exponent p over all points. */
  p: number;
  /** Fitted exponent over the three largest sizes, where fixed costs matter least. */
  pLarge: number;
  best: { p: number; how: string };
}

type Levels = { n: number; re: number | null; im: number | null }[];
function levelError(levels: Levels, first: number, re: Float64Array, im: Float64Array | null): number {
  let worst = 0;
  for (const l of levels) {
    const k = l.n - first;
    if (k >= 0 && k < re.length) worst = Math.max(worst, Math.hypot((l.re ?? NaN) - re[k]!, (l.im ?? NaN) - (im ? im[k]! : 0)));
  }
  return worst;
}

/** `analyse` of a file opened fresh (memo of solved bases emptied), with the time limit out of the way. */
function analysed(text: string, asked: number, first: number, re: Float64Array, im: Float64Array | null) {
  clearBasisMemo();
  const r = analyse(text, { limits: { maxMillis: 600_000 } });
  const cut = r.diagnostics.filter((d) => d.code === 'limits').length;
  return { error: levelError(r.levels, first, re, im), note: `${r.levels.length}/${asked} levels${cut ? `, ${cut} limits finding(s)` : ''}` };
}

const PACKET = { x0: 0.5, s: 0.04, k: 150 }; // the packet of bench/anchor.ts (boxPacketReference)
const KINK = 0.3; // the triangle of bench/anchor.ts (kinkReference)
const COHERENT_D = 10;

const SERIES: Series[] = [
  {
    id: 'box-packet',
    job: 'box, smooth packet, N coefficients through analyse()',
    size: 'levels N',
    sizes: { tiny: [20, 40], quick: [100, 200, 400, 800], full: [100, 200, 400, 800, 1600, 3200] },
    best: { p: 1, how: 'sine transform of O(N) samples, N log N' },
    run: (n) => {
      const ref = boxPacketReference(n);
      const text = `system box(0, 1)\nstate gaussian(center = ${PACKET.x0}, width = ${PACKET.s}, momentum = ${PACKET.k})\nbasis ${n}\n`;
      return () => analysed(text, n, 1, ref.re, ref.im);
    },
  },
  {
    id: 'box-kink',
    job: 'box, kinked triangle, N coefficients through analyse()',
    size: 'levels N',
    sizes: { tiny: [20, 40], quick: [100, 200, 400, 800], full: [125, 250, 500, 1000, 2000] },
    best: { p: 1, how: 'sine transform per smooth piece with endpoint corrections, N log N' },
    run: (n) => {
      const ref = kinkReference(n);
      const text = `system box(0, 1)\nstate psi(x) = x < ${KINK} ? x / ${KINK} : (1 - x) / ${1 - KINK}\nbasis ${n}\n`;
      return () => analysed(text, n, 1, ref, null);
    },
  },
  {
    id: 'oscillator',
    job: `oscillator, coherent state d = ${COHERENT_D}, N coefficients through analyse()`,
    size: 'levels N',
    sizes: { tiny: [20, 40], quick: [50, 100, 200, 400], full: [50, 100, 200, 400, 800, 1600] },
    best: { p: 1, how: 'Hermite recurrence on the state\'s fixed support, nodes x N' },
    run: (n) => {
      const ref = coherentReference(n, COHERENT_D / Math.SQRT2);
      const text = `system oscillator(omega = 1)\nstate gaussian(center = ${COHERENT_D}, width = ${Math.SQRT1_2})\nbasis ${n}\n`;
      return () => analysed(text, n, 0, ref, null);
    },
  },
  {
    id: 'potential',
    job: 'V(x) = x^2 (m = 1/2), lowest N levels, walls at 1.2 sqrt(2N + 1) + 5',
    size: 'levels N',
    sizes: { tiny: [5, 10], quick: [25, 50, 100, 200], full: [25, 50, 100, 200, 400, 800] },
    best: { p: 3, how: 'dense symmetric eigensolve of a grid of O(N) points' },
    run: (n) => {
      const wall = 1.2 * Math.sqrt(2 * n + 1) + 5;
      return () => {
        const p = potentialBasis((xs) => xs.map((x) => x * x), -wall, wall, 0.5, n);
        // E_n = 2 n + 1 for H = p^2 + x^2 (closed form); relative error over the resolved levels.
        const resolved = p.unresolved === null ? n : p.unresolved - 1;
        let worst = 0;
        for (let k = 0; k < resolved; k++) worst = Math.max(worst, Math.abs(p.basis.energies[k]! - (2 * k + 1)) / (2 * k + 1));
        return { error: worst, note: `${p.points} intervals${p.unresolved === null ? '' : `, levels from ${p.unresolved} unresolved`}` };
      };
    },
  },
  {
    id: 'evolution-oscillator',
    job: 'evolution, oscillator, N levels x 200 times (<x>, <p>, survival), coherent state of mean level N/2',
    size: 'levels N',
    sizes: { tiny: [20, 40], quick: [100, 200, 400, 800], full: [100, 200, 400, 800, 1600] },
    best: { p: 1, how: 'tridiagonal X and D (ladder operators), N x times' },
    // d = sqrt(N): |alpha|^2 = N/2, so every one of the N levels carries a nonzero weight and is kept.
    run: (n) => evolution(oscillatorBasis(1, 0, 1, n), n, coherentReference(n, Math.sqrt(n / 2)), new Float64Array(n), Math.sqrt(n)),
  },
  {
    id: 'evolution-box',
    job: 'evolution, box, N levels x 200 times (<x>, <p>, survival), the kinked triangle (every level populated)',
    size: 'levels N',
    sizes: { tiny: [20, 40], quick: [50, 100, 200, 400], full: [50, 100, 200, 400, 800] },
    best: { p: 2, how: 'dense X and D (half zero by parity), N^2 x times' },
    run: (n) => evolution(boxBasis(0, 1, 1, n), n, kinkReference(n), new Float64Array(n), null),
  },
];

const TIMES = 200;

/** Evolution over one oscillator period (t in [0, 2 pi]); checked against d cos t for the coherent state. */
function evolution(basis: ReturnType<typeof boxBasis>, n: number, re: Float64Array, im: Float64Array, d: number | null) {
  const times = Float64Array.from({ length: TIMES }, (_, j) => (2 * Math.PI * j) / (TIMES - 1));
  return () => {
    const e = evolve(basis, re, im, times, { maxLevels: n, weightCutoff: 0 });
    let worst = 0;
    // <x>(t) = d cos t, <p>(t) = -d sin t for a coherent state (Glauber, Phys. Rev. 131, 2766 (1963)).
    if (d !== null) times.forEach((t, j) => (worst = Math.max(worst, Math.abs(e.meanX[j]! - d * Math.cos(t)), Math.abs(e.meanP[j]! + d * Math.sin(t)))));
    // Otherwise: the survival at t = 0 is 1 (it is normalised by the kept weight).
    else worst = Math.abs(e.survival[0]! - 1);
    return { error: worst, note: e.complete ? '' : `cut after ${e.meanX.length} times` };
  };
}

export interface ScalingOptions {
  quick?: boolean;
  /** Two tiny sizes a series, for the smoke test (test/bench/scaling.test.ts). */
  tiny?: boolean;
  reps?: number;
  only?: string[];
  log?: (line: string) => void;
}

/** Times every series at its sizes (one warm-up run a point) and fits the exponents. */
export function runScaling(options: ScalingOptions = {}): ScalingSeries[] {
  const reps = options.reps ?? (options.quick ? 3 : 5);
  const out: ScalingSeries[] = [];
  for (const s of SERIES) {
    if (options.only && !options.only.includes(s.id)) continue;
    const points: ScalingPoint[] = [];
    for (const n of options.tiny ? s.sizes.tiny : options.quick ? s.sizes.quick : s.sizes.full) {
      const job = s.run(n);
      const { timing, result } = measure(job, { reps, warmup: 1 });
      points.push({ n, timing, error: result.error, note: result.note });
      options.log?.(`${s.id} N = ${n}: ${timing.median.toFixed(2)} ms, error ${result.error.toExponential(1)}${result.note ? `, ${result.note}` : ''}`);
    }
    const fit = (pts: ScalingPoint[]) => fitExponent(pts.map((q) => q.n), pts.map((q) => q.timing.median));
    out.push({ id: s.id, job: s.job, size: s.size, points, p: fit(points), pLarge: fit(points.slice(-3)), best: s.best });
  }
  return out;
}

const ms = (t: number) => (t >= 100 ? t.toFixed(0) : t >= 10 ? t.toFixed(1) : t.toFixed(2));

/** The scaling table as Markdown: one block a series (sizes, medians, errors), then the exponents. */
export function formatScaling(header: string[], series: ScalingSeries[]): string {
  const lines = [...header, ''];
  for (const s of series) {
    lines.push(`**${s.job}** (${s.size}; median ms [q1-q3], worst error against the closed form)`, '');
    lines.push(`| N | ${s.points.map((q) => q.n.toLocaleString('en-US')).join(' | ')} |`);
    lines.push(`|---|${s.points.map(() => '---').join('|')}|`);
    lines.push(`| ms | ${s.points.map((q) => `${ms(q.timing.median)} [${ms(q.timing.q1)}-${ms(q.timing.q3)}]`).join(' | ')} |`);
    lines.push(`| error | ${s.points.map((q) => q.error.toExponential(1)).join(' | ')} |`);
    if (s.points.some((q) => q.note)) lines.push(`| note | ${s.points.map((q) => q.note || '-').join(' | ')} |`);
    lines.push('');
  }
  lines.push('| series | fitted p, all sizes | fitted p, three largest | best known | p |', '|---|---|---|---|---|');
  for (const s of series) lines.push(`| ${s.id} | ${s.p.toFixed(2)} | ${s.pLarge.toFixed(2)} | ${s.best.how} | ${s.best.p} |`);
  return lines.join('\n');
}
