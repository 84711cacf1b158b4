/**
 * Renderings of a sweep for `eigenspan sweep`: a readable table (one line a point, then the located
 * changes and the design window) and CSV (one row a point). The JSON is `expand --json`'s object,
 * whose `sweep` field holds the sweep (render.ts). Numbers go through the one formatter.
 */
import { energyUnitDescription } from '../shared/energyUnit';
import type { AnalysisResult } from '../analysis/types';
import type { SweepResult } from '../analysis/sweep/index';
import { formatNumber as num } from '../shared/numbers';
import { diagnosticLines } from './render';

/** Populations shown per point in the table (the CSV has every level a point reports). */
const TABLE_LEVELS = 3;

function withUnit(v: number, unit: string | null): string {
  return unit === null ? num(v, 9) : `${num(v, 9)} ${unit}`;
}

/** The lowest `count` level labels any valid point reports (a finite well's count grows along a sweep). */
function labels(s: SweepResult, count: number): number[] {
  const all = new Set<number>();
  for (const p of s.points) if (p?.valid) for (const l of p.levels) all.add(l.n);
  return [...all].sort((a, b) => a - b).slice(0, count);
}

function head(s: SweepResult): string[] {
  const lines = s.axes.map((a) => `sweep of ${a.name}${a.unit ? ` [${a.unit}]` : ''}: ${num(a.from, 9)} to ${num(a.to, 9)} in ${a.steps} steps (${a.spacing === 'log' ? 'logarithmic' : 'linear'})`);
  lines.push(`${s.finished} of ${s.total} points${s.stopped ? ` (stopped: ${s.stopped === 'time' ? 'time limit' : 'cancelled'})` : ''}; ${s.systemFixed ? "the system does not depend on the swept values: its eigenbasis was solved once" : 'the system changes between points'}; ${s.probes} refinement probes`);
  return lines;
}

/** `eigenspan sweep` (the default): the points, the located changes, the design window and the findings. */
export function renderSweepTable(result: AnalysisResult, text: string, file: string): string {
  const s = result.sweep!;
  const eu = result.units.energy ? ` [${result.units.energy}]` : '';
  const ns = labels(s, TABLE_LEVELS);
  const cols = [...s.axes.map((a) => a.name), 'bound', 'captured', `mean${eu}`, `spread${eu}`, ...ns.map((n) => `P(${n})`), ...s.expects.map((x) => `line ${x.line}`)];
  const rows: string[][] = [];
  for (const p of s.points) {
    if (!p) continue;
    const pop = ns.map((n) => {
      const l = p.levels.find((x) => x.n === n);
      return l ? num(l.weight, 6) : '—';
    });
    const verdicts = p.expects.map((ok) => (ok ? 'holds' : 'FAILS'));
    const at = p.at.map((v) => num(v, 9));
    if (!p.valid) rows.push([...at, `invalid: ${p.problem ?? ''}`]);
    else rows.push([...at, p.bound === null ? '—' : String(p.bound), num(p.captured, 8), num(p.mean, 8), num(p.spread, 8), ...pop, ...verdicts]);
  }
  const width = cols.map((c, k) => Math.max(c.length, ...rows.map((r) => (k < r.length && !(r[k]!.startsWith('invalid')) ? r[k]!.length : 0))));
  const fmtRow = (r: string[]): string => '  ' + r.map((c, k) => (c.startsWith('invalid') ? c : c.padStart(width[k] ?? 0))).join('  ');
  const lines = [`== ${file}`, ...head(s), fmtRow(cols), ...rows.map(fmtRow)];
  lines.push(...locatedLines(s), ...windowLines(s));
  lines.push(...diagnosticLines(file, text, result.diagnostics));
  return lines.join('\n') + '\n';
}

/** ` (other = value)`: in a map, the value of the axis held fixed (`other`, default the second). */
function rowText(s: SweepResult, row: number | null, other = 1): string {
  return row === null ? '' : ` (${s.axes[other]!.name} = ${withUnit(row, s.axes[other]!.unit)})`;
}

