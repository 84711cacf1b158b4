/**
 * The syntax tree of a `.qstate` file.
 * Every node carries document offsets (half-open [start, end)); expression texts are kept verbatim
 * together with their offset so the expression layer can report exact ranges.
 */

/** A range in the document. */
export interface Span {
  start: number;
  end: number;
}

/** The text of one math expression and where it sits in the document. */
export interface ExprText extends Span {
  /** The expression exactly as written (continuation lines joined as in the source, newlines kept). */
  text: string;
}

/** One argument of a system or state constructor: `name = expr` or a bare `expr`. */
export interface Arg extends Span {
  name: string | null;
  nameSpan: Span | null;
  value: ExprText;
}

/** The system part shared by `system ...` and `state eigen(N) of ...`. */
export type SystemSpec =
  | { kind: 'box'; span: Span; keywordSpan: Span; args: Arg[] }
  | { kind: 'well'; span: Span; keywordSpan: Span; args: Arg[] }
  | { kind: 'oscillator'; span: Span; keywordSpan: Span; args: Arg[] }
  | {
      kind: 'potential';
      span: Span;
      keywordSpan: Span;
      expr: ExprText;
      from: ExprText;
      to: ExprText;
      /** `with mass(x) = ...`: a mass that depends on x, and the span of its `mass(x)` head. */
      mass?: ExprText;
      massHead?: Span;
      /** `walls LEFT RIGHT` after `over [A, B]`. */
      walls?: WallDeclaration;
    };

/** What each end of a `V(x)` interval is: `hard` (a physical wall) or `open` (it only truncates the line). */
export type WallKind = 'hard' | 'open';

/** The `walls LEFT RIGHT` clause after `over [A, B]` (absent: both ends are `open`). */
export interface WallDeclaration {
  left: WallKind;
  right: WallKind;
  span: Span;
}

/** The state part of a `state` statement. */
export type StateSpec =
  | { kind: 'psi'; span: Span; expr: ExprText }
  | { kind: 'eigen'; span: Span; level: ExprText; system: SystemSpec }
  | { kind: 'gaussian'; span: Span; keywordSpan: Span; args: Arg[] }
  /** `samples("PATH")`: a table of samples in a data file; `pathSpan` covers the quoted path, quotes included. */
  | { kind: 'samples'; span: Span; keywordSpan: Span; path: string; pathSpan: Span }
  | { kind: 'thermal'; span: Span; keywordSpan: Span; args: Arg[]; system: SystemSpec }
  | { kind: 'mixture'; span: Span; keywordSpan: Span; parts: MixturePart[] };

/** One part of a `mixture(...)`: `WEIGHT: STATE`, where the state is a pure one. */
export interface MixturePart extends Span {
  weight: ExprText;
  state: StateSpec;
}

/** A comparison at the end of an `expect` line. */
export type Comparison =
  | { kind: 'tolerance'; span: Span; value: ExprText; tolerance: ExprText }
  | { kind: 'atLeast'; span: Span; value: ExprText }
  | { kind: 'atMost'; span: Span; value: ExprText };

/** What an `expect` line asserts. */
export type Expectation =
  | { kind: 'norm'; comparison: Comparison }
  | { kind: 'parity'; value: 'even' | 'odd' | 'mixed'; valueSpan: Span }
  | { kind: 'weight'; from: ExprText; to: ExprText | null; comparison: Comparison }
  | { kind: 'energy'; comparison: Comparison }
  | { kind: 'spread'; comparison: Comparison }
  | { kind: 'level'; level: ExprText; comparison: Comparison }
  | { kind: 'continuum'; comparison: Comparison }
  | { kind: 'revival'; comparison: Comparison }
  | { kind: 'mean'; observable: 'x' | 'p'; time: ExprText; comparison: Comparison }
  | { kind: 'window'; from: ExprText; to: ExprText; rangeSpan: Span };

/**
 * What a `sweep` line varies: the `let` named `name`, from `from` to `to` in `steps` equal steps
 * (steps + 1 points), spaced evenly (`linear`) or evenly in the logarithm (`log`). See parseSweep.ts.
 */
export interface SweepSpec {
  name: string;
  nameSpan: Span;
  from: ExprText;
  to: ExprText;
  steps: ExprText;
  spacing: 'linear' | 'log';
  /** The trailing `log` word, when written. */
  spacingSpan: Span | null;
}

/** One statement; `span` covers the whole statement including continuation lines, `keywordSpan` its keyword. */
export type Statement =
  | { kind: 'units'; span: Span; keywordSpan: Span; units: { name: string; span: Span }[] }
  | { kind: 'mass'; span: Span; keywordSpan: Span; expr: ExprText }
  | { kind: 'let'; span: Span; keywordSpan: Span; name: string; nameSpan: Span; expr: ExprText }
  | { kind: 'system'; span: Span; keywordSpan: Span; system: SystemSpec }
  | { kind: 'state'; span: Span; keywordSpan: Span; state: StateSpec }
  | { kind: 'basis'; span: Span; keywordSpan: Span; expr: ExprText }
  | { kind: 'expect'; span: Span; keywordSpan: Span; expectation: Expectation }
  | { kind: 'evolve'; span: Span; keywordSpan: Span; to: ExprText; steps: ExprText | null }
  | { kind: 'sweep'; span: Span; keywordSpan: Span; sweep: SweepSpec };

/** A statement whose keyword was recognised but which was left out of `statements` because of an error. */
export interface RejectedStatement {
  keyword: Statement['kind'];
  span: Span;
  keywordSpan: Span;
  /**
   * The name a rejected `let` tried to define (a reserved name, a keyword, a second definition, a
   * missing value), when one could be read: the mistake is reported once, where it is made, so later
   * uses of the name add no finding of their own.
   */
  name?: string;
}

/** The names rejected `let` statements tried to define (their later uses add no finding of their own). */
export function rejectedNames(file: QFile): Set<string> {
  const names = new Set<string>();
  for (const r of file.rejected ?? []) if (r.name !== undefined) names.add(r.name);
  return names;
}

/** A parsed file: the statements that parsed (in order) and the text they came from. */
export interface QFile {
  text: string;
  statements: Statement[];
  /**
   * Statements with a known keyword that failed to parse (already reported). Later layers use it to
   * avoid follow-up findings such as "no system" when the system line merely has a typo.
   */
  rejected?: RejectedStatement[];
}
