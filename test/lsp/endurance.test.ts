/**
 * A long editing session against the built server: 10,000 edits to one document. The server's memory
 * must stay bounded (no growth with the number of edits beyond a fixed allowance) and it must write
 * nothing to disk.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startClient } from './client';

/** Resident memory of a process in MB, from /proc (Linux). */
function rssMb(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  if (!m) throw new Error('no VmRSS in /proc status');
  return Number(m[1]) / 1024;
}

const BASE = 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\nbasis 20\nexpect weight 1 >= 0.99\n';

/** The text after edit k: the basis line cycles through 20..29 and a comment grows and shrinks. */
function textAt(k: number): string {
  return BASE.replace('basis 20', `basis ${20 + (k % 10)}`) + `# edit ${'x'.repeat(k % 50)}\n`;
}

describe('a long editing session', () => {
  it('10,000 edits to one document keep the server memory bounded and write nothing', { timeout: 600_000 }, async () => {
    const cwd = mkdtempSync(join(tmpdir(), 'eigenspan-endurance-'));
    const client = await startClient({ cwd, settings: { debounceMs: 20 } });
    try {
      const uri = 'file:///endurance.qstate';
      client.open(uri, textAt(0), 1);
      await client.diagnostics(uri, (p) => p.version === 1);
      const pid = client.child.pid!;
      let warm = 0;
      for (let k = 1; k <= 10_000; k++) {
        client.change(uri, k + 1, textAt(k));
        // Let the server keep up every so often, as a typist pauses; the wait is on a publish, not a timer.
        if (k % 250 === 0) await client.diagnostics(uri, (p) => p.version === k + 1, 60_000);
        if (k === 1000) warm = rssMb(pid);
        if (k % 2000 === 0) client.publishes.splice(0, client.publishes.length - 10);
      }
      await client.diagnostics(uri, (p) => p.version === 10_001, 60_000);
      const after = rssMb(pid);
      console.log(`server RSS: ${warm.toFixed(1)} MB after 1,000 edits, ${after.toFixed(1)} MB after 10,000`);
      // Bound (stated): once warm after 1,000 edits, the next 9,000 may add at most 64 MB of resident
      // memory (garbage collection timing), and the total stays under 400 MB.
      expect(after - warm).toBeLessThan(64);
      expect(after).toBeLessThan(400);
      expect(readdirSync(cwd)).toEqual([]);
    } finally {
      await client.stop();
    }
  });
});
