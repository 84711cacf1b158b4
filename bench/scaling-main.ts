/**
 * Entry of the scaling table (bundled and run by scripts/bench-scaling.mjs): prints the table as
 * Markdown on stdout, progress on stderr. Arguments: --quick (four small sizes a series, three runs a
 * point: the re-run after engine changes), --reps N, --only id,id, --json OUT.
 */
import { writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { formatScaling, runScaling } from './scaling';

const argv = process.argv.slice(2);
const opt = (name: string): string | undefined => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
};
const quick = argv.includes('--quick');
const reps = opt('--reps') ? Math.max(1, Number(opt('--reps'))) : undefined;
const only = opt('--only')?.split(',').filter((s) => s !== '');
const load = () => loadavg().map((v) => v.toFixed(1)).join(' ');
const started = new Date().toISOString();
const startLoad = load();
const t0 = performance.now();
const series = runScaling({ quick, reps, only, log: (line) => process.stderr.write(`bench-scaling: ${line}\n`) });
const header = [
  `Scaling table${quick ? ' (--quick)' : ''}, ${started}, node ${process.version}, ${cpus().length} x ${cpus()[0]?.model ?? 'unknown'}`,
  `load average at start ${startLoad}, at end ${load()}; ${((performance.now() - t0) / 1000).toFixed(0)} s in all`,
  'p is the least-squares slope of log(median time) against log N over the sizes shown (common practice).',
];
process.stdout.write(formatScaling(header, series) + '\n');
const json = opt('--json');
if (json) writeFileSync(json, JSON.stringify({ header, series }, null, 2) + '\n');
