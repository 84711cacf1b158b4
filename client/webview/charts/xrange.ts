/**
 * The x window the state and time views show: where the state and the levels that carry it live, and
 * the classically allowed region of those levels (the well), instead of the whole integration window
 * (a finite well's is mostly empty). Pure (no DOM).
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import type { PanelResult } from '../../src/messages';
import { sampledState } from '../physics';
import { relevantLevels } from './facts';

/**
 * A curve is taken as present where it reaches this fraction of its own peak: a Gaussian's density
 * beyond 3.7 widths, a bound level's density 3.5 decay lengths into the barrier (exp(-2 kappa d) = 1e-3).
 */
export const PRESENCE = 1e-3;

/** A window wider than this share of the sampled extent shows the whole extent (nothing worth clipping). */
const KEEP_ALL = 0.85;

/** Room added on each side of what is present, as a share of its width. */
const PAD = 0.1;

/** The shown window, the sampled extent and whether the window leaves part of it out. */
export interface XRange {
  lo: number;
  hi: number;
  full: [number, number];
  clipped: boolean;
}

/** First and last index where `curve` reaches `PRESENCE` of its peak, or null for a zero curve. */
function presence(curve: ArrayLike<number | null>): [number, number] | null {
  let peak = 0;
  for (let j = 0; j < curve.length; j++) peak = Math.max(peak, Math.abs(curve[j] ?? 0));
  if (!(peak > 0) || !Number.isFinite(peak)) return null;
  let a = -1;
  let b = -1;
  for (let j = 0; j < curve.length; j++) if (Math.abs(curve[j] ?? 0) >= PRESENCE * peak) ((a = a < 0 ? j : a), (b = j));
  return a < 0 ? null : [a, b];
}

/**
 * The window for a result with samples: the union of where |psi|^2 (or the mixed density), each
 * `extra` curve (the time view's |psi(x, t)|^2) and each level holding 99 % of the weight are present,
 * and where V lies below the highest of those levels; padded, and widened to the whole extent when it
 * would leave little out.
 */
export function xRange(result: PanelResult, extra: ArrayLike<number | null>[] = []): XRange {
  const s = result.samples!;
  const x = s.x;
  const full: [number, number] = [x[0] ?? 0, x[x.length - 1] ?? 1];
  const curves: ArrayLike<number | null>[] = [sampledState(s).density, ...extra];
  const levels = relevantLevels(result);
  for (const l of levels) {
    const phi = s.phi[result.levels.indexOf(l)];
    if (phi) curves.push(phi.map((v) => (v ?? 0) * (v ?? 0)));
  }
  let a = Infinity;
  let b = -Infinity;
  for (const c of curves) {
    const r = presence(c);
    if (r) ((a = Math.min(a, r[0])), (b = Math.max(b, r[1])));
  }
  const top = Math.max(-Infinity, ...levels.map((l) => l.energy ?? -Infinity));
  for (let j = 0; j < x.length; j++) if (s.potential[j] !== null && s.potential[j]! <= top) ((a = Math.min(a, j)), (b = Math.max(b, j)));
  if (!(a < b)) return { lo: full[0], hi: full[1], full, clipped: false };
  const width = (x[b] ?? full[1]) - (x[a] ?? full[0]);
  let lo = Math.max(full[0], (x[a] ?? full[0]) - PAD * width);
  let hi = Math.min(full[1], (x[b] ?? full[1]) + PAD * width);
  if (hi - lo >= KEEP_ALL * (full[1] - full[0])) ((lo = full[0]), (hi = full[1]));
  return { lo, hi, full, clipped: lo > full[0] || hi < full[1] };
}

/** The note saying a view shows part of the x range, or null when it shows all of it. */
export function rangeNote(w: XRange, lengthUnit: string | null): string | null {
  if (!w.clipped) return null;
  const u = lengthUnit ? ` ${lengthUnit}` : '';
  const f = (v: number) => formatNumber(v, 3);
  return `x shown where the state and the levels that carry it exceed ${formatNumber(PRESENCE * 100)} % of their peaks, and where V lies below those levels; computed on ${f(w.full[0])} to ${f(w.full[1])}${u}.`;
}
