import { describe, it, expect } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
// @ts-expect-error: a plain .mjs script without type declarations
import { HARNESS, bundleWorker, figures, injectOnly, report, suitePass } from '../../scripts/bench-compare.mjs';

// scripts/bench-compare.mjs: the parts that decide what is compared. No timing is asserted.
describe('bench-compare', () => {
  const older = ['export function runSuite(options: SuiteOptions = {}): SuiteResult {', '  const step = (name: string, f: () => void) => {', '    const t0 = performance.now();'].join('\n');

  it('puts the item filter into a suite that predates it, and leaves others alone', () => {
    const injected: string = injectOnly(older);
    expect(injected).toContain('if (only && !only.includes(Number.parseInt(name, 10))) return;');
    expect(injected.indexOf('return;')).toBeLessThan(injected.indexOf('performance.now()'));
    const newer = older.replace('{\n    const t0', '{\n    if (options.only && !options.only.includes(1)) return;\n    const t0');
    expect(injectOnly(newer)).toBe(newer);
    expect(injectOnly('export const x = 1;')).toBe('export const x = 1;');
  });

  it('reports medians, new/old and the rows only one side has', () => {
    const side = (ms: number[]) => new Map<string, { ms: number[]; accuracy: number | null }>([['[1] a job', { ms, accuracy: 1e-15 }]]);
    const old = side([10, 30, 20]);
    const neu = side([5, 15, 10]);
    neu.set('[2] new only', { ms: [1], accuracy: null });
    const r = report(['h'], [old, neu], ['[1] a job', '[2] new only']);
    expect(r.rows).toHaveLength(1);
    expect(r.rows[0].old.median).toBe(20);
    expect(r.rows[0].new.median).toBe(10);
    expect(r.rows[0].ratio).toBeCloseTo(0.5, 12);
    expect(r.text).toContain('[2] new only: only in the new checkout');
  });

  it('bundles this checkout\'s own suite and runs one item of it in a fresh process', async () => {
    const tmp = mkdtempSync(join(tmpdir(), 'eigenspan-compare-test-'));
    try {
      const root = process.cwd();
      const file: string = await bundleWorker(root, tmp, 'this');
      const result = suitePass(file, root, { root, tiny: true, reps: 1, only: [1] });
      const items = new Set(result.rows.map((row: { item: number }) => row.item));
      expect([...items]).toEqual([1]);
      const keys = [...figures(result).keys()];
      expect(keys.some((k: string) => k.startsWith('[1] box:'))).toBe(true);
      expect(keys.some((k: string) => k.startsWith('[1] scaling:'))).toBe(true);
    } finally {
      rmSync(tmp, { recursive: true, force: true });
    }
  });

  it('times both checkouts with this tree\'s stopwatch, not the checkout\'s own bench/stats.ts', async () => {
    const tmp = mkdtempSync(join(tmpdir(), 'eigenspan-compare-test-'));
    try {
      // A checkout whose own stats.ts would fail: the bundle must take this tree's instead.
      const fake = join(tmp, 'checkout');
      mkdirSync(join(fake, 'bench'), { recursive: true });
      writeFileSync(join(fake, 'bench', 'stats.ts'), "export function measure(): never { throw new Error('the checkout\\'s own stats.ts'); }\n");
      writeFileSync(
        join(fake, 'bench', 'suite.ts'),
        [
          "import { measure } from './stats';",
          'export function runSuite(options: { reps?: number }) {',
          '  let calls = 0;',
          '  const m = measure(() => ++calls, { reps: options.reps ?? 1, minSampleMs: 0 });',
          "  return { rows: [{ item: 1, job: 'counted', timing: m.timing, accuracy: { value: calls } }], scaling: [] };",
          '}',
        ].join('\n'),
      );
      const file: string = await bundleWorker(fake, tmp, 'fake');
      const result = suitePass(file, fake, { reps: 4 }, 0);
      expect(HARNESS.endsWith(join('bench', 'stats.ts'))).toBe(true);
      expect(result.rows[0].timing.runs).toBe(4);
      // One run before the warm-up loop, none more at warmup 1, up to three for the batch size, four timed.
      expect(result.rows[0].accuracy.value).toBeGreaterThanOrEqual(5);
    } finally {
      rmSync(tmp, { recursive: true, force: true });
    }
  });
});
