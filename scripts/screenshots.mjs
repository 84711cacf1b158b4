#!/usr/bin/env node
// Renders the spectrum panel in headless Chromium with real engine results and saves PNGs.
//   node scripts/screenshots.mjs                 the README's pictures into docs/screenshots/ (the three
//                                                views, and the sweep view of a one- and a two-parameter sweep)
//   node scripts/screenshots.mjs --all --out DIR [--only WORD] [--theme NAME] [--width 480|1400]
//                                                every view of every example, in the light, dark and
//                                                high-contrast themes, at 480 px and 1400 px wide (the sweep
//                                                view for the examples with a sweep line)
// Needs `npm run build` first (it serves dist/webview, the very files the extension ships) and
// Debian's chromium. The page is the extension's own HTML (buildPanelHtml) with a stand-in for the
// webview API, as in the browser tests (test/panel/harness.ts).
import { build } from 'esbuild';
import { createServer } from 'node:http';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';

const CHROMIUM = '/usr/bin/chromium';
const args = process.argv.slice(2);
const all = args.includes('--all');
const outAt = args.indexOf('--out');
const out = resolve(outAt >= 0 ? args[outAt + 1] : 'docs/screenshots');
const onlyAt = args.indexOf('--only');
/** With --only WORD, just the examples whose name contains WORD (with --all). */
const only = onlyAt >= 0 ? args[onlyAt + 1] : '';
const themeAt = args.indexOf('--theme');
/** With --theme NAME (dark, light, high-contrast), just that theme (with --all). */
const onlyTheme = themeAt >= 0 ? args[themeAt + 1] : '';
const widthAt = args.indexOf('--width');
/** With --width N (480 or 1400), just that width (with --all). */
const onlyWidth = widthAt >= 0 ? Number(args[widthAt + 1]) : 0;

/** Editor-like colours per theme kind, set as the --vscode-* variables the panel reads. */
const THEMES = {
  dark: { cls: 'vscode-dark', vars: { bg: '#1f1f1f', fg: '#cccccc', efg: '#d4d4d4', desc: '#9d9d9d', border: '#3c3c3c', blue: '#3794ff', orange: '#d18616', green: '#89d185', red: '#f14c4c', purple: '#b180d7', yellow: '#cca700', focus: '#0078d4', button: '#0078d4', buttonFg: '#ffffff' } },
  light: { cls: 'vscode-light', vars: { bg: '#ffffff', fg: '#3b3b3b', efg: '#3b3b3b', desc: '#717171', border: '#e5e5e5', blue: '#1a85ff', orange: '#d18616', green: '#388a34', red: '#e51400', purple: '#652d90', yellow: '#bf8803', focus: '#005fb8', button: '#005fb8', buttonFg: '#ffffff' } },
  'high-contrast': { cls: 'vscode-high-contrast', vars: { bg: '#000000', fg: '#ffffff', efg: '#ffffff', desc: '#ffffff', border: '#6fc3df', contrast: '#6fc3df', blue: '#3794ff', orange: '#d18616', green: '#89d185', red: '#f14c4c', purple: '#b180d7', yellow: '#ffd700', focus: '#f38518', button: '#000000', buttonFg: '#ffffff' } },
};

/** The README's pictures: which example, which view and what to set first. */
const README = [
  { name: 'panel-spectrum.png', file: 'examples/plucked-box.qstate', tab: 'spectrum' },
  { name: 'panel-state.png', file: 'examples/plucked-box.qstate', tab: 'state', terms: 6 },
  { name: 'panel-time.png', file: 'examples/gaas-well-packet.qstate', tab: 'time', time: 40 },
  { name: 'panel-sweep.png', file: 'examples/gate-widened-well.qstate', tab: 'sweep' },
  { name: 'panel-sweep-map.png', file: 'examples/well-growth-map.qstate', tab: 'sweep' },
];

