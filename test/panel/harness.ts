/**
 * Browser test harness for the spectrum panel: bundles the webview as the build does, serves the real
 * HTML from `buildPanelHtml` on 127.0.0.1, and drives Debian's Chromium through playwright-core.
 * A missing browser is an error (the tests fail), never a skip.
 */
import { build } from 'esbuild';
import { createServer, type Server } from 'node:http';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { AddressInfo } from 'node:net';
import { chromium, type Browser } from 'playwright-core';
import { buildPanelHtml, makeNonce } from '../../client/src/panelHtml';

export const CHROMIUM = '/usr/bin/chromium';

/** Bundles client/webview/main.ts exactly as scripts/build.mjs does (browser, iife, es2022) into a fresh folder. */
export async function bundleWebview(): Promise<string> {
  const dir = mkdtempSync(join(tmpdir(), 'eigenspan-webview-'));
  await build({
    bundle: true,
    platform: 'browser',
    format: 'iife',
    target: 'es2022',
    entryPoints: ['client/webview/main.ts'],
    outfile: join(dir, 'panel.js'),
    logLevel: 'warning',
  });
  copyFileSync('client/webview/panel.css', join(dir, 'panel.css'));
  copyFileSync('test/panel/vscode-stub.js', join(dir, 'vscode-stub.js'));
  return dir;
}

/** A running page server and the nonces it handed out (one per load). */
export interface PanelServer {
  origin: string;
  nonces: string[];
  close(): Promise<void>;
}

const TYPES: Record<string, string> = { '.js': 'text/javascript', '.css': 'text/css' };

/** Serves `/` (the panel HTML, a fresh nonce per request) and `/webview/<file>` from `dir` on 127.0.0.1. */
export async function servePanel(dir: string): Promise<PanelServer> {
  const nonces: string[] = [];
  let origin = '';
  const server: Server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', origin);
    if (url.pathname === '/') {
      const nonce = makeNonce();
      nonces.push(nonce);
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
      res.end(buildPanelHtml({ webviewBase: `${origin}/webview`, nonce, preludeScripts: ['vscode-stub.js'] }));
      return;
    }
    const m = /^\/webview\/([\w.-]+)$/.exec(url.pathname);
    const file = m ? join(dir, m[1]!) : '';
    if (m && existsSync(file)) {
      res.writeHead(200, { 'content-type': TYPES[file.slice(file.lastIndexOf('.'))] ?? 'application/octet-stream' });
      res.end(readFileSync(file));
      return;
    }
    res.writeHead(404);
    res.end();
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return { origin, nonces, close: () => new Promise((resolve) => server.close(() => resolve())) };
}

/** Launches headless Chromium; throws (so the test fails) when the browser is not installed. */
export async function launchChromium(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) throw new Error(`Chromium is required for the panel tests and was not found at ${CHROMIUM} (apt-get install chromium).`);
  return chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking'] });
}

/** Makes a folder for screenshots. */
export function artifacts(): string {
  mkdirSync('test-artifacts', { recursive: true });
  return 'test-artifacts';
}
