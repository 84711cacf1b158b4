/**
 * The name rules of a sweep line, shared by the trusted check (plan.ts) and the untrusted one
 * (untrusted.ts): the swept name must be a `let`, and the range of a sweep and of its design window
 * may use only names defined before the swept let, since every point sets that let and what follows
 * it anew. Names-only rules: they need no evaluated value, so both pipelines report them alike.
 */
import type { QFile, Span, SweepSpec } from '../../language/ast';
import { suggest } from '../../language/suggest';
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import type { Expr } from '../../expr/types';
import { forEachNode } from '../../expr/walk';
import { capital } from '../findings';

/**
 * The finding for the first name `e` uses that `isLate` calls a `let` defined at or after the swept
 * let `letName` (on line `letLine`), or null when there is none. `what` names the value (slots.ts).
 */
export function lateNameFinding(e: Expr, isLate: (name: string) => boolean, what: string, letName: string, letLine: number): EngineDiagnostic | null {
  let found: { name: string; span: Span } | null = null;
  forEachNode(e, (n) => {
    if (found || n.type !== 'symbol') return;
    if (isLate(n.name)) found = { name: n.name, span: { start: n.start, end: n.end } };
  });
  if (!found) return null;
  const late: { name: string; span: Span } = found;
  return diagnostic('name', late.span.start, late.span.end, `${capital(what)} may use only names defined before '${letName}' (line ${letLine}); '${late.name}' is not.`, { severity: 'error' });
}

/** The finding for a sweep of `spec.name` that no `let` of `file` defines, with the nearest let name as a fix. */
export function notALetFinding(spec: SweepSpec, file: QFile): EngineDiagnostic {
  const names = file.statements.flatMap((s) => (s.kind === 'let' ? [s.name] : []));
  const near = suggest(spec.name, names);
  const hint = near === null ? (names.length === 0 ? ' The file defines no `let` names.' : '') : ` Did you mean '${near}'?`;
  const fixes = near === null ? [] : [{ kind: 'replace' as const, title: `Change to '${near}'`, start: spec.nameSpan.start, end: spec.nameSpan.end, text: near }];
  return diagnostic('name', spec.nameSpan.start, spec.nameSpan.end, `A sweep varies a \`let\` value; '${spec.name}' is not defined by a \`let\`.${hint}`, { severity: 'error', fixes });
}
