/**
 * Finds the constructor call the cursor is inside, from the text alone, so that completion and
 * signature help work on half-typed lines that do not parse yet.
 */

/** The innermost open call before the cursor. */
export interface OpenCall {
  /** The name written before the `(`. */
  name: string;
  /** Offset just after the `(`. */
  argsStart: number;
  /** Index of the argument the cursor is in (commas at depth one before it). */
  index: number;
  /** The text of the current argument up to the cursor. */
  current: string;
  /** Names already given as `name = …` in this call. */
  named: string[];
}

/** The start offset of the statement holding `offset`: the last line start not followed by white space. */
export function statementStart(text: string, offset: number): number {
  let at = text.lastIndexOf('\n', Math.max(0, offset - 1)) + 1;
  // Continuation lines start with white space; walk back to the line that starts the statement.
  while (at > 0 && /[ \t]/.test(text[at] ?? '')) at = text.lastIndexOf('\n', at - 2) + 1;
  return at;
}

/** The innermost call opened before `offset` in its statement and still open, or null. */
export function openCallAt(text: string, offset: number): OpenCall | null {
  const start = statementStart(text, offset);
  const stack: { name: string; argsStart: number; commas: number[] }[] = [];
  for (let k = start; k < offset; k++) {
    const c = text[k];
    if (c === '#') {
      const nl = text.indexOf('\n', k);
      if (nl < 0 || nl >= offset) break;
      k = nl;
    } else if (c === '(' || c === '[') {
      const m = /([A-Za-z_][A-Za-z0-9_]*)\s*$/.exec(text.slice(start, k));
      stack.push({ name: c === '(' && m ? m[1]! : '', argsStart: k + 1, commas: [] });
    } else if (c === ')' || c === ']') {
      stack.pop();
    } else if (c === ',' && stack.length > 0) {
      stack[stack.length - 1]!.commas.push(k);
    }
  }
  const top = stack[stack.length - 1];
  if (!top || top.name === '') return null;
  const argStart = top.commas.length > 0 ? top.commas[top.commas.length - 1]! + 1 : top.argsStart;
  const named: string[] = [];
  const inner = text.slice(top.argsStart, offset);
  for (const m of inner.matchAll(/(?:^|,)\s*([A-Za-z_][A-Za-z0-9_]*)\s*=(?!=)/g)) named.push(m[1]!);
  return { name: top.name, argsStart: top.argsStart, index: top.commas.length, current: text.slice(argStart, offset), named };
}
