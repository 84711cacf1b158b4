/**
 * Report of the side-by-side benchmark (bench/anchor-main.ts): one row per job with each side's
 * median, interquartile range and accuracy, and the ratio engine / python (above 1: the engine is
 * slower). Also the check of a whole-process result against the example's own `expect` lines.
 */
import type { Timing } from './stats';

/** One side of a row. */
export interface Side {
  method: string;
  timing: Timing;
  /** Accuracy reached (kernel rows: against the closed form or reference; process rows: max |w_engine - w_python|). */
  accuracy: number;
  note: string;
}

/** One row measured on both sides in one interleaved run. */
export interface SideBySide {
  id: string;
  job: string;
  engine: Side;
  python: Side;
}

function ms(t: number): string {
  if (!Number.isFinite(t)) return '-';
  return t >= 100 ? t.toFixed(0) : t >= 1 ? t.toFixed(1) : t.toFixed(3);
}

function sci(v: number): string {
  return !Number.isFinite(v) ? '-' : v === 0 ? '0' : v.toExponential(1);
}

/** engine median / python median. */
export function ratio(row: SideBySide): number {
  return row.engine.timing.median / row.python.timing.median;
}

/** The rows as a Markdown table under the header lines, then each row's methods and notes. */
export function formatAnchorTable(header: string[], rows: SideBySide[]): string {
  const out = [...header, '', 'Times in ms, median [q1-q3] over the interleaved reps; ratio = engine median / python median (> 1: the engine is slower).', ''];
  out.push('| job | engine | engine accuracy | numpy/scipy | python accuracy | ratio |');
  out.push('|---|---|---|---|---|---|');
  for (const r of rows) {
    const e = r.engine.timing;
    const p = r.python.timing;
    out.push(
      `| ${r.job} | ${ms(e.median)} [${ms(e.q1)}-${ms(e.q3)}] (${e.runs}) | ${sci(r.engine.accuracy)} | ${ms(p.median)} [${ms(p.q1)}-${ms(p.q3)}] (${p.runs}) | ${sci(r.python.accuracy)} | ${ratio(r).toFixed(2)}x |`,
    );
  }
  out.push('');
  for (const r of rows) {
    out.push(`${r.id}: engine ${r.engine.method}${r.engine.note ? ` (${r.engine.note})` : ''}; python ${r.python.method}${r.python.note ? ` (${r.python.note})` : ''}`);
  }
  return out.join('\n');
}

interface ResultJson {
  levels?: { n: number; weight: number }[];
  norm?: number | null;
  energy?: { mean: number | null; spread: number | null } | null;
}

const NUM = String.raw`[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?`;

/**
 * How many of the file's numeric `expect` lines (weight, norm, energy, spread; FORMAT.md) a result
 * meets. Units are ignored: the examples state each expected value in the file's own unit, which is
 * the unit both sides report in. Parity lines are not counted.
 */
export function checkExpects(text: string, json: ResultJson): { checked: number; met: number } {
  let checked = 0;
  let met = 0;
  const weights = new Map((json.levels ?? []).map((l) => [l.n, l.weight]));
  const within = (v: number | null | undefined, rest: string): boolean | null => {
    if (v === null || v === undefined) return false;
    const cmp = new RegExp(`^(>=|<=)\\s*(${NUM})`).exec(rest);
    if (cmp) return cmp[1] === '>=' ? v >= Number(cmp[2]) : v <= Number(cmp[2]);
    const tol = new RegExp(`^(${NUM})[^+±]*(?:\\+-|±)\\s*(${NUM})`).exec(rest);
    if (tol) return Math.abs(v - Number(tol[1])) <= Number(tol[2]);
    return null;
  };
  for (const raw of text.split('\n')) {
    const line = raw.replace(/#.*/, '').trim();
    const m = /^expect\s+(weight|norm|energy|spread)\s+(.*)$/.exec(line);
    if (!m) continue;
    let value: number | null | undefined;
    let rest = m[2]!;
    if (m[1] === 'weight') {
      const r = /^(\d+)(?:\s*\.\.\s*(\d+))?\s*(.*)$/.exec(rest);
      if (!r) continue;
      const lo = Number(r[1]);
      const hi = r[2] ? Number(r[2]) : lo;
      value = 0;
      for (let n = lo; n <= hi; n++) value += weights.get(n) ?? 0;
      rest = r[3]!;
    } else if (m[1] === 'norm') value = json.norm;
    else value = m[1] === 'energy' ? json.energy?.mean : json.energy?.spread;
    const ok = within(value, rest.trim());
    if (ok === null) continue;
    checked++;
    if (ok) met++;
  }
  return { checked, met };
}

interface Located {
  kind: string;
  axis: number;
  at: number;
  before: number;
  after: number;
  row: number | null;
}

/**
 * How far apart the two sides' sweeps put the places they located (`sweep.located` of `expand --json`):
 * each engine place is matched with the other side's of the same kind, axis, counts and row (rows equal
 * to 1e-12 relative), and the worst relative distance of `at` is returned with the number of places
 * that had no match on either side. Null when neither result has a sweep.
 */
export function locatedDifference(a: Record<string, unknown>, b: Record<string, unknown>): { worst: number; unmatched: number; count: number } | null {
  const la = ((a.sweep as { located?: Located[] } | undefined)?.located ?? []) as Located[];
  const lb = ((b.sweep as { located?: Located[] } | undefined)?.located ?? []) as Located[];
  if (!a.sweep && !b.sweep) return null;
  const same = (x: number | null, y: number | null) => (x === null || y === null ? x === y : Math.abs(x - y) <= 1e-12 * Math.abs(x));
  let worst = 0;
  let matched = 0;
  for (const p of la) {
    const q = lb.filter((l) => l.kind === p.kind && l.axis === p.axis && l.before === p.before && l.after === p.after && same(p.row, l.row));
    if (q.length === 0) continue;
    matched++;
    worst = Math.max(worst, Math.min(...q.map((l) => Math.abs(l.at - p.at) / Math.abs(p.at))));
  }
  return { worst, unmatched: la.length - matched + Math.max(0, lb.length - matched), count: la.length };
}
