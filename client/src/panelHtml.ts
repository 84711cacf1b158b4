/**
 * Builds the spectrum panel's HTML. Used by the extension (with webview URIs) and by the browser
 * tests (with a local http server), so both run exactly the same page. Pure.
 */

/** Inputs of `buildPanelHtml`. */
export interface PanelHtmlOptions {
  /** URI (as text) of the folder holding panel.js and panel.css, with no trailing slash. */
  webviewBase: string;
  /** A fresh nonce for this load (see `makeNonce`); only scripts carrying it may run. */
  nonce: string;
  /**
   * Extra scripts (file names inside `webviewBase`) loaded before the panel, in order. Default none.
   * The tests use this to provide a stand-in for the webview API through the allowed script path.
   */
  preludeScripts?: string[];
  /** Window title (default "Eigenspan spectrum"). */
  title?: string;
}

/** Escapes text for a double-quoted HTML attribute or a text node (HTML standard, section 13.1). */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);
}

/**
 * A nonce of 128 random bits from the platform's cryptographic generator, base64-encoded
 * (CSP Level 3 asks for at least 128 bits, freshly generated for each response).
 */
export function makeNonce(): string {
  const bytes = new Uint8Array(16);
  globalThis.crypto.getRandomValues(bytes);
  let s = '';
  for (const b of bytes) s += String.fromCharCode(b);
  return btoa(s);
}

/**
 * The Content-Security-Policy of the panel: nothing by default; scripts only with this load's nonce
 * and from the panel's own folder; styles, images and fonts only from that folder (images also as
 * data: URLs, which the PNG export produces).
 */
export function panelCsp(webviewBase: string, nonce: string): string {
  const base = `${webviewBase}/`;
  return [
    "default-src 'none'",
    `script-src 'nonce-${nonce}' ${base}`,
    `style-src ${base}`,
    `img-src ${base} data:`,
    `font-src ${base}`,
  ].join('; ');
}

/** The sweep view (its tab is shown when the file has a sweep): the quantity chooser, a status line and the chart. */
const SWEEP_VIEW = `  <section id="view-sweep" class="view" role="tabpanel" aria-labelledby="tab-sweep">
    <div class="controls">
      <label>Show <select id="sweep-quantity"><option value="overview">captured weight, lowest populations, ⟨E⟩</option></select></label>
      <output id="sweep-status" aria-live="polite"></output>
    </div>
    <div id="notes-sweep" class="notes" hidden></div>
    <p id="empty-sweep" class="empty" hidden></p>
    <div id="chart-sweep" class="chart"></div>
  </section>
`;

/** The state view's banner when it shows a sweep point instead of the file's own values. */
const POINT_BANNER = `    <div id="state-point" class="point-banner" role="status" hidden>
      <span id="state-point-text"></span>
      <button type="button" id="state-point-back">Back to the file's own value</button>
    </div>
`;

/** The full HTML document of the panel. Nothing from the analysed file is written into it. */
export function buildPanelHtml(options: PanelHtmlOptions): string {
  const base = options.webviewBase.replace(/\/+$/, '');
  const nonce = escapeHtml(options.nonce);
  const src = (file: string) => escapeHtml(`${base}/${encodeURIComponent(file)}`);
  const scripts = [...(options.preludeScripts ?? []), 'panel.js']
    .map((f) => `<script nonce="${nonce}" src="${src(f)}"></script>`)
    .join('\n');
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${escapeHtml(panelCsp(base, options.nonce))}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<link rel="stylesheet" href="${src('panel.css')}">
<title>${escapeHtml(options.title ?? 'Eigenspan spectrum')}</title>
</head>
<body>
<header class="bar">
  <span id="file-name" class="file-name">no file</span>
  <nav class="tabs" role="tablist" aria-label="Views">
    <button type="button" role="tab" id="tab-spectrum" data-tab="spectrum" aria-controls="view-spectrum">Spectrum</button>
    <button type="button" role="tab" id="tab-state" data-tab="state" aria-controls="view-state">State</button>
    <button type="button" role="tab" id="tab-time" data-tab="time" aria-controls="view-time">Time</button>
    <button type="button" role="tab" id="tab-sweep" data-tab="sweep" aria-controls="view-sweep" hidden>Sweep</button>
  </nav>
  <span class="tools">
    <button type="button" id="export-png" title="Save the current plot as a PNG image">PNG</button>
    <button type="button" id="export-svg" title="Save the current plot as an SVG drawing">SVG</button>
  </span>
</header>
<section id="summary" class="summary" aria-live="polite"></section>
<section id="problems" class="problems" hidden>
  <h2 id="problems-title">The file has errors</h2>
  <ul id="problems-list"></ul>
</section>
<section id="empty" class="empty" hidden><p id="empty-reason">Open a .qstate file to see its spectrum.</p></section>
<section id="findings" class="findings" hidden aria-label="Findings that leave the results valid">
  <ul id="findings-list"></ul>
</section>
<main id="views" class="views">
  <section id="view-spectrum" class="view" role="tabpanel" aria-labelledby="tab-spectrum">
    <div class="controls">
      <label>Scale <select id="scale"><option value="auto" id="scale-auto">auto</option><option value="linear">linear</option><option value="log">log</option></select></label>
      <label>Against <select id="axis"><option value="n">level n</option><option value="energy">energy E_n</option></select></label>
    </div>
    <div id="notes-spectrum" class="notes" hidden></div>
    <p id="empty-spectrum" class="empty" hidden></p>
    <div id="chart-spectrum" class="chart"></div>
  </section>
  <section id="view-state" class="view" role="tabpanel" aria-labelledby="tab-state">
${POINT_BANNER}    <div class="controls">
      <label for="terms">Terms K</label>
      <input type="range" id="terms" min="1" max="1" step="1" value="1">
      <output id="terms-out" for="terms"></output>
    </div>
    <div id="notes-state" class="notes" hidden></div>
    <p id="empty-state" class="empty" hidden></p>
    <div id="chart-state" class="chart"></div>
  </section>
  <section id="view-time" class="view" role="tabpanel" aria-labelledby="tab-time">
    <div class="controls" id="time-controls">
      <button type="button" id="play" aria-pressed="false">Play</button>
      <input type="range" id="time" min="0" max="0" step="1" value="0" aria-label="Time step">
      <output id="time-out" for="time"></output>
    </div>
    <div id="notes-time" class="notes" hidden></div>
    <p id="empty-time" class="empty" hidden></p>
    <div id="chart-time" class="chart"></div>
  </section>
${SWEEP_VIEW}</main>
${scripts}
</body>
</html>
`;
}
