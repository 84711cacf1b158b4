/**
 * Entry of `npm run bench` (bundled by scripts/bench.mjs): runs the suite, prints the report and writes
 * bench/results.json. EIGENSPAN_BENCH_TINY=1 runs tiny sizes once; EIGENSPAN_BENCH_REPS sets the runs;
 * EIGENSPAN_BENCH_ONLY=1,4 runs only those items.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { formatReport, runSuite } from './suite';

const tiny = process.env.EIGENSPAN_BENCH_TINY === '1';
const repsText = process.env.EIGENSPAN_BENCH_REPS;
const reps = repsText ? Number(repsText) : undefined;
const root = process.cwd();
const only = process.env.EIGENSPAN_BENCH_ONLY?.split(',').map(Number).filter((n) => Number.isInteger(n));
const result = runSuite({ root, tiny, reps, only, log: (line) => process.stderr.write(`bench: ${line}\n`) });
const out = process.env.EIGENSPAN_BENCH_OUT ?? join(root, 'bench', 'results.json');
writeFileSync(out, JSON.stringify(result, null, 2) + '\n');
process.stdout.write(formatReport(result) + '\n');
process.stdout.write(`\nWrote ${out}\n`);
