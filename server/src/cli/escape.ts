/**
 * Escaping of everything the command line prints, so text from a file (a formula, a name, a file name)
 * can neither drive the terminal nor forge a line that a problem matcher would trust.
 *
 * Escaped: the C0 controls (U+0000-U+001F), DEL (U+007F), the C1 controls (U+0080-U+009F), the line and
 * paragraph separators (U+2028, U+2029) and the bidirectional controls (U+061C, U+200E, U+200F,
 * U+202A-U+202E, U+2066-U+2069; Unicode Standard Annex 9). Nothing else: µ, Å, ℏ and every other
 * printable character print as they are. A control prints as `\n`, `\r`, `\t` or `\xHH`, any other
 * escaped character as `\uHHHH`.
 */

const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;
const UNSAFE_BUT_NEWLINE = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;
/** What JSON.stringify leaves raw inside strings (it escapes C0 itself). */
const UNSAFE_IN_JSON = /[\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

const NAMED: Record<string, string> = { '\n': '\\n', '\r': '\\r', '\t': '\\t' };

function hex(c: string, width: number): string {
  return c.charCodeAt(0).toString(16).toUpperCase().padStart(width, '0');
}

function escapeOne(c: string): string {
  const code = c.charCodeAt(0);
  return NAMED[c] ?? (code <= 0xff ? `\\x${hex(c, 2)}` : `\\u${hex(c, 4)}`);
}

/** `s` with every unsafe character escaped (line breaks too: for file names and one-line fields). */
export function escapeText(s: string): string {
  return s.replace(UNSAFE, escapeOne);
}

/** `s` with every unsafe character escaped except the line feeds that separate its lines. */
export function escapeLines(s: string): string {
  return s.replace(UNSAFE_BUT_NEWLINE, escapeOne);
}

/**
 * A JSON text with the unsafe characters JSON.stringify leaves raw written as `\uHHHH` escapes: still
 * the same JSON value (they can only occur inside strings), now safe to print.
 */
export function escapeJson(json: string): string {
  return json.replace(UNSAFE_IN_JSON, (c) => `\\u${hex(c, 4)}`);
}
