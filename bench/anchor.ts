/**
 * The engine's side of the side-by-side benchmark against numpy/scipy (scripts/bench-python.mjs).
 * Each row is one job the engine does, with the accuracy it reaches against a closed form or a
 * reference value; the python side (bench/python/anchor.py) does the same job under the same row id.
 * The states and systems are repeated in anchor.py; both sides print their accuracy, so a drift shows.
 */
import { analyse } from '../server/src/analysis/index';
import { clearBasisMemo } from '../server/src/analysis/systems';
import { boxCoefficientsFromSamples } from '../server/src/physics/dst';
import { potentialBasis } from '../server/src/physics/potential';
import { createBudget } from '../server/src/physics/budget';
import { oscillatorBasis } from '../server/src/physics/oscillator';
import { evolve } from '../server/src/physics/evolution';

/** One engine job: a timed run and the accuracy of its result. */
export interface AnchorRow {
  id: string;
  /** The job in words, the same for both sides. */
  job: string;
  /** How the engine does it. */
  method: string;
  run: () => unknown;
  /** Accuracy of a result (same measure as the python side), with a short note (levels, cuts). */
  accuracy: (result: unknown, ref: AnchorRefs) => { value: number; note: string };
}

/** Reference values fetched from the python side (none in the smoke test). */
export interface AnchorRefs {
  /** Lowest quartic levels from a sine DVR at 1,200 intervals (python side). */
  quartic?: number[];
}

const BOX = { x0: 0.5, s: 0.04, k: 150 };
const KINK = 0.3;
/** E_0..E_2 of H = p^2 + x^4 (Hioe and Montroll, J. Math. Phys. 16, 1945 (1975), from memory). */
const HIOE = [1.060362090484183, 3.799673029801394, 7.455697937986738];
const MORSE = { D: 200, alpha: 1, a: -1.5, b: 12, mass: 1 };

/**
 * Closed-form box coefficients of the packet (2 pi s^2)^(-1/4) exp(-(x-x0)^2/(4 s^2) + i k x) on [0, 1]:
 * with q = n pi, c_n = sqrt 2 A sqrt(4 pi) s / (2i) [e^{i(k+q)x0 - (k+q)^2 s^2} - e^{i(k-q)x0 - (k-q)^2 s^2}]
 * (derived from the Gaussian Fourier integral; the tails beyond the walls are below 1e-100).
 */
export function boxPacketReference(count: number): { re: Float64Array; im: Float64Array } {
  const re = new Float64Array(count);
  const im = new Float64Array(count);
  const { x0, s, k } = BOX;
  const pref = Math.SQRT2 * Math.pow(2 * Math.PI * s * s, -0.25) * Math.sqrt(4 * Math.PI) * s * 0.5;
  for (let n = 1; n <= count; n++) {
    const q = n * Math.PI;
    const gp = Math.exp(-((k + q) ** 2) * s * s);
    const gm = Math.exp(-((k - q) ** 2) * s * s);
    const ar = gp * Math.cos((k + q) * x0) - gm * Math.cos((k - q) * x0);
    const ai = gp * Math.sin((k + q) * x0) - gm * Math.sin((k - q) * x0);
    re[n - 1] = pref * ai;
    im[n - 1] = -pref * ar;
  }
  return { re, im };
}

/**
 * c_n = sqrt 6 sin(n pi x0) / ((n pi)^2 x0 (1 - x0)) for the normalised triangle peaked at x0 on [0, 1]
 * (derived in this comment: two integrations by parts leave (1/(n pi)^2) sin(n pi x0) (1/x0 + 1/(1-x0))
 * times sqrt 2, and the norm of the unnormalised triangle is 1/3).
 */
export function kinkReference(count: number): Float64Array {
  const c = new Float64Array(count);
  for (let n = 1; n <= count; n++) {
    const q = n * Math.PI;
    c[n - 1] = (Math.sqrt(6) * Math.sin(q * KINK)) / (q * q * KINK * (1 - KINK));
  }
  return c;
}

