/**
 * The mass profile of a numerical system (`V(x) = ... over [A, B] with mass(x) = ...`): the compiled
 * mass as the solver's `MassProfile`, probed for values that are not a positive real mass, and the
 * solver's notes about it as findings on the mass formula.
 */
import type { MassProfile } from '../physics/massProfile';
import type { PotentialNote } from '../physics/potential';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { SystemModel } from './model';
import { fmt } from './findings';

type PotentialSystem = Extract<SystemModel, { kind: 'potential' }>;

/**
 * The profile of `system` (undefined when it names no mass), or null after an `evaluation` error on the
 * mass formula: the mass is probed at 513 points and on both sides of every breakpoint, and must be
 * real, finite and positive at each.
 */
export function massProfileOf(system: PotentialSystem, out: EngineDiagnostic[]): MassProfile | null | undefined {
  const fn = system.massFn;
  const span = system.massSpan;
  if (!fn || !span) return undefined;
  const { a, b } = system;
  const breaks = fn.breakpoints(a, b).filter((x) => x > a && x < b);
  const probe: number[] = [];
  for (let j = 0; j < 513; j++) probe.push(a + ((j + 0.5) / 513) * (b - a));
  for (const x of breaks) probe.push(x - 1e-9 * (b - a), x + 1e-9 * (b - a));
  const xs = Float64Array.from(probe);
  const v = fn.evaluate(xs, 0);
  for (let j = 0; j < xs.length; j++) {
    const re = v.re[j]!;
    const what =
      Math.abs(v.im[j]!) > 1e-12 * Math.max(1, Math.abs(re)) ? 'complex' : Number.isNaN(re) ? 'not a number' : !Number.isFinite(re) ? 'infinite' : re <= 0 ? 'not positive' : null;
    if (what !== null) {
      out.push(diagnostic('evaluation', span.start, span.end, `The mass is ${what} at x = ${fmt(xs[j]!)}; it must be a positive, finite mass everywhere inside the interval.`));
      return null;
    }
  }
  return {
    at: (pts) => fn.evaluate(pts, 0).re,
    slope: (pts) => fn.evaluate(pts, 1).d1re ?? new Float64Array(pts.length),
    breaks,
  };
}

/** The solver's `mass` notes as findings on the mass formula (a bad value is an error, the rest warnings). */
export function massFindings(system: PotentialSystem, notes: PotentialNote[], out: EngineDiagnostic[]): void {
  const span = system.massSpan;
  if (!span) return;
  for (const n of notes) {
    if (n.kind !== 'mass') continue;
    const bad = /^The mass is /.test(n.message);
    const message = n.message.replace(/x = (-?[0-9.e+-]+)/g, (_, x: string) => `x = ${fmt(Number(x))}`);
    out.push(diagnostic(bad ? 'evaluation' : 'convergence', span.start, span.end, message));
  }
}
