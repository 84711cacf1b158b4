/**
 * The report writers of `check` (SARIF 2.1.0, JUnit XML), bundled apart as dist/reports.js and loaded only
 * when `--sarif` or `--junit` is given (scripts/build.mjs), so `expand` and a plain `check` never load them.
 */
export { renderSarif } from './sarif';
export { renderJunit } from './junit';
