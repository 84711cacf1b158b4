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
import { KEYWORDS as KEYWORD_TABLE } from '../language/keywords';
import { evolveRest, fileUnits, snippetToPlain, templateFor, type FileUnits } from './templates';

/** What the client can do with completion items, and what asked for them. */
export interface CompletionOptions {
  /** The client accepts snippets (`textDocument.completion.completionItem.snippetSupport`). */
  snippets: boolean;
  /**
   * The trigger character that asked for the list, if any. A space asks only where a word must follow
   * (after `system`, `state`, `of`, `expect`, `evolve`, a `to` value, or inside a constructor call), so
   * typing a formula does not pop a list at every space.
   */
  trigger?: string;
}

/**
 * One item. A snippet goes in as a snippet for clients that take them and as its plain text
 * (`snippetToPlain`: every placeholder's value, no `${1}`) for the rest.
 */
function item(label: string, kind: CompletionItemKind, detail: string, snippet: string | null, options: CompletionOptions, sortText?: string): CompletionItem {
  const c: CompletionItem = { label, kind, detail };
  if (snippet !== null && options.snippets && snippet.includes('$')) {
    c.insertText = snippet;
    c.insertTextFormat = InsertTextFormat.Snippet;
  } else if (snippet !== null) {
    c.insertText = snippetToPlain(snippet);
    c.insertTextFormat = InsertTextFormat.PlainText;
  }
  if (sortText) c.sortText = sortText;
  return c;
}

