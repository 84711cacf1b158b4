/**
 * The spectrum panel in the webview: receives typed results from the extension host, draws the three
 * linked views with ECharts and keeps the user's view settings across reloads.
 * Every incoming message is checked (see parseHostMessage) and invalid ones are dropped; text from the
 * file is only ever set with textContent.
 */
import * as echarts from 'echarts/core';
import { BarChart, CustomChart, LineChart, ScatterChart } from 'echarts/charts';
import { GridComponent, TooltipComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, VisualMapContinuousComponent } from 'echarts/components';
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers';
import { parseHostMessage, type HostMessage, type PanelResult } from '../src/messages';
import { formatNumber } from '../src/format';
import { oscillatorQuantum, quantaText } from '../../server/src/shared/quanta';
import { decayText } from '../../server/src/shared/decayText';
import { readPalette, themeKind, type Palette, type ThemeKind } from './theme';
import { capturedText, continuumText, DEFAULT_SETTINGS, describeView, effectiveScale, invalidates, missingEnergyText, type TooltipRows, type ViewSettings } from './charts';
import { l2Distance, partialSum, sampledState } from './physics';
import { axisLabels, drawnTexts, itemLayouts, linePoints, xPixel, yPixel } from './inspect';
import { pickedText, SweepTab, sweepStatus, syncQuantities } from './sweepTab';
import { SWEEP_QUANTITIES, type SweepQuantity } from './charts/sweepQuantity';

echarts.use([BarChart, LineChart, ScatterChart, CustomChart, GridComponent, TooltipComponent, LegendComponent, MarkLineComponent, MarkAreaComponent, VisualMapContinuousComponent, CanvasRenderer, SVGRenderer]);

interface WebviewApi {
  postMessage(msg: unknown): void;
  getState(): unknown;
  setState(s: unknown): void;
}
declare function acquireVsCodeApi(): WebviewApi;

type Tab = ViewSettings['tab'];
const TABS: Tab[] = ['spectrum', 'state', 'time', 'sweep'];
const vscode = acquireVsCodeApi();
const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

/** Restores settings saved by an earlier load, field by field, ignoring anything malformed. */
function restore(saved: unknown): { settings: ViewSettings; scaleChosen: boolean } {
  const s = { ...DEFAULT_SETTINGS };
  let scaleChosen = false;
  if (typeof saved === 'object' && saved !== null) {
    const o = saved as Record<string, unknown>;
    if (TABS.includes(o.tab as Tab)) s.tab = o.tab as Tab;
    if (o.scale === 'linear' || o.scale === 'log' || o.scale === 'auto') ((s.scale = o.scale), (scaleChosen = o.scaleChosen === true));
    if (o.axis === 'n' || o.axis === 'energy') s.axis = o.axis;
    if (Number.isInteger(o.terms) && (o.terms as number) >= 1) s.terms = o.terms as number;
    if (Number.isInteger(o.timeIndex) && (o.timeIndex as number) >= 0) s.timeIndex = o.timeIndex as number;
    if (SWEEP_QUANTITIES.includes(o.sweepQuantity as SweepQuantity)) s.sweepQuantity = o.sweepQuantity as SweepQuantity;
  }
  return { settings: s, scaleChosen };
}

const restored = restore(vscode.getState());
const settings: ViewSettings = restored.settings;
let scaleChosen = restored.scaleChosen;
type ResultMessage = Extract<HostMessage, { type: 'result' }>;
let current: ResultMessage | null = null;
/** The last result whose plots meant something, drawn dimmed while the file has errors that invalidate its results. */
let lastGood: ResultMessage | null = null;
let themeOverride: ThemeKind | null = null;
let palette: Palette = currentPalette();
let renders = 0;
let lastRenderMs = 0;
/** When the message being handled arrived, so the redraw time includes checking it. */
let messageAt: number | null = null;
let sized: Partial<Record<Tab, string>> = {};
let timer: number | null = null;
/** The document's sweep and the sweep point picked for the state view. */
const sweepTab = new SweepTab();
/** The quantity the sweep view draws (the chosen one when the sweep has it). */
let shownQuantity: SweepQuantity = 'overview';
/** A reload left the panel on the sweep view: it returns there when the sweep arrives (the result comes first). */
let backToSweep = settings.tab === 'sweep';

