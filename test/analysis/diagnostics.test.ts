/**
 * Data-driven diagnostic fixtures: each file under test/fixtures/diagnostics marks the diagnostics it
 * must produce (code and exact range) inline; see helpers.ts for the marker syntax.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { check } from './helpers';

const dir = join(__dirname, '..', 'fixtures', 'diagnostics');

describe('diagnostic fixtures', () => {
  for (const name of readdirSync(dir).filter((f) => f.endsWith('.qstate')).sort()) {
    it(name, () => {
      const text = readFileSync(join(dir, name), 'utf8');
      const { result, missing, unexpected } = check(text);
      const summary = result.diagnostics.map((d) => `${d.code} [${d.start}, ${d.end}) ${d.message}`);
      expect(missing, summary.join('\n')).toEqual([]);
      expect(unexpected).toEqual([]);
      if (name === 'clean.qstate') {
        expect(result.diagnostics.filter((d) => d.severity !== 'info')).toEqual([]);
      }
    });
  }
});
