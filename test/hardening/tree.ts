/** Temporary files and trees for the hardening tests (removed when the test process exits). */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const made: string[] = [];
process.on('exit', () => {
  for (const d of made) rmSync(d, { recursive: true, force: true });
});

/** A fresh temporary folder. */
export function tempDir(prefix = 'eigenspan-hostile-'): string {
  const d = mkdtempSync(join(tmpdir(), prefix));
  made.push(d);
  return d;
}

/** Writes `text` to a new file called `name` in a fresh temporary folder; returns its path. */
export function writeTemp(name: string, text: string | Buffer): string {
  const p = join(tempDir(), name);
  writeFileSync(p, text);
  return p;
}
