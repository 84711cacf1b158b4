/**
 * What the front ends show of a position-dependent mass: the regions between its jumps with the mass
 * in each (hover), and the mass on the plot grid with the interfaces (panel). Masses are in electron
 * masses in a physical file, as written in a natural one.
 */
import type { Eigenbasis } from '../physics/types';
import type { UnitSystem } from '../expr/types';
import { UNITS } from '../expr/constants';
import { toInternal } from '../expr/units';

/** One region between interfaces (or the line's ends, null) and the smallest and largest mass in it. */
export interface MassRegion {
  from: number | null;
  to: number | null;
  min: number;
  max: number;
}

/** The electron mass in internal units, or 1 in natural units (masses are then shown as they are). */
function massUnit(units: UnitSystem): { scale: number; unit: string | null } {
  if (units.mode === 'natural') return { scale: 1, unit: null };
  const me = UNITS.get('m_e')!;
  return { scale: toInternal(me.si, me.dimension, units), unit: 'm_e' };
}

/**
 * The regions of a basis whose mass depends on x (null otherwise): between consecutive interfaces
 * (`massJumps`) within the walls or the support, each sampled at 65 points for its range.
 */
export function massRegions(basis: Eigenbasis, units: UnitSystem): { regions: MassRegion[]; unit: string | null } | null {
  if (!basis.masses) return null;
  const { scale, unit } = massUnit(units);
  const [lo, hi] = basis.walls ?? basis.support;
  const cuts = (basis.massJumps ?? []).filter((x) => x > lo && x < hi);
  const edges = [lo, ...cuts, hi];
  const regions: MassRegion[] = [];
  for (let i = 0; i + 1 < edges.length; i++) {
    const xs = Float64Array.from({ length: 65 }, (_, j) => edges[i]! + ((edges[i + 1]! - edges[i]!) * (j + 0.5)) / 65);
    const m = basis.masses(xs);
    let min = Infinity;
    let max = -Infinity;
    for (const v of m) ((min = Math.min(min, v / scale)), (max = Math.max(max, v / scale)));
    regions.push({ from: i === 0 && !basis.walls ? null : edges[i]!, to: i + 2 === edges.length && !basis.walls ? null : edges[i + 1]!, min, max });
  }
  return { regions, unit };
}

/** The mass on the plot grid and the interfaces, for the panel (null when the mass is constant). */
export function massSamples(basis: Eigenbasis, xs: Float64Array, units: UnitSystem): { mass: number[]; interfaces: number[]; massUnit: string | null } | null {
  if (!basis.masses) return null;
  const { scale, unit } = massUnit(units);
  const m = basis.masses(xs);
  return { mass: Array.from(m, (v) => (Number.isFinite(v) ? v / scale : 0)), interfaces: [...(basis.massJumps ?? [])], massUnit: unit };
}