/**
 * c_n = e^{-a^2/2} a^n / sqrt(n!) (Glauber, Phys. Rev. 131, 2766 (1963)), real a > 0, by the product
 * c_n = c_{n-1} a / sqrt(n) (relative rounding about sqrt(n) eps; the sum of logarithms it replaces lost
 * 1.4e-12 relative at n = 454, d = 30, against 50-digit decimal arithmetic). From the log form only when
 * e^{-a^2/2} would underflow.
 */
export function coherentReference(count: number, alpha: number): Float64Array {
  const c = new Float64Array(count);
  if (0.5 * alpha * alpha < 700) {
    let v = Math.exp(-0.5 * alpha * alpha);
    for (let n = 0; n < count; n++) {
      if (n > 0) v *= alpha / Math.sqrt(n);
      c[n] = v;
    }
    return c;
  }
  let logFact = 0;
  for (let n = 0; n < count; n++) {
    if (n > 0) logFact += Math.log(n);
    c[n] = Math.exp(-0.5 * alpha * alpha + n * Math.log(alpha) - 0.5 * logFact);
  }
  return c;
}

/** E_n = w (n + 1/2) - alpha^2 (n + 1/2)^2 / (2 m), w = alpha sqrt(2 D / m) (Morse, Phys. Rev. 34, 57 (1929)). */
export function morseExact(count: number): Float64Array {
  const { D, alpha, mass } = MORSE;
  const w = alpha * Math.sqrt((2 * D) / mass);
  return Float64Array.from({ length: count }, (_, n) => w * (n + 0.5) - (alpha * alpha * (n + 0.5) ** 2) / (2 * mass));
}

type Levels = { n: number; re: number | null; im: number | null }[];

/** max |c_n - ref_n| over the levels the analysis returned (n counted from `first`). */
function levelError(levels: Levels, first: number, refRe: Float64Array, refIm: Float64Array | null): number {
  let worst = 0;
  for (const l of levels) {
    const k = l.n - first;
    if (k < 0 || k >= refRe.length) continue;
    worst = Math.max(worst, Math.hypot((l.re ?? NaN) - refRe[k]!, (l.im ?? NaN) - (refIm ? refIm[k]! : 0)));
  }
  return worst;
}

function worstRel(E: Float64Array, ref: ArrayLike<number>, count: number): number {
  let w = 0;
  for (let k = 0; k < Math.min(count, ref.length, E.length); k++) w = Math.max(w, Math.abs(E[k]! - ref[k]!) / Math.abs(ref[k]!));
  return w;
}

/** An analysis with a raised time limit, the memo of solved bases emptied (a file opened fresh). */
function analyseCold(text: string) {
  clearBasisMemo();
  return analyse(text, { limits: { maxMillis: 600_000 } });
}

function analysisNote(r: ReturnType<typeof analyse>, asked: number): string {
  const cut = r.diagnostics.filter((d) => d.code === 'limits').length;
  return `${r.levels.length} of ${asked} levels returned${cut ? `, ${cut} limits finding(s)` : ''}`;
}