/** `eigenspan demo`: the sweep in a few lines (its axes, the points finished, the located changes and the design window). */
export function renderSweepSummary(s: SweepResult): string {
  return [...head(s), ...locatedLines(s, SUMMARY_LINES), ...windowLines(s, SUMMARY_LINES)].join('\n') + '\n';
}

/** Located places and windows listed by the demo's summary at most. */
const SUMMARY_LINES = 6;

/** `  ... and N more` when `all` is longer than `max`. */
function more(all: number, max: number): string[] {
  return all > max ? [`  ... and ${all - max} more`] : [];
}

function locatedLines(s: SweepResult, max = Infinity): string[] {
  if (s.located.length === 0) return ['located between points: nothing (no bound level appears and no expect line flips)'];
  const out = ['located between points:'];
  for (const l of s.located.slice(0, max)) {
    const a = s.axes[l.axis]!;
    const where = `${a.name} = ${withUnit(l.at, a.unit)} (between ${num(l.bracket[0], 15)} and ${num(l.bracket[1], 15)})${rowText(s, l.row, 1 - l.axis)}`;
    if (l.kind === 'bound') out.push(`  bound levels ${l.before} -> ${l.after} at ${where}`);
    else {
      const x = s.expects[l.expect!]!;
      out.push(`  line ${x.line} (${x.text}) ${l.after === 1 ? 'starts' : 'stops'} holding at ${where}`);
    }
  }
  return [...out, ...more(s.located.length, max)];
}

function windowLines(s: SweepResult, max = Infinity): string[] {
  if (s.expects.length === 0) return ['design window: no expect lines to judge'];
  const part = s.stopped === null ? '' : ', over the points that finished';
  if (s.windows.length === 0) return [`design window: empty (no swept value satisfies every expect line${part})`];
  const a = s.axes[0]!;
  return [
    `design window (every expect line holds${part}):`,
    ...s.windows.slice(0, max).map((w) => `  ${a.name} from ${withUnit(w.from, a.unit)}${w.fromEdge ? " (the sweep's end)" : ''} to ${withUnit(w.to, a.unit)}${w.toEdge ? " (the sweep's end)" : ''}${rowText(s, w.row)}`),
    ...more(s.windows.length, max),
  ];
}

/**
 * `eigenspan sweep --csv`: a comment line naming the units (dropped with `bare`), a header, and one row
 * a point: the swept values (a name equal to another column's as `let:NAME`), `valid`, `bound`, `captured`, `continuum`, `mean`, `spread`, then `P<n>` and
 * `E<n>` for each level the points report, then `expect<line>` as 1 (holds) or 0; empty cells for
 * numbers a point has not. Points the budget did not reach are left out.
 */
export function renderSweepCsv(result: AnalysisResult, bare = false): string {
  const s = result.sweep!;
  const ns = labels(s, 10);
  const fixed = ['valid', 'bound', 'captured', 'continuum', 'mean', 'spread', ...ns.map((n) => `P${n}`), ...ns.map((n) => `E${n}`), ...s.expects.map((x) => `expect${x.line}`)];
  // A swept name that equals another column's name is written let:NAME, so every header is unique.
  const header = [...s.axes.map((a) => (fixed.includes(a.name) ? `let:${a.name}` : a.name)), ...fixed];
  const units = [...s.axes.map((a) => `${a.name} in ${a.unit ?? 'natural units'}`), `energy in ${energyUnitDescription(result.units)}`].join('; ');
  const rows = bare ? [header.join(',')] : [`# ${units}`, header.join(',')];
  const cell = (v: number | null | undefined): string => (v === null || v === undefined || !Number.isFinite(v) ? '' : String(v));
  for (const p of s.points) {
    if (!p) continue;
    const by = new Map(p.levels.map((l) => [l.n, l]));
    rows.push(
      [
        ...p.at.map(cell),
        p.valid ? '1' : '0',
        cell(p.bound),
        cell(p.captured),
        cell(p.continuum),
        cell(p.mean),
        cell(p.spread),
        ...ns.map((n) => cell(by.get(n)?.weight)),
        ...ns.map((n) => cell(by.get(n)?.energy)),
        ...p.expects.map((ok) => (ok ? '1' : '0')),
      ].join(','),
    );
  }
  return rows.join('\n') + '\n';
}
