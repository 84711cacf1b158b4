/**
 * Tables that depend only on a transform's size (twiddles, half sines), kept for the few most recent
 * sizes: an analysis often alternates two sizes (a transform and its nested half-size check), which a
 * one-entry cache would rebuild on every call.
 */
export class SizeTables<T> {
  private readonly tables = new Map<number, T>();
  constructor(
    private readonly make: (n: number) => T,
    private readonly keep = 4,
  ) {}

  /** The table of size n, built on first use; the least recently used size is dropped past `keep`. */
  get(n: number): T {
    const hit = this.tables.get(n);
    if (hit !== undefined) {
      // Re-insert so the map's order stays least recently used first.
      this.tables.delete(n);
      this.tables.set(n, hit);
      return hit;
    }
    const t = this.make(n);
    this.tables.set(n, t);
    if (this.tables.size > this.keep) this.tables.delete(this.tables.keys().next().value as number);
    return t;
  }
}
