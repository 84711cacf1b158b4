// Builds production bundles and packs the extension into a .vsix with @vscode/vsce, offline.
// Everything the extension runs is bundled into dist/, so no node_modules go in (--no-dependencies);
// .vscodeignore keeps sources, tests and maps out.
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { createVSIX } from '@vscode/vsce';

const pkg = JSON.parse(readFileSync('package.json', 'utf8'));
const out = process.argv.find((a) => a.startsWith('--out='))?.slice(6) ?? `out/${pkg.name}-${pkg.version}.vsix`;

// The production build overwrites the bundles in place (others may be using dist/ right now);
// stale source maps stay out of the package through .vscodeignore's allow-list.
execFileSync(process.execPath, ['scripts/build.mjs', '--production'], { stdio: 'inherit' });
for (const f of ['dist/extension.js', 'dist/server.js', 'dist/worker.js', 'dist/sweepWorker.js', 'dist/webview/panel.js', 'dist/webview/panel.css']) {
  if (!existsSync(f)) {
    console.error(`package: ${f} is missing after the production build`);
    process.exit(1);
  }
}
// The production build leaves the test hooks out (EIGENSPAN_TEST_BUILD false, scripts/build.mjs); check it.
for (const f of ['dist/server.js', 'dist/worker.js']) {
  if (readFileSync(f, 'utf8').includes('EIGENSPAN_TEST_HOOKS')) {
    console.error(`package: ${f} carries the test hooks`);
    process.exit(1);
  }
}
mkdirSync(out.slice(0, Math.max(0, out.lastIndexOf('/'))) || '.', { recursive: true });
await createVSIX({
  packagePath: out,
  dependencies: false,
  // No repository is published, so relative links in the README stay as they are.
  allowMissingRepository: true,
  rewriteRelativeLinks: false,
  skipLicense: !existsSync('LICENSE') && !existsSync('LICENSE.md'),
});
console.log(`package: wrote ${out}`);
