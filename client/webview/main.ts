/**
 * The spectrum panel in the webview: receives typed results from the extension host, draws the three
 * linked views with ECharts and keeps the user's view settings across reloads.
 * Every incoming message is checked (see parseHostMessage) and invalid ones are dropped; text from the
 * file is only ever set with textContent.
 */
import * as echarts from 'echarts/core';
import { BarChart, LineChart } from 'echarts/charts';
import { GridComponent, TooltipComponent, LegendComponent, MarkLineComponent } from 'echarts/components';
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers';
import { parseHostMessage, type HostMessage, type PanelResult } from '../src/messages';
import { formatNumber } from '../src/format';
import { readPalette, themeKind, type Palette, type ThemeKind } from './theme';
import { DEFAULT_SETTINGS, spectrumOption, stateOption, timeOption, type TooltipRows, type ViewSettings } from './charts';
import { l2Distance, normalisedState, partialSum } from './physics';

echarts.use([BarChart, LineChart, GridComponent, TooltipComponent, LegendComponent, MarkLineComponent, CanvasRenderer, SVGRenderer]);

interface WebviewApi {
  postMessage(msg: unknown): void;
  getState(): unknown;
  setState(s: unknown): void;
}
declare function acquireVsCodeApi(): WebviewApi;

type Tab = ViewSettings['tab'];
const TABS: Tab[] = ['spectrum', 'state', 'time'];
const vscode = acquireVsCodeApi();
const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

/** Restores settings saved by an earlier load, field by field, ignoring anything malformed. */
function restore(saved: unknown): { settings: ViewSettings; scaleChosen: boolean } {
  const s = { ...DEFAULT_SETTINGS };
  let scaleChosen = false;
  if (typeof saved === 'object' && saved !== null) {
    const o = saved as Record<string, unknown>;
    if (TABS.includes(o.tab as Tab)) s.tab = o.tab as Tab;
    if (o.scale === 'linear' || o.scale === 'log') ((s.scale = o.scale), (scaleChosen = o.scaleChosen === true));
    if (o.axis === 'n' || o.axis === 'energy') s.axis = o.axis;
    if (Number.isInteger(o.terms) && (o.terms as number) >= 1) s.terms = o.terms as number;
    if (Number.isInteger(o.timeIndex) && (o.timeIndex as number) >= 0) s.timeIndex = o.timeIndex as number;
  }
  return { settings: s, scaleChosen };
}

const restored = restore(vscode.getState());
const settings: ViewSettings = restored.settings;
let scaleChosen = restored.scaleChosen;
let current: Extract<HostMessage, { type: 'result' }> | null = null;
let themeOverride: ThemeKind | null = null;
let palette: Palette = currentPalette();
let renders = 0;
let lastRenderMs = 0;
/** When the message being handled arrived, so the redraw time includes checking it. */
let messageAt: number | null = null;
let sized: Partial<Record<Tab, string>> = {};
let timer: number | null = null;

const charts: Record<Tab, echarts.ECharts> = {
  spectrum: echarts.init($('chart-spectrum'), undefined, { renderer: 'canvas' }),
  state: echarts.init($('chart-state'), undefined, { renderer: 'canvas' }),
  time: echarts.init($('chart-time'), undefined, { renderer: 'canvas' }),
};
const lastOption: Partial<Record<Tab, Record<string, unknown>>> = {};

function save(): void {
  vscode.setState({ ...settings, selected: null, scaleChosen });
}

function currentPalette(): Palette {
  const cs = getComputedStyle(document.body);
  return readPalette((n) => cs.getPropertyValue(n), themeKind(document.body, themeOverride));
}

/** Tooltip content built from text nodes (never HTML strings). */
function tooltip(rows: TooltipRows): HTMLElement {
  const table = document.createElement('table');
  table.className = 'tip';
  for (const [k, v] of rows) {
    const tr = table.insertRow();
    tr.insertCell().textContent = k;
    tr.insertCell().textContent = v;
  }
  return table;
}

