// Bundles the command line, the language server (and its worker) and the VS Code client with esbuild.
// dist/ holds the bundles that ship; dist/test/ (not with --production) a second server and worker
// built with EIGENSPAN_TEST_BUILD on, whose worker carries the test hooks (server/src/lsp/testHooks.ts)
// the fault and scheduling tests use. Everywhere else the define is false and the hooks are dead code.
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

const production = process.argv.includes('--production');
mkdirSync('dist', { recursive: true });

const common = {
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: !production,
  minify: production,
  logLevel: 'warning',
};

// The command line loads some halves only for the commands that need them: its drawing half
// (server/src/cli/plotRender.ts, with the chart library) for `plot`, and check's report writers
// (server/src/cli/reports.ts: SARIF, JUnit) for `check --sarif/--junit`. In dist/cli.js each require of
// these stays a require of its own bundle beside it (dist/plot.js, dist/reports.js). The rest is one bundle,
// dist/cli-main.js: requiring command modules lazily inside it would wrap the engine and all of mathjs in
// lazy initialisers and defeat tree shaking (measured: 767 -> 2,175 KiB).
const APART = { './plotRender': './plot.js', './reports': './reports.js' };
const cliApart = {
  name: 'cli-apart',
  setup(b) {
    b.onResolve({ filter: /^\.\/(plotRender|reports)$/ }, (args) => ({ path: APART[args.path], external: true }));
  },
};

const entries = [
  // The bin is a small loader (server/src/cli/loader.ts) that runs dist/cli-main.js through V8's code cache.
  { in: 'server/src/cli/loader.ts', out: 'dist/cli.js', banner: '#!/usr/bin/env node' },
  { in: 'server/src/cli/main.ts', out: 'dist/cli-main.js', plugins: [cliApart] },
  { in: 'server/src/cli/reports.ts', out: 'dist/reports.js' },
  // ECharts' development warnings (console output that would bypass the escaping) are off; the rasteriser is a native package.
  { in: 'server/src/cli/plotRender.ts', out: 'dist/plot.js', external: ['@resvg/resvg-js'], defines: { 'process.env.NODE_ENV': '"production"' } },
  { in: 'server/src/api/engine.ts', out: 'dist/engine.js' },
  { in: 'server/src/lsp/main.ts', out: 'dist/server.js' },
  { in: 'server/src/lsp/worker.ts', out: 'dist/worker.js' },
  { in: 'server/src/lsp/sweepWorker.ts', out: 'dist/sweepWorker.js' },
  { in: 'client/src/extension.ts', out: 'dist/extension.js', external: ['vscode'] },
  ...(production
    ? []
    : [
        { in: 'server/src/lsp/main.ts', out: 'dist/test/server.js', test: true },
        { in: 'server/src/lsp/worker.ts', out: 'dist/test/worker.js', test: true },
        { in: 'server/src/lsp/sweepWorker.ts', out: 'dist/test/sweepWorker.js', test: true },
      ]),
];

await Promise.all(
  entries
    .filter((e) => existsSync(e.in))
    .map((e) =>
      build({
        ...common,
        entryPoints: [e.in],
        outfile: e.out,
        external: e.external ?? [],
        plugins: e.plugins ?? [],
        banner: e.banner ? { js: e.banner } : undefined,
        define: { EIGENSPAN_TEST_BUILD: e.test ? 'true' : 'false', ...e.defines },
      }),
    ),
);

// The command line's code cache, from one run of the fresh bundle on a few examples (scripts/train-cli-cache.cjs).
// V8 checks a cache against the source's length only, so the bundle ends with a build id (a hash of its
// text) and the cache is named by it (dist/cli-main.ID.cache): the loader never pairs a bundle with the
// cache of another build. Old caches are removed first.
for (const f of readdirSync('dist')) if (/^cli-main(\.[0-9a-f]+)?\.cache$/.test(f)) rmSync(join('dist', f), { force: true });
if (existsSync('dist/cli-main.js')) {
  const text = readFileSync('dist/cli-main.js', 'utf8');
  writeFileSync('dist/cli-main.js', `${text}\n// eigenspan-build ${createHash('sha256').update(text).digest('hex').slice(0, 16)}\n`);
}
const trained = spawnSync(process.execPath, ['scripts/train-cli-cache.cjs'], { stdio: 'inherit' });
if (trained.status !== 0) console.warn('build: no code cache for the command line (scripts/train-cli-cache.cjs failed); it still runs, compiling as usual');

if (existsSync('client/webview/main.ts')) {
  await build({
    ...common,
    platform: 'browser',
    format: 'iife',
    target: 'es2022',
    entryPoints: ['client/webview/main.ts'],
    outfile: 'dist/webview/panel.js',
  });
  // The panel's style sheet goes beside its script: the webview may load styles only from dist/webview.
  if (existsSync('client/webview/panel.css')) copyFileSync('client/webview/panel.css', 'dist/webview/panel.css');
}
