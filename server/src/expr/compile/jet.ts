/**
 * The values a compiled node produces on a grid (a jet: value, d/dx and d2/dx2, real and imaginary
 * parts), the evaluation context, the buffers each node reuses between calls, and the nodes every other
 * module builds on: constants, the position x, and constant folding.
 */
import type { Complex, PhiProvider } from '../types';

export type F64 = Float64Array;

/** Values of one node on the grid: real and (in complex mode) imaginary parts with derivatives. */
export interface Jet {
  v: F64;
  vi: F64 | null;
  d1: F64 | null;
  d1i: F64 | null;
  d2: F64 | null;
  d2i: F64 | null;
}

export interface Ctx {
  /** Buffers of each node, kept between calls of one compiled function and reused when the size fits. */
  cache: Map<object, Jet>;
  n: number;
  xs: F64;
  order: 0 | 1 | 2;
  cx: boolean;
  phi: PhiProvider | undefined;
}

/** A compiled node. `cst` is its value when it does not depend on x. */
export interface CNode {
  cst: Complex | null;
  /** May produce a non-real value for real x. */
  complex: boolean;
  /** Provably real and >= 0 for real x. */
  nonneg: boolean;
  run(c: Ctx): Jet;
}

/**
 * The output buffers of the node identified by `key`: reused from the previous call when the grid size,
 * order and mode are the same (each node always writes the same arrays, so unwritten ones stay zero),
 * otherwise allocated once for this grid.
 */
export function alloc(c: Ctx, key: object): Jet {
  const n = c.n;
  const o = c.order;
  const old = c.cache.get(key);
  if (old && old.v.length === n && (old.vi !== null) === c.cx && (old.d1 !== null) === o >= 1 && (old.d2 !== null) === o >= 2) return old;
  const j: Jet = {
    v: new Float64Array(n),
    vi: c.cx ? new Float64Array(n) : null,
    d1: o >= 1 ? new Float64Array(n) : null,
    d1i: c.cx && o >= 1 ? new Float64Array(n) : null,
    d2: o >= 2 ? new Float64Array(n) : null,
    d2i: c.cx && o >= 2 ? new Float64Array(n) : null,
  };
  c.cache.set(key, j);
  return j;
}

export function constNode(z: Complex): CNode {
  const key = {};
  return {
    cst: z,
    complex: z.im !== 0,
    nonneg: z.im === 0 && z.re >= 0,
    run(c) {
      // The buffer keeps its constant between calls; it is filled only when newly allocated.
      const y = alloc(c, key);
      if (y.v[0] !== z.re || (y.vi !== null && y.vi[0] !== z.im)) {
        y.v.fill(z.re);
        if (y.vi) y.vi.fill(z.im);
      }
      return y;
    },
  };
}

/** The position x; one per compiled function so that functions never share buffers. */
export function makeXNode(): CNode {
  const key = {};
  return {
  cst: null,
  complex: false,
  nonneg: false,
  run(c) {
    // The grid itself is the value (nodes never write their inputs); d/dx x = 1 is kept between calls.
    const y = alloc(c, key);
    if (y.d1 && y.d1[0] !== 1) y.d1.fill(1);
    return { v: c.xs, vi: y.vi, d1: y.d1, d1i: y.d1i, d2: y.d2, d2i: y.d2i };
  },
  };
}

/** Folds a node that does not depend on x by running it on a one-point grid. */
export function fold(node: CNode, cx: boolean): Complex {
  const j = node.run({ cache: new Map(), n: 1, xs: new Float64Array(1), order: 0, cx, phi: undefined });
  return { re: j.v[0]!, im: j.vi ? j.vi[0]! : 0 };
}

export function finish(node: CNode, deps: CNode[]): CNode {
  if (deps.every((d) => d.cst !== null) && !(node as { usesPhi?: boolean }).usesPhi) {
    const z = fold(node, deps.some((d) => d.complex) || node.complex);
    return constNode(z);
  }
  return node;
}

