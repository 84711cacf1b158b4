/**
 * Item 5 of the benchmark suite: a state expression evaluated on many points by the engine's compiled
 * closures against the math library's own compile().evaluate (a plain mathjs instance). Used by suite.ts.
 */
import { all, create } from 'mathjs';
import { parseExpression } from '../server/src/expr/sandbox';
import { checkExpression } from '../server/src/expr/check';
import { compileFunction } from '../server/src/expr/compile';
import { createScope } from '../server/src/expr/units';
import type { CompiledFunction } from '../server/src/expr/types';
import { measure, ratioOf } from './stats';
import type { Row } from './suite';

// 5. A state expression on 10^4 points: plain mathjs compiled evaluation against our closures.

function ours(text: string): CompiledFunction | null {
  const p = parseExpression({ text, start: 0, end: text.length });
  if (!p.result) return null;
  const scope = { ...createScope({ mode: 'natural' }), hasX: true };
  const c = checkExpression(p.result, scope, null, 'the benchmark');
  if (c.diagnostics.some((d) => d.severity === 'error')) return null;
  return compileFunction(p.result, scope).result;
}

export function benchExpression(text: string, points: number, reps: number): Row {
  const reference = create(all, {});
  const code = reference.compile(text);
  const xs = new Float64Array(points);
  for (let k = 0; k < points; k++) xs[k] = -1 + (2 * k) / (points - 1);
  const f = ours(text);
  const refRe = new Float64Array(points);
  const refIm = new Float64Array(points);
  const scope = { x: 0 };
  const mj = measure(
    () => {
      for (let k = 0; k < points; k++) {
        scope.x = xs[k]!;
        const v = code.evaluate(scope) as number | { re: number; im: number };
        if (typeof v === 'number') {
          refRe[k] = v;
          refIm[k] = 0;
        } else {
          refRe[k] = v.re;
          refIm[k] = v.im;
        }
      }
    },
    { reps },
  );
  const notes: string[] = [];
  if (!f) {
    notes.push('the expression did not compile');
    return { item: 5, job: `evaluate ${text}`, method: 'compiled closures', size: `${points} points`, timing: null, accuracy: { value: null, measure: '', reference: '' }, baseline: null, ratio: null, target: null, notes };
  }
  const our = measure(() => f.evaluate(xs), { reps });
  let diff = 0;
  for (let k = 0; k < points; k++) {
    const d = Math.hypot(our.result.re[k]! - refRe[k]!, our.result.im[k]! - refIm[k]!) / Math.max(1, Math.hypot(refRe[k]!, refIm[k]!));
    diff = Math.max(diff, d);
  }
  const ratio = ratioOf(mj.timing, our.timing);
  return {
    item: 5,
    job: `state expression on ${points} points: ${text}`,
    method: `our compiled closures (complex-aware, ${f.complex ? 'complex' : 'real'} path)`,
    size: `${points} points`,
    timing: our.timing,
    accuracy: { value: diff, measure: 'max |ours - mathjs| / max(1, |mathjs|)', reference: 'mathjs 15.2 evaluate on a plain instance (reference library)' },
    baseline: { method: 'mathjs compile().evaluate per point (plain instance)', timing: mj.timing, accuracy: 0 },
    ratio,
    target: { text: '>= 5x faster, identical to 1e-15', met: (ratio ?? 0) >= 5 && diff <= 1e-15 },
    notes: [],
  };
}