function constructors(after: 'system' | 'state', units: FileUnits | null, options: CompletionOptions): CompletionItem[] {
  return CONSTRUCTORS.filter((c) => c.after === after).map((c, k) => {
    const it = item(c.name, CompletionItemKind.Constructor, c.doc, templateFor('constructor', c.name, units, c.snippet), options, String(k).padStart(2, '0'));
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
  // Empty tab stops, no argument names (left as they are they would be unknown names); a client without snippets gets the bare name.
  for (const f of FUNCTIONS) out.push(item(f.name, CompletionItemKind.Function, f.doc, options.snippets ? `${f.name}(${Array.from({ length: f.arity }, (_, k) => `\${${k + 1}}`).join(', ')})$0` : null, options, `2${f.name}`));
  const inFunction = /^(state\s+psi\s*\(|system\s+V\s*\()/.test(lineStart);
  if (inFunction) out.push(item('x', CompletionItemKind.Variable, 'position', null, options, '0x'));
  if (/^state\s+psi\s*\(/.test(lineStart)) out.push(item('phi', CompletionItemKind.Function, 'phi(n, x): eigenfunction n of the system', 'phi(${1:1}, x)', options, '0phi'));
  if (view.file.statements.some((s) => s.kind === 'units')) {
    for (const u of UNIT_NAMES) out.push(item(u.name, CompletionItemKind.Unit, `${u.kind}: ${u.doc}`, null, options, `3${u.name}`));
  }
  return out;
}

/**
 * Whether a statement with this keyword may start at `at`: a keyword the file may hold once is not
 * offered again, `units` only before every other statement and `mass` only before the system and state
 * (the format's order rules), so an accepted keyword does not create a finding of its own.
 */
function keywordFits(view: DocView, keyword: string, at: number): boolean {
  const others = [...view.file.statements.map((s) => ({ kind: s.kind as string, start: s.span.start, end: s.span.end })), ...(view.file.rejected ?? []).map((r) => ({ kind: r.keyword as string, start: r.span.start, end: r.span.end }))].filter((s) => !(s.start <= at && at <= s.end));
  if (KEYWORD_TABLE.find((k) => k.keyword === keyword)?.once && others.some((s) => s.kind === keyword)) return false;
  if (keyword === 'units') return !others.some((s) => s.start < at);
  if (keyword === 'mass') return !others.some((s) => s.start < at && (s.kind === 'system' || s.kind === 'state'));
  // A sweep varies a `let`: without one there is nothing to sweep.
  if (keyword === 'sweep') return others.some((s) => s.kind === 'let' && s.start < at);
  return true;
}

/** Where a space asks for a list: right after a word that must be followed by another. */
const AFTER_SPACE = /^(system|state|expect|expect\s+parity|evolve|evolve\s+to\s+\S.*|state\s+eigen\b.*\bof|system\s+V\s*\(\s*x\s*\)[^]*\bover\s*\[[^\]]*\])\s+$/;

/** Completion items at `offset`. */
export function completeAt(view: DocView, offset: number, options: CompletionOptions): CompletionItem[] {
  const text = view.text;
  const lineStart = text.lastIndexOf('\n', Math.max(0, offset - 1)) + 1;
  const before = text.slice(lineStart, offset);
  if (before.includes('#')) return [];
  const units = fileUnits(view.file, text);
  if (/^[a-z]*$/.test(before)) {
    if (options.trigger === ' ') return [];
    // A keyword with several forms completes to the bare keyword: the space the user types next asks for its forms.
    return KEYWORDS.filter((k) => keywordFits(view, k.name, lineStart)).map((k, n) => item(k.name, CompletionItemKind.Keyword, k.doc, k.snippet.endsWith(' ') ? k.name : templateFor('keyword', k.name, units, k.snippet), options, String(n).padStart(2, '0')));
  }
  const start = statementStart(text, offset);
  const head = text.slice(start, offset);
  const call = openCallAt(text, offset);
  if (options.trigger === ' ' && !AFTER_SPACE.test(head) && !(call && /^\s*$/.test(call.current) && CONSTRUCTORS.some((c) => c.name === call.name))) return [];
  if (/^system\s+[A-Za-z]*$/.test(head) || /^state\s+eigen\b.*\bof\s+[A-Za-z]*$/.test(head)) return constructors('system', units, options);
  if (/^state\s+[A-Za-z]*$/.test(head)) return constructors('state', units, options);
  if (/^units\b/.test(head)) return UNIT_NAMES.filter((u) => ['length', 'energy', 'time', 'frequency'].includes(u.kind)).map((u) => item(u.name, CompletionItemKind.Unit, u.kind === 'frequency' ? `energy as a frequency (E = h f): ${u.doc}` : `${u.kind}: ${u.doc}`, null, options));
  // 'expect window' judges a sweep: offered only in a file with a `sweep` line.
  const swept = view.file.statements.some((st) => st.kind === 'sweep');
  if (/^expect\s+[a-z]*$/.test(head)) return EXPECT_KINDS.filter((k) => swept || k.name !== 'window').map((k) => item(k.name, CompletionItemKind.Keyword, k.doc, templateFor('expect', k.name, units, k.snippet), options));
  if (/^expect\s+parity\s+[a-z]*$/.test(head)) return PARITIES.map((p) => item(p, CompletionItemKind.EnumMember, `parity ${p}`, null, options));
  if (/^evolve\s+[a-z]*$/.test(head)) return [item('to', CompletionItemKind.Keyword, 'The time to evolve up to, then the number of steps.', evolveRest(units), options)];
  // After a potential's interval: the mass profile it may carry (`with mass(x) = ...`), in the file's units.
  if (/^system\s+V\s*\(\s*x\s*\)[^]*\bover\s*\[[^\]]*\]\s+[a-z]*$/.test(head) && !/\bwith\b/.test(head)) {
    return [item('with mass(x) =', CompletionItemKind.Keyword, 'A mass that depends on x (BenDaniel-Duke kinetic energy); the mass line holds where it names none.', `with mass(x) = \${1:${units ? '1 m_e' : '1'}}`, options)];
  }
  const names = expressionNames(view, start, head, options);
  // After the time: `steps`, beside the names and units the time may still take.
  if (/^evolve\s+to\s+\S.*\s[a-z]*$/.test(head) && !/\bsteps\b/.test(head)) return [item('steps', CompletionItemKind.Keyword, 'How many time steps (default 200).', 'steps ${1:200}', options, ' steps'), ...names];
  const ctor = call ? CONSTRUCTORS.find((c) => c.name === call.name) : undefined;
  if (call && ctor && /^\s*[A-Za-z_]*$/.test(call.current)) {
    const args = ctor.parameters
      .filter((p) => !p.positional && !call.named.includes(p.name))
      .map((p, k) => item(`${p.name} =`, CompletionItemKind.Property, p.doc, `${p.name} = $1`, options, ` ${k}`));
    return [...args, ...names];
  }
  return names;
}