function boxRows(tiny: boolean): AnchorRow[] {
  const count = tiny ? 20 : 200;
  const N = tiny ? 64 : 256;
  const ref = boxPacketReference(count);
  const text = `system box(0, 1)\nstate gaussian(center = ${BOX.x0}, width = ${BOX.s}, momentum = ${BOX.k})\nbasis ${count}\n`;
  const samples = () => {
    const re = new Float64Array(N + 1);
    const im = new Float64Array(N + 1);
    const amp = Math.pow(2 * Math.PI * BOX.s * BOX.s, -0.25);
    for (let j = 0; j <= N; j++) {
      const x = j / N;
      const g = amp * Math.exp(-((x - BOX.x0) ** 2) / (4 * BOX.s * BOX.s));
      re[j] = g * Math.cos(BOX.k * x);
      im[j] = g * Math.sin(BOX.k * x);
    }
    return { re, im };
  };
  const kinkCount = tiny ? 50 : 2000;
  const kink = kinkReference(kinkCount);
  const kinkText = `system box(0, 1)\nstate psi(x) = x < ${KINK} ? x / ${KINK} : (1 - x) / ${1 - KINK}\nbasis ${kinkCount}\n`;
  return [
    {
      id: 'box-packet-analyse',
      job: `${count} box coefficients, smooth packet, through the expansion path`,
      method: 'analyse() of the .qstate text',
      run: () => analyseCold(text),
      accuracy: (r) => {
        const a = r as ReturnType<typeof analyse>;
        return { value: levelError(a.levels, 1, ref.re, ref.im), note: analysisNote(a, count) };
      },
    },
    {
      id: 'box-packet-kernel',
      job: `${count} box coefficients, smooth packet, inner kernel (${N} samples)`,
      method: 'samples + boxCoefficientsFromSamples (FFT)',
      run: () => {
        const s = samples();
        return boxCoefficientsFromSamples(s.re, s.im, 0, 1, count);
      },
      accuracy: (r) => {
        const c = r as { re: Float64Array; im: Float64Array };
        const levels = Array.from(c.re, (re, k) => ({ n: k + 1, re, im: c.im[k]! }));
        return { value: levelError(levels, 1, ref.re, ref.im), note: `${N} samples` };
      },
    },
    {
      id: 'box-kink',
      job: `${kinkCount} box coefficients, kinked state`,
      method: 'analyse() of the .qstate text',
      run: () => analyseCold(kinkText),
      accuracy: (r) => {
        const a = r as ReturnType<typeof analyse>;
        return { value: levelError(a.levels, 1, kink, null), note: analysisNote(a, kinkCount) };
      },
    },
  ];
}

function oscillatorRows(tiny: boolean): AnchorRow[] {
  const count = tiny ? 40 : 1000;
  const d = tiny ? 5 : 30;
  const ref = coherentReference(count, d / Math.SQRT2);
  const text = `system oscillator(omega = 1)\nstate gaussian(center = ${d}, width = ${Math.SQRT1_2})\nbasis ${count}\n`;
  const levels = tiny ? 30 : 200;
  const steps = tiny ? 50 : 1000;
  const dEv = tiny ? 3 : 10;
  const basis = oscillatorBasis(1, 0, 1, levels);
  const cRe = coherentReference(levels, dEv / Math.SQRT2);
  const cIm = new Float64Array(levels);
  const times = Float64Array.from({ length: steps }, (_, j) => (2 * Math.PI * j) / (steps - 1));
  return [
    {
      id: 'oscillator',
      job: `${count} oscillator coefficients, coherent state d = ${d}`,
      method: 'analyse() of the .qstate text',
      run: () => analyseCold(text),
      accuracy: (r) => {
        const a = r as ReturnType<typeof analyse>;
        return { value: levelError(a.levels, 0, ref, null), note: analysisNote(a, count) };
      },
    },
    {
      id: 'evolution',
      job: `evolution, ${levels} levels x ${steps} times (oscillator, coherent state d = ${dEv})`,
      method: 'evolve(): closed-form X and D, <x>, <p>, survival',
      run: () => evolve(basis, cRe, cIm, times, { maxLevels: levels, weightCutoff: 0 }),
      accuracy: (r) => {
        // <x>(t) = d cos t, <p>(t) = -d sin t (Glauber, Phys. Rev. 131, 2766 (1963)).
        const e = r as { meanX: Float64Array; meanP: Float64Array; complete: boolean };
        let worst = 0;
        times.forEach((t, j) => (worst = Math.max(worst, Math.abs(e.meanX[j]! - dEv * Math.cos(t)), Math.abs(e.meanP[j]! + dEv * Math.sin(t)))));
        return { value: worst, note: e.complete ? 'complete' : `cut after ${e.meanX.length} times` };
      },
    },
  ];
}

