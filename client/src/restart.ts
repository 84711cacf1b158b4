/**
 * When to restart a language server that died: again and again, but not more than `maxRestarts`
 * times within `windowMs` (a crash loop is reported instead of hidden).
 */

/** Options of `RestartPolicy`. */
export interface RestartOptions {
  /** Most restarts inside the window (default 5). */
  maxRestarts?: number;
  /** The window in milliseconds (default 180 000, three minutes). */
  windowMs?: number;
}

/** Counts recent crashes. */
export class RestartPolicy {
  private readonly times: number[] = [];
  private readonly max: number;
  private readonly window: number;

  constructor(options: RestartOptions = {}) {
    this.max = options.maxRestarts ?? 5;
    this.window = options.windowMs ?? 180_000;
  }

  /** Records a crash at `now` (ms) and says whether to restart. */
  shouldRestart(now: number): boolean {
    this.times.push(now);
    while (this.times.length > 0 && now - this.times[0]! > this.window) this.times.shift();
    return this.times.length <= this.max;
  }
}
