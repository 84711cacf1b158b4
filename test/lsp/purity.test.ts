// The engine stays pure: only server/src/lsp/ may speak the protocol or start threads (house style,
// habit 1). The scan reads every import and require of the engine folders.
import { describe, it, expect } from 'vitest';
import { readdirSync, readFileSync, statSync, existsSync } from 'node:fs';
import { join } from 'node:path';

const FOLDERS = ['language', 'expr', 'physics', 'analysis', 'cli'];

/** Module specifiers imported by a TypeScript source (static, dynamic, require and re-exports). */
function importsOf(source: string): string[] {
  const out: string[] = [];
  const re = /(?:\bimport\s+(?:type\s+)?(?:[^'"]*?\s+from\s+)?|\bexport\s+(?:type\s+)?[^'"]*?\s+from\s+|\bimport\s*\(\s*|\brequire\s*\(\s*)['"]([^'"]+)['"]/g;
  for (const m of source.matchAll(re)) out.push(m[1]!);
  return out;
}

/** Why `spec` is not allowed in `folder`, or null. */
function violation(folder: string, spec: string): string | null {
  const bare = spec.replace(/^node:/, '');
  if (/^vscode-language(server|client)/.test(spec)) return 'protocol library';
  if (spec === 'vscode') return 'editor API';
  if (bare === 'worker_threads') return 'threads';
  if (bare === 'net') return 'network';
  if ((bare === 'fs' || bare.startsWith('fs/')) && folder !== 'cli') return 'file system';
  return null;
}

function files(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? files(p) : /\.(ts|mts|cts|js|mjs)$/.test(name) ? [p] : [];
  });
}

describe('engine purity', () => {
  it('the scanner sees every import form (so the scan below can fail)', () => {
    const sample = [
      "import { createConnection } from 'vscode-languageserver/node';",
      "import type { X } from 'vscode';",
      "export { a } from 'node:worker_threads';",
      "const net = require('net');",
      "const fs = await import('node:fs');",
      "import 'fs/promises';",
    ].join('\n');
    const found = importsOf(sample).map((s) => violation('physics', s));
    expect(found).toEqual(['protocol library', 'editor API', 'threads', 'network', 'file system', 'file system']);
    expect(violation('cli', 'node:fs')).toBeNull();
    expect(violation('physics', '../expr/types')).toBeNull();
  });

  it('language, expr, physics, analysis and cli import no protocol, editor, thread, network (or, outside cli, file) modules', () => {
    const root = join('server', 'src');
    const scanned = FOLDERS.flatMap((f) => files(join(root, f)).map((p) => ({ folder: f, path: p })));
    expect(scanned.length).toBeGreaterThan(0);
    const bad: string[] = [];
    for (const { folder, path } of scanned) {
      for (const spec of importsOf(readFileSync(path, 'utf8'))) {
        const why = violation(folder, spec);
        // The command line's sweep front end is the one place outside lsp/ that starts threads (the engine stays free of them).
        if (why === 'threads' && path === join(root, 'cli', 'sweepThreads.ts')) continue;
        if (why) bad.push(`${path}: ${spec} (${why})`);
      }
    }
    expect(bad).toEqual([]);
  });
});