const charts: Record<Tab, echarts.ECharts> = {
  spectrum: echarts.init($('chart-spectrum'), undefined, { renderer: 'canvas' }),
  state: echarts.init($('chart-state'), undefined, { renderer: 'canvas' }),
  time: echarts.init($('chart-time'), undefined, { renderer: 'canvas' }),
  sweep: echarts.init($('chart-sweep'), undefined, { renderer: 'canvas' }),
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

/**
 * Which sections are visible: the plots (possibly dimmed as stale), the list of findings that invalidate
 * the results, or the empty-state text.
 */
function show(section: { views: boolean; stale?: boolean; problems?: boolean; empty?: boolean }): void {
  $('views').hidden = !section.views;
  $('views').classList.toggle('stale', section.stale === true);
  $('views').setAttribute('aria-disabled', String(section.stale === true));
  $('problems').hidden = section.problems !== true;
  $('empty').hidden = section.empty !== true;
  for (const id of ['export-png', 'export-svg']) ($(id) as HTMLButtonElement).disabled = !section.views || section.stale === true;
}

/** An oscillator's energy also in its quantum ħω, ` (2.5 ħω)`; nothing for other systems (display only). */
function inQuanta(r: PanelResult, e: number): string {
  const q = oscillatorQuantum(r.system);
  return q === null ? '' : ` (${quantaText(e, q)})`;
}

function summaryItems(r: PanelResult): [string, string][] {
  const eu = r.units.energy ? ` ${r.units.energy}` : '';
  const c = r.system?.center;
  const about = c === null || c === undefined ? '' : ` about x = ${formatNumber(c)}${r.units.length ? ` ${r.units.length}` : ''}`;
  const items: [string, string][] = [
    ['⟨E⟩', r.energy?.mean == null ? missingEnergyText(r, 'mean') : `${formatNumber(r.energy.mean, 5)}${eu}${inQuanta(r, r.energy.mean)}`],
    ['ΔE', r.energy?.spread == null ? missingEnergyText(r, 'spread') : spreadText(r.energy.spread, r.energy.mean, eu, inQuanta(r, r.energy.spread))],
    ['captured', r.captured == null ? '–' : capturedText(r.captured)],
    r.mixture ? ['purity Tr ρ²', formatNumber(r.purity, 6)] : ['norm as written', formatNumber(r.norm, 6)],
    ['parity', r.parity === null ? 'none (V has no symmetry centre)' : `${r.parity}${about}`],
    // The captured weight stands beside it: one figure, not two.
    ['levels for 99.9 %', r.levelsFor999 == null ? `not reached with ${r.levels.length} level${r.levels.length === 1 ? '' : 's'}` : String(r.levelsFor999)],
  ];
  if (r.continuum !== undefined) items.push(['continuum', continuumText(r.continuum)]);
  if (typeof r.meanQuantumNumber === 'number') items.push(['⟨n⟩', formatNumber(r.meanQuantumNumber, 5)]);
  const decay = decayText(r.decay, { mixture: Boolean(r.mixture), kind: r.system?.kind, parity: r.parity });
  if (decay !== null) items.push(['decay', decay]);
  return items;
}

function summary(r: PanelResult): void {
  const el = $('summary');
  el.replaceChildren();
  for (const [k, v] of summaryItems(r)) {
    const span = document.createElement('span');
    span.className = 'figure';
    const b = document.createElement('b');
    b.textContent = k;
    span.append(b, ' ', v);
    el.append(span);
  }
}

/** Fills a list with findings, each a link to its line when the line is known. */
function listFindings(list: HTMLElement, msg: ResultMessage, keep: (d: PanelResult['diagnostics'][number]) => boolean): number {
  const items = msg.result.diagnostics.map((d, i) => ({ d, line: msg.diagnosticLines?.[i] })).filter(({ d }) => keep(d));
  list.replaceChildren();
  for (const { d, line } of items.slice(0, 50)) {
    const li = document.createElement('li');
    li.className = d.severity;
    const code = document.createElement('code');
    code.textContent = d.code;
    li.append(line !== undefined ? `line ${line + 1}: ` : '', code, ' ', d.message);
    if (line !== undefined) {
      li.tabIndex = 0;
      li.classList.add('link');
      const go = () => vscode.postMessage({ type: 'reveal', line });
      li.addEventListener('click', go);
      li.addEventListener('keydown', (e) => e.key === 'Enter' && go());
    }
    list.append(li);
  }
  return items.length;
}

/** The findings that invalidate the results, in place of fresh plots. */
function problems(msg: ResultMessage): void {
  const n = listFindings($('problems-list'), msg, (d) => d.severity === 'error');
  const last = lastGood ? ' The plots below are from the last analysis without them, dimmed.' : '';
  setText('problems-title', `${msg.fileName} has ${n} error${n === 1 ? '' : 's'} that make the results meaningless; the plots resume when ${n === 1 ? 'it is' : 'they are'} fixed.${last}`);
}

/** Failed checks and warnings that leave the expansion valid, shown beside the plots. */
function findings(msg: ResultMessage | null): void {
  const n = msg ? listFindings($('findings-list'), msg, (d) => d.severity !== 'info') : 0;
  $('findings').hidden = n === 0;
}

function syncControls(r: PanelResult | null): void {
  syncSweepControls();
  for (const t of TABS) {
    const on = t === settings.tab;
    $(`tab-${t}`).setAttribute('aria-selected', String(on));
    $(`tab-${t}`).tabIndex = on ? 0 : -1;
    $(`view-${t}`).hidden = !on;
  }
  ($('scale') as HTMLSelectElement).value = settings.scale;
  $('scale-auto').textContent = r ? `auto (${effectiveScale({ result: r, settings, palette, tooltip })})` : 'auto';
  ($('axis') as HTMLSelectElement).value = settings.axis;
  const maxK = r ? Math.max(1, Math.min(r.levels.length, r.samples?.phi.length ?? r.levels.length)) : 1;
  const terms = $('terms') as HTMLInputElement;
  terms.max = String(maxK);
  terms.value = String(Math.min(settings.terms, maxK));
  // A mixed state has no wave function to sum: a slider that changes nothing is disabled.
  terms.disabled = Boolean(r?.mixture);
  if (r && r.samples) {
    const st = sampledState(r.samples);
    const part = partialSum(r.samples, r.levels, settings.terms);
    const err = l2Distance(r.samples.x, st.re, st.im, part.re, part.im);
    // A mixed state has no wave function to sum.
    setText('terms-out', r.mixture ? 'a mixed state has no wave function, so no partial sum ψ_K' : `K = ${part.terms}: ‖ψ − ψ_K‖ = ${formatNumber(err, 3)}`);
  } else setText('terms-out', '');
  syncTime(r);
}

function syncTime(r: PanelResult | null): void {
  const ev = r?.evolution;
  const steps = ev?.times.length ?? 0;
  const time = $('time') as HTMLInputElement;
  time.max = String(Math.max(0, steps - 1));
  time.value = String(Math.min(settings.timeIndex, Math.max(0, steps - 1)));
  time.disabled = steps < 2;
  ($('play') as HTMLButtonElement).disabled = steps < 2;
  // Without an evolution there is nothing to play: the view says how to get one instead.
  $('time-controls').hidden = steps === 0;
  const t = ev?.times[Math.min(settings.timeIndex, steps - 1)];
  const unit = r?.units.time ?? (r?.units.energy ? `(ħ/${r.units.energy})` : '(natural units, ħ = 1)');
  setText('time-out', t === undefined || t === null ? '' : `t = ${formatNumber(t, 4)} ${unit}`);
}

/** Draws one view's description into its chart, notes and empty-state text. */
function draw(file: PanelResult, tab: Tab): void {
  const r = drawnResult(file, tab);
  const el = $(`chart-${tab}`);
  const view = describeView({ result: r, settings: { ...settings, sweepQuantity: shownQuantity }, palette, tooltip, size: { width: el.clientWidth || 800, height: el.clientHeight || 440 } });
  const notes = $(`notes-${tab}`);
  notes.replaceChildren(...view.notes.map((n) => Object.assign(document.createElement('p'), { textContent: n })));
  notes.hidden = view.notes.length === 0;
  setText(`empty-${tab}`, view.empty ?? '');
  $(`empty-${tab}`).hidden = view.empty === null;
  el.hidden = view.option === null;
  const option = view.option;
  if (option) {
    // Resizing is costly; do it only when the view's box changed (a tab that was hidden has none).
    const size = `${el.clientWidth}x${el.clientHeight}`;
    if (sized[tab] !== size) ((sized[tab] = size), charts[tab].resize());
    // The first draw builds everything; later ones replace only what changes, which ECharts does far faster.
    if (lastOption[tab]) charts[tab].setOption(option, { replaceMerge: ['series', 'xAxis', 'yAxis', 'grid', 'visualMap'], lazyUpdate: false, silent: true });
    else charts[tab].setOption(option, { notMerge: true, lazyUpdate: false, silent: true });
    lastOption[tab] = option;
  } else {
    charts[tab].clear();
    delete lastOption[tab];
  }
}

/** Draws the visible view now; the hidden ones are drawn when their tab is opened. */
function render(): void {
  const started = performance.now();
  if (current && !invalidates(current.result)) lastGood = current;
  // While the file has invalidating errors, the last good result (if any, of the same file) is drawn dimmed.
  const stale = current !== null && current !== lastGood && lastGood !== null && lastGood.uri === current.uri;
  const shown = stale ? lastGood : current;
  const r = shown ? drawnResult(shown.result, settings.tab) : null;
  syncControls(r);
  if (!current || !r) return;
  setText('file-name', current.fileName);
  summary(current.result);
  const bad = invalidates(current.result);
  if (bad) problems(current);
  findings(bad ? null : current);
  if (bad && !stale) {
    if (current.result.levels.length === 0 && !current.result.diagnostics.some((d) => d.severity === 'error')) {
      setText('empty-reason', `No expansion for ${current.fileName} yet (no levels were computed).`);
      show({ views: false, empty: true });
    } else show({ views: false, problems: true });
  } else {
    show({ views: true, stale, problems: bad });
    draw(r, settings.tab);
  }
  renders++;
  lastRenderMs = performance.now() - (messageAt ?? started);
  messageAt = null;
  document.body.dataset.renders = String(renders);
  document.body.dataset.version = String(current.version);
}

let renderFrame: number | null = null;
/** Draws on the next frame (once, however often it is asked for before then). */
function renderSoon(): void {
  if (renderFrame !== null) return;
  renderFrame = requestAnimationFrame(() => {
    renderFrame = null;
    render();
  });
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
      if (!current || current.uri !== msg.uri) ((settings.selected = null), (lastGood = null));
      if (sweepTab.uri !== msg.uri) sweepTab.reset(msg.uri);
      // A new version of the file: the picked point belongs to the old text.
      else if (current && msg.version > current.version) sweepTab.picked = null;
      current = msg;
      render();
      break;
    case 'empty':
      current = null;
      lastGood = null;
      sweepTab.reset(null);
      stopPlaying();
      setText('empty-reason', msg.reason);
      setText('file-name', 'no file');
      $('summary').replaceChildren();
      show({ views: false, empty: true });
      $('findings').hidden = true;
      break;
    case 'theme':
      themeOverride = msg.kind;
      palette = currentPalette();
      render();
      break;
    case 'settings':
      if (!scaleChosen) ((settings.scale = msg.plotScale), render());
      break;
    default:
      if (sweepTab.handle(msg)) {
        // A picked point's result opens the state view on it.
        if (msg.type === 'pointResult' && msg.result) settings.tab = 'state';
        // Points may arrive by the thousand: they are drawn once a frame, however many came.
        if (msg.type === 'sweepPoint') renderSoon();
        else render();
      }
  }
}