function setText(id: string, text: string): void {
  $(id).textContent = text;
}

function show(section: 'views' | 'problems' | 'empty'): void {
  $('views').hidden = section !== 'views';
  $('problems').hidden = section !== 'problems';
  $('empty').hidden = section !== 'empty';
  for (const id of ['export-png', 'export-svg']) ($(id) as HTMLButtonElement).disabled = section !== 'views';
}

function summary(r: PanelResult): void {
  const el = $('summary');
  el.replaceChildren();
  const eu = r.units.energy ? ` ${r.units.energy}` : '';
  const items: [string, string][] = [
    ['⟨E⟩', r.energy?.mean == null ? '∞ or n/a' : `${formatNumber(r.energy.mean, 5)}${eu}`],
    ['ΔE', r.energy?.spread == null ? '∞ or n/a' : `${formatNumber(r.energy.spread, 4)}${eu}`],
    ['captured', r.captured == null ? '–' : `${formatNumber(100 * r.captured, 6)} %`],
    ['norm', formatNumber(r.norm, 6)],
    ['parity', r.parity ?? '–'],
    ['levels for 99.9 %', r.levelsFor999 == null ? 'not reached' : String(r.levelsFor999)],
  ];
  if (r.continuum !== undefined) items.push(['continuum', formatNumber(r.continuum, 4)]);
  if (r.decay && r.decay.classification !== 'unknown') items.push(['decay', `${r.decay.classification}${r.decay.exponent !== null ? ` (n^-${formatNumber(r.decay.exponent, 3)})` : ''}`]);
  for (const [k, v] of items) {
    const span = document.createElement('span');
    span.className = 'figure';
    const b = document.createElement('b');
    b.textContent = k;
    span.append(b, ' ', v);
    el.append(span);
  }
}

function problems(msg: Extract<HostMessage, { type: 'result' }>): boolean {
  const errors = msg.result.diagnostics.map((d, i) => ({ d, line: msg.diagnosticLines?.[i] })).filter(({ d }) => d.severity === 'error');
  if (errors.length === 0) return false;
  setText('problems-title', `${msg.fileName} has ${errors.length} error${errors.length > 1 ? 's' : ''}; plots resume when it is fixed.`);
  const list = $('problems-list');
  list.replaceChildren();
  for (const { d, line } of errors.slice(0, 50)) {
    const li = document.createElement('li');
    const code = document.createElement('code');
    code.textContent = d.code;
    li.append(line !== undefined ? `line ${line + 1}: ` : '', code, ' ', d.message);
    if (line !== undefined) {
      li.tabIndex = 0;
      li.className = 'link';
      const go = () => vscode.postMessage({ type: 'reveal', line });
      li.addEventListener('click', go);
      li.addEventListener('keydown', (e) => e.key === 'Enter' && go());
    }
    list.append(li);
  }
  return true;
}

function syncControls(r: PanelResult | null): void {
  for (const t of TABS) {
    const on = t === settings.tab;
    $(`tab-${t}`).setAttribute('aria-selected', String(on));
    $(`tab-${t}`).tabIndex = on ? 0 : -1;
    $(`view-${t}`).hidden = !on;
  }
  ($('scale') as HTMLSelectElement).value = settings.scale;
  ($('axis') as HTMLSelectElement).value = settings.axis;
  const maxK = r ? Math.max(1, Math.min(r.levels.length, r.samples?.phi.length ?? r.levels.length)) : 1;
  const terms = $('terms') as HTMLInputElement;
  terms.max = String(maxK);
  terms.value = String(Math.min(settings.terms, maxK));
  const steps = r?.evolution?.times.length ?? 1;
  const time = $('time') as HTMLInputElement;
  time.max = String(Math.max(0, steps - 1));
  time.value = String(Math.min(settings.timeIndex, steps - 1));
  if (r && r.samples) {
    const st = normalisedState(r.samples);
    const part = partialSum(r.samples, r.levels, settings.terms);
    const err = l2Distance(r.samples.x, st.re, st.im, part.re, part.im);
    setText('terms-out', `K = ${part.terms}: ‖ψ − ψ_K‖ = ${formatNumber(err, 3)}`);
  } else setText('terms-out', '');
  const ev = r?.evolution;
  const t = ev?.times[Math.min(settings.timeIndex, (ev?.times.length ?? 1) - 1)];
  setText('time-out', t === undefined ? 'no time evolution' : `t = ${formatNumber(t, 4)} ${r?.units.time ?? '(ħ/energy unit)'}`);
}

