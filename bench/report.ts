/** The plain-text report of the benchmark suite (`formatReport`), printed by bench/main.ts. */
import type { SuiteResult } from './suite';

function ms(t: number | null | undefined): string {
  if (t === null || t === undefined || !Number.isFinite(t)) return '-';
  return t >= 100 ? t.toFixed(0) : t >= 1 ? t.toFixed(2) : t.toFixed(3);
}

function sci(v: number | null): string {
  return v === null || !Number.isFinite(v) ? '-' : v === 0 ? '0' : v.toExponential(1);
}

/** The suite's result as a plain-text report: one table of rows, then the scaling tables and notes. */
export function formatReport(r: SuiteResult): string {
  const out: string[] = [];
  out.push(`Eigenspan benchmarks, ${r.meta.date}, node ${r.meta.node}, ${r.meta.cpus} x ${r.meta.cpuModel}${r.meta.tiny ? ' (tiny sizes)' : ''}`);
  out.push('Times in ms: median [q1 - q3] over the runs; ratio = baseline median / median; warm = re-analysis with the system unchanged.');
  out.push('');
  const head = ['#', 'job', 'method', 'median', 'IQR', 'warm', 'accuracy', 'baseline', 'base acc.', 'ratio', 'target'];
  const table = [head];
  for (const row of r.rows) {
    table.push([
      String(row.item),
      row.job.length > 60 ? `${row.job.slice(0, 57)}...` : row.job,
      row.method.length > 40 ? `${row.method.slice(0, 37)}...` : row.method,
      ms(row.timing?.median),
      row.timing ? `${ms(row.timing.q1)}-${ms(row.timing.q3)}` : '-',
      row.warm ? ms(row.warm.median) : '-',
      sci(row.accuracy.value),
      row.baseline ? ms(row.baseline.timing?.median) : '-',
      row.baseline ? sci(row.baseline.accuracy) : '-',
      row.ratio === null ? '-' : `${row.ratio.toFixed(1)}x`,
      row.target ? `${row.target.met === null ? '?' : row.target.met ? 'met' : 'MISSED'}: ${row.target.text}` : '',
    ]);
  }
  const widths = head.map((_, c) => Math.max(...table.map((t) => t[c]!.length)));
  for (const t of table) out.push(t.map((cell, c) => cell.padEnd(widths[c]!)).join('  ').trimEnd());
  out.push('');
  for (const row of r.rows) {
    const lines = [...(row.baseline?.note ? [row.baseline.note] : []), ...row.notes];
    if (lines.length === 0) continue;
    out.push(`[${row.item}] ${row.job} (${row.size})`);
    for (const l of lines) out.push(`    ${l}`);
  }
  out.push('');
  for (const s of r.scaling) {
    out.push(`Scaling [${s.item}] ${s.what}: t ~ ${s.sizeName}^${s.exponent.toFixed(2)}`);
    out.push(`    ${s.sizeName.padEnd(10)} ${s.sizes.map((v) => String(v).padStart(8)).join('')}`);
    out.push(`    ${'ms'.padEnd(10)} ${s.times.map((v) => ms(v).padStart(8)).join('')}`);
    for (const [k, v] of Object.entries(s.extra)) out.push(`    ${k}: ${v.map((x) => (Number.isInteger(x) ? String(x) : x.toFixed(2))).join(', ')}`);
  }
  return out.join('\n');
}
