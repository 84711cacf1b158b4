/**
 * How a user raises each cap, for the `limits` findings: the editor setting and the command-line
 * option that set it (package.json `eigenspan.*`, docs/format.md "Command line"). One table, so every
 * finding names the same two spellings.
 */

/** The caps a finding can name: the settable limits and the time limit. */
export type CapName = 'maxBasis' | 'maxGridPoints' | 'maxExpressionLength' | 'maxNesting' | 'maxFileBytes' | 'maxStatements' | 'maxEvolveSteps' | 'time';

/** ` Raise it with the editor setting ... or ... on the command line.` for the cap `name`. */
export function raiseHint(name: CapName): string {
  if (name === 'time') return ' The time limit is the editor setting `eigenspan.timeBudgetMs` and `--time-limit MS` on the command line.';
  return ` Raise it with the editor setting \`eigenspan.limits.${name}\` or \`--limit ${name}=N\` on the command line.`;
}