/** Draws the visible view now; the hidden ones are drawn when their tab is opened. */
function render(): void {
  const started = performance.now();
  const r = current?.result ?? null;
  syncControls(r);
  if (!current || !r) return;
  setText('file-name', current.fileName);
  summary(r);
  if (problems(current)) {
    show('problems');
  } else if (r.levels.length === 0) {
    setText('empty-reason', `No expansion for ${current.fileName} yet (no levels were computed).`);
    show('empty');
  } else {
    show('views');
    const ctx = { result: r, settings, palette, tooltip };
    const tab = settings.tab;
    let option: Record<string, unknown> | null = null;
    if (tab === 'spectrum') option = spectrumOption(ctx);
    else if (tab === 'state') option = r.samples ? stateOption(ctx) : null;
    else option = r.evolution && r.evolution.times.length > 0 ? timeOption(ctx) : null;
    if (option) {
      // Resizing is costly; do it only when the view's box changed (a tab that was hidden has none).
      const el = $(`chart-${tab}`);
      const size = `${el.clientWidth}x${el.clientHeight}`;
      if (sized[tab] !== size) ((sized[tab] = size), charts[tab].resize());
      // The first draw builds everything; later ones replace only what changes, which ECharts does far faster.
      if (lastOption[tab]) charts[tab].setOption(option, { replaceMerge: ['series', 'xAxis', 'yAxis', 'grid'], lazyUpdate: false, silent: true });
      else charts[tab].setOption(option, { notMerge: true, lazyUpdate: false, silent: true });
      lastOption[tab] = option;
    } else {
      charts[tab].clear();
      delete lastOption[tab];
    }
  }
  renders++;
  lastRenderMs = performance.now() - (messageAt ?? started);
  messageAt = null;
  document.body.dataset.renders = String(renders);
  document.body.dataset.version = String(current.version);
}

function stopPlaying(): void {
  if (timer !== null) window.clearInterval(timer);
  timer = null;
  $('play').textContent = 'Play';
  $('play').setAttribute('aria-pressed', 'false');
}

function onMessage(data: unknown): void {
  messageAt = performance.now();
  const msg = parseHostMessage(data);
  if (!msg) return;
  switch (msg.type) {
    case 'result':
      if (current && current.uri === msg.uri && msg.version < current.version) return;
      if (!current || current.uri !== msg.uri) settings.selected = null;
      current = msg;
      render();
      break;
    case 'empty':
      current = null;
      stopPlaying();
      setText('empty-reason', msg.reason);
      setText('file-name', 'no file');
      $('summary').replaceChildren();
      show('empty');
      break;
    case 'theme':
      themeOverride = msg.kind;
      palette = currentPalette();
      render();
      break;
    case 'settings':
      if (!scaleChosen) ((settings.scale = msg.plotScale), render());
      break;
  }
}

window.addEventListener('message', (e: MessageEvent) => onMessage(e.data));

