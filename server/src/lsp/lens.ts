/**
 * Code lenses on the `state` line and inlay hints after `let` values.
 */
import { InlayHintKind, type CodeLens, type InlayHint } from 'vscode-languageserver';
import type { DocView } from './view';
import { rangeOf, positionAt } from './positions';
import { fmt, fmtComplex, withUnit } from './format';

/** The command the VS Code client registers to open the spectrum panel. */
export const SHOW_PANEL_COMMAND = 'eigenspan.showPanel';

/** Lenses on the `state` line: energy mean, levels for 99.9%, and "Show spectrum" when the client has the panel. */
export function lensesFor(view: DocView, panel: boolean): CodeLens[] {
  const s = view.file.statements.find((x) => x.kind === 'state');
  if (!s) return [];
  const range = rangeOf(view.lines, s.span.start, s.span.start);
  const out: CodeLens[] = [];
  const r = view.result;
  // A lens with an empty command is shown as plain text (LSP 3.17 leaves the command to the client).
  const text = (title: string): CodeLens => ({ range, command: { title, command: '' } });
  if (r) {
    const e = withUnit(r.units.energy);
    if (r.energy) {
      const mean = r.energy.mean === null ? '⟨E⟩ diverges' : `⟨E⟩ = ${fmt(r.energy.mean, 5)}${r.energy.spread === null ? '' : ` ± ${fmt(r.energy.spread, 3)}`}${e}`;
      out.push(text(mean));
    }
    out.push(text(r.levelsFor999 !== null ? `99.9% in ${r.levelsFor999} level${r.levelsFor999 === 1 ? '' : 's'}` : `99.9% not reached in ${r.levels.length} levels`));
  } else if (view.evaluate) {
    out.push(text('analysing…'));
  }
  if (panel) out.push({ range, command: { title: 'Show spectrum', command: SHOW_PANEL_COMMAND, arguments: [view.uri] } });
  return out;
}

/** Inlay hints after each `let` value: its value in the file's units, when the analysis reports it. */
export function letHints(view: DocView, from: number, to: number): InlayHint[] {
  const values = view.result?.values;
  if (!values) return [];
  const out: InlayHint[] = [];
  for (const s of view.file.statements) {
    if (s.kind !== 'let' || s.expr.end < from || s.expr.start > to) continue;
    const v = values.find((x) => x.name === s.name);
    if (!v) continue;
    // Skip a bare number: the hint would repeat what is written.
    if (/^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(s.expr.text) && Math.abs(v.im) === 0 && !v.unit) continue;
    out.push({ position: positionAt(view.lines, s.expr.end), label: `= ${fmtComplex(v.re, v.im, 5)}${withUnit(v.unit)}`, kind: InlayHintKind.Type, paddingLeft: true });
  }
  return out;
}
