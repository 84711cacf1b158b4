/**
 * Reader of the state clause `samples("PATH")` (grammar in `parser.ts`): a table of samples of the
 * wave function in a data file, named by a path relative to the `.qstate` file's folder.
 * The parser only reads the path; which paths may be read is the front ends' rule (cli/files.ts), and
 * the table itself is read by the engine (analysis/samples.ts).
 */
import type { Span, StateSpec } from './ast';
import { fail, unexpected, type Ctx } from './parserParts';
import { skipSpace } from './text';

/** Longest path accepted, in characters (a longer one is a mistake, not a file name). */
export const MAX_PATH_LENGTH = 1024;

/** `samples("PATH")`, starting after the word `samples` (at `kindSpan`), up to `hi`. */
export function parseSamples(ctx: Ctx, kindSpan: Span, hi: number): StateSpec | null {
  const { m } = ctx;
  const open = skipSpace(m, kindSpan.end, hi);
  const example = `as in 'samples("data/packet.csv")'`;
  if (open >= hi || m[open] !== '(') return unexpected(ctx, open, hi, kindSpan, `Expected '(' and a quoted path after 'samples', ${example}.`);
  const q = skipSpace(m, open + 1, hi);
  if (q >= hi || m[q] !== '"') return fail(ctx, 'syntax', { start: open, end: Math.min(hi, q + 1) }, `Expected a quoted path inside the parentheses, ${example}.`);
  let close = q + 1;
  while (close < hi && m[close] !== '"' && m[close] !== '\n' && m[close] !== '\r') close++;
  const pathSpan: Span = { start: q, end: close + 1 };
  if (close >= hi || m[close] !== '"') {
    return fail(ctx, 'syntax', { start: q, end: q + 1 }, "This '\"' is not closed on its line (a '#' starts a comment, so a path cannot contain one).");
  }
  const path = m.slice(q + 1, close);
  const problem = pathProblem(path);
  if (problem !== null) return fail(ctx, 'syntax', pathSpan, problem);
  const end = skipSpace(m, close + 1, hi);
  if (end >= hi || m[end] !== ')') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '(' is not closed after the path.");
  const rest = skipSpace(m, end + 1, hi);
  if (rest < hi) return fail(ctx, 'syntax', { start: rest, end: hi }, "Unexpected text after 'samples(...)'.");
  return { kind: 'samples', span: { start: kindSpan.start, end: end + 1 }, keywordSpan: kindSpan, path, pathSpan };
}

/** Why a written path cannot name a data file, or null. Where it may lead is checked by the front ends. */
function pathProblem(path: string): string | null {
  if (path.trim() === '') return 'The path is empty; name a data file relative to this file, as in "data/packet.csv".';
  if (path.length > MAX_PATH_LENGTH) return `The path is ${path.length} characters long, above the limit of ${MAX_PATH_LENGTH}.`;
  if (path.includes('\\')) return "Write folders with '/', not '\\' (paths are the same on every system).";
  // Control characters never belong in a file name and could disguise one in a message.
  if (/[\u0000-\u001f\u007f]/.test(path)) return 'The path contains a control character.';
  return null;
}