function selectTab(t: Tab): void {
  settings.tab = t;
  save();
  render();
}
for (const t of TABS) {
  $(`tab-${t}`).addEventListener('click', () => selectTab(t));
  // Arrow keys move between tabs, as the WAI-ARIA tabs pattern describes.
  $(`tab-${t}`).addEventListener('keydown', (e) => {
    const step = e.key === 'ArrowRight' ? 1 : e.key === 'ArrowLeft' ? -1 : 0;
    if (!step) return;
    const next = TABS[(TABS.indexOf(t) + step + TABS.length) % TABS.length]!;
    selectTab(next);
    $(`tab-${next}`).focus();
  });
}
$('scale').addEventListener('change', (e) => {
  settings.scale = (e.target as HTMLSelectElement).value === 'log' ? 'log' : 'linear';
  scaleChosen = true;
  save();
  render();
});
$('axis').addEventListener('change', (e) => {
  settings.axis = (e.target as HTMLSelectElement).value === 'energy' ? 'energy' : 'n';
  save();
  render();
});
$('terms').addEventListener('input', (e) => {
  settings.terms = Math.max(1, parseInt((e.target as HTMLInputElement).value, 10) || 1);
  save();
  render();
});
$('time').addEventListener('input', (e) => {
  settings.timeIndex = Math.max(0, parseInt((e.target as HTMLInputElement).value, 10) || 0);
  save();
  render();
});
$('play').addEventListener('click', () => {
  if (timer !== null) return stopPlaying();
  const steps = current?.result.evolution?.times.length ?? 0;
  if (steps < 2) return;
  $('play').textContent = 'Pause';
  $('play').setAttribute('aria-pressed', 'true');
  timer = window.setInterval(() => {
    const n = current?.result.evolution?.times.length ?? 0;
    if (n < 2 || settings.tab !== 'time') return stopPlaying();
    settings.timeIndex = (settings.timeIndex + 1) % n;
    render();
  }, 50);
});

// Linking: picking a level in the spectrum sets K to include it and marks it in the state view.
charts.spectrum.on('click', (params: unknown) => {
  const k = (params as { dataIndex?: number }).dataIndex;
  if (typeof k !== 'number' || !current) return;
  settings.selected = k;
  settings.terms = Math.max(settings.terms, k + 1);
  save();
  render();
});

function exportPlot(format: 'png' | 'svg'): void {
  const tab = settings.tab;
  const option = lastOption[tab];
  if (!option) return;
  const chart = charts[tab];
  let data: string;
  if (format === 'png') {
    data = chart.getDataURL({ type: 'png', pixelRatio: 2, backgroundColor: palette.background });
  } else {
    // A server-side-style SVG instance renders the same option to a string without touching the DOM.
    const svg = echarts.init(null, undefined, { renderer: 'svg', ssr: true, width: chart.getWidth(), height: chart.getHeight() });
    svg.setOption(option);
    data = svg.renderToSVGString();
    svg.dispose();
  }
  vscode.postMessage({ type: 'export', format, view: tab, data });
}
$('export-png').addEventListener('click', () => exportPlot('png'));
$('export-svg').addEventListener('click', () => exportPlot('svg'));

// Follow the editor's theme: VS Code marks the kind with a class on <body> and sets the colours as
// CSS variables on <html>; a switch between two themes of one kind changes only the variables.
let themeFrame: number | null = null;
const themeObserver = new MutationObserver(() => {
  if (themeFrame !== null) return;
  themeFrame = requestAnimationFrame(() => {
    themeFrame = null;
    palette = currentPalette();
    render();
  });
});
themeObserver.observe(document.body, { attributes: true, attributeFilter: ['class', 'style'] });
themeObserver.observe(document.documentElement, { attributes: true, attributeFilter: ['class', 'style'] });

new ResizeObserver(() => {
  sized = {};
  charts[settings.tab].resize();
}).observe($('views'));

/** Read-only facts about what is drawn, for the browser tests and for troubleshooting. */
(window as unknown as { eigenspanPanel: unknown }).eigenspanPanel = {
  inspect() {
    const tab = settings.tab;
    const opt = charts[tab].getOption() as { series?: { id?: string; data?: unknown[] }[]; backgroundColor?: unknown } | undefined;
    const series = (opt?.series ?? []).map((s) => ({ id: String(s.id ?? ''), data: s.data ?? [] }));
    return { tab, settings: { ...settings }, renders, lastRenderMs, version: current?.version ?? null, background: opt?.backgroundColor ?? null, palette: { ...palette }, series };
  },
};

show('empty');
syncControls(null);
vscode.postMessage({ type: 'ready' });
