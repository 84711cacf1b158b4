/**
 * The sweep lines in the untrusted pipeline (analysis/untrusted.ts): names and dimensions only,
 * nothing evaluated. The swept name must be a `let`; what each expression of a sweep or window line
 * must be comes from slots.ts and which names it may use from names.ts, as in plan.ts. Values (whole
 * steps, one sign for `log`, the range inside the sweep) need evaluation and are checked by plan.ts in
 * trusted files.
 */
import type { QFile, Statement } from '../../language/ast';
import type { EngineDiagnostic } from '../../language/catalogue';
import type { Dimension, Scope } from '../../expr/types';
import { parseExpression } from '../../expr/sandbox';
import { checkExpression } from '../../expr/check';
import { lineTable, positionAt } from '../../language/positions';
import { sweepLineSlots, windowSlots, type SweepSlot } from '../slots';
import { lateNameFinding, notALetFinding } from './names';

type LetStatement = Extract<Statement, { kind: 'let' }>;

/** Checks the `sweep` and `expect window` lines against `scope` (every `let` with its checked dimension). */
export function checkSweepsUntrusted(file: QFile, scope: Scope, parseOptions: { maxLength: number; maxDepth: number }, push: (d: EngineDiagnostic[]) => void): void {
  let first: { letStmt: LetStatement; dimension: Dimension } | null = null;
  const lets = new Set(file.statements.flatMap((s) => (s.kind === 'let' ? [s.name] : [])));
  const check = (slot: SweepSlot, letStmt: LetStatement): void => {
    const p = parseExpression(slot.src, parseOptions);
    push(p.diagnostics);
    if (!p.result) return;
    // A let defined at or after the swept one, as plan.ts judges it (a let whose value failed was reported on its line).
    const isLate = (name: string): boolean => lets.has(name) && (scope.values.get(name)?.definedAt?.start ?? -1) >= letStmt.nameSpan.start;
    const late = lateNameFinding(p.result, isLate, slot.what, letStmt.name, positionAt(lineTable(file.text), letStmt.span.start).line + 1);
    if (late) return push([late]);
    push(checkExpression(p.result, { ...scope, hasX: false, hasPhi: false }, slot.dimension, slot.what).diagnostics);
  };
  for (const s of file.statements) {
    if (s.kind !== 'sweep') continue;
    const own = scope.values.get(s.sweep.name);
    const letStmt = file.statements.find((x): x is LetStatement => x.kind === 'let' && x.name === s.sweep.name);
    if (!own || !letStmt) {
      if (!letStmt) push([notALetFinding(s.sweep, file)]);
      continue;
    }
    first ??= { letStmt, dimension: own.dimension };
    for (const slot of sweepLineSlots(s.sweep, own.dimension, scope.units)) check(slot, letStmt);
  }
  for (const s of file.statements) {
    if (s.kind !== 'expect' || s.expectation.kind !== 'window' || first === null) continue;
    for (const slot of windowSlots(s.expectation, first.letStmt.name, first.dimension)) check(slot, first.letStmt);
  }
}
