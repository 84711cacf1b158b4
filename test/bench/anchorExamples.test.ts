import { describe, it, expect } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { locatedDifference } from '../../bench/anchor-report';

// The whole-process rows of the side-by-side benchmark need a python job for every example; the jobs are
// read here from the python sources as text (the tests never run python).
describe('side-by-side benchmark, whole-process rows', () => {
  it('every example file has a job on the python side', () => {
    const dir = join(process.cwd(), 'bench', 'python');
    const jobs = new Set<string>();
    for (const f of readdirSync(dir).filter((n) => n.endsWith('.py'))) {
      const text = readFileSync(join(dir, f), 'utf8');
      const table = /^JOBS = \{([\s\S]*?)^\}/m.exec(text);
      for (const m of (table?.[1] ?? '').matchAll(/'([a-z0-9-]+)':/g)) jobs.add(m[1]!);
    }
    const examples = readdirSync(join(process.cwd(), 'examples')).filter((n) => n.endsWith('.qstate')).map((n) => n.replace(/\.qstate$/, ''));
    expect(examples.length).toBeGreaterThan(10);
    expect(examples.filter((n) => !jobs.has(n))).toEqual([]);
  });

  it('compares the places two sweeps located, matched by kind, axis, counts and row', () => {
    const place = (kind: string, at: number, row: number | null, before = 1, after = 2) => ({ kind, axis: 0, at, before, after, row });
    const a = { sweep: { located: [place('bound', 5, null), place('expect', 2, null, 0, 1), place('bound', 9, 50)] } };
    // Relative distances 1e-10 and 0 (derived in this comment); the row-50 place has no partner (other row).
    const b = { sweep: { located: [place('bound', 5 * (1 + 1e-10), null), place('expect', 2, null, 0, 1), place('bound', 9, 60)] } };
    const d = locatedDifference(a, b)!;
    expect(Math.abs(d.worst - 1e-10)).toBeLessThan(1e-16);
    expect(d.count).toBe(3);
    expect(d.unmatched).toBe(2);
    expect(locatedDifference({}, {})).toBeNull();
  });
});
