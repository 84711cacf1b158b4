/**
 * The set-up every Chromium test file of the panel shares: the bundled webview served over HTTP, one
 * headless Chromium for the file, both closed after it, and an `it` that fails at once when the set-up
 * failed (a missing Chromium fails every test, it never skips one).
 */
import { it as vitestIt, expect, beforeAll, afterAll } from 'vitest';
import type { Browser } from 'playwright-core';
import { bundleWebview, servePanel, launchChromium, type PanelServer } from './harness';

export interface PanelSuiteOptions {
  /**
   * Runs once the server and the browser are up: open the file's pages here, check its preconditions
   * (a throw fails every test of the file with that error).
   */
  ready?: (up: { browser: Browser; server: PanelServer }) => Promise<void>;
  /** Every test also expects this list to stay empty (the pages' errors, collected by openPanel). */
  errors?: string[];
  /** Milliseconds for the set-up (default 120,000). */
  setupTimeout?: number;
  /** Milliseconds for each test that does not give its own (default: vitest's). */
  testTimeout?: number;
}

/** Registers the file's set-up and tear-down, and returns its `it`. */
export function panelSuite(options: PanelSuiteOptions = {}): (name: string, body: () => Promise<void>, timeout?: number) => void {
  let browser: Browser | undefined;
  let server: PanelServer | undefined;
  let setupError: unknown = null;
  beforeAll(async () => {
    try {
      server = await servePanel(await bundleWebview());
      browser = await launchChromium();
      await options.ready?.({ browser, server });
    } catch (e) {
      setupError = e;
    }
  }, options.setupTimeout ?? 120_000);
  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });
  return (name, body, timeout) => {
    vitestIt(
      name,
      async () => {
        if (setupError) throw setupError;
        await body();
        if (options.errors) expect(options.errors).toEqual([]);
      },
      timeout ?? options.testTimeout,
    );
  };
}
