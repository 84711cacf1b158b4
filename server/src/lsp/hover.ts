/**
 * Hover: what the analysis knows about the statement under the cursor, as Markdown.
 */
import type { Hover, MarkupContent } from 'vscode-languageserver';
import type { AnalysisResult, LevelResult } from '../analysis/types';
import type { Comparison, Statement } from '../language/ast';
import type { DocView } from './view';
import { letNameAt, statementAt, letDefinitions } from './syntax';
import { rangeOf } from './positions';
import { fmt, fmtComplex, fmtPhase, withUnit } from './format';
import { FUNCTIONS, KEYWORDS } from './vocabulary';
import { oscillatorQuantum, quantaText } from '../shared/quanta';
import { H_SI, UNITS } from '../expr/constants';

/** How many levels the state hover lists, and how many energies the system hover lists. */
const TOP_LEVELS = 6;
const SYSTEM_LEVELS = 8;

function md(lines: string[]): MarkupContent {
  return { kind: 'markdown', value: lines.join('\n') };
}

/** Why there is no full result to show. */
function missing(view: DocView): string {
  return view.evaluate ? '_The analysis of this version is not ready yet._' : '_Evaluation is off in this workspace (untrusted); only syntax, name and unit checks run._';
}

/** The level table: largest weights first, at most `TOP_LEVELS` rows. */
function levelTable(result: AnalysisResult): string[] {
  const unit = result.units.energy;
  const top = [...result.levels].sort((a, b) => b.weight - a.weight || a.n - b.n).slice(0, TOP_LEVELS);
  if (top.length === 0) return [];
  const rows = top.map((l: LevelResult) => `| ${l.n} | ${fmt(l.energy)} | ${fmt(l.weight)} | ${l.re === null || l.im === null ? '—' : fmtPhase(l.re, l.im)} |`);
  // A mixed state has populations P_n and no coefficients, so no phases.
  const mixed = top.some((l) => l.re === null);
  return ['', `| n | E_n${unit ? ` (${unit})` : ''} | ${mixed ? 'P_n' : '\\|c_n\\|²'} | phase |`, '|---:|---:|---:|---:|', ...rows];
}

function stateHover(view: DocView): string[] {
  const r = view.result;
  if (!r) return ['**state**', '', missing(view)];
  const e = withUnit(r.units.energy);
  const lines = ['**state**', ''];
  if (r.mixture) {
    // A mixed state has populations P_n and no wave function: its purity instead of a norm.
    const parts = r.mixture.weights.length;
    lines.push(`mixed state of ${parts} ${r.mixture.kind === 'thermal' ? 'thermal level' : 'part'}${parts === 1 ? '' : 's'}, purity Tr ρ² = ${fmt(r.purity)}  `);
    lines.push(`captured Σ P_n = ${fmt(r.captured)} over ${r.levels.length} levels  `);
  } else {
    lines.push(`norm ∫|ψ|² dx = ${fmt(r.norm)}  `);
    lines.push(`captured Σ|c_n|² = ${fmt(r.captured)} over ${r.levels.length} levels  `);
  }
  if (r.energy) {
    // The spread is a property of the state (ΔE = sqrt(<H^2> - <H>^2)), not an error bar: its own line.
    // An oscillator's energies also in its quantum ħω (display only).
    const q = oscillatorQuantum(r.system);
    const inQ = (v: number): string => (q === null ? '' : ` = ${quantaText(v, q)}`);
    lines.push(`energy mean ⟨E⟩ = ${r.energy.mean === null ? 'diverges' : fmt(r.energy.mean) + e + inQ(r.energy.mean)}  `);
    lines.push(`energy spread ΔE = ${r.energy.spread === null ? (r.energy.mean === null ? 'diverges' : 'infinite or not defined') : fmt(r.energy.spread, 4) + e + inQ(r.energy.spread)}  `);
  }
  if (typeof r.meanQuantumNumber === 'number') lines.push(`mean quantum number ⟨n⟩ = ${fmt(r.meanQuantumNumber)}  `);
  if (r.parity) lines.push(`parity ${r.parity}  `);
  if (r.continuum !== undefined) lines.push(`continuum weight ${fmt(r.continuum)}  `);
  if (r.levelsFor999 !== null) lines.push(`99.9% reached with ${r.levelsFor999} level${r.levelsFor999 === 1 ? "" : "s"}  `);
  return [...lines, ...levelTable(r)];
}

