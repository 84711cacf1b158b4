/**
 * Findings carried over an edit: while the full analysis of a new text is on its way, the numerical
 * findings of the last full analysis stay published, their ranges mapped through the edit, so they do
 * not vanish at every keystroke and come back a moment later. The quick (static) stage's own findings
 * are always its fresh ones; a carried finding is dropped when the quick stage proves it stale (the new
 * text has an error that stops the numerical stage, or the text it was about was deleted). Carried
 * findings are marked `{ stale: true }` in their LSP `data` and carry no fixes (their edits belong to
 * the older text); the editor features (hovers, fixes) never see them.
 */
import type { EngineDiagnostic } from '../language/catalogue';

/** The one replaced region between two texts: [start, oldEnd) of the old text became [start, newEnd) of the new. */
export interface TextEdit {
  start: number;
  oldEnd: number;
  newEnd: number;
}

/** The smallest single edit from `a` to `b`: the common prefix and suffix are kept (O(length)). */
export function editBetween(a: string, b: string): TextEdit {
  const n = Math.min(a.length, b.length);
  let start = 0;
  while (start < n && a.charCodeAt(start) === b.charCodeAt(start)) start++;
  let tail = 0;
  while (tail < n - start && a.charCodeAt(a.length - 1 - tail) === b.charCodeAt(b.length - 1 - tail)) tail++;
  return { start, oldEnd: a.length - tail, newEnd: b.length - tail };
}

/**
 * A range of the old text in the new one, or null when the text it covered was replaced entirely.
 * Ends before the edit stay, starts after it shift; a range holding the edit grows or shrinks with it;
 * an insertion at a range's start moves the range, one at its end leaves it.
 */
export function mapRange(s: number, e: number, edit: TextEdit): { start: number; end: number } | null {
  const delta = edit.newEnd - edit.oldEnd;
  const replaced = edit.oldEnd > edit.start;
  if (replaced && s >= edit.start && e <= edit.oldEnd && !(s === e && (s === edit.start || s === edit.oldEnd))) return null;
  const start = s < edit.start ? s : s >= edit.oldEnd ? s + delta : edit.newEnd;
  const end = e <= edit.start ? e : e >= edit.oldEnd ? e + delta : edit.newEnd;
  return { start, end: Math.max(start, end) };
}

const key = (d: EngineDiagnostic): string => `${d.start}:${d.end}:${d.code}:${d.message}`;

/**
 * The findings to carry into a new text: those of the old full analysis that its own quick stage did
 * not give (the numerical ones), mapped through the edit from `oldText` to `newText`; none when the new
 * quick stage found an error (the numerical stage then does not run, so they are all stale).
 */
export function carryOver(full: EngineDiagnostic[], oldStatic: EngineDiagnostic[], newStatic: EngineDiagnostic[], oldText: string, newText: string): EngineDiagnostic[] {
  if (newStatic.some((d) => d.severity === 'error')) return [];
  const quick = new Set(oldStatic.map(key));
  const edit = editBetween(oldText, newText);
  const out: EngineDiagnostic[] = [];
  for (const d of full) {
    if (quick.has(key(d))) continue;
    const r = mapRange(d.start, d.end, edit);
    if (r) out.push({ start: r.start, end: r.end, severity: d.severity, code: d.code, message: d.message });
  }
  return out;
}
