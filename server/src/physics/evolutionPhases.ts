/**
 * The phases e^{-i E_k t_j} of `evolve` (evolution.ts), time after time. On equally spaced times (as an
 * `evolve` line gives them) each level's phase is rotated by e^{-i E_k dt} (four multiplications instead
 * of a cosine and a sine) and recomputed exactly every `RESEED` steps, so the rounding of the rotation
 * never grows past RESEED steps (about 1e-14 relative; common practice); other times get a cosine and a
 * sine each.
 */

/** Steps between exact recomputations of a rotated phase. */
export const RESEED = 64;

/**
 * Counted operations for one cosine and sine pair with the products around it (measured about 25-40 ns
 * a level and time, against about 1 ns per counted operation of the eigen-solver), so the counted
 * work of the time loops tracks their time.
 */
export const TRIG_OPS = 32;

/** Counted operations for one rotation of a phase: four multiplications and two sums, with the loads. */
export const ROTATE_OPS = 8;

/** The phases of n levels at the times in turn: `advance(j)` (j = 0, 1, 2, ...) sets zr + i zi to e^{-i E_k t_j}. */
export interface PhaseSteps {
  zr: Float64Array;
  zi: Float64Array;
  /** Moves to time j (the next one) and returns the operations counted. */
  advance(j: number): number;
}

/** True when t_j = t_0 + j dt to a few units of rounding of the largest time. */
function equallySpaced(times: Float64Array): boolean {
  const nt = times.length;
  if (nt < 3) return false;
  const t0 = times[0];
  const dt = (times[nt - 1] - t0) / (nt - 1);
  const tol = 8 * Number.EPSILON * Math.max(Math.abs(t0), Math.abs(times[nt - 1]));
  if (!(Math.abs(dt) > tol)) return false;
  for (let j = 1; j < nt; j++) if (Math.abs(times[j] - (t0 + j * dt)) > tol) return false;
  return true;
}

export function phaseSteps(E: Float64Array, n: number, times: Float64Array): PhaseSteps {
  const zr = new Float64Array(n);
  const zi = new Float64Array(n);
  const rotate = equallySpaced(times);
  const wr = new Float64Array(rotate ? n : 0);
  const wi = new Float64Array(rotate ? n : 0);
  if (rotate) {
    const dt = (times[times.length - 1] - times[0]) / (times.length - 1);
    for (let k = 0; k < n; k++) {
      wr[k] = Math.cos(-E[k] * dt);
      wi[k] = Math.sin(-E[k] * dt);
    }
  }
  const advance = (j: number): number => {
    if (!rotate || j % RESEED === 0) {
      const t = times[j];
      for (let k = 0; k < n; k++) {
        const ph = -E[k] * t;
        zr[k] = Math.cos(ph);
        zi[k] = Math.sin(ph);
      }
      return TRIG_OPS * n;
    }
    for (let k = 0; k < n; k++) {
      const r = zr[k] * wr[k] - zi[k] * wi[k];
      zi[k] = zr[k] * wi[k] + zi[k] * wr[k];
      zr[k] = r;
    }
    return ROTATE_OPS * n;
  };
  return { zr, zi, advance };
}
