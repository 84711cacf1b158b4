/**
 * Breakpoints: where a piecewise feature of a compiled function switches (a condition changes value, a
 * step jumps, abs or min/max kinks), found by a scan and bisection to near machine precision.
 */
import type { PhiProvider } from '../types';
import type { CNode, F64, Jet } from './jet';

/** Where a piecewise feature may switch: the subtree to evaluate and the discrete indicator of its value. */
export interface Switch {
  node: CNode;
  indicator: (re: number, im: number) => number;
}

/**
 * A copy made with `set`: `slice` goes through the species lookup, which V8 turns into a slow generic
 * path once any loaded library has touched a constructor's species.
 */
function clone(a: F64): F64 {
  const out = new Float64Array(a.length);
  out.set(a);
  return out;
}

/** Options of `breakpoints`. */
export interface BreakpointOptions {
  /** Samples of the first scan over [a, b] (default 4096). */
  samples?: number;
  /** Relative width at which bisection stops (default 1e-14). */
  relTol?: number;
}

export function findBreakpoints(switches: Switch[], cx: boolean, a: number, b: number, phi: PhiProvider | undefined, options: BreakpointOptions = {}): number[] {
  const m = Math.max(8, options.samples ?? 4096);
  const tol = options.relTol ?? 1e-14;
  if (!(b > a) || switches.length === 0) return [];
  const xs = new Float64Array(m + 1);
  for (let k = 0; k <= m; k++) xs[k] = a + ((b - a) * k) / m;
  xs[m] = b;
  const one = new Float64Array(1);
  const out: number[] = [];
  const same = (p: number, q: number) => p === q || (Number.isNaN(p) && Number.isNaN(q));
  for (const s of switches) {
    const cache = new Map<object, Jet>();
    const j = s.node.run({ cache, n: m + 1, xs, order: 0, cx, phi });
    // The scan's indicator values are copied: the one-point runs below reuse other buffers of the cache.
    const jv = clone(j.v);
    const jvi = j.vi ? clone(j.vi) : null;
    const ind = (k: number) => s.indicator(jv[k]!, jvi ? jvi[k]! : 0);
    const pointCache = new Map<object, Jet>();
    const at = (x: number) => {
      one[0] = x;
      const r = s.node.run({ cache: pointCache, n: 1, xs: one, order: 0, cx, phi });
      return s.indicator(r.v[0]!, r.vi ? r.vi[0]! : 0);
    };
    let prev = ind(0);
    for (let k = 1; k <= m; k++) {
      const cur = ind(k);
      if (!same(prev, cur)) {
        let lo = xs[k - 1]!;
        let hi = xs[k]!;
        const left = prev;
        for (let it = 0; it < 200 && hi - lo > tol * Math.max(1, Math.abs(lo), Math.abs(hi)); it++) {
          const mid = 0.5 * (lo + hi);
          if (mid <= lo || mid >= hi) break;
          if (same(at(mid), left)) lo = mid;
          else hi = mid;
        }
        out.push(0.5 * (lo + hi));
      }
      prev = cur;
    }
  }
  out.sort((p, q) => p - q);
  const merged: number[] = [];
  for (const x of out) {
    const last = merged[merged.length - 1];
    if (last === undefined || x - last > 1e-12 * Math.max(1, Math.abs(x))) merged.push(x);
  }
  return merged;
}

