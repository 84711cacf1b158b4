/**
 * The refinement's bracket closer (analysis/sweep/bracket.ts) and the bound-count gauge (bound.ts): the
 * places they locate against closed forms and against plain bisection on the same file, and the work
 * they take, counted in probes (never timed).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { closeBracket, type Probe } from '../../server/src/analysis/sweep/bracket';
import { bisectSteps, boundSteps, expectFlip, MAX_ITERATIONS, narrow, REFINE_RELATIVE, type Refiner } from '../../server/src/analysis/sweep/refine';
import { prepareSweep, runPoints, runSweep, type PointOutcome, type SweepJob } from '../../server/src/analysis/sweep/index';
import { evaluatePoint } from '../../server/src/analysis/sweep/point';
import { createBudget } from '../../server/src/physics/budget';

const example = (name: string): string => readFileSync(join(__dirname, '..', '..', 'examples', name), 'utf8');

/** hbar^2 / (2 m) for m = 0.067 m_e, in meV nm^2: 38.0998211615486 / 0.067 (CHECKS.md, CODATA 2018). */
const C = 38.0998211615486 / 0.067;

/** A synthetic probe: swept value v at fraction t, the margin m and the side. */
function fake(t: number, v: number, m: number | null, side: boolean): Probe {
  const point = { index: [], at: [v], valid: true, problem: null, findings: [], levels: [], captured: null, continuum: null, mean: null, spread: null, bound: null, expects: [side] };
  return { t, out: { point, margins: [m], complete: true, notes: [], gauge: null } };
}

/** Closes [0, 1] on the swept value v = 2 + 3 t, whose side flips at t = r; counts the probes. */
function close(r: number, margin: (t: number) => number | null): { lo: Probe; hi: Probe; probes: number } {
  const v = (t: number) => 2 + 3 * t;
  let probes = 0;
  const make = (t: number) => fake(t, v(t), margin(t), t > r);
  const c = closeBracket(make(0), make(1), {
    side: (p) => p.out.point.expects[0]!,
    margin: (p) => p.out.margins[0] ?? null,
    probe: (t) => {
      probes++;
      return make(t);
    },
    closed: (a, b) => narrow(a, b, 0),
    // d(ln v)/dt = 3 / v (derived): the step moving v by 0.4e-13 of itself.
    minStep: (t) => (0.4 * REFINE_RELATIVE * v(t)) / 3,
    budget: createBudget(),
    maxProbes: MAX_ITERATIONS,
  });
  return { ...c, probes };
}

describe('closing a bracket', () => {
  const r = 0.3141592653589793;
  const closedOn = (c: { lo: Probe; hi: Probe }) => {
    expect(c.lo.out.point.expects[0]).toBe(false);
    expect(c.hi.out.point.expects[0]).toBe(true);
    expect(c.lo.t).toBeLessThanOrEqual(r);
    expect(c.hi.t).toBeGreaterThan(r);
    expect(narrow(c.lo, c.hi, 0)).toBe(true);
  };

  it('closes on a linear margin in three probes: the guess, then one step past it', () => {
    const c = close(r, (t) => t - r);
    closedOn(c);
    expect(c.probes).toBeLessThanOrEqual(3);
  });

  it('bisects without a margin, about log2(1 / 1e-13) probes', () => {
    const c = close(r, () => null);
    closedOn(c);
    // Bisection from width 1 to 1e-13 of v (about 2.3 / 3 in t): 43 to 45 halvings (derived).
    expect(c.probes).toBeGreaterThanOrEqual(40);
    expect(c.probes).toBeLessThanOrEqual(46);
  });

  it('converges on a strongly curved margin far quicker than bisection', () => {
    const c = close(0.8, (t) => Math.exp(30 * t) - Math.exp(30 * 0.8));
    expect(c.lo.t).toBeLessThanOrEqual(0.8);
    expect(c.hi.t).toBeGreaterThan(0.8);
    expect(narrow(c.lo, c.hi, 0)).toBe(true);
    expect(c.probes).toBeLessThanOrEqual(25);
  });

  it('keeps the sides of the probes when the margin rounds the wrong way near the change', () => {
    // A margin with noise of 1e-9 around the root: its sign is wrong within 1e-9 of it.
    const c = close(r, (t) => t - r + 1e-9 * Math.sin(1e7 * t));
    closedOn(c);
    expect(c.probes).toBeLessThanOrEqual(MAX_ITERATIONS);
  });
});

/** The grid points of a prepared sweep, and a refiner along the first axis at the second's index j that counts its probes. */
function setup(text: string): { job: SweepJob; outcomes: (PointOutcome | null)[] } {
  const job = prepareSweep(text)!;
  const outcomes: (PointOutcome | null)[] = new Array(job.total).fill(null);
  for (const { k, out } of runPoints(job, [...Array(job.total).keys()], createBudget())) outcomes[k] = out;
  return { job, outcomes };
}