function systemHover(view: DocView): string[] {
  const r = view.result;
  if (!r || !r.system) return ['**system**', '', missing(view)];
  const s = r.system;
  const e = withUnit(r.units.energy);
  const first = s.firstLabel;
  const lines = [`**system** ${s.kind}`, ''];
  if (s.boundCount !== undefined) lines.push(`${s.boundCount} bound state${s.boundCount === 1 ? '' : 's'}  `);
  if (s.center !== null) lines.push(`centre ${fmt(s.center)}${withUnit(r.units.length)}  `);
  lines.push(...massLines(s.mass, r.units.length));
  const shown = s.energies.slice(0, SYSTEM_LEVELS);
  const q = oscillatorQuantum(s);
  if (q !== null) lines.push(`quantum ħω = ${fmt(q)}${e}  `);
  if (shown.length > 0) {
    lines.push('', `| n | E_n${e ? ` (${e.trim()})` : ''} |${q !== null ? ' E_n (ħω) |' : ''}${s.uncertainties ? ' ± |' : ''}`, `|---:|---:|${q !== null ? '---:|' : ''}${s.uncertainties ? '---:|' : ''}`);
    shown.forEach((en, k) => {
      const u = s.uncertainties ? ` ${fmt(s.uncertainties[k], 2)} |` : '';
      lines.push(`| ${first + k} | ${fmt(en)} |${q !== null ? ` ${fmt(en / q)} |` : ''}${u}`);
    });
  }
  return lines;
}

/** Which mass holds where, one line per region between the mass's interfaces. */
function massLines(mass: NonNullable<AnalysisResult['system']>['mass'], lengthUnit: string | null): string[] {
  if (!mass) return [];
  const u = withUnit(lengthUnit);
  const mu = withUnit(mass.unit);
  return mass.regions.map((g) => {
    const where = g.from === null && g.to === null ? 'everywhere' : g.from === null ? `x < ${fmt(g.to!)}${u}` : g.to === null ? `x > ${fmt(g.from)}${u}` : `${fmt(g.from)} < x < ${fmt(g.to)}${u}`;
    const value = g.min === g.max || Math.abs(g.max - g.min) <= 1e-12 * g.max ? fmt(g.min) : `${fmt(g.min)} to ${fmt(g.max)}`;
    return `mass ${value}${mu} for ${where}  `;
  });
}

function comparisonText(c: Comparison): string {
  if (c.kind === 'tolerance') return `${c.value.text.trim()} ± ${c.tolerance.text.trim()}`;
  return `${c.kind === 'atLeast' ? '≥' : '≤'} ${c.value.text.trim()}`;
}

/** The integer written in a level bound (`expect weight 1..20`), or null. */
function levelNumber(text: string): number | null {
  const v = Number(text.trim());
  return Number.isInteger(v) ? v : null;
}

function expectHover(view: DocView, s: Extract<Statement, { kind: 'expect' }>): string[] {
  const x = s.expectation;
  const r = view.result;
  const lines = [`**expect** ${x.kind}`, ''];
  const expected = x.kind === 'parity' ? x.value : x.kind === 'window' ? `${x.from.text.trim()}..${x.to.text.trim()}` : comparisonText(x.comparison);
  let measured = '—';
  if (r) {
    const e = withUnit(r.units.energy);
    if (x.kind === 'norm') measured = fmt(r.norm, 12);
    else if (x.kind === 'parity') measured = r.parity ?? 'undefined (no centre of symmetry)';
    else if (x.kind === 'energy' || x.kind === 'spread') {
      const v = r.energy ? (x.kind === 'energy' ? r.energy.mean : r.energy.spread) : null;
      const q = oscillatorQuantum(r.system);
      measured = v === null ? 'diverges' : fmt(v, 12) + e + (q === null ? '' : ` = ${quantaText(v, q)}`);
    }
    else if (x.kind === 'level') {
      const n = levelNumber(x.level.text);
      const l = r.levels.find((lv) => lv.n === n) ?? null;
      if (l) measured = fmt(l.energy, 12) + e;
    } else if (x.kind === 'continuum') {
      if (r.continuum !== undefined) measured = fmt(r.continuum, 12);
    } else if (x.kind === 'revival' || x.kind === 'mean') {
      // Measured where the line is checked, and kept on the result for this hover.
      const m = r.measured?.find((v) => v.start === s.span.start);
      if (m) measured = m.value === null ? (x.kind === 'revival' ? 'no revival found' : 'not available') : fmt(m.value, 12) + withUnit(m.unit);
    } else {
      const from = levelNumber(x.from.text);
      const to = x.to ? levelNumber(x.to.text) : from;
      if (from !== null && to !== null) {
        let sum = 0;
        for (const l of r.levels) if (l.n >= from && l.n <= to) sum += l.weight;
        measured = fmt(sum, 12);
      }
    }
  }
  lines.push(`expected ${expected}  `);
  if (!r) return [...lines, '', missing(view)];
  lines.push(`measured ${measured}  `);
  const failed = view.diagnostics.some((d) => d.code === 'expect' && d.start < s.span.end && d.end >= s.span.start);
  lines.push(failed ? '✗ does not hold' : '✓ holds');
  return lines;
}

