/**
 * Completion: keywords at the start of a line, constructors after `system`, `state` and `of`, named
 * arguments inside constructor calls, `expect` kinds, unit names, and inside expressions the `let`
 * names defined so far, the built-in constants and the allowed functions.
 */
import { CompletionItemKind, InsertTextFormat, type CompletionItem } from 'vscode-languageserver';
import type { DocView } from './view';
import { CONSTANTS, CONSTRUCTORS, EXPECT_KINDS, FUNCTIONS, KEYWORDS, PARITIES, UNIT_NAMES } from './vocabulary';
import { openCallAt, statementStart } from './calls';
import { fmtComplex, withUnit } from './format';
import { isReservedName } from '../language/reserved';

/** What the client can do with completion items. */
export interface CompletionOptions {
  /** The client accepts snippets (`textDocument.completion.completionItem.snippetSupport`). */
  snippets: boolean;
  /** The client runs `editor.action.triggerSuggest` (VS Code): reopen the list after `system `, `state `, `expect `. */
  retrigger?: boolean;
}

function item(label: string, kind: CompletionItemKind, detail: string, snippet: string | null, options: CompletionOptions, sortText?: string): CompletionItem {
  const c: CompletionItem = { label, kind, detail };
  if (snippet !== null && options.snippets && snippet.includes('$')) {
    c.insertText = snippet;
    c.insertTextFormat = InsertTextFormat.Snippet;
  } else if (snippet !== null) {
    // Without snippet support insert the call with its placeholders' default text.
    c.insertText = snippet.replace(/\$\{\d+\|([^,|]*)[^}]*\|\}/g, '$1').replace(/\$\{\d+:([^}]*)\}/g, '$1').replace(/\$\d+/g, '');
    c.insertTextFormat = InsertTextFormat.PlainText;
  }
  if (sortText) c.sortText = sortText;
  return c;
}

function constructors(after: 'system' | 'state', options: CompletionOptions): CompletionItem[] {
  return CONSTRUCTORS.filter((c) => c.after === after).map((c, k) => {
    const it = item(c.name, CompletionItemKind.Constructor, c.doc, c.snippet, options, String(k).padStart(2, '0'));
    it.documentation = { kind: 'markdown', value: c.doc };
    return it;
  });
}

/** Names usable inside an expression on the statement starting at `start`. */
function expressionNames(view: DocView, start: number, lineStart: string, options: CompletionOptions): CompletionItem[] {
  const out: CompletionItem[] = [];
  for (const s of view.file.statements) {
    // A reserved name (`let __proto__`) is refused where it is defined and never offered.
    if (s.kind !== 'let' || s.span.start >= start || isReservedName(s.name)) continue;
    const v = view.result?.values?.find((x) => x.name === s.name);
    const detail = v ? `= ${fmtComplex(v.re, v.im)}${withUnit(v.unit)}` : `= ${s.expr.text.trim()}`;
    out.push(item(s.name, CompletionItemKind.Variable, detail, null, options, `0${s.name}`));
  }
  for (const c of CONSTANTS) out.push(item(c.name, CompletionItemKind.Constant, c.doc, null, options, `1${c.name}`));
  for (const f of FUNCTIONS) out.push(item(f.name, CompletionItemKind.Function, f.doc, f.arity === 2 ? `${f.name}(\${1:a}, \${2:b})` : `${f.name}(\${1})`, options, `2${f.name}`));
  const inFunction = /^(state\s+psi\s*\(|system\s+V\s*\()/.test(lineStart);
  if (inFunction) out.push(item('x', CompletionItemKind.Variable, 'position', null, options, '0x'));
  if (/^state\s+psi\s*\(/.test(lineStart)) out.push(item('phi', CompletionItemKind.Function, 'phi(n, x): eigenfunction n of the system', 'phi(${1:1}, x)', options, '0phi'));
  if (view.file.statements.some((s) => s.kind === 'units')) {
    for (const u of UNIT_NAMES) out.push(item(u.name, CompletionItemKind.Unit, `${u.kind}: ${u.doc}`, null, options, `3${u.name}`));
  }
  return out;
}

/** Completion items at `offset`. */
export function completeAt(view: DocView, offset: number, options: CompletionOptions): CompletionItem[] {
  const text = view.text;
  const lineStart = text.lastIndexOf('\n', Math.max(0, offset - 1)) + 1;
  const before = text.slice(lineStart, offset);
  if (before.includes('#')) return [];
  if (/^[a-z]*$/.test(before)) {
    return KEYWORDS.map((k, n) => {
      const it = item(k.name, CompletionItemKind.Keyword, k.doc, k.snippet, options, String(n).padStart(2, '0'));
      if (k.snippet.endsWith(' ') && options.retrigger) it.command = { title: 'Suggest', command: 'editor.action.triggerSuggest' };
      return it;
    });
  }
  const start = statementStart(text, offset);
  const head = text.slice(start, offset);
  if (/^system\s+[A-Za-z]*$/.test(head) || /^state\s+eigen\b.*\bof\s+[A-Za-z]*$/.test(head)) return constructors('system', options);
  if (/^state\s+[A-Za-z]*$/.test(head)) return constructors('state', options);
  if (/^units\b/.test(head)) return UNIT_NAMES.filter((u) => u.kind === 'length' || u.kind === 'energy' || u.kind === 'time').map((u) => item(u.name, CompletionItemKind.Unit, `${u.kind}: ${u.doc}`, null, options));
  if (/^expect\s+[a-z]*$/.test(head)) return EXPECT_KINDS.map((k) => item(k.name, CompletionItemKind.Keyword, k.doc, k.snippet, options));
  if (/^expect\s+parity\s+[a-z]*$/.test(head)) return PARITIES.map((p) => item(p, CompletionItemKind.EnumMember, `parity ${p}`, null, options));
  const names = expressionNames(view, start, head, options);
  const call = openCallAt(text, offset);
  const ctor = call ? CONSTRUCTORS.find((c) => c.name === call.name) : undefined;
  if (call && ctor && /^\s*[A-Za-z_]*$/.test(call.current)) {
    const args = ctor.parameters
      .filter((p) => !p.positional && !call.named.includes(p.name))
      .map((p, k) => item(`${p.name} =`, CompletionItemKind.Property, p.doc, `${p.name} = $1`, options, ` ${k}`));
    return [...args, ...names];
  }
  return names;
}
