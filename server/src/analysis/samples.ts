/**
 * Sampled states: the table of a data file named by `state samples("PATH")` (docs/format.md,
 * "Sampled states"), read from the text a front end handed in (`AnalyseOptions.data`; the engine reads
 * no file), checked row by row, and converted to internal units.
 *
 * The table: `#` starts a comment (whole lines or the end of a row), blank lines are skipped; the first
 * other line may be a header naming the columns, `x` first, then `re` and optionally `im`, or `abs` and
 * optionally `phase`; `x [nm]` gives x its unit (else the `.qstate` file's length unit), `phase [deg]`
 * the phase's (else radians). Without a header, two columns are x, re and three are x, re, im. Cells are
 * separated by commas when the header (or the first row) has one, else by white space; the columns
 * re_expansion and im_expansion of `expand --samples` are passed over. The values of
 * psi are in (x's length unit)^(-1/2).
 */
import type { QFile, Span, StateSpec } from '../language/ast';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { UnitSystem } from '../expr/types';
import { internalUnitSI, lookupPhysical, sameDimension } from '../expr/units';
import { parse } from '../language/parser';
import type { DataFile } from './options';
import { fmt, plural } from './findings';
import { raiseHint } from '../shared/limits';

/** Most bytes of a data file a front end reads (a larger one is refused before it is parsed). */
export const DATA_MAX_BYTES = 8 * 1024 * 1024;

/**
 * Grid nodes the projection spends per sample: every interval between samples is a panel of the
 * 20-point rule (the spline is a cubic there), so the rows are capped at maxGridPoints / 20 - 1.
 */
export const NODES_PER_SAMPLE = 20;

/** Fewest samples: the not-a-knot spline needs four. */
export const MIN_SAMPLES = 4;

/** Bad rows named one by one in the finding before the rest are only counted. */
const NAMED_PROBLEMS = 3;

/** A checked table in internal units (x strictly increasing). */
export interface SampleTable {
  x: Float64Array;
  re: Float64Array;
  im: Float64Array;
  /** The 1-based line of each row in the data file. */
  lines: Int32Array;
}

/** The samples state's model: the table and where the path is written. */
export interface SamplesModel {
  kind: 'samples';
  path: string;
  pathSpan: Span;
  table: SampleTable;
}

/** Every data path the file names, with its range (for the front ends to read, and the editor to watch). */
export function dataPaths(file: QFile): { path: string; span: Span }[] {
  const out: { path: string; span: Span }[] = [];
  for (const s of file.statements) if (s.kind === 'state' && s.state.kind === 'samples') out.push({ path: s.state.path, span: s.state.pathSpan });
  return out;
}

/** `dataPaths` of a text (parsed here; cheap). */
export function dataPathsOf(text: string): { path: string; span: Span }[] {
  return dataPaths(parse(text).file);
}

/**
 * The model of `samples("PATH")`: the data file from `data`, its table checked and in internal units.
 * Findings (code `data`, on the path) go to `out`; null when there is no usable table.
 */
export function samplesModel(spec: Extract<StateSpec, { kind: 'samples' }>, data: ReadonlyMap<string, DataFile>, units: UnitSystem, maxRows: number, out: EngineDiagnostic[]): SamplesModel | null {
  const at = spec.pathSpan;
  const err = (message: string): null => {
    out.push(diagnostic('data', at.start, at.end, message));
    return null;
  };
  const file = data.get(spec.path);
  if (file === undefined) return err(`The data file "${spec.path}" was not read: this front end reads no data files.`);
  if ('refused' in file) return err(`The data file "${spec.path}" is not read: ${file.refused}.`);
  if (file.text.length > DATA_MAX_BYTES) return err(`The data file "${spec.path}" is longer than ${DATA_MAX_BYTES} bytes; it is not read.`);
  if (file.text.includes('\u0000')) return err(`The data file "${spec.path}" is binary (it contains NUL bytes), not a table of numbers.`);
  const read = readTable(file.text, maxRows);
  if ('problem' in read) return err(`"${spec.path}" ${read.problem}`);
  const scaled = toInternal(read, units);
  if (typeof scaled === 'string') return err(`"${spec.path}" ${scaled}`);
  return { kind: 'samples', path: spec.path, pathSpan: at, table: scaled };
}

