import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { editDistance, suggest, SUGGEST_CAPS } from '../../server/src/language/suggest';
import { withQuickStage, workCounter } from '../../server/src/language/meter';

/** Full-table optimal string alignment distance, the textbook recurrence (Damerau 1964), as a reference. */
function reference(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[a.length]![b.length]!;
}

/** The unbounded rule the bounded search must agree with below its caps (the previous implementation). */
function referenceSuggest(word: string, candidates: string[]): string | null {
  let best: string | null = null;
  let bestScore = Infinity;
  for (const c of candidates) {
    if (c === word) continue;
    const score = c.toLowerCase() === word.toLowerCase() ? 0.5 : reference(word, c);
    if (score < bestScore || (score === bestScore && best !== null && c < best)) [best, bestScore] = [c, score];
  }
  const allowed = word.length <= 4 ? 1 : Math.max(1, Math.floor(word.length / 3));
  return best !== null && bestScore <= allowed ? best : null;
}

const word = fc.string({ unit: fc.constantFrom('a', 'b', 'c', 'A', '_'), maxLength: 12 });

describe('the banded edit distance', () => {
  it('equals the full table whenever it is within the bound, and says "more" otherwise', () => {
    fc.assert(
      fc.property(word, word, fc.nat(8), (a, b, max) => {
        const full = reference(a, b);
        expect(editDistance(a, b, max)).toBe(full <= max ? full : max + 1);
        expect(editDistance(a, b)).toBe(full);
      }),
      { numRuns: 2000, seed: 14 },
    );
  });

  it('knows the textbook values (common practice: kitten/sitting 3, a transposition costs 1)', () => {
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('ca', 'ac')).toBe(1);
    expect(editDistance('omega', 'omgea', 1)).toBe(1);
  });
});

describe('suggest', () => {
  it('agrees with the unbounded search below its caps', () => {
    fc.assert(
      fc.property(word, fc.array(word, { maxLength: 20 }), (w, cs) => {
        if (w.length === 0) return;
        expect(suggest(w, cs)).toBe(referenceSuggest(w, cs));
      }),
      { numRuns: 2000, seed: 15 },
    );
  });

  it('gives no suggestion for a word longer than the cap, without computing anything', () => {
    const meter = workCounter();
    const long = 'a'.repeat(SUGGEST_CAPS.maxWordLength + 1);
    expect(withQuickStage({ meter }, () => suggest(long, [long + 'b', 'a'.repeat(240_000)]))).toBeNull();
    expect(meter.ops).toBe(0);
  });

  it('bounds the cells of one call whatever the candidates (the 240,000-character name of issue 14)', () => {
    const meter = workCounter();
    const candidates = ['a'.repeat(240_000), ...Array.from({ length: 5000 }, (_, i) => 'q'.repeat(40) + i)];
    withQuickStage({ meter }, () => suggest('q'.repeat(38) + 'z7', candidates));
    // Candidates looked at plus cells: at most the two caps (plus one candidate's band of cells).
    expect(meter.ops).toBeLessThanOrEqual(2 * SUGGEST_CAPS.maxCandidates + SUGGEST_CAPS.maxCellsPerCall + 64 * 43);
  });

  it('stops suggesting once the allowance of a short text is spent', () => {
    const candidates = Array.from({ length: 1000 }, (_, i) => 'q'.repeat(40) + i);
    const found = withQuickStage({ textLength: 0 }, () => {
      let n = 0;
      for (let i = 0; i < 1000; i++) if (suggest('q'.repeat(40) + 'z' + i, candidates) !== null) n++;
      return n;
    });
    // The 200,000 base cells run out long before the 1000 calls (each fills about 45 x 3 cells for each of
    // up to 1000 candidates, capped at 5,000); without an allowance every call finds its candidate.
    expect(found).toBeGreaterThan(0);
    expect(found).toBeLessThan(100);
    const unbounded = withQuickStage({}, () => suggest('q'.repeat(40) + 'z7', candidates));
    // Distance 1 from q...q7, q...q17, q...q27, ...; ties go to the alphabetically first.
    expect(unbounded).toBe(referenceSuggest('q'.repeat(40) + 'z7', candidates));
    expect(unbounded).toBe('q'.repeat(40) + '17');
  });
});
