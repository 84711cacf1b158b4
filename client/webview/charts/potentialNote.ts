/**
 * A flat potential beyond the state view's energy axis (a finite well's barriers, higher than the levels
 * that carry the state): the walls then run off the top of the plot and the depth shows nowhere, so it
 * is said in words. Pure (no DOM).
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import type { PanelResult } from '../../src/messages';
import type { XRange } from './xrange';

/**
 * Share of the shown samples that must sit at V's maximum for it to count as a plateau: a parabola or a
 * quartic reaches its maximum only at the window's edges, a well's barriers fill much of the window.
 */
const PLATEAU_SHARE = 0.1;

/** The note, or null when V's top is on the plot or V only rises steadily past it. */
export function potentialAboveNote(result: PanelResult, win: XRange, top: number): string | null {
  const s = result.samples;
  if (!s) return null;
  const shown: number[] = [];
  s.potential.forEach((v, j) => {
    const x = s.x[j];
    if (v !== null && Number.isFinite(v) && x !== null && x !== undefined && x >= win.lo && x <= win.hi) shown.push(v);
  });
  if (shown.length === 0) return null;
  const vmax = Math.max(...shown);
  if (!(vmax > top)) return null;
  const atTop = shown.filter((v) => v >= vmax - 1e-9 * Math.abs(vmax)).length;
  if (atTop < PLATEAU_SHARE * shown.length) return null;
  const u = result.units.energy ? ` ${result.units.energy}` : '';
  return `V reaches ${formatNumber(vmax, 4)}${u}, above the top of the plot (${formatNumber(top, 4)}${u}): the energy axis spans the levels that carry the state.`;
}