/** The columns a header names. */
interface Columns {
  kind: 're' | 'abs';
  /** Cells per row. */
  count: number;
  /** Index of each named column in a row. */
  x: number;
  a: number;
  b: number | null;
  xUnit: string | null;
  /** Multiplies the phase column into radians. */
  phaseScale: number;
  comma: boolean;
  /** 1-based line of the header, or 0 without one. */
  line: number;
}

/** A table as written: x, the two value columns, and the header's facts. */
interface RawTable {
  columns: Columns;
  x: number[];
  a: number[];
  b: number[];
  lines: number[];
}

/** One line of the data file without its comment, or null for a blank or comment line. */
function content(line: string): string | null {
  const hash = line.indexOf('#');
  const t = (hash < 0 ? line : line.slice(0, hash)).trim();
  return t === '' ? null : t;
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Reads the rows; a problem sentence (naming lines) when the table is not usable. */
export function readTable(text: string, maxRows: number): RawTable | { problem: string } {
  // A byte order mark at the start is not part of the first line.
  const lines = (text.charCodeAt(0) === 0xfeff ? text.slice(1) : text).split(/\r\n|\n|\r/);
  let columns: Columns | null = null;
  const raw: RawTable = { columns: null as unknown as Columns, x: [], a: [], b: [], lines: [] };
  const problems: string[] = [];
  for (let li = 0; li < lines.length; li++) {
    const c = content(lines[li]!);
    if (c === null) continue;
    if (columns === null) {
      const h = /^[A-Za-z|]/.test(c) ? header(c, li + 1) : defaultColumns(c);
      if (typeof h === 'string') return { problem: `line ${li + 1}: ${h}` };
      columns = h;
      raw.columns = h;
      if (h.line > 0) continue;
    }
    if (raw.x.length >= maxRows) return { problem: `has more than ${maxRows} rows (line ${li + 1}), the most that fit the grid cap (20 nodes a row); it is not read.${raiseHint('maxGridPoints')}` };
    const cells = columns.comma ? c.split(',').map((s) => s.trim()) : c.split(/\s+/);
    const bad = rowProblem(cells, columns);
    if (bad !== null) {
      problems.push(`line ${li + 1}: ${bad}`);
      continue;
    }
    raw.x.push(Number(cells[columns.x]));
    raw.a.push(Number(cells[columns.a]));
    raw.b.push(columns.b === null ? 0 : Number(cells[columns.b]));
    raw.lines.push(li + 1);
  }
  if (problems.length > 0) {
    const more = problems.length > NAMED_PROBLEMS ? `; and ${plural(problems.length - NAMED_PROBLEMS, 'more bad row')}` : '';
    return { problem: `has ${plural(problems.length, 'bad row')}: ${problems.slice(0, NAMED_PROBLEMS).join('; ')}${more}.` };
  }
  if (columns === null || raw.x.length < MIN_SAMPLES) return { problem: `has ${plural(raw.x.length, 'row')} of samples; at least ${MIN_SAMPLES} are needed.` };
  for (let k = 1; k < raw.x.length; k++) {
    const [p, q] = [raw.x[k - 1]!, raw.x[k]!];
    if (q === p) return { problem: `line ${raw.lines[k]}: x = ${fmt(q)} repeats the x of line ${raw.lines[k - 1]}; each x must appear once.` };
    if (q < p) return { problem: `line ${raw.lines[k]}: x = ${fmt(q)} is below the x = ${fmt(p)} of line ${raw.lines[k - 1]}; the rows must be sorted by increasing x.` };
  }
  return raw;
}

/** Why a row cannot be read, or null. */
function rowProblem(cells: string[], columns: Columns): string | null {
  if (cells.length !== columns.count) return `${plural(cells.length, 'cell')} where the ${columns.line > 0 ? 'header names' : 'first row has'} ${columns.count}`;
  for (let k = 0; k < cells.length; k++) {
    const s = cells[k]!;
    if (s === '') return `cell ${k + 1} is blank`;
    if (!NUMBER.test(s)) return /^[+-]?(nan|inf|infinity)$/i.test(s) ? `cell ${k + 1} is '${s}', not a finite number` : `cell ${k + 1} ('${s.slice(0, 20)}') is not a number`;
    if (!Number.isFinite(Number(s))) return `cell ${k + 1} overflows double precision`;
  }
  return null;
}

/** The columns of a table without a header: x, re or x, re, im. */
function defaultColumns(first: string): Columns | string {
  const comma = first.includes(',');
  const count = (comma ? first.split(',') : first.split(/\s+/)).length;
  if (count !== 2 && count !== 3) return `the first row has ${plural(count, 'cell')}; without a header the columns are x, re (and im).`;
  return { kind: 're', count, x: 0, a: 1, b: count === 3 ? 2 : null, xUnit: null, phaseScale: 1, comma, line: 0 };
}

/** Reads a header such as `x [nm], re, im` or `x abs phase [deg]`. */
function header(line: string, lineNo: number): Columns | string {
  const comma = line.includes(',');
  const names: { name: string; unit: string | null }[] = [];
  const re = /([A-Za-z|][A-Za-z_|]*)\s*(?:\[\s*([^\]]*?)\s*\])?/y;
  let p = 0;
  while (p < line.length) {
    while (p < line.length && /[\s,]/.test(line[p]!)) p++;
    if (p >= line.length) break;
    re.lastIndex = p;
    const m = re.exec(line);
    if (m === null) return `the header has '${line.slice(p, p + 12)}' where a column name is expected (x, re, im, abs, phase).`;
    names.push({ name: m[1]!.toLowerCase(), unit: m[2] ?? null });
    p = re.lastIndex;
  }
  const list = names.map((n) => n.name).join(', ');
  const index = (n: string): number => names.findIndex((c) => c.name === n);
  if (names[0]?.name !== 'x') return `the header's first column must be x (it names ${list}).`;
  // The export's expansion columns (cli/export.ts) are read past, so its file can be read back.
  const known = new Set(['x', 're', 'im', 'abs', 'phase', 're_expansion', 'im_expansion']);
  const unknown = names.find((n) => !known.has(n.name));
  if (unknown) return `the header names a column '${unknown.name}'; the columns are x, re, im, abs and phase.`;
  if (new Set(names.map((n) => n.name)).size !== names.length) return `the header names a column twice (${list}).`;
  const kind = index('re') >= 0 ? 're' : index('abs') >= 0 ? 'abs' : null;
  if (kind === null || (kind === 're' && (index('abs') >= 0 || index('phase') >= 0)) || (kind === 'abs' && index('im') >= 0)) {
    return `the header names ${list}; the values are re (and im) or abs (and phase).`;
  }
  const other = kind === 're' ? index('im') : index('phase');
  const unitOf = (i: number): string | null => (i < 0 ? null : names[i]!.unit);
  const stray = names.find((n) => n.unit !== null && n.name !== 'x' && n.name !== 'phase');
  if (stray) return `the column ${stray.name} takes no unit (psi is in the length unit of x to the power -1/2).`;
  let phaseScale = 1;
  const pu = kind === 'abs' ? unitOf(other) : null;
  if (pu !== null && pu !== 'rad') {
    if (pu !== 'deg') return `the phase's unit must be rad or deg, not '${pu}'.`;
    phaseScale = Math.PI / 180;
  }
  return { kind, count: names.length, x: 0, a: index(kind), b: other < 0 ? null : other, xUnit: unitOf(0), phaseScale, comma, line: lineNo };
}