function refiner(job: SweepJob, counter: { probes: number }): Refiner {
  const a = job.setting.axes[0]!;
  const budget = createBudget();
  return {
    probe: (t, systemOnly = false) => {
      counter.probes++;
      return evaluatePoint(job.setting, [t], [], budget, systemOnly);
    },
    budget,
    axis: 0,
    // A linear axis: d(ln v)/dt = (to - from) / v (derived).
    minStep: (t) => (0.4 * REFINE_RELATIVE * Math.abs(a.from + (a.to - a.from) * t)) / Math.abs(a.to - a.from),
  };
}

describe('the bound-level steps of a finite well by its gauge', () => {
  const text = example('gate-widened-well.qstate');

  it('finds each step where z0 = n pi / 2, to the stated 1e-13, in at most 3 probes a step', () => {
    // Level n + 1 binds at w = n pi sqrt(hbar^2 / (2 m V0)) (Griffiths, finite square well (from memory)),
    // V0 = 220 meV: 5.05, 10.1 and 15.15 nm lie between 2 and 20 nm.
    const { result } = runSweep(text)!;
    const steps = result.located.filter((l) => l.kind === 'bound');
    expect(steps.map((s) => [s.before, s.after])).toEqual([[1, 2], [2, 3], [3, 4]]);
    steps.forEach((s, i) => {
      const want = (i + 1) * Math.PI * Math.sqrt(C / 220);
      expect(Math.abs(s.at - want) / want).toBeLessThan(REFINE_RELATIVE);
      expect(s.bracket[1] - s.bracket[0]).toBeLessThanOrEqual(REFINE_RELATIVE * s.bracket[1]);
    });
    // The ground weight reaches 0.9 near 2.29 nm and falls below it again near 5.96 nm.
    const flips = result.located.filter((l) => l.kind === 'expect').length;
    expect(flips).toBe(2);
    // Bisection took 146 probes on this file (about 45 a step); 3 a step and 8 a flip at most now.
    expect(result.probes).toBeLessThanOrEqual(3 * steps.length + 8 * flips);
  });

  it('agrees with bisection on the count for the same file, with a fifteenth of its probes', () => {
    const { job, outcomes } = setup(text);
    const gauge = { probes: 0 };
    const bisect = { probes: 0 };
    let compared = 0;
    for (let i = 0; i + 1 < outcomes.length; i++) {
      const lo = { t: i / job.setting.axes[0]!.steps, out: outcomes[i]! };
      const hi = { t: (i + 1) / job.setting.axes[0]!.steps, out: outcomes[i + 1]! };
      const a = boundSteps(lo, hi, refiner(job, gauge));
      const b = bisectSteps(lo, hi, refiner(job, bisect), 0);
      expect(a.length).toBe(b.length);
      a.forEach((c, k) => {
        const [x, y] = [c.lo.out.point.at[0]!, c.hi.out.point.at[0]!];
        const [u, w] = [b[k]!.lo.out.point.at[0]!, b[k]!.hi.out.point.at[0]!];
        // Both brackets hold the same step: they overlap, each within the stated width.
        expect(Math.max(x, u)).toBeLessThanOrEqual(Math.min(y, w));
        expect(c.lo.out.point.bound).toBe(b[k]!.lo.out.point.bound);
        expect(c.hi.out.point.bound).toBe(b[k]!.hi.out.point.bound);
        compared++;
      });
    }
    expect(compared).toBe(3);
    expect(gauge.probes * 15).toBeLessThanOrEqual(bisect.probes);
  });

  it('locates the expect flip where plain bisection on the verdict does', () => {
    const { job, outcomes } = setup(text);
    const i = outcomes.findIndex((o, k) => k + 1 < outcomes.length && o!.point.expects[0] !== outcomes[k + 1]!.point.expects[0]);
    const steps = job.setting.axes[0]!.steps;
    const lo = { t: i / steps, out: outcomes[i]! };
    const hi = { t: (i + 1) / steps, out: outcomes[i + 1]! };
    const count = { probes: 0 };
    const c = expectFlip(0, lo, hi, refiner(job, count));
    // Plain bisection on the verdict, written out here.
    const r = refiner(job, { probes: 0 });
    let [a, b] = [lo, hi];
    while (!narrow(a, b, 0)) {
      const t = 0.5 * (a.t + b.t);
      const p = { t, out: r.probe(t)! };
      if (p.out.point.expects[0] === a.out.point.expects[0]) a = p;
      else b = p;
    }
    const mid = (p: Probe, q: Probe) => 0.5 * (p.out.point.at[0]! + q.out.point.at[0]!);
    expect(Math.abs(mid(c.lo, c.hi) - mid(a, b))).toBeLessThanOrEqual(REFINE_RELATIVE * mid(a, b));
    expect(c.lo.out.point.expects[0]).toBe(lo.out.point.expects[0]);
    expect(c.hi.out.point.expects[0]).toBe(hi.out.point.expects[0]);
    expect(count.probes).toBeLessThanOrEqual(8);
  });
});

