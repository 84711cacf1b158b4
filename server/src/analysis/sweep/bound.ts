/**
 * The bound-level count of a sweep point, and its gauge: a continuous quantity of the point whose
 * crossing of a threshold is exactly where the count steps, so the refinement (refine.ts) can close a
 * step's bracket by regula falsi in a few system-only probes instead of bisecting on the count.
 *
 * - A finite well: the count is max(1, ceil(q)) with q = 2 z0 / pi, z0 = (w / 2) sqrt(2 m V0) / hbar
 *   (Griffiths, Introduction to Quantum Mechanics, finite square well section (from memory); physics/well.ts
 *   computes the count from the same z0), so the count exceeds n (n >= 1) exactly when q > n: the
 *   gauge is q and the margin of step n is q - n.
 * - A numerical potential: the count is the number of the system's first levels below the lower of V
 *   at the two walls, so it exceeds n exactly when level n + 1 lies below that value: the margin of
 *   step n is that wall value minus E_{n+1} (none when the first levels stop before n + 1).
 */
import type { AnalysisResult } from '../types';
import type { Model } from '../model';
import { wellStrength } from '../../physics/well';

/** What the count steps on (see the module comment). */
export type BoundGauge = { kind: 'well'; q: number } | { kind: 'levels'; top: number; energies: number[] };

/**
 * The signed margin of the step from n to n + 1 levels: > 0 exactly where the count exceeds n (null
 * without one). On a log axis a well's margin is ln(q / n), linear in the fraction when the width or
 * the depth is swept (q goes as w sqrt(V0)); on a linear axis q - n, linear when the width is.
 */
export function stepMargin(g: BoundGauge, n: number, logAxis = false): number | null {
  if (g.kind === 'well') return logAxis ? Math.log(g.q / n) : g.q - n;
  return n >= 0 && n < g.energies.length ? g.top - g.energies[n]! : null;
}

/** The bound-level count and its gauge at a point (null and null for systems that bind every level). */
export function boundOf(result: AnalysisResult, model: Model): { bound: number | null; gauge: BoundGauge | null } {
  const sys = result.system;
  if (!sys) return { bound: null, gauge: null };
  const m = model.system?.model;
  if (sys.boundCount !== undefined) {
    // The count is the basis's (physics/well.ts), from the same depth, width and mass.
    const z0 = m?.kind === 'well' ? wellStrength(m.depth, m.width, model.mass) : NaN;
    return { bound: sys.boundCount, gauge: Number.isFinite(z0) ? { kind: 'well', q: (2 * z0) / Math.PI } : null };
  }
  if (!m || m.kind !== 'potential') return { bound: null, gauge: null };
  const v = m.V.evaluate(Float64Array.of(m.a, m.b), 0).re;
  const top = Math.min(Number.isFinite(v[0]!) ? v[0]! : Infinity, Number.isFinite(v[1]!) ? v[1]! : Infinity);
  const below = sys.energies.filter((e) => e < top).length;
  if (below >= sys.energies.length) return { bound: null, gauge: null };
  return { bound: below, gauge: Number.isFinite(top) ? { kind: 'levels', top, energies: sys.energies.slice() } : null };
}