/** The table in internal units: x scaled by its unit, psi by that unit to the power -1/2, abs and phase made re and im. */
function toInternal(raw: RawTable, units: UnitSystem): SampleTable | string {
  const cols = raw.columns;
  let scale = 1;
  if (cols.xUnit !== null) {
    const u = lookupPhysical(cols.xUnit);
    if (units.mode === 'natural') return `gives x the unit ${cols.xUnit}, but this file has no units line (natural units); remove the unit or add a units line.`;
    if (u === null || !sameDimension(u.dimension, [1, 0, 0, 0])) return `gives x the unit '${cols.xUnit}', which is not a unit of length.`;
    scale = u.si / internalUnitSI([1, 0, 0, 0], units);
  }
  const n = raw.x.length;
  const t: SampleTable = { x: new Float64Array(n), re: new Float64Array(n), im: new Float64Array(n), lines: Int32Array.from(raw.lines) };
  const amp = 1 / Math.sqrt(scale);
  for (let k = 0; k < n; k++) {
    t.x[k] = raw.x[k]! * scale;
    const a = raw.a[k]!;
    const b = raw.b[k]!;
    if (cols.kind === 're') {
      t.re[k] = a * amp;
      t.im[k] = b * amp;
    } else {
      t.re[k] = a * Math.cos(b * cols.phaseScale) * amp;
      t.im[k] = a * Math.sin(b * cols.phaseScale) * amp;
    }
  }
  return t;
}
