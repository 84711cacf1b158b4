/**
 * The whole analysis never throws and never reports an internal error, on prefixes, single-character
 * mutations and random lines of the bundled examples (property tests with fast-check).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyse } from '../../server/src/analysis/index';

const dir = join(__dirname, '..', '..', 'examples');
const examples = readdirSync(dir)
  .filter((f) => f.endsWith('.qstate'))
  .map((f) => readFileSync(join(dir, f), 'utf8'));

function sound(text: string): void {
  const r = analyse(text, { limits: { maxBasis: 400, maxEvolveSteps: 200 } });
  for (const d of r.diagnostics) {
    expect(d.start).toBeGreaterThanOrEqual(0);
    expect(d.end).toBeLessThanOrEqual(text.length);
    expect(d.start).toBeLessThanOrEqual(d.end);
    // Wording on purpose: an internal error has no code of its own (it is an 'evaluation' finding on the
    // first character), so its sentence is the only mark of it.
    expect(d.message).not.toMatch(/internal error/);
    expect(d.message.length).toBeGreaterThan(10);
  }
}

describe('analysis robustness', () => {
  it('has examples to mutate', () => {
    expect(examples.length).toBeGreaterThanOrEqual(6);
  });

  it('survives prefixes of every example', { timeout: 300_000 }, () => {
    for (const text of examples) {
      for (let k = 0; k <= text.length; k += 37) sound(text.slice(0, k));
    }
  });

  it('survives single-character mutations', { timeout: 300_000 }, () => {
    const alphabet = '()[]=,.+-*/^<>?:#\n 0123456789xeipa_\u00b1';
    fc.assert(
      fc.property(fc.nat(examples.length - 1), fc.nat(), fc.constantFrom(...alphabet.split('')), fc.constantFrom('replace', 'insert', 'delete'), (which, pos, ch, op) => {
        const text = examples[which]!;
        const at = pos % (text.length + 1);
        const mutated = op === 'delete' ? text.slice(0, at) + text.slice(at + 1) : op === 'insert' ? text.slice(0, at) + ch + text.slice(at) : text.slice(0, at) + ch + text.slice(at + 1);
        sound(mutated);
      }),
      { numRuns: 60, seed: 20261201 },
    );
  });

  it('survives random lines spliced into examples', { timeout: 300_000 }, () => {
    fc.assert(
      fc.property(fc.nat(examples.length - 1), fc.string({ maxLength: 60 }), fc.nat(), (which, line, pos) => {
        const lines = examples[which]!.split('\n');
        lines.splice(pos % (lines.length + 1), 0, line);
        sound(lines.join('\n'));
      }),
      { numRuns: 50, seed: 7 },
    );
  });
});
