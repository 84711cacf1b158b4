/**
 * What the editor offers while typing, gathered from the engine's own tables so the server never
 * disagrees with the parser: statement keywords and their forms (language/keywords), constructor
 * parameters (language/signatures), the built-in functions (expr/builtins/table, the one record per function that the sandbox, checker and compiler also read), units and constants
 * (expr/constants). This module only reshapes them for completion, signature help and hover.
 */
import { KEYWORDS as KEYWORD_TABLE, PARITY_VALUES, INNER_WORDS, RESERVED_NAMES, OPERATOR_WORDS } from '../language/keywords';
import { SIGNATURES } from '../language/signatures';
import { BUILTINS } from '../expr/builtins/table';
import { BUILTIN_NUMBERS, CONSTANTS as PHYSICAL_CONSTANTS, UNITS } from '../expr/constants';

/** One parameter of a constructor such as `well(...)`. */
export interface Parameter {
  name: string;
  /** Positional parameters are written bare, named ones as `name = value`. */
  positional: boolean;
  optional: boolean;
  doc: string;
}

/** A constructor the editor can complete and explain. */
export interface Constructor {
  name: string;
  /** Where it may appear. */
  after: 'system' | 'state';
  doc: string;
  parameters: Parameter[];
  /** An LSP snippet for the whole call. */
  snippet: string;
}

/** The forms of `keyword`, with the keyword and its space removed from label and snippet. */
function formsOf(keyword: string): { head: string; label: string; snippet: string; doc: string }[] {
  const k = KEYWORD_TABLE.find((x) => x.keyword === keyword);
  if (!k) return [];
  return k.forms.map((f) => {
    const label = f.label.replace(new RegExp(`^${keyword}\\s+`), '');
    return { head: /^[A-Za-z_]+/.exec(label)?.[0] ?? label, label, snippet: f.snippet.replace(new RegExp(`^${keyword}\\s+`), ''), doc: f.doc };
  });
}

/**
 * Statement keywords. A keyword with one form completes to that form; `system`, `state` and `expect`
 * complete to the keyword and a space so the next list (the constructors or kinds) follows.
 */
export const KEYWORDS: readonly { name: string; doc: string; snippet: string }[] = KEYWORD_TABLE.map((k) => ({
  name: k.keyword,
  doc: k.doc,
  snippet: k.forms.length === 1 ? k.forms[0]!.snippet : `${k.keyword} `,
}));

/** System and state constructors: the forms of `system` and `state`, with the parameters of `SIGNATURES`. */
export const CONSTRUCTORS: readonly Constructor[] = (['system', 'state'] as const).flatMap((after) =>
  formsOf(after).map((f): Constructor => {
    const sig = (SIGNATURES as Record<string, (typeof SIGNATURES)[keyof typeof SIGNATURES] | undefined>)[f.head];
    const parameters: Parameter[] = sig
      ? sig.params.map((p) => ({ name: p.name, positional: sig.positional, optional: !p.required, doc: p.doc + (p.defaultText !== undefined ? ` Default ${p.defaultText}.` : '') }))
      : f.head === 'eigen'
        ? [{ name: 'N', positional: true, optional: false, doc: 'The level of the other system.' }]
        : [];
    return { name: f.head, after, doc: sig ? `${sig.doc} ${f.doc}` : f.doc, parameters, snippet: f.snippet };
  }),
);

/** What `expect` can assert, with a snippet for the rest of the line. */
export const EXPECT_KINDS: readonly { name: string; doc: string; snippet: string }[] = formsOf('expect').map((f) => ({ name: f.head, doc: f.doc, snippet: f.snippet }));

/** The values of `expect parity`. */
export const PARITIES: readonly string[] = PARITY_VALUES;

/** Built-in names: dimensionless numbers, physical constants and the particle masses. */
export const CONSTANTS: readonly { name: string; doc: string }[] = [
  ...[...BUILTIN_NUMBERS].map(([name, v]) => ({ name, doc: v.doc })),
  ...[...PHYSICAL_CONSTANTS].map(([name, v]) => ({ name, doc: v.doc })),
];

/** The built-in functions (`phi` is offered separately, only inside `psi(x)`). */
export const FUNCTIONS: readonly { name: string; doc: string; arity: number }[] = BUILTINS.filter((f) => f.name !== 'phi').map((f) => ({
  name: f.name,
  doc: f.doc,
  arity: f.minArgs,
}));

/** Unit names with what they measure. */
export const UNIT_NAMES: readonly { name: string; kind: string; doc: string }[] = [...UNITS].map(([name, u]) => ({ name, kind: u.kind, doc: u.doc }));

/** Names a `let` may not take. */
export const RESERVED: ReadonlySet<string> = new Set<string>([
  ...KEYWORD_TABLE.map((k) => k.keyword),
  ...CONSTRUCTORS.map((c) => c.name),
  ...CONSTANTS.map((c) => c.name),
  ...BUILTINS.map((f) => f.name),
  ...UNITS.keys(),
  ...PARITY_VALUES,
  ...INNER_WORDS,
  ...RESERVED_NAMES,
  ...OPERATOR_WORDS,
]);
