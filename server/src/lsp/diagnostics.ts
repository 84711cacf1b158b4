/**
 * Engine diagnostics as LSP diagnostics: the catalogue code, source `eigenspan`, and the fixes in `data`.
 */
import { DiagnosticSeverity, type Diagnostic } from 'vscode-languageserver';
import type { EngineDiagnostic, FixData, Severity } from '../language/catalogue';
import { rangeOf, type LineTable } from './positions';

/** What the server stores in `Diagnostic.data`: the version the offsets belong to and the fixes. */
export interface DiagnosticData {
  version: number;
  fixes: FixData[];
}

const SEVERITY: Record<Severity, DiagnosticSeverity> = {
  error: DiagnosticSeverity.Error,
  warning: DiagnosticSeverity.Warning,
  info: DiagnosticSeverity.Information,
};

/** Converts one engine diagnostic of document version `version`. */
export function toLspDiagnostic(lines: LineTable, version: number, d: EngineDiagnostic): Diagnostic {
  const out: Diagnostic = {
    range: rangeOf(lines, d.start, d.end),
    severity: SEVERITY[d.severity] ?? DiagnosticSeverity.Error,
    code: d.code,
    source: 'eigenspan',
    message: d.message,
  };
  if (d.fixes && d.fixes.length > 0) out.data = { version, fixes: d.fixes } satisfies DiagnosticData;
  return out;
}

/** Converts a list, dropping exact duplicates (static checks can be reported again by the full analysis). */
export function toLspDiagnostics(lines: LineTable, version: number, list: EngineDiagnostic[]): Diagnostic[] {
  const seen = new Set<string>();
  const out: Diagnostic[] = [];
  for (const d of list) {
    const key = `${d.start}:${d.end}:${d.code}:${d.message}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(toLspDiagnostic(lines, version, d));
  }
  return out;
}

/** What a carried finding holds in `Diagnostic.data`: it comes from the previous full analysis (see carry.ts). */
export interface CarriedData {
  stale: true;
}

/** Carried findings (already mapped into the current text) as LSP diagnostics, marked stale and without fixes. */
export function toCarriedLspDiagnostics(lines: LineTable, list: EngineDiagnostic[]): Diagnostic[] {
  return list.map((d) => ({ ...toLspDiagnostic(lines, 0, { ...d, fixes: undefined }), data: { stale: true } satisfies CarriedData }));
}

/** The quick stage's findings and the carried ones, in document order. */
export function withCarried(fresh: Diagnostic[], carried: Diagnostic[]): Diagnostic[] {
  const at = (d: Diagnostic): number[] => [d.range.start.line, d.range.start.character, d.range.end.line, d.range.end.character];
  const before = (a: Diagnostic, b: Diagnostic): number => {
    const x = at(a);
    const y = at(b);
    for (let i = 0; i < 4; i++) if (x[i] !== y[i]) return x[i]! - y[i]!;
    return 0;
  };
  return [...fresh, ...carried].sort(before);
}
