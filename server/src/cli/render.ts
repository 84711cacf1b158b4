/**
 * Renderings of an analysis result for the command line: JSON (the fixed contract), CSV and a table.
 * Lines and columns come from the one offset-to-line table (language/positions.ts), numbers in the
 * table from the one formatter (shared/numbers.ts).
 */
import { energySymbol, energyUnitDescription } from '../shared/energyUnit';
import type { AnalysisResult } from '../analysis/types';
import type { EngineDiagnostic } from '../language/catalogue';
import { lineTable, positionAt, type LineTable } from '../language/positions';
import { formatNumber } from '../shared/numbers';
import { oscillatorQuantum, quantaText } from '../shared/quanta';
import { decayText } from '../shared/decayText';

/** A diagnostic with 1-based lines and columns, as the JSON and `check` print them. */
export interface LocatedDiagnostic {
  line: number;
  column: number;
  endLine: number;
  endColumn: number;
  severity: EngineDiagnostic['severity'];
  code: EngineDiagnostic['code'];
  message: string;
}

/** Locates a diagnostic (1-based). */
export function locate(d: EngineDiagnostic, lines: LineTable): LocatedDiagnostic {
  const s = positionAt(lines, d.start);
  const e = positionAt(lines, d.end);
  return {
    line: s.line + 1,
    column: s.character + 1,
    endLine: e.line + 1,
    endColumn: e.character + 1,
    severity: d.severity,
    code: d.code,
    message: d.message,
  };
}

/** `FILE:LINE:COL: SEVERITY[CODE]: MESSAGE`. */
export function renderDiagnostic(file: string, d: EngineDiagnostic, lines: LineTable): string {
  const l = locate(d, lines);
  return `${file}:${l.line}:${l.column}: ${l.severity}[${l.code}]: ${l.message.replace(/\s*[\r\n\u2028\u2029]\s*/g, ' ')}`;
}

/** The JSON object of `expand --json`. */
export function toJson(result: AnalysisResult, text: string): Record<string, unknown> {
  const lines = lineTable(text);
  const out: Record<string, unknown> = {
    levels: result.levels.map((l) => {
      const o: Record<string, number | null> = { n: l.n, energy: l.energy, re: l.re, im: l.im, weight: l.weight };
      if (l.uncertainty !== undefined) o.uncertainty = l.uncertainty;
      if (l.coefficientUncertainty !== undefined) o.coefficientUncertainty = l.coefficientUncertainty;
      if (l.unresolved) (o as Record<string, unknown>).unresolved = true;
      return o;
    }),
    norm: result.norm,
    captured: result.captured,
    ...(result.purity !== undefined ? { purity: result.purity } : {}),
    ...(result.mixture ? { mixture: result.mixture } : {}),
    energy: result.energy ?? { mean: null, spread: null },
    parity: result.parity,
  };
  if (result.continuum !== undefined) out.continuum = result.continuum;
  if (result.meanQuantumNumber !== undefined) out.meanQuantumNumber = result.meanQuantumNumber;
  out.diagnostics = result.diagnostics.map((d) => locate(d, lines));
  out.units = result.units;
  out.system = result.system;
  out.decay = result.decay;
  out.levelsFor999 = result.levelsFor999;
  if (result.evolution) {
    const { density: _density, ...rest } = result.evolution;
    out.evolution = rest;
  }
  // A file with `sweep` lines: the sweep's points, located changes and design window (docs/format.md, "Sweeps").
  if (result.sweep) out.sweep = result.sweep;
  return out;
}

