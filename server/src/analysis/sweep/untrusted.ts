/**
 * The sweep lines in the untrusted pipeline (analysis/untrusted.ts): names and dimensions only,
 * nothing evaluated. The swept name must be a `let`, the range must have the let's dimension, the
 * number of steps and the window's range are checked the same way. Values (whole steps, one sign for
 * `log`, the range inside the sweep) need evaluation and are checked by plan.ts in trusted files.
 */
import type { ExprText, QFile, Statement } from '../../language/ast';
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import type { Dimension, Scope } from '../../expr/types';
import { parseExpression } from '../../expr/sandbox';
import { checkExpression } from '../../expr/check';
import { isDimensionless, sameDimension, withArticle } from '../../expr/units';
import { capital } from '../findings';

/** Checks the `sweep` and `expect window` lines against `scope` (every `let` with its checked dimension). */
export function checkSweepsUntrusted(file: QFile, scope: Scope, parseOptions: { maxLength: number; maxDepth: number }, push: (d: EngineDiagnostic[]) => void): void {
  let first: Dimension | null = null;
  const check = (src: ExprText, dim: Dimension, what: string): void => {
    const p = parseExpression(src, parseOptions);
    push(p.diagnostics);
    if (!p.result) return;
    const c = checkExpression(p.result, { ...scope, hasX: false, hasPhi: false }, null, what);
    push(c.diagnostics);
    if (c.dimension !== null && !sameDimension(c.dimension, dim)) {
      push([diagnostic('units', src.start, src.end, `${capital(what)} must be ${isDimensionless(dim) ? 'a plain number' : withArticle(dim)}, but it is ${withArticle(c.dimension)}.`, { severity: 'error' })]);
    }
  };
  for (const s of file.statements) {
    if (s.kind === 'sweep') {
      const own = scope.values.get(s.sweep.name);
      const isLet = file.statements.some((x: Statement) => x.kind === 'let' && x.name === s.sweep.name);
      if (!own || !isLet) {
        const span = s.sweep.nameSpan;
        if (!isLet) push([diagnostic('name', span.start, span.end, `A sweep varies a \`let\` value; '${s.sweep.name}' is not defined by a \`let\`.`, { severity: 'error' })]);
        continue;
      }
      first ??= own.dimension;
      const what = `the sweep of '${s.sweep.name}'`;
      check(s.sweep.from, own.dimension, `the first value of ${what}`);
      check(s.sweep.to, own.dimension, `the last value of ${what}`);
      check(s.sweep.steps, [0, 0, 0, 0], 'the number of steps');
    }
  }
  for (const s of file.statements) {
    if (s.kind !== 'expect' || s.expectation.kind !== 'window' || first === null) continue;
    check(s.expectation.from, first, "the first value of the window's range");
    check(s.expectation.to, first, "the last value of the window's range");
  }
}
