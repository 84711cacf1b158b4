/**
 * The expression compiler: checked expressions to closures over typed arrays (see compiler.ts). The
 * folder's modules: complex.ts (complex arithmetic), jet.ts (values, buffers, constants and folding),
 * arith.ts and power.ts (operators), nodes.ts (built-in functions and piecewise forms), breakpoints.ts
 * (where piecewise features switch) and compiler.ts (the tree walk and the public entry points).
 */
export { compileFunction, evaluateConstant, findBadPoint } from './compiler';
export type { BreakpointOptions } from './breakpoints';