/** Bundles the engine's analysis and the panel's HTML builder for this script (they are TypeScript). */
async function engine() {
  const dir = mkdtempSync(join(tmpdir(), 'eigenspan-shots-'));
  const file = join(dir, 'engine.mjs');
  await build({
    stdin: { contents: "export { analyse } from './server/src/analysis/index';\nexport { runSweep } from './server/src/analysis/sweep/index';\nexport { dataOf } from './server/src/cli/data';\nexport { buildPanelHtml, makeNonce } from './client/src/panelHtml';\n", resolveDir: process.cwd(), loader: 'ts' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    outfile: file,
    logLevel: 'warning',
  });
  const mod = await import(pathToFileURL(file).href);
  rmSync(dir, { recursive: true, force: true });
  return mod;
}

/** A stand-in for the webview API: records posts, keeps state in sessionStorage, no theme of its own. */
const STUB = `window.__posted = [];
window.acquireVsCodeApi = function () {
  return {
    postMessage: function (m) { window.__posted.push(m); },
    getState: function () { var s = sessionStorage.getItem('panel-state'); return s ? JSON.parse(s) : undefined; },
    setState: function (s) { sessionStorage.setItem('panel-state', JSON.stringify(s)); return s; },
  };
};`;

async function serve(buildPanelHtml, makeNonce) {
  const web = resolve('dist/webview');
  let origin = '';
  const server = createServer((req, res) => {
    const path = new URL(req.url ?? '/', origin).pathname;
    if (path === '/') {
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
      return res.end(buildPanelHtml({ webviewBase: `${origin}/webview`, nonce: makeNonce(), preludeScripts: ['stub.js'] }));
    }
    if (path === '/webview/stub.js') return res.writeHead(200, { 'content-type': 'text/javascript' }), res.end(STUB);
    const m = /^\/webview\/(panel\.(js|css))$/.exec(path);
    if (m) return res.writeHead(200, { 'content-type': m[2] === 'js' ? 'text/javascript' : 'text/css' }), res.end(readFileSync(join(web, m[1])));
    res.writeHead(404);
    res.end();
  });
  await new Promise((r) => server.listen(0, '127.0.0.1', r));
  origin = `http://127.0.0.1:${server.address().port}`;
  return { origin, close: () => new Promise((r) => server.close(r)) };
}

/** Sets a theme's class and variables the way the editor does (class on body, variables on html). */
async function applyTheme(page, kind) {
  const t = THEMES[kind];
  await page.evaluate((t) => {
    document.body.classList.remove('vscode-dark', 'vscode-light', 'vscode-high-contrast');
    document.body.classList.add(t.cls);
    const v = t.vars;
    const set = (k, x) => x && document.documentElement.style.setProperty(k, x);
    set('--vscode-editor-background', v.bg);
    set('--vscode-foreground', v.fg);
    set('--vscode-editor-foreground', v.efg);
    set('--vscode-descriptionForeground', v.desc);
    set('--vscode-panel-border', v.border);
    set('--vscode-editorWidget-border', v.border);
    set('--vscode-contrastBorder', v.contrast);
    set('--vscode-contrastActiveBorder', v.contrast);
    for (const c of ['blue', 'orange', 'green', 'red', 'purple', 'yellow']) set(`--vscode-charts-${c}`, v[c]);
    set('--vscode-focusBorder', v.focus);
    set('--vscode-button-background', v.button);
    set('--vscode-button-foreground', v.buttonFg);
    set('--vscode-font-family', 'sans-serif');
    set('--vscode-font-size', '13px');
  }, t);
}

/** Posts a result as the host does and waits for the panel to draw it. */
async function post(page, msg) {
  await page.evaluate(async (m) => {
    const before = document.body.dataset.renders ?? '0';
    window.postMessage(m, '*');
    await new Promise((r) => {
      const tick = () => ((document.body.dataset.renders ?? '0') !== before ? r() : requestAnimationFrame(tick));
      requestAnimationFrame(tick);
    });
  }, msg);
}

const analysed = new Map();
/** The panel's result message body for an example, analysed once per run. */
function resultFor(analyse, dataOf, path) {
  if (!analysed.has(path)) {
    const source = readFileSync(path, 'utf8');
    // A generous time limit, so the pictures do not depend on how busy the machine is.
    // The data files the example names, read as the command line reads them (inside its folder).
    const { file: _file, ...result } = analyse(source, { samples: true, limits: { maxMillis: 60000 }, data: dataOf(path, source) });
    const lines = result.diagnostics.map((d) => source.slice(0, d.start).split('\n').length - 1);
    analysed.set(path, { json: JSON.stringify(result), lines });
  }
  const a = analysed.get(path);
  return { result: JSON.parse(a.json), lines: a.lines };
}

const swept = new Map();
/** The sweep of an example (as the language server sends it when the sweep ends), run once per run; null without one. */
function sweepFor(runSweep, dataOf, path) {
  const text = readFileSync(path, 'utf8');
  if (!swept.has(path)) swept.set(path, JSON.stringify(runSweep(text, { data: dataOf(path, text) }, { maxMillis: 600000 })?.result ?? null));
  return JSON.parse(swept.get(path));
}

async function shoot(page, engine, shot, path, version) {
  const { analyse, runSweep, dataOf } = engine;
  const { result, lines } = resultFor(analyse, dataOf, shot.file);
  const name = shot.file.slice(shot.file.lastIndexOf('/') + 1);
  const uri = `file:///ws/${name}`;
  // The sweep tab appears once the file's sweep has arrived; the others can be opened first.
  if (shot.tab !== 'sweep') await page.click(`#tab-${shot.tab}`);
  await post(page, { type: 'result', uri, version, fileName: name, result, diagnosticLines: lines });
  if (shot.tab === 'sweep') {
    await post(page, { type: 'sweep', uri, version, sweep: sweepFor(runSweep, dataOf, shot.file) });
    await page.click('#tab-sweep');
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
  }
  const set = async (id, v) => page.$eval(`#${id}`, (el, x) => ((el.value = String(x)), el.dispatchEvent(new Event('input'))), v);
  if (shot.terms) await set('terms', shot.terms);
  if (shot.time && result.evolution) await set('time', Math.min(shot.time, result.evolution.times.length - 1));
  await page.screenshot({ path });
}

/** The views of an example: the three, and the sweep view when it has a sweep line. */
const tabsOf = (path) => ['spectrum', 'state', 'time', ...(/^\s*sweep\s/m.test(readFileSync(path, 'utf8')) ? ['sweep'] : [])];

if (!existsSync(CHROMIUM)) throw new Error(`Chromium is needed at ${CHROMIUM} (apt-get install chromium)`);
if (!existsSync('dist/webview/panel.js')) throw new Error('dist/webview/panel.js is missing: run npm run build first');
const bundled = await engine();
const { buildPanelHtml, makeNonce } = bundled;
const server = await serve(buildPanelHtml, makeNonce);
const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking'] });
mkdirSync(out, { recursive: true });
let version = 0;
const written = [];
try {
  const plans = all
    ? Object.keys(THEMES)
        .filter((theme) => onlyTheme === '' || theme === onlyTheme)
        .flatMap((theme) => [480, 1400].filter((width) => onlyWidth === 0 || width === onlyWidth).map((width) => ({ theme, width })))
    : [{ theme: 'dark', width: 1100 }];
  for (const { theme, width } of plans) {
    const page = await browser.newPage({ viewport: { width, height: width < 800 ? 900 : 700 } });
    const errors = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(`${server.origin}/`);
    await applyTheme(page, theme);
    await page.waitForFunction(() => (window.__posted ?? []).length > 0);
    const shots = all
      ? readdirSync('examples').filter((f) => f.endsWith('.qstate') && f.includes(only)).sort().flatMap((f) => tabsOf(`examples/${f}`).map((tab) => ({ file: `examples/${f}`, tab, time: 40, name: `${f.replace(/\.qstate$/, '')}-${tab}-${theme}-${width}.png` })))
      : README;
    for (const shot of shots) {
      const path = join(out, shot.name);
      await shoot(page, bundled, shot, path, ++version);
      written.push(path);
    }
    if (errors.length) throw new Error(`page errors: ${errors.join('; ')}`);
    await page.close();
  }
} finally {
  await browser.close();
  await server.close();
}
console.log(`screenshots: ${written.length} written to ${out}`);
