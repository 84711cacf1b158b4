/**
 * The table's decay line on the examples, through the built command line (dist/cli.js).
 * Expected laws: a plucked string (a kink) has |c_n| ~ n^-2 (Boyd, Chebyshev and Fourier Spectral
 * Methods, ch. 2 (from memory)); a displaced thermal state's populations fall geometrically, with a
 * ratio a level that tends to e^(-hbar omega / k_B T) (test/shared/decayText.test.ts derives it), so no
 * power of n may be printed for it.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

const CLI = join(__dirname, '..', '..', 'dist', 'cli.js');
const EXAMPLES = join(__dirname, '..', '..', 'examples');

function decayLine(example: string): string | undefined {
  const r = spawnSync(process.execPath, [CLI, 'expand', join(EXAMPLES, example)], { encoding: 'utf8' });
  expect(r.status, r.stderr).toBe(0);
  return r.stdout.split('\n').find((l) => l.startsWith('decay:'));
}

describe('the decay line of the table', () => {
  it('names the kink of the plucked box and the range of n fitted', () => {
    expect(decayLine('plucked-box.qstate')).toMatch(/^decay: \|c_n\| ~ n\^-2 over n = \d+\.\.\d+: psi' jumps \(psi has a kink\)$/);
  });

  it('says a thermal mixture\'s populations fall geometrically, with a ratio, not a power', () => {
    const line = decayLine('thermal-ion-shift.qstate');
    expect(line).toMatch(/^decay: P_n falls geometrically, by about a factor 0\.2\d* a level over n = \d+\.\.\d+: faster than any power of n$/);
    expect(line).not.toMatch(/n\^-|sqrt|smooth\)/);
  });

  it('shows a geometric fall of a pure state too, which used to have no line', () => {
    expect(decayLine('ion-trap-kick.qstate')).toMatch(/^decay: \|c_n\| falls geometrically, by about a factor [0-9.]+ a level over n = \d+\.\.\d+: faster than any power of n, so psi is smooth$/);
  });
});
