/**
 * The sweep lines in the untrusted pipeline (analysis/untrusted.ts): names and dimensions only,
 * nothing evaluated. The swept name must be a `let`; what each expression of a sweep or window line
 * must be comes from slots.ts, as in plan.ts. Values (whole steps, one sign for `log`, the range
 * inside the sweep) need evaluation and are checked by plan.ts in trusted files.
 */
import type { QFile, Statement } from '../../language/ast';
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import type { Dimension, Scope } from '../../expr/types';
import { parseExpression } from '../../expr/sandbox';
import { checkExpression } from '../../expr/check';
import { sweepLineSlots, windowSlots, type SweepSlot } from '../slots';

/** Checks the `sweep` and `expect window` lines against `scope` (every `let` with its checked dimension). */
export function checkSweepsUntrusted(file: QFile, scope: Scope, parseOptions: { maxLength: number; maxDepth: number }, push: (d: EngineDiagnostic[]) => void): void {
  let first: { name: string; dimension: Dimension } | null = null;
  const check = (slot: SweepSlot): void => {
    const p = parseExpression(slot.src, parseOptions);
    push(p.diagnostics);
    if (!p.result) return;
    push(checkExpression(p.result, { ...scope, hasX: false, hasPhi: false }, slot.dimension, slot.what).diagnostics);
  };
  for (const s of file.statements) {
    if (s.kind !== 'sweep') continue;
    const own = scope.values.get(s.sweep.name);
    const isLet = file.statements.some((x: Statement) => x.kind === 'let' && x.name === s.sweep.name);
    if (!own || !isLet) {
      const span = s.sweep.nameSpan;
      if (!isLet) push([diagnostic('name', span.start, span.end, `A sweep varies a \`let\` value; '${s.sweep.name}' is not defined by a \`let\`.`, { severity: 'error' })]);
      continue;
    }
    first ??= { name: s.sweep.name, dimension: own.dimension };
    sweepLineSlots(s.sweep, own.dimension, scope.units).forEach(check);
  }
  for (const s of file.statements) {
    if (s.kind !== 'expect' || s.expectation.kind !== 'window' || first === null) continue;
    windowSlots(s.expectation, first.name, first.dimension).forEach(check);
  }
}
