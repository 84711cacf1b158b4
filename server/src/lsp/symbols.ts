/**
 * Document symbols, go to definition, references and rename for `let` names.
 */
import { SymbolKind, type DocumentSymbol, type Location, type Range, type WorkspaceEdit } from 'vscode-languageserver';
import type { Statement } from '../language/ast';
import type { DocView } from './view';
import { rangeOf } from './positions';
import { letDefinitions, letNameAt, occurrences } from './syntax';
import { RESERVED } from './vocabulary';
import { isReservedName } from '../language/reserved';

function describe(s: Statement): { name: string; detail: string; kind: SymbolKind } {
  switch (s.kind) {
    case 'units':
      return { name: 'units', detail: s.units.map((u) => u.name).join(', '), kind: SymbolKind.Namespace };
    case 'mass':
      return { name: 'mass', detail: s.expr.text.trim(), kind: SymbolKind.Constant };
    case 'let':
      return { name: s.name, detail: s.expr.text.trim(), kind: SymbolKind.Variable };
    case 'system':
      return { name: `system ${s.system.kind}`, detail: '', kind: SymbolKind.Class };
    case 'state':
      return { name: `state ${s.state.kind}`, detail: '', kind: SymbolKind.Object };
    case 'basis':
      return { name: 'basis', detail: s.expr.text.trim(), kind: SymbolKind.Number };
    case 'expect':
      return { name: `expect ${s.expectation.kind}`, detail: '', kind: SymbolKind.Event };
    case 'evolve':
      return { name: 'evolve', detail: s.to.text.trim(), kind: SymbolKind.Event };
    case 'sweep':
      return { name: `sweep ${s.sweep.name}`, detail: `${s.sweep.from.text.trim()} to ${s.sweep.to.text.trim()}`, kind: SymbolKind.Event };
  }
}

/** One symbol per statement, in document order. */
export function documentSymbols(view: DocView): DocumentSymbol[] {
  return view.file.statements.map((s) => {
    const d = describe(s);
    const sel = s.kind === 'let' ? s.nameSpan : s.keywordSpan;
    const sym: DocumentSymbol = { name: d.name, kind: d.kind, range: rangeOf(view.lines, s.span.start, s.span.end), selectionRange: rangeOf(view.lines, sel.start, sel.end) };
    if (d.detail) sym.detail = d.detail;
    return sym;
  });
}

/** Where the `let` name under the cursor is defined. */
export function definitionAt(view: DocView, offset: number): Location | null {
  const hit = letNameAt(view.file, offset);
  const def = hit ? letDefinitions(view.file).get(hit.name) : undefined;
  return def ? { uri: view.uri, range: rangeOf(view.lines, def.nameSpan.start, def.nameSpan.end) } : null;
}

/** Every occurrence of the `let` name under the cursor. */
export function referencesAt(view: DocView, offset: number, includeDeclaration: boolean): Location[] {
  const hit = letNameAt(view.file, offset);
  if (!hit) return [];
  const o = occurrences(view.file, hit.name);
  const spans = includeDeclaration ? [...o.definition, ...o.uses] : o.uses;
  return spans.sort((a, b) => a.start - b.start).map((s) => ({ uri: view.uri, range: rangeOf(view.lines, s.start, s.end) }));
}

/** The range and current text of a renameable name under the cursor. */
export function prepareRenameAt(view: DocView, offset: number): { range: Range; placeholder: string } | null {
  const hit = letNameAt(view.file, offset);
  return hit ? { range: rangeOf(view.lines, hit.span.start, hit.span.end), placeholder: hit.name } : null;
}

/** Why `name` cannot be the new name of a `let`, or null when it can. */
export function renameProblem(view: DocView, oldName: string, name: string): string | null {
  if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name)) return `'${name}' is not a name (letters, digits and _, not starting with a digit).`;
  if (RESERVED.has(name)) return `'${name}' is a built-in name.`;
  if (isReservedName(name)) return `'${name}' is a reserved name.`;
  if (name !== oldName && letDefinitions(view.file).has(name)) return `'${name}' is already defined.`;
  return null;
}

/** The edit renaming the `let` name under the cursor, or an error message. */
export function renameAt(view: DocView, offset: number, newName: string): WorkspaceEdit | { error: string } | null {
  const hit = letNameAt(view.file, offset);
  if (!hit) return null;
  const problem = renameProblem(view, hit.name, newName);
  if (problem) return { error: problem };
  const o = occurrences(view.file, hit.name);
  const edits = [...o.definition, ...o.uses].sort((a, b) => a.start - b.start).map((s) => ({ range: rangeOf(view.lines, s.start, s.end), newText: newName }));
  return { changes: { [view.uri]: edits } };
}
