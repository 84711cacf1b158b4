/**
 * Axis numbers: rounded ends and tick-friendly ceilings, and the floor of the log axis. Pure.
 */

/** The smallest positive weight shown on the log axis, a power of ten. */
export function logFloor(weights: ArrayLike<number | null>): number {
  let m = Infinity;
  for (let k = 0; k < weights.length; k++) {
    const w = weights[k];
    if (w !== null && w !== undefined && w > 0) m = Math.min(m, w);
  }
  if (!Number.isFinite(m)) return 1e-16;
  return Math.max(1e-18, 10 ** Math.floor(Math.log10(m)));
}

/** Rounds away from zero to two significant digits, so explicit axis ends get short labels. */
export function niceBound(v: number, up: boolean): number {
  if (!Number.isFinite(v) || v === 0) return 0;
  const p = 10 ** (Math.floor(Math.log10(Math.abs(v))) - 1);
  return (up ? Math.ceil(v / p) : Math.floor(v / p)) * p;
}

/** The smallest of 1, 2, 2.5, 5 or 10 times a power of ten that is at least v > 0 (a tick-friendly ceiling). */
export function niceCeil(v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) return 1;
  const p = 10 ** Math.floor(Math.log10(v));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= v * (1 - 1e-12)) return m * p;
  return 10 * p;
}
