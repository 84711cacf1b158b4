/**
 * Runs `node scripts/package.mjs` (production bundles + vsce, offline) and reads the .vsix, a zip
 * archive, with a small reader of the zip central directory (PKWARE APPNOTE.TXT, sections 4.3.7,
 * 4.3.12 and 4.3.16).
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { execFile } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readFileSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { inflateRawSync } from 'node:zlib';

interface Entry {
  name: string;
  method: number;
  size: number;
  compressed: number;
  offset: number;
}

/** Lists the entries of a zip archive from its central directory. */
function listZip(buf: Buffer): Entry[] {
  let eocd = -1;
  for (let i = buf.length - 22; i >= Math.max(0, buf.length - 65_557); i--) {
    if (buf.readUInt32LE(i) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw new Error('not a zip archive: no end of central directory record');
  const count = buf.readUInt16LE(eocd + 10);
  let p = buf.readUInt32LE(eocd + 16);
  const out: Entry[] = [];
  for (let k = 0; k < count; k++) {
    if (buf.readUInt32LE(p) !== 0x02014b50) throw new Error('bad central directory header');
    const n = buf.readUInt16LE(p + 28);
    const e = buf.readUInt16LE(p + 30);
    const c = buf.readUInt16LE(p + 32);
    out.push({
      name: buf.toString('utf8', p + 46, p + 46 + n),
      method: buf.readUInt16LE(p + 10),
      compressed: buf.readUInt32LE(p + 20),
      size: buf.readUInt32LE(p + 24),
      offset: buf.readUInt32LE(p + 42),
    });
    p += 46 + n + e + c;
  }
  return out;
}

/** The bytes of one entry (stored or deflated). */
function readEntry(buf: Buffer, e: Entry): Buffer {
  const n = buf.readUInt16LE(e.offset + 26);
  const x = buf.readUInt16LE(e.offset + 28);
  const data = buf.subarray(e.offset + 30 + n + x, e.offset + 30 + n + x + e.compressed);
  return e.method === 8 ? inflateRawSync(data) : Buffer.from(data);
}

let vsix: Buffer;
let entries: Entry[];

beforeAll(async () => {
  // Package a copy of the project, so the production build does not rewrite dist/ under tests that
  // are running from it at the same time.
  const work = mkdtempSync(join(tmpdir(), 'eigenspan-vsix-'));
  for (const p of ['package.json', '.vscodeignore', 'README.md', 'LICENSE', 'language-configuration.json', 'syntaxes', 'scripts', 'server', 'client', 'docs/screenshots']) {
    if (existsSync(p)) cpSync(p, join(work, p), { recursive: true });
  }
  symlinkSync(resolve('node_modules'), join(work, 'node_modules'), 'dir');
  const out = join(work, 'eigenspan.vsix');
  await new Promise<void>((resolve, reject) =>
    execFile(process.execPath, ['scripts/package.mjs', `--out=${out}`], { cwd: work, maxBuffer: 16 << 20 }, (err, stdout, stderr) =>
      err ? reject(new Error(`packaging failed: ${err.message}\n${stdout}\n${stderr}`)) : resolve(),
    ),
  );
  vsix = readFileSync(out);
  entries = listZip(vsix);
}, 300_000);

describe('the .vsix package', () => {
  it('contains the bundles, the webview, the grammar and the language configuration', () => {
    const names = entries.map((e) => e.name);
    for (const f of [
      'extension.vsixmanifest',
      '[Content_Types].xml',
      'extension/package.json',
      'extension/dist/extension.js',
      'extension/dist/server.js',
      'extension/dist/worker.js',
      'extension/dist/sweepWorker.js',
      'extension/dist/webview/panel.js',
      'extension/dist/webview/panel.css',
      'extension/syntaxes/qstate.tmLanguage.json',
      'extension/language-configuration.json',
    ]) {
      expect(names).toContain(f);
    }
  });

  it('leaves out node_modules, sources, tests and source maps', () => {
    const bad = entries.map((e) => e.name).filter((n) => /node_modules|\.ts$|\.map$|^extension\/(test|client|server|scripts|bench|examples)\//.test(n) || n.includes('cli.js'));
    expect(bad).toEqual([]);
  });

  it('carries no test hooks: no test build, and the shipped worker and server hold none of the hook code', () => {
    const names = entries.map((e) => e.name);
    expect(names.filter((n) => n.startsWith('extension/dist/test/'))).toEqual([]);
    const byName = new Map(entries.map((e) => [e.name, e]));
    for (const f of ['extension/dist/worker.js', 'extension/dist/server.js']) {
      const code = readEntry(vsix, byName.get(f)!).toString('utf8');
      // The hook comment, the environment switch and the log line of testHooks.ts.
      for (const marker of ['eigenspan-test', 'EIGENSPAN_TEST_HOOKS', 'test hook']) expect(code, `${f} holds '${marker}'`).not.toContain(marker);
    }
  });

  it('ships the manifest unchanged and minified bundles without source map links', () => {
    const byName = new Map(entries.map((e) => [e.name, e]));
    const manifest = JSON.parse(readEntry(vsix, byName.get('extension/package.json')!).toString('utf8'));
    expect(manifest.main).toBe('./dist/extension.js');
    expect(manifest.contributes.grammars[0].path).toBe('./syntaxes/qstate.tmLanguage.json');
    expect(manifest.contributes.languages[0].configuration).toBe('./language-configuration.json');
    const ext = readEntry(vsix, byName.get('extension/dist/extension.js')!).toString('utf8');
    expect(ext).not.toContain('sourceMappingURL');
    expect(ext).toContain('eigenspan/setTrust');
    // The grammar inside is the one in the repository.
    expect(readEntry(vsix, byName.get('extension/syntaxes/qstate.tmLanguage.json')!).toString('utf8')).toBe(readFileSync('syntaxes/qstate.tmLanguage.json', 'utf8'));
  });
});
