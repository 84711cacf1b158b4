/**
 * Drives the panel page in Chromium for the browser tests and the screenshot script: real engine
 * results posted as the extension host posts them, and read-only views of what the page drew.
 */
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { analyse } from '../../server/src/analysis/index';
import type { PanelResult } from '../../client/src/messages';

/** A drawn text and its box (see client/webview/inspect.ts). */
export interface DrawnText {
  text: string;
  x: number;
  y: number;
  width: number;
  height: number;
}

/** What the page's inspect() reports. */
export interface Inspect {
  tab: string;
  lastRenderMs: number;
  settings: { terms: number; scale: string; timeIndex: number; tab: string; axis: string };
  renders: number;
  version: number | null;
  background: unknown;
  palette: { background: string; foreground: string; lineWidth: number; kind: string };
  series: { id: string; data: unknown[] }[];
}

/** The analysis of a source text as the server sends it to the panel (no syntax tree), with the findings' lines. */
export function resultOf(source: string): { result: PanelResult; lines: number[] } {
  // A generous time limit, so the results do not depend on how busy the machine is.
  const { file: _file, ...result } = analyse(source, { samples: true, limits: { maxMillis: 60_000 } });
  const lines = result.diagnostics.map((d) => source.slice(0, d.start).split('\n').length - 1);
  return { result: JSON.parse(JSON.stringify(result)) as PanelResult, lines };
}

/** The host's result message for a file's text. */
export function messageFor(source: string, version: number, uri: string): Record<string, unknown> {
  const { result, lines } = resultOf(source);
  return { type: 'result', uri, version, fileName: uri.slice(uri.lastIndexOf('/') + 1), result, diagnosticLines: lines };
}

/** The host's result message for a file on disk. */
export const messageForFile = (path: string, version: number) => messageFor(readFileSync(path, 'utf8'), version, `file:///ws/${path.slice(path.lastIndexOf('/') + 1)}`);

/** Opens the panel page at a width and waits for its ready message. */
export async function openPanel(browser: Browser, origin: string, width: number, height = 720, errors: string[] = []): Promise<Page> {
  const p = await browser.newPage({ viewport: { width, height } });
  p.on('pageerror', (e) => errors.push(e.message));
  p.on('console', (m) => m.type() === 'error' && !/Content Security Policy/.test(m.text()) && errors.push(m.text()));
  await p.goto(`${origin}/`);
  await p.evaluate(() => document.addEventListener('securitypolicyviolation', (e) => ((window as unknown as { __csp: string[] }).__csp ??= []).push(`${e.violatedDirective} ${e.blockedURI}`)));
  await p.waitForFunction(() => ((window as unknown as { __posted?: unknown[] }).__posted ?? []).length > 0);
  return p;
}

/** Posts a message into the page as the host would and resolves once a frame has been drawn after it. */
export async function post(p: Page, msg: unknown): Promise<void> {
  await p.evaluate(async (m) => {
    const before = document.body.dataset.renders ?? '0';
    window.postMessage(m, '*');
    await new Promise<void>((resolve) => {
      let frames = 0;
      const tick = () => ((document.body.dataset.renders ?? '0') !== before || ++frames > 3 ? resolve() : requestAnimationFrame(tick));
      requestAnimationFrame(tick);
    });
  }, msg);
}

type PanelApi = {
  inspect(): Inspect;
  texts(): DrawnText[];
  axisLabels(): { x: string[][]; y: string[][] };
  itemLayouts(id: string): ({ x: number; y: number; width: number; height: number } | null)[];
  yPixel(index: number, value: number): number;
  xPixel(value: number): number;
  linePoints(id: string): [number, number][];
};

/** Calls one of the page's read-only inspection functions. */
export function panel<K extends keyof PanelApi>(p: Page, name: K, ...args: Parameters<PanelApi[K]>): Promise<ReturnType<PanelApi[K]>> {
  return p.evaluate(([n, a]) => {
    const api = (window as unknown as { eigenspanPanel: Record<string, (...x: unknown[]) => unknown> }).eigenspanPanel;
    return api[n as string]!(...(a as unknown[]));
  }, [name, args] as const) as Promise<ReturnType<PanelApi[K]>>;
}

/** Opens a tab by clicking it, as a user does. */
export async function openTab(p: Page, tab: 'spectrum' | 'state' | 'time'): Promise<void> {
  await p.click(`#tab-${tab}`);
}

/** Pairs of drawn texts whose boxes overlap by more than a pixel each way. */
export function overlaps(texts: DrawnText[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < texts.length; i++) {
    for (let j = i + 1; j < texts.length; j++) {
      const a = texts[i]!;
      const b = texts[j]!;
      const w = Math.min(a.x + a.width, b.x + b.width) - Math.max(a.x, b.x);
      const h = Math.min(a.y + a.height, b.y + b.height) - Math.max(a.y, b.y);
      if (w > 1 && h > 1) out.push(`"${a.text}" overlaps "${b.text}"`);
    }
  }
  return out;
}

/** Sets the value of a range input and fires its input event, as dragging it does. */
export async function slide(p: Page, id: string, value: number): Promise<void> {
  await p.$eval(`#${id}`, (el, v) => {
    (el as HTMLInputElement).value = String(v);
    el.dispatchEvent(new Event('input'));
  }, value);
}
