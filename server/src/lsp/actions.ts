/**
 * Quick fixes: every diagnostic that carries fixes offers them as workspace edits (the server never
 * writes files), each attached to its diagnostic.
 */
import { CodeActionKind, type CodeAction, type Diagnostic, type TextEdit } from 'vscode-languageserver';
import type { FixData } from '../language/catalogue';
import type { DocView } from './view';
import { rangeOf } from './positions';
import { toLspDiagnostic, type DiagnosticData } from './diagnostics';

function sameRange(a: Diagnostic, b: Diagnostic): boolean {
  return (
    a.range.start.line === b.range.start.line &&
    a.range.start.character === b.range.start.character &&
    a.range.end.line === b.range.end.line &&
    a.range.end.character === b.range.end.character
  );
}

/**
 * The fixes of a diagnostic the client sent back. Offsets are only trusted for the current version;
 * otherwise the current findings are searched for one with the same code and range.
 */
function fixesOf(view: DocView, d: Diagnostic): FixData[] {
  const data = d.data as Partial<DiagnosticData> | undefined;
  if (data && data.version === view.version && Array.isArray(data.fixes)) return data.fixes;
  for (const e of view.diagnostics) {
    if (!e.fixes || e.code !== d.code) continue;
    if (sameRange(toLspDiagnostic(view.lines, view.version, e), d)) return e.fixes;
  }
  return [];
}

function editOf(view: DocView, f: FixData): TextEdit | null {
  const n = view.text.length;
  if (f.kind === 'insert') {
    if (!(f.at >= 0 && f.at <= n)) return null;
    return { range: rangeOf(view.lines, f.at, f.at), newText: f.text };
  }
  if (!(f.start >= 0 && f.end >= f.start && f.end <= n)) return null;
  return { range: rangeOf(view.lines, f.start, f.end), newText: f.text };
}

/** Quick fixes for the diagnostics in the request's context. */
export function quickFixes(view: DocView, diagnostics: Diagnostic[]): CodeAction[] {
  const out: CodeAction[] = [];
  for (const d of diagnostics) {
    if (d.source !== 'eigenspan') continue;
    const fixes = fixesOf(view, d);
    fixes.forEach((f) => {
      const edit = editOf(view, f);
      if (!edit) return;
      out.push({
        title: f.title,
        kind: CodeActionKind.QuickFix,
        diagnostics: [d],
        // The engine marks which fix repairs the file; otherwise only a lone fix is preferred.
        isPreferred: f.preferred ?? fixes.length === 1,
        edit: { changes: { [view.uri]: [edit] } },
      });
    });
  }
  return out;
}