function potentialRows(tiny: boolean): AnchorRow[] {
  const qCount = tiny ? 5 : 50;
  const mCount = tiny ? 5 : 15;
  const hCount = tiny ? 20 : 3200;
  const hWall = tiny ? 12 : 95;
  const morse = morseExact(mCount);
  const unresolved = (u: number | null) => (u === null ? 'all resolved' : `levels from ${u} unresolved`);
  type PB = ReturnType<typeof potentialBasis>;
  return [
    {
      id: 'quartic',
      job: `quartic p^2 + x^4 on [-7, 7], ${qCount} levels to 1e-10`,
      method: 'potentialBasis (sine DVR), tolerance 1e-10',
      run: () => potentialBasis((xs) => xs.map((x) => x ** 4), -7, 7, 0.5, qCount, { tolerance: 1e-10 }),
      accuracy: (r, refs) => {
        const p = r as PB;
        const ref = refs.quartic ?? HIOE;
        return { value: worstRel(p.basis.energies, ref, qCount), note: `${p.points} intervals (sizes ${p.sizes.join(', ')}), ${unresolved(p.unresolved)}${refs.quartic ? '' : ', checked on E_0..E_2 only'}` };
      },
    },
    {
      id: 'morse',
      job: `Morse D = ${MORSE.D}, alpha = ${MORSE.alpha}, lowest ${mCount} levels`,
      method: 'potentialBasis (sine DVR), tolerance 1e-10',
      run: () => potentialBasis((xs) => xs.map((x) => MORSE.D * (1 - Math.exp(-MORSE.alpha * x)) ** 2), MORSE.a, MORSE.b, MORSE.mass, mCount, { tolerance: 1e-10 }),
      accuracy: (r) => {
        const p = r as PB;
        return { value: worstRel(p.basis.energies, morse, mCount), note: `${p.points} intervals, ${unresolved(p.unresolved)}` };
      },
    },
    {
      id: 'harmonic',
      job: `V = x^2 (m = 1/2) on [-${hWall}, ${hWall}], ${hCount} levels`,
      method: 'potentialBasis (sine DVR), default options',
      run: () => potentialBasis((xs) => xs.map((x) => x * x), -hWall, hWall, 0.5, hCount),
      accuracy: (r) => {
        // H = p^2 + x^2: E_n = 2 n + 1 (closed form).
        const p = r as PB;
        const exact = Float64Array.from({ length: hCount }, (_, n) => 2 * n + 1);
        const resolved = p.unresolved === null ? hCount : p.unresolved - 1;
        return { value: worstRel(p.basis.energies, exact, hCount), note: `${p.points} intervals, ${unresolved(p.unresolved)}; worst over the resolved ${resolved}: ${worstRel(p.basis.energies, exact, resolved).toExponential(1)}` };
      },
    },
    {
      // The same job with the time limit raised to 600 s, which lifts the solver's caps (potential.ts, capRaise).
      id: 'harmonic-raised',
      job: `V = x^2 (m = 1/2) on [-${hWall}, ${hWall}], ${hCount} levels, time limit raised to 600 s`,
      method: 'potentialBasis (sine DVR), budget with a 600 s limit',
      run: () => potentialBasis((xs) => xs.map((x) => x * x), -hWall, hWall, 0.5, hCount, { budget: createBudget({ limitMs: 600_000 }) }),
      accuracy: (r) => {
        // H = p^2 + x^2: E_n = 2 n + 1 (closed form).
        const p = r as PB;
        const exact = Float64Array.from({ length: hCount }, (_, n) => 2 * n + 1);
        const resolved = p.unresolved === null ? hCount : p.unresolved - 1;
        return { value: worstRel(p.basis.energies, exact, hCount), note: `${p.points} intervals (sizes ${p.sizes.join(', ')}), ${unresolved(p.unresolved)}; worst over the resolved ${resolved}: ${worstRel(p.basis.energies, exact, resolved).toExponential(1)}` };
      },
    },
  ];
}

/** Every engine row, in the order of the table of the performance issue. */
export function anchorRows(tiny = false): AnchorRow[] {
  const box = boxRows(tiny);
  const osc = oscillatorRows(tiny);
  const pot = potentialRows(tiny);
  return [box[0]!, box[1]!, box[2]!, osc[0]!, pot[0]!, pot[1]!, osc[1]!, pot[2]!, pot[3]!];
}
