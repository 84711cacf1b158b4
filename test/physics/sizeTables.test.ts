import { describe, expect, it } from 'vitest';
import { SizeTables } from '../../server/src/physics/sizeTables';

describe('size tables', () => {
  it('builds each size once while it is among the recent sizes, and drops the least recently used', () => {
    const built: number[] = [];
    const t = new SizeTables((n: number) => {
      built.push(n);
      return new Float64Array(n);
    }, 2);
    // Two sizes alternating (a transform and its half-size check) are built once each.
    for (let i = 0; i < 5; i++) {
      expect(t.get(512).length).toBe(512);
      expect(t.get(256).length).toBe(256);
    }
    expect(built).toEqual([512, 256]);
    // A third size drops the least recently used (512), which is then built again.
    t.get(1024);
    t.get(256);
    t.get(512);
    expect(built).toEqual([512, 256, 1024, 512]);
  });
});
