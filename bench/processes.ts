/**
 * Items 7 and 8 of the benchmark suite: the language server's own benchmark (run, not owned, here),
 * the cold start of the command line and the bundle sizes. Used by suite.ts.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { measure, ratioOf, summarise } from './stats';
import type { Row } from './suite';

// ---------------------------------------------------------------------------------------------------
// 7. The language server (bench/lsp.mjs belongs to the server's developer; it is only run here).

export function benchLsp(root: string, tiny: boolean): Row {
  const script = join(root, 'bench', 'lsp.mjs');
  const row: Row = {
    item: 7,
    job: 'language server: keystroke to diagnostics, memory with 20 documents',
    method: 'node bench/lsp.mjs',
    size: '',
    timing: null,
    accuracy: { value: null, measure: '', reference: '' },
    baseline: null,
    ratio: null,
    target: null,
    notes: [],
  };
  if (!existsSync(script)) {
    row.notes.push('bench/lsp.mjs is missing: no language-server figures in this run');
    return row;
  }
  if (tiny) {
    row.notes.push('not run in tiny mode');
    return row;
  }
  const r = spawnSync(process.execPath, [script], { cwd: root, encoding: 'utf8', timeout: 300_000 });
  const lines = `${r.stdout ?? ''}`.split('\n').filter((l) => l.trim() !== '');
  row.notes.push(...lines.slice(-40));
  if (r.status !== 0) row.notes.push(`bench/lsp.mjs exited with ${r.status ?? r.signal}: ${(r.stderr ?? '').trim().split('\n').slice(-3).join(' / ')}`);
  return row;
}

// ---------------------------------------------------------------------------------------------------
// 8. Cold start and bundle sizes.

export function benchColdStart(root: string, example: string, reps: number): Row {
  const cli = join(root, 'dist', 'cli.js');
  const row: Row = {
    item: 8,
    job: `cold start: node dist/cli.js expand examples/${example} --json`,
    method: 'spawned process, wall clock',
    size: '1 file',
    timing: null,
    accuracy: { value: null, measure: 'exit status', reference: 'FORMAT.md command line contract' },
    baseline: null,
    ratio: null,
    target: null,
    notes: [],
  };
  if (!existsSync(cli)) {
    row.notes.push('dist/cli.js is missing (run npm run build)');
    return row;
  }
  const spawnOnce = () => spawnSync(process.execPath, [cli, 'expand', join('examples', example), '--json'], { cwd: root, encoding: 'utf8' });
  const times: number[] = [];
  let status: number | null = null;
  spawnOnce();
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    const p = spawnOnce();
    times.push(performance.now() - t0);
    status = p.status;
  }
  const bare = measure(() => spawnSync(process.execPath, ['-e', '0']), { reps, minSampleMs: 0 });
  row.timing = summarise(times);
  row.accuracy.value = status;
  row.baseline = { method: 'node -e 0 (bare node start)', timing: bare.timing, accuracy: null };
  row.ratio = ratioOf(bare.timing, row.timing);
  row.notes.push(`time above a bare node start: ${(row.timing.median - bare.timing.median).toFixed(0)} ms`);
  return row;
}

/** Bytes of each bundle, and how much of the CLI and server bundles mathjs takes (esbuild metafile). */
export function bundleRows(root: string): Row {
  const files = ['dist/extension.js', 'dist/server.js', 'dist/worker.js', 'dist/webview/panel.js', 'dist/cli.js', 'dist/cli-main.js'];
  const notes: string[] = [];
  for (const f of files) {
    const p = join(root, f);
    notes.push(existsSync(p) ? `${f}: ${(statSync(p).size / 1024).toFixed(0)} KiB` : `${f}: missing`);
  }
  try {
    const req = createRequire(join(root, 'package.json'));
    const esbuild = req('esbuild') as typeof import('esbuild');
    for (const entry of ['server/src/cli/main.ts', 'server/src/lsp/worker.ts']) {
      if (!existsSync(join(root, entry))) continue;
      const r = esbuild.buildSync({
        entryPoints: [join(root, entry)],
        bundle: true,
        platform: 'node',
        format: 'cjs',
        target: 'node20',
        write: false,
        metafile: true,
        logLevel: 'silent',
        outfile: join(root, 'out', 'bench-meta.js'),
      });
      let total = 0;
      let math = 0;
      for (const out of Object.values(r.metafile!.outputs)) {
        for (const [input, info] of Object.entries(out.inputs)) {
          total += info.bytesInOutput;
          if (input.includes('node_modules/mathjs/') || /node_modules\/(typed-function|complex\.js|fraction\.js|decimal\.js|javascript-natural-sort|seedrandom|escape-latex|tiny-emitter|@babel\/runtime)\//.test(input)) math += info.bytesInOutput;
        }
      }
      notes.push(`${entry} unminified: ${(total / 1024).toFixed(0)} KiB, of which mathjs and its dependencies ${(math / 1024).toFixed(0)} KiB (${((100 * math) / total).toFixed(0)}%)`);
    }
  } catch (err) {
    notes.push(`bundle composition not measured: ${(err as Error).message}`);
  }
  return {
    item: 8,
    job: 'bundle sizes',
    method: 'file sizes of npm run build output; composition from an esbuild metafile',
    size: '',
    timing: null,
    accuracy: { value: null, measure: '', reference: '' },
    baseline: null,
    ratio: null,
    target: null,
    notes,
  };
}

