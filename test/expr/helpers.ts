/** Shared helpers of the expression-layer tests. */
import { parseExpression } from '../../server/src/expr/sandbox';
import { checkExpression } from '../../server/src/expr/check';
import { compileFunction, evaluateConstant } from '../../server/src/expr/compile';
import { createScope, makeUnitSystem } from '../../server/src/expr/units';
import type { CompiledFunction, Expr, Scope } from '../../server/src/expr/types';

/** Parses `text` placed at document offset `at`; throws in the test when it does not parse. */
export function parse(text: string, at = 0): Expr {
  const p = parseExpression({ text, start: at, end: at + text.length });
  if (!p.result) throw new Error(`did not parse: ${text}: ${JSON.stringify(p.diagnostics)}`);
  return p.result;
}

/** A scope in natural units or for a `units` line such as ['nm', 'eV']. */
export function scopeFor(units: string[] | null, extra: Partial<Scope> = {}): Scope {
  const u = makeUnitSystem(units === null ? null : units.map((name, k) => ({ name, span: { start: k * 10, end: k * 10 + name.length } })));
  if (!u.result) throw new Error(JSON.stringify(u.diagnostics));
  return { ...createScope(u.result), ...extra };
}

/** Parse, check and compile an expression of x; throws in the test on any diagnostic. */
export function compiled(text: string, scope: Scope = scopeFor(null, { hasX: true })): CompiledFunction {
  const e = parse(text);
  const c = checkExpression(e, scope, null, 'the test');
  if (c.diagnostics.length > 0) throw new Error(JSON.stringify(c.diagnostics));
  const f = compileFunction(e, scope);
  if (!f.result) throw new Error(JSON.stringify(f.diagnostics));
  return f.result;
}

/** The value of a constant expression in internal units; throws in the test on any diagnostic. */
export function constant(text: string, scope: Scope): { re: number; im: number } {
  const v = evaluateConstant(parse(text), scope);
  if (!v.result) throw new Error(JSON.stringify(v.diagnostics));
  return v.result.value;
}

/** A small deterministic generator (common practice: a linear congruential generator) for test points. */
export function points(n: number, lo: number, hi: number, seed = 12345): Float64Array {
  const xs = new Float64Array(n);
  let s = seed >>> 0;
  for (let k = 0; k < n; k++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    xs[k] = lo + ((hi - lo) * s) / 4294967296;
  }
  return xs;
}