window.addEventListener('message', (e: MessageEvent) => onMessage(e.data));

function selectTab(t: Tab): void {
  settings.tab = t;
  backToSweep = false;
  save();
  render();
}
for (const t of TABS) {
  $(`tab-${t}`).addEventListener('click', () => selectTab(t));
  // Arrow keys move between tabs, as the WAI-ARIA tabs pattern describes.
  $(`tab-${t}`).addEventListener('keydown', (e) => {
    const step = e.key === 'ArrowRight' ? 1 : e.key === 'ArrowLeft' ? -1 : 0;
    if (!step) return;
    const open = TABS.filter((x) => !$(`tab-${x}`).hidden);
    const next = open[(open.indexOf(t) + step + open.length) % open.length]!;
    selectTab(next);
    $(`tab-${next}`).focus();
  });
}
$('scale').addEventListener('change', (e) => {
  const v = (e.target as HTMLSelectElement).value;
  settings.scale = v === 'log' || v === 'linear' ? v : 'auto';
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

// Picking a sweep point shows its state: the host asks the server for the point's full result.
charts.sweep.on('click', (params: unknown) => {
  const data = (params as { data?: unknown }).data;
  const point = Array.isArray(data) ? sweepTab.pointAt(Number(data[2])) : null;
  if (!point) return;
  sweepTab.pending = point.at;
  sweepTab.failed = null;
  vscode.postMessage({ type: 'pickPoint', at: point.at });
  render();
});
$('sweep-quantity').addEventListener('change', (e) => {
  const v = (e.target as HTMLSelectElement).value as SweepQuantity;
  settings.sweepQuantity = SWEEP_QUANTITIES.includes(v) ? v : 'overview';
  save();
  render();
});
$('state-point-back').addEventListener('click', () => {
  sweepTab.picked = null;
  render();
});

/** The result a view draws: the state view a picked sweep point's, the sweep view the file's with its sweep as it stands. */
function drawnResult(file: PanelResult, tab: Tab): PanelResult {
  const uri = current?.uri ?? null;
  if (tab === 'state' && sweepTab.picked && sweepTab.picked.uri === uri) return sweepTab.picked.result;
  if (tab === 'sweep') {
    const sweep = sweepTab.sweepFor(uri) ?? file.sweep;
    return sweep ? { ...file, sweep } : file;
  }
  return file;
}

/** The sweep tab (shown when the file has a sweep), its chooser and status, and the state view's banner for a picked point. */
function syncSweepControls(): void {
  const sweep = sweepTab.sweepFor(current?.uri ?? null) ?? current?.result.sweep ?? null;
  $('tab-sweep').hidden = sweep === null;
  if (sweep !== null && backToSweep) ((settings.tab = 'sweep'), (backToSweep = false));
  if (sweep === null && settings.tab === 'sweep') settings.tab = 'spectrum';
  // The user's choice is kept; a quantity this sweep lacks is drawn as the nearest one it has.
  shownQuantity = syncQuantities($('sweep-quantity') as HTMLSelectElement, sweep, settings.sweepQuantity);
  setText('sweep-status', sweepStatus(sweepTab, sweep, current?.version ?? null));
  const picked = sweepTab.picked && sweepTab.picked.uri === current?.uri ? sweepTab.picked : null;
  $('state-point').hidden = picked === null;
  setText('state-point-text', picked ? pickedText(picked, current?.result ?? null) : '');
}

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
    // A redraw with fewer series leaves empty places in ECharts' option arrays (replaceMerge keeps the indices).
    const series = (opt?.series ?? []).filter((s) => s !== null && s !== undefined).map((s) => ({ id: String(s.id ?? ''), data: s.data ?? [] }));
    return { tab, settings: { ...settings }, renders, lastRenderMs, version: current?.version ?? null, background: opt?.backgroundColor ?? null, palette: { ...palette }, series };
  },
  texts: () => drawnTexts(charts[settings.tab]),
  axisLabels: () => axisLabels(charts[settings.tab]),
  itemLayouts: (id: string) => itemLayouts(charts[settings.tab], id),
  yPixel: (index: number, value: number) => yPixel(charts[settings.tab], index, value),
  xPixel: (value: number) => xPixel(charts[settings.tab], value),
  linePoints: (id: string) => linePoints(charts[settings.tab], id),
  /** Where datum `dataIndex` of series `id` lies, in page pixels (its first two values as x and y). */
  pixelOf: (id: string, dataIndex: number) => {
    const chart = charts[settings.tab];
    const opt = chart.getOption() as { series?: { id?: string; data?: unknown[][] }[] };
    const d = (opt.series ?? []).find((q) => q && q.id === id)?.data?.[dataIndex];
    if (!d) return null;
    const [x, y] = chart.convertToPixel({ seriesId: id }, [Number(d[0]), Number(d[1])]) as number[];
    const box = $(`chart-${settings.tab}`).getBoundingClientRect();
    return { x: box.left + x!, y: box.top + y! };
  },
};

show({ views: false, empty: true });
syncControls(null);
vscode.postMessage({ type: 'ready' });

/** The energy spread, with a spread below the rounding of the mean (an eigenstate's, about 1e-14 of it) shown as 0: that is noise, not data. */
function spreadText(spread: number, mean: number | null, eu: string, quanta: string): string {
  if (mean !== null && Math.abs(spread) <= 1e-12 * Math.abs(mean)) return `0${eu} (below 1e-12 of ⟨E⟩)`;
  return `${formatNumber(spread, 4)}${eu}${quanta}`;
}