/** `expand --json`: one JSON object. */
export function renderJson(result: AnalysisResult, text: string): string {
  return JSON.stringify(toJson(result, text), (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2);
}

/**
 * `expand --csv`: a comment line naming the energy unit (`# energy in meV`; dropped with `bare`), the
 * header `n,energy,re,im,weight` and one row a level.
 */
export function renderCsv(result: AnalysisResult, bare = false): string {
  const unit = energyUnitDescription(result.units);
  const rows = bare ? ['n,energy,re,im,weight'] : [`# energy in ${unit}`, 'n,energy,re,im,weight'];
  // A mixed state has no coefficients: its re and im cells are empty.
  for (const l of result.levels) rows.push([l.n, l.energy, l.re, l.im, l.weight].map((v) => (v === null ? '' : String(v))).join(','));
  return rows.join('\n') + '\n';
}

/** A number in the table, through the one formatter every front end shares. */
const num = formatNumber;

/** `expand --table` and `demo`: a readable summary with the levels table. */
export function renderTable(result: AnalysisResult, text: string, file: string): string {
  const eu = result.units.energy ?? '';
  const quantum = oscillatorQuantum(result.system);
  const lines: string[] = [];
  lines.push(`== ${file}`);
  if (result.system) {
    lines.push(`system: ${result.system.kind}${result.system.boundCount !== undefined ? ` (${result.system.boundCount} bound state${result.system.boundCount === 1 ? '' : 's'})` : ''}`);
  }
  if (result.levels.length > 0) {
    const top = result.levels.filter((l) => l.weight > 1e-12);
    const shown = top.slice(0, 12);
    // An oscillator's energies also in its quantum hbar omega, where they read n + 1/2.
    const inQ = (e: number): string => (quantum === null ? '' : `  ${num(e / quantum, 8).padStart(16)}`);
    lines.push(`  ${'n'.padStart(4)}  ${(energySymbol('E_n', result.units) + (eu ? ` [${eu}]` : '')).padStart(16)}${quantum === null ? '' : `  ${'E_n [hbar omega]'.padStart(16)}`}  ${'Re c_n'.padStart(13)}  ${'Im c_n'.padStart(13)}  ${(result.mixture ? 'P_n' : '|c_n|^2').padStart(13)}`);
    for (const l of shown) {
      lines.push(`  ${String(l.n).padStart(4)}  ${num(l.energy, 8).padStart(16)}${inQ(l.energy)}  ${num(l.re).padStart(13)}  ${num(l.im).padStart(13)}  ${num(l.weight).padStart(13)}`);
    }
    if (top.length > shown.length) lines.push(`  ... ${top.length - shown.length} more levels with weight above 1e-12 (of ${result.levels.length} computed)`);
  }
  if (result.norm !== null && !result.mixture) lines.push(`norm (as written): ${num(result.norm, 10)}`);
  if (result.mixture && result.purity !== undefined) {
    lines.push(`mixed state: ${result.mixture.weights.length} ${result.mixture.kind === 'thermal' ? 'thermal levels' : 'parts'}, purity Tr rho^2 = ${num(result.purity, 10)}`);
  }
  if (result.captured !== null) lines.push(`captured weight: ${num(result.captured, 10)}${result.levelsFor999 !== null ? `   (99.9% within ${result.levelsFor999} levels)` : ''}`);
  if (result.continuum !== undefined) lines.push(`continuum weight: ${num(result.continuum, 6)}`);
  if (result.energy) {
    const q = (e: number): string => (quantum === null ? '' : ` (${quantaText(e, quantum, true)})`);
    lines.push(`energy mean: ${result.energy.mean === null ? 'diverges' : num(result.energy.mean, 10) + (eu ? ' ' + eu : '') + q(result.energy.mean)}   spread: ${result.energy.spread === null ? 'diverges' : num(result.energy.spread, 10) + (eu ? ' ' + eu : '') + q(result.energy.spread)}`);
  }
  if (typeof result.meanQuantumNumber === 'number') lines.push(`mean quantum number <n>: ${num(result.meanQuantumNumber, 8)}`);
  if (result.parity) lines.push(`parity: ${result.parity}`);
  const decay = decayText(result.decay, { mixture: Boolean(result.mixture), kind: result.system?.kind, ascii: true, parity: result.parity });
  if (decay !== null) lines.push(`decay: ${decay}`);
  if (result.evolution) {
    // Times carry the file's time unit; a file with units but no time unit counts time in hbar per its energy unit.
    const timeUnit = result.units.time ? ` ${result.units.time}` : result.units.energy ? ` hbar/${result.units.energy}` : '';
    lines.push(`evolution: ${result.evolution.times.length} times up to ${num(result.evolution.times[result.evolution.times.length - 1], 6)}${timeUnit}; revival ${result.evolution.revival === null ? 'none found' : num(result.evolution.revival, 8) + timeUnit}`);
  }
  lines.push(...diagnosticLines(file, text, result.diagnostics));
  return lines.join('\n') + '\n';
}

/** The table's closing block: `diagnostics: none`, or each finding as a `FILE:LINE:COL:` line, indented. */
export function diagnosticLines(file: string, text: string, diagnostics: AnalysisResult['diagnostics']): string[] {
  if (diagnostics.length === 0) return ['diagnostics: none'];
  const idx = lineTable(text);
  return ['diagnostics:', ...diagnostics.map((d) => '  ' + renderDiagnostic(file, d, idx))];
}