describe('the map of width and depth', () => {
  it('finds every step along both axes at the closed form, in at most 3 probes a step', () => {
    const { result } = runSweep(example('well-growth-map.qstate'))!;
    expect(result.stopped).toBeNull();
    const [widths, offsets] = [result.axes[0]!.values, result.axes[1]!.values];
    let steps = 0;
    for (const l of result.located.filter((x) => x.kind === 'bound')) {
      // z0 = (w / 2) sqrt(V0 / C) = n pi / 2 (Griffiths, finite square well (from memory)): along the width
      // w = n pi sqrt(C / V0), along the depth V0 = C (n pi / w)^2, n the lower count.
      const n = Math.min(l.before, l.after);
      const want = l.axis === 0 ? n * Math.PI * Math.sqrt(C / l.row!) : C * ((n * Math.PI) / l.row!) ** 2;
      expect(Math.abs(l.at - want) / want).toBeLessThan(REFINE_RELATIVE);
      expect(l.axis === 0 ? offsets : widths).toContain(l.row);
      steps++;
    }
    // The count at every point is max(1, ceil(2 z0 / pi)) (the same closed form).
    for (const p of result.points) {
      const z0 = 0.5 * p!.at[0]! * Math.sqrt(p!.at[1]! / C);
      expect(p!.bound).toBe(Math.max(1, Math.ceil((2 * z0) / Math.PI)));
    }
    const flips = result.located.filter((l) => l.kind === 'expect').length;
    expect(steps).toBeGreaterThan(20);
    expect(result.probes).toBeLessThanOrEqual(3 * steps + 8 * flips);
  });
});

describe('the bound-level step of a numerical potential by its gauge', () => {
  // A Poeschl-Teller well -D sech^2 x (hbar = m = 1) binds a second level once D passes l (l + 1) / 2 with
  // l = 1, D = 1 (Poeschl & Teller, Z. Phys. 83, 143 (1933)); between walls at -8 and 8 the engine counts
  // levels below V at the walls, so its step lies a little above that (the walls push the level up).
  const text = 'let D = 1\nsystem V(x) = -D / cosh(x)^2 over [-8, 8]\nstate gaussian(center = 0, width = 1)\nbasis 10\nsweep D from 0.5 to 1.5 steps 2\n';

  it('agrees with bisection on the count, with a fifth of its probes', () => {
    const { job, outcomes } = setup(text);
    expect(outcomes.map((o) => o!.point.bound)).toEqual([1, 1, 2]);
    const lo = { t: 0.5, out: outcomes[1]! };
    const hi = { t: 1, out: outcomes[2]! };
    const gauge = { probes: 0 };
    const bisect = { probes: 0 };
    const [a] = boundSteps(lo, hi, refiner(job, gauge));
    const [b] = bisectSteps(lo, hi, refiner(job, bisect), 0);
    const [x, y] = [a!.lo.out.point.at[0]!, a!.hi.out.point.at[0]!];
    const [u, w] = [b!.lo.out.point.at[0]!, b!.hi.out.point.at[0]!];
    expect(y - x).toBeLessThanOrEqual(REFINE_RELATIVE * y);
    expect(Math.max(x, u)).toBeLessThanOrEqual(Math.min(y, w));
    // Above the free well's threshold D = 1 (derived in the comment above), below the next point.
    expect(x).toBeGreaterThan(1);
    expect(gauge.probes * 5).toBeLessThanOrEqual(bisect.probes);
  });
});

describe('a sweep downwards over several steps in one interval', () => {
  it('finds each step on its own, in the sweep direction, at the closed form', () => {
    // hbar = m = 1, width 2 (a = 1): z0 = sqrt(2 D), and level k + 1 binds at D = k^2 pi^2 / 8 (Griffiths,
    // finite square well (from memory); derived: z0 = k pi / 2). From D = 40 down to 0.5 in two steps the
    // counts are 6, 5 and 1: one step in the first interval, four in the second.
    const { result } = runSweep('let D = 5\nsystem well(depth = D, width = 2)\nstate gaussian(center = 0, width = 0.5)\nsweep D from 40 to 0.5 steps 2\n')!;
    expect(result.points.map((p) => p!.bound)).toEqual([6, 5, 1]);
    const steps = result.located.filter((l) => l.kind === 'bound');
    expect(steps.map((s) => [s.before, s.after])).toEqual([[6, 5], [5, 4], [4, 3], [3, 2], [2, 1]]);
    steps.forEach((s, i) => {
      const k = 5 - i;
      const want = (k * k * Math.PI * Math.PI) / 8;
      expect(Math.abs(s.at - want) / want).toBeLessThan(REFINE_RELATIVE);
    });
    // Two probes a step (the guess, then one least step past it) and a few more for a curved gauge.
    expect(result.probes).toBeLessThanOrEqual(4 * steps.length);
  });
});
