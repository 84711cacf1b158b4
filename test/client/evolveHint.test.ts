import { describe, expect, it } from 'vitest';
import { writtenTime } from '../../client/webview/charts/evolveHint';

describe('the evolve hint writes round durations as a user would', () => {
  it('a whole number plainly, in the file time unit', () => {
    // niceCeil rounds 1,850 fs up to a round 2,000 fs: written "2000 fs", not "2e3 fs".
    const t = writtenTime(1850, { length: 'nm', energy: 'eV', time: 'fs' })!;
    expect(t.text).toBe('2000 fs');
    expect(t.value).toBe(2000);
  });

  it('a fraction as its digits, bare in natural units', () => {
    const t = writtenTime(0.123, { length: null, energy: null, time: null })!;
    // niceCeil rounds up to a round 0.2.
    expect(t.text).toBe('0.2');
    expect(t.value).toBeGreaterThanOrEqual(0.123);
  });
});
