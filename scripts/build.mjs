// Bundles the command line, the language server (and its worker) and the VS Code client with esbuild.
// dist/ holds the bundles that ship; dist/test/ (not with --production) a second server and worker
// built with EIGENSPAN_TEST_BUILD on, whose worker carries the test hooks (server/src/lsp/testHooks.ts)
// the fault and scheduling tests use. Everywhere else the define is false and the hooks are dead code.
import { build } from 'esbuild';
import { copyFileSync, existsSync, mkdirSync } from 'node:fs';

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
// these stays a require of its own bundle beside it (dist/plot.js, dist/reports.js). The other commands'
// code stays in dist/cli.js, evaluated on first require (server/src/cli/main.ts).
const APART = { './plotRender': './plot.js', './reports': './reports.js' };
const cliApart = {
  name: 'cli-apart',
  setup(b) {
    b.onResolve({ filter: /^\.\/(plotRender|reports)$/ }, (args) => ({ path: APART[args.path], external: true }));
  },
};

const entries = [
  { in: 'server/src/cli/main.ts', out: 'dist/cli.js', banner: '#!/usr/bin/env node', plugins: [cliApart] },
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
