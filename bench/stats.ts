/**
 * Timing and fitting helpers of the benchmark suite.
 * Every figure is a median over repeated runs after one warm-up run, with the interquartile range and
 * the extremes beside it, because the benchmark machine is shared and noisy.
 */

/** Summary of repeated timings, in milliseconds. */
export interface Timing {
  /** Number of timed runs (the warm-up run is not counted). */
  runs: number;
  median: number;
  q1: number;
  q3: number;
  min: number;
  max: number;
}

/** Options of {@link measure}. */
export interface MeasureOptions {
  /** Timed runs (default 9). */
  reps?: number;
  /** Untimed warm-up runs first, so the JIT has compiled the code (default 1). */
  warmup?: number;
  /**
   * When one run takes less than this many milliseconds, each timed sample repeats the job until it
   * does and reports the time per job (default 2), so timer resolution does not dominate.
   */
  minSampleMs?: number;
  /**
   * Keep warming up (untimed) until this many milliseconds have passed (default: the environment variable EIGENSPAN_BENCH_WARMUP_MS, else 0: only `warmup`
   * runs). The comparison of two builds sets it, so sub-millisecond jobs are timed after V8's
   * optimising compiler is done with them rather than while it works.
   */
  warmupMs?: number;
}

/** The q-quantile (0..1) of sorted values by linear interpolation between order statistics (common practice). */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}

/** Summarises raw timings (ms) as median, quartiles and extremes. */
export function summarise(times: readonly number[]): Timing {
  const s = [...times].sort((a, b) => a - b);
  return { runs: s.length, median: quantile(s, 0.5), q1: quantile(s, 0.25), q3: quantile(s, 0.75), min: s[0] ?? NaN, max: s[s.length - 1] ?? NaN };
}

/**
 * Times `job` (synchronous): `warmup` untimed runs, then `reps` timed samples; returns the summary and
 * the last result. Fast jobs are batched per sample (see `minSampleMs`).
 */
export function measure<T>(job: () => T, options: MeasureOptions = {}): { timing: Timing; result: T } {
  const reps = Math.max(1, Math.floor(options.reps ?? 9));
  const warmup = Math.max(0, Math.floor(options.warmup ?? 1));
  const minSample = options.minSampleMs ?? 2;
  const warmupMs = options.warmupMs ?? (Number(process.env.EIGENSPAN_BENCH_WARMUP_MS) || 0);
  let result = job();
  // Untimed warm-up: at least `warmup` runs, and for a short job until `warmupMs` have passed (at most
  // 2,000 runs), so the optimising compiler has finished with it before the first timed sample.
  const t0 = performance.now();
  let runs = 1;
  while (runs < warmup || (performance.now() - t0 < warmupMs && runs < 2000)) {
    result = job();
    runs++;
  }
  // Batch size from the fastest of three timed single runs (one slow run must not make the batch short).
  let one = Infinity;
  for (let k = 0; k < 3; k++) {
    const t = performance.now();
    result = job();
    one = Math.min(one, performance.now() - t);
    if (one >= minSample) break;
  }
  const batch = one >= minSample ? 1 : Math.min(1000, Math.max(1, Math.ceil(minSample / Math.max(one, 1e-3))));
  const times: number[] = [];
  for (let r = 0; r < reps; r++) {
    const t = performance.now();
    for (let b = 0; b < batch; b++) result = job();
    times.push((performance.now() - t) / batch);
  }
  return { timing: summarise(times), result };
}

/**
 * Least-squares slope p of log t against log n, the exponent of t ~ C n^p (common practice).
 * NaN when fewer than two usable points.
 */
export function fitExponent(sizes: readonly number[], times: readonly number[]): number {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < Math.min(sizes.length, times.length); i++) {
    if (sizes[i]! > 0 && times[i]! > 0) {
      xs.push(Math.log(sizes[i]!));
      ys.push(Math.log(times[i]!));
    }
  }
  const n = xs.length;
  if (n < 2) return NaN;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i]! - mx) * (ys[i]! - my);
    sxx += (xs[i]! - mx) ** 2;
  }
  return sxx > 0 ? sxy / sxx : NaN;
}

/** baseline median / our median (> 1: ours is faster), or null when either is missing. */
export function ratioOf(baseline: Timing | null, ours: Timing | null): number | null {
  return baseline && ours && ours.median > 0 ? baseline.median / ours.median : null;
}
