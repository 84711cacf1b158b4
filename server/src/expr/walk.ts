/**
 * A walk over the checked expression tree, so every pass that looks for names shares one traversal.
 */
import type { Expr } from './types';

/** Calls `visit` on every node of `e`, parents before children, in source order. */
export function forEachNode(e: Expr, visit: (node: Expr) => void): void {
  visit(e);
  switch (e.type) {
    case 'unary':
      forEachNode(e.arg, visit);
      break;
    case 'binary':
      forEachNode(e.left, visit);
      forEachNode(e.right, visit);
      break;
    case 'call':
      for (const a of e.args) forEachNode(a, visit);
      break;
    case 'conditional':
      forEachNode(e.test, visit);
      forEachNode(e.then, visit);
      forEachNode(e.otherwise, visit);
      break;
    case 'number':
    case 'symbol':
      break;
  }
}