function letHover(view: DocView, name: string): string[] {
  const def = letDefinitions(view.file).get(name);
  const lines = [`**let** \`${name}\``];
  if (def) lines.push('', '```', `${name} = ${def.expr.text.trim()}`, '```');
  const v = view.result?.values?.find((x) => x.name === name);
  if (v) lines.push('', `= ${fmtComplex(v.re, v.im, 8)}${withUnit(v.unit)}`);
  else if (!view.result) lines.push('', missing(view));
  return lines;
}

/** The `units` line: what each name is, and what a frequency standing for an energy means. */
function unitsHover(view: DocView, s: Extract<Statement, { kind: 'units' }>): string[] {
  const lines = ['**units**', ''];
  for (const u of s.units) {
    const info = UNITS.get(u.name);
    if (!info) continue;
    if (info.kind === 'frequency') lines.push(`\`${u.name}\`: energies as the frequency E/h (${info.doc}; h = ${H_SI} J s, exact)  `);
    else lines.push(`\`${u.name}\`: ${info.kind === 'energy' && u.name === 'invcm' ? 'energies as the wavenumber E/(h c)' : info.kind} (${info.doc})  `);
  }
  const t = view.result?.units.time;
  if (t && !s.units.some((u) => u.name === t)) lines.push(`times in \`${t}\`, one over the frequency unit  `);
  return lines;
}

/** The built-in function called at `offset` (the name under the cursor, followed by '('), or null. */
function functionAt(text: string, offset: number): { doc: string; start: number; end: number } | null {
  const word = /[A-Za-z0-9_]/;
  let start = offset;
  while (start > 0 && word.test(text.charAt(start - 1))) start--;
  let end = offset;
  while (end < text.length && word.test(text.charAt(end))) end++;
  if (start === end || !/^[ \t]*\(/.test(text.slice(end, end + 80))) return null;
  const name = text.slice(start, end);
  const f = FUNCTIONS.find((g) => g.name === name);
  return f ? { doc: f.doc, start, end } : null;
}

/** The hover at `offset`, or null when there is nothing to say. */
export function hoverAt(view: DocView, offset: number): Hover | null {
  const name = letNameAt(view.file, offset);
  if (name) return { contents: md(letHover(view, name.name)), range: rangeOf(view.lines, name.span.start, name.span.end) };
  const s = statementAt(view.file, offset);
  if (!s) return null;
  const fn = functionAt(view.text, offset);
  if (fn) return { contents: md([fn.doc]), range: rangeOf(view.lines, fn.start, fn.end) };
  let lines: string[] | null = null;
  if (s.kind === 'state') lines = stateHover(view);
  else if (s.kind === 'system') lines = systemHover(view);
  else if (s.kind === 'expect') lines = expectHover(view, s);
  else if (s.kind === 'units') lines = unitsHover(view, s);
  else if (offset >= s.keywordSpan.start && offset <= s.keywordSpan.end) {
    const k = KEYWORDS.find((w) => w.name === s.kind);
    if (k) lines = [`**${k.name}**`, '', k.doc];
  }
  if (!lines) return null;
  return { contents: md(lines), range: rangeOf(view.lines, s.span.start, s.span.end) };
}
