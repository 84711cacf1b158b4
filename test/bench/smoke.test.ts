import { describe, it, expect } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { formatReport, runSuite } from '../../bench/suite';

// The suite at tiny sizes with one run each: it must complete and produce well-formed rows.
// No timing is asserted: targets are reported by `npm run bench`, never checked in tests.
describe('benchmark suite (tiny sizes, one run)', () => {
  const result = runSuite({ tiny: true, reps: 1 });

  it('has rows for every item with the expected fields', () => {
    const items = new Set(result.rows.map((r) => r.item));
    for (let i = 1; i <= 8; i++) expect(items.has(i)).toBe(true);
    for (const row of result.rows) {
      expect(typeof row.job).toBe('string');
      expect(typeof row.method).toBe('string');
      expect(row.job.length).toBeGreaterThan(0);
      expect(row.accuracy).toHaveProperty('value');
      expect(row.accuracy).toHaveProperty('measure');
      expect(row.accuracy).toHaveProperty('reference');
      expect(Array.isArray(row.notes)).toBe(true);
      if (row.timing) {
        expect(row.timing.runs).toBeGreaterThanOrEqual(1);
        expect(row.timing.min).toBeLessThanOrEqual(row.timing.median);
        expect(row.timing.median).toBeLessThanOrEqual(row.timing.max);
        expect(row.timing.q1).toBeLessThanOrEqual(row.timing.q3);
      }
      if (row.baseline?.timing && row.timing) expect(row.ratio).toBeCloseTo(row.baseline.timing.median / row.timing.median, 10);
    }
  });

  it('measures accuracy against its references', () => {
    // The numbers themselves are checked loosely: a broken kernel shows up as a large error.
    const box = result.rows.filter((r) => r.item === 1);
    expect(box.length).toBe(2);
    for (const r of box) expect(r.accuracy.value!).toBeLessThan(1e-10);
    const osc = result.rows.find((r) => r.item === 2)!;
    expect(osc.accuracy.value!).toBeLessThan(1e-10);
    const expr = result.rows.filter((r) => r.item === 5);
    for (const r of expr) expect(r.accuracy.value!).toBeLessThanOrEqual(1e-15);
  });

  it('has scaling tables with a fitted exponent', () => {
    expect(result.scaling.map((s) => s.item).sort()).toEqual([1, 4, 6]);
    for (const s of result.scaling) {
      expect(s.sizes.length).toBe(s.times.length);
      expect(Number.isFinite(s.exponent)).toBe(true);
    }
    expect(formatReport(result)).toContain('Scaling [1]');
  });

  it('runs from the command line and writes results.json', () => {
    const dir = mkdtempSync(join(tmpdir(), 'eigenspan-smoke-'));
    try {
      const out = join(dir, 'results.json');
      const r = spawnSync(process.execPath, ['scripts/bench.mjs', '--tiny'], { encoding: 'utf8', env: { ...process.env, EIGENSPAN_BENCH_OUT: out } });
      expect(r.status).toBe(0);
      expect(r.stdout).toContain('median');
      const json = JSON.parse(readFileSync(out, 'utf8'));
      expect(json.meta.tiny).toBe(true);
      expect(json.rows.length).toBe(result.rows.length);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
