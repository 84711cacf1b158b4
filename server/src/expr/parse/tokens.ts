/**
 * A tokenizer that follows the token rules of mathjs 15.2's parser, so that its tokens line up with the
 * nodes of mathjs's tree (which carry no positions) in source order.
 */
// Tokenizer: follows the token rules of mathjs 15.2's parser so that tokens line up with the tree.

export type TokKind = 'num' | 'sym' | 'str' | 'op' | 'bad';
export interface Tok {
  kind: TokKind;
  text: string;
  start: number;
  end: number;
}

const DELIM3 = new Set(['>>>']);
const DELIM2 = new Set(['.*', './', '.^', '^|', '?.', '??', '==', '!=', '<=', '>=', '<<', '>>']);
const DELIM1 = new Set([',', '(', ')', '[', ']', '{', '}', ';', '+', '-', '*', '/', '%', '^', '~', '!', '&', '|', '=', ':', '?', '<', '>']);
const NAMED = new Set(['mod', 'to', 'in', 'and', 'xor', 'or', 'not']);

const isDigit = (c: string) => c >= '0' && c <= '9';
// mathjs's letters plus the micro sign, which is handed to mathjs as the Greek mu.
const LETTER = /^[a-zA-Z_$\u00B5\u00C0-\u02AF\u0370-\u03FF\u2100-\u214F]$/;
function isAlpha(s: string, i: number): boolean {
  const c = s.charAt(i);
  if (LETTER.test(c)) return true;
  const hi = c === '\uD835' ? c : s.charAt(i - 1);
  const lo = c === '\uD835' ? s.charAt(i + 1) : c;
  return hi === '\uD835' && /^[\uDC00-\uDFFF]$/.test(lo);
}
const isSpace = (c: string) => c === ' ' || c === '\t' || c === '\u00A0' || c === '\n' || c === '\r';
const isDecimalMark = (c: string, next: string) => c === '.' && next !== '/' && next !== '*' && next !== '^';

/** Length of the operator token at i (mathjs's three-, two- and one-character delimiters), or 0. */
function operatorLength(s: string, i: number): number {
  if (DELIM3.has(s.substr(i, 3))) return 3;
  const c2 = s.substr(i, 2);
  if (DELIM2.has(c2) && (c2 !== '?.' || !isDigit(s.charAt(i + 2)))) return 2;
  const c = s.charAt(i);
  return DELIM1.has(c) || c === "'" ? 1 : 0;
}

/**
 * End of the number starting at i by mathjs's rules (0b/0o/0x prefixes, a decimal mark, an exponent),
 * or -1 when i holds a lone '.' (an operator).
 */
function numberEnd(s: string, i: number): number {
  const n = s.length;
  const c2 = s.substr(i, 2);
  if (c2 === '0b' || c2 === '0o' || c2 === '0x') {
    i += 2;
    while (i < n && (isAlpha(s, i) || isDigit(s.charAt(i)))) i++;
    if (s.charAt(i) === '.') {
      i++;
      while (i < n && (isAlpha(s, i) || isDigit(s.charAt(i)))) i++;
    }
    return i;
  }
  if (s.charAt(i) === '.') {
    i++;
    if (!isDigit(s.charAt(i))) return -1;
  } else {
    while (isDigit(s.charAt(i))) i++;
    if (isDecimalMark(s.charAt(i), s.charAt(i + 1))) i++;
  }
  while (isDigit(s.charAt(i))) i++;
  const e = s.charAt(i);
  if ((e === 'e' || e === 'E') && (isDigit(s.charAt(i + 1)) || s.charAt(i + 1) === '-' || s.charAt(i + 1) === '+')) {
    i++;
    if (s.charAt(i) === '+' || s.charAt(i) === '-') i++;
    while (isDigit(s.charAt(i))) i++;
  }
  return i;
}

/**
 * Splits `s` into tokens the way mathjs does, and returns the text to hand to mathjs: newlines become
 * spaces (continuation lines belong to one expression), comments are blanked, the micro sign becomes mu.
 */
export function tokenize(s: string): { tokens: Tok[]; mathText: string } {
  const tokens: Tok[] = [];
  const out = s.split('');
  let i = 0;
  const n = s.length;
  const operandEnd = (t: Tok | undefined) =>
    t !== undefined &&
    (t.kind === 'num' || t.kind === 'sym' || t.kind === 'str' || (t.kind === 'op' && [')', ']', '}', "'", '!'].includes(t.text)));
  while (i < n) {
    const c = s.charAt(i);
    if (c === '\n' || c === '\r') {
      out[i] = ' ';
      i++;
      continue;
    }
    if (isSpace(c)) {
      i++;
      continue;
    }
    if (c === '#') {
      while (i < n && s.charAt(i) !== '\n' && s.charAt(i) !== '\r') out[i++] = ' ';
      continue;
    }
    const start = i;
    if (c === '"' || (c === "'" && !operandEnd(tokens[tokens.length - 1]))) {
      i++;
      while (i < n && s.charAt(i) !== c) i += s.charAt(i) === '\\' ? 2 : 1;
      i = Math.min(n, i + 1);
      tokens.push({ kind: 'str', text: s.slice(start, i), start, end: i });
      continue;
    }
    const op = operatorLength(s, i);
    if (op > 0) {
      i += op;
      tokens.push({ kind: 'op', text: s.slice(start, i), start, end: i });
      continue;
    }
    if (isDigit(c) || c === '.') {
      const end = numberEnd(s, i);
      i = end < 0 ? i + 1 : end;
      tokens.push({ kind: end < 0 ? 'op' : 'num', text: s.slice(start, i), start, end: i });
      continue;
    }
    if (isAlpha(s, i)) {
      while (i < n && (isAlpha(s, i) || isDigit(s.charAt(i)))) {
        if (s.charAt(i) === '\u00B5') out[i] = '\u03BC';
        i++;
      }
      const text = s.slice(start, i);
      tokens.push({ kind: NAMED.has(text) ? 'op' : 'sym', text, start, end: i });
      continue;
    }
    tokens.push({ kind: 'bad', text: s.slice(i), start, end: n });
    break;
  }
  return { tokens, mathText: out.join('') };
}

