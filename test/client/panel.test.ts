import { describe, it, expect } from 'vitest';
import { SpectrumPanelController, PANEL_VIEW_TYPE, plotScaleSetting, themeKindName } from '../../client/src/panel';
import { ResultStore } from '../../client/src/results';
import { makeVscode, makeDocument, FakeUri, type FakePanel } from './vscode-stub';
import { parabolaResult } from './fixtures';
import { SweepStore } from '../../client/src/sweeps';
import { sweepFrame } from '../../client/src/sweepFrame';

function setup(options: { trusted?: boolean } = {}) {
  const vs = makeVscode();
  vs.state.isTrusted = options.trusted ?? true;
  const store = new ResultStore();
  let n = 0;
  const ctl = new SpectrumPanelController({
    api: vs.api,
    extensionUri: FakeUri.file('/ext') as never,
    store,
    plotScale: () => vs.config.plotScale as 'linear' | 'log',
    trusted: () => vs.state.isTrusted,
    nonce: () => `nonce${++n}AAAAAAAAAAAAAAAA`,
  });
  const doc = makeDocument('/ws/parabola.qstate', 'system box(0, 1)\nstate psi(x) = x * (1 - x)\nbasis 12\n');
  return { vs, store, ctl, doc };
}

const ready = (p: FakePanel) => p.received.fire({ type: 'ready' });

describe('spectrum panel lifecycle', () => {
  it('opens beside the editor with scripts limited to dist/webview and a nonce CSP', () => {
    const { vs, ctl, doc } = setup();
    vs.openEditor(doc);
    ctl.show();
    expect(vs.panels).toHaveLength(1);
    const p = vs.panels[0]!;
    expect(p.viewType).toBe(PANEL_VIEW_TYPE);
    expect(p.showOptions).toEqual({ viewColumn: -2, preserveFocus: true });
    const opts = p.webview.options as { enableScripts: boolean; localResourceRoots: FakeUri[] };
    expect(opts.enableScripts).toBe(true);
    expect(opts.localResourceRoots.map(String)).toEqual(['file:///ext/dist/webview']);
    expect(p.webview.html).toContain("default-src 'none'");
    expect(p.webview.html).toContain("script-src 'nonce-nonce1AAAAAAAAAAAAAAAA' https://webview.test/ext/dist/webview/");
    expect(p.webview.html).toMatch(/<script nonce="nonce1AAAAAAAAAAAAAAAA" src="https:\/\/webview.test\/ext\/dist\/webview\/panel.js"><\/script>/);
    // A second show reveals the same panel instead of opening another.
    ctl.show();
    expect(vs.panels).toHaveLength(1);
    expect(p.revealed).toBe(1);
  });

  it('posts nothing before the panel is ready, then settings, theme and the latest result with diagnostic lines', () => {
    const { vs, store, ctl, doc } = setup();
    vs.openEditor(doc);
    ctl.show();
    const p = vs.panels[0]!;
    const r = parabolaResult(8);
    r.diagnostics = [{ start: 17, end: 22, severity: 'warning', code: 'norm', message: 'not normalised' }];
    store.set({ uri: doc.uri.toString(), version: 3, result: r });
    expect(p.posted).toHaveLength(0);
    vs.state.themeKind = 4;
    ready(p);
    expect(p.posted.map((m) => (m as { type: string }).type)).toEqual(['settings', 'theme', 'result']);
    expect(p.ofType('theme')[0]!.kind).toBe('high-contrast-light');
    const msg = p.ofType('result')[0]!;
    expect(msg.fileName).toBe('parabola.qstate');
    expect(msg.version).toBe(3);
    expect(msg.diagnosticLines).toEqual([1]);
    // A newer version is forwarded, an older one arriving late is not.
    store.set({ uri: doc.uri.toString(), version: 4, result: r });
    store.set({ uri: doc.uri.toString(), version: 2, result: r });
    expect(p.ofType('result').map((m) => m.version)).toEqual([3, 4]);
  });

  it('follows the active qstate editor and ignores other editors', () => {
    const { vs, store, ctl, doc } = setup();
    const other = makeDocument('/ws/second.qstate', 'system box(0, 2)\n');
    const notes = makeDocument('/ws/notes.md', '# notes', 'markdown');
    vs.openEditor(doc);
    ctl.show();
    const p = vs.panels[0]!;
    ready(p);
    expect(p.ofType('empty')[0]!.reason).toMatch(/Waiting for the first analysis of parabola\.qstate/);
    vs.openEditor(other);
    ctl.follow(vs.state.activeTextEditor as never);
    expect(ctl.currentUri).toBe(other.uri.toString());
    store.set({ uri: other.uri.toString(), version: 1, result: parabolaResult(4) });
    expect(p.ofType('result').at(-1)!.fileName).toBe('second.qstate');
    vs.openEditor(notes);
    ctl.follow(vs.state.activeTextEditor as never);
    expect(ctl.currentUri).toBe(other.uri.toString());
    // Results for a file the panel does not show are not posted.
    const before = p.posted.length;
    store.set({ uri: doc.uri.toString(), version: 9, result: parabolaResult(4) });
    expect(p.posted.length).toBe(before);
  });

  it('shows the trust reason instead of plots in an untrusted workspace', () => {
    const { vs, store, ctl, doc } = setup({ trusted: false });
    vs.openEditor(doc);
    store.set({ uri: doc.uri.toString(), version: 1, result: parabolaResult(4) });
    ctl.show();
    ready(vs.panels[0]!);
    expect(vs.panels[0]!.ofType('result')).toHaveLength(0);
    expect(vs.panels[0]!.ofType('empty')[0]!.reason).toMatch(/not trusted/);
  });

  it('drops malformed messages from the panel', async () => {
    const { vs, ctl, doc } = setup();
    vs.openEditor(doc);
    ctl.show();
    const p = vs.panels[0]!;
    for (const bad of [null, 42, 'ready', { type: 'nope' }, { type: 'reveal', line: -1 }, { type: 'reveal', line: 1.5 }, { type: 'export', format: 'gif', view: 'state', data: 'x' }, { type: 'export', format: 'png', view: 'state', data: 'data:text/html,<b>' }, { type: 'export', format: 'svg', view: '../../x', data: '<svg/>' }]) {
      await ctl.receive(bad);
    }
    expect(p.posted).toHaveLength(0);
    expect(vs.shown).toHaveLength(0);
    expect(vs.files.size).toBe(0);
  });

  it('reveals a line the panel asks for', async () => {
    const { vs, ctl, doc } = setup();
    vs.openEditor(doc);
    ctl.show();
    await ctl.receive({ type: 'reveal', line: 2 });
    expect(vs.shown).toHaveLength(1);
    const sel = (vs.shown[0]!.options as { selection: { start: { line: number } } }).selection;
    expect(sel.start.line).toBe(2);
    await ctl.receive({ type: 'reveal', line: 99 });
    expect(vs.shown).toHaveLength(1);
  });

  it('saves an exported PNG through a save dialog and never replaces a file without asking', async () => {
    const { vs, ctl, doc } = setup();
    vs.openEditor(doc);
    ctl.show();
    const png = 'data:image/png;base64,' + Buffer.from([0x89, 0x50, 0x4e, 0x47, 1, 2, 3]).toString('base64');
    const target = FakeUri.file('/ws/parabola-spectrum.png');
    vs.answers.save.push(target);
    await ctl.receive({ type: 'export', format: 'png', view: 'spectrum', data: png });
    expect(ctl.lastExport?.kind).toBe('saved');
    expect([...vs.files.get(target.toString())!]).toEqual([0x89, 0x50, 0x4e, 0x47, 1, 2, 3]);
    // Same target again: the user is asked, declines, and the file keeps its bytes.
    vs.answers.save.push(target);
    vs.answers.warning.push(undefined);
    await ctl.receive({ type: 'export', format: 'png', view: 'spectrum', data: 'data:image/png;base64,AAAA' });
    expect(vs.warnings.at(-1)!.options).toEqual({ modal: true });
    expect(ctl.lastExport?.kind).toBe('cancelled');
    expect(vs.files.get(target.toString())!.length).toBe(7);
    // SVG: accepted after an explicit "Replace".
    const svgTarget = FakeUri.file('/ws/p.svg');
    vs.files.set(svgTarget.toString(), new Uint8Array([1]));
    vs.answers.save.push(svgTarget);
    vs.answers.warning.push('Replace');
    await ctl.receive({ type: 'export', format: 'svg', view: 'state', data: '<svg xmlns="http://www.w3.org/2000/svg"></svg>' });
    expect(new TextDecoder().decode(vs.files.get(svgTarget.toString()))).toContain('<svg');
  });

  it('is restored by the serializer after a reload and opens anew after being closed', () => {
    const { vs, store, ctl, doc } = setup();
    vs.openEditor(doc);
    store.set({ uri: doc.uri.toString(), version: 1, result: parabolaResult(4) });
    const restored = vs.api.window.createWebviewPanel(PANEL_VIEW_TYPE, 'Spectrum', { viewColumn: 2 }, {}) as unknown as FakePanel;
    ctl.restore(restored as never);
    expect((restored.webview.options as { localResourceRoots: FakeUri[] }).localResourceRoots.map(String)).toEqual(['file:///ext/dist/webview']);
    expect(restored.webview.html).toContain('nonce1');
    ready(restored);
    expect(restored.ofType('result')).toHaveLength(1);
    restored.dispose();
    expect(ctl.isOpen).toBe(false);
    ctl.show();
    expect(vs.panels).toHaveLength(2);
    // A fresh nonce for each load.
    expect(vs.panels[1]!.webview.html).toContain('nonce2');
    expect(vs.panels[1]!.webview.html).not.toContain('nonce1');
  });

  it('maps theme kinds', () => {
    expect([1, 2, 3, 4].map(themeKindName)).toEqual(['light', 'dark', 'high-contrast', 'high-contrast-light']);
  });
});

describe('the plot scale setting', () => {
  it("sends the user's own scale, most specific scope first, and 'auto' when none is set", () => {
    expect(plotScaleSetting(undefined)).toBe('auto');
    expect(plotScaleSetting({})).toBe('auto');
    expect(plotScaleSetting({ globalValue: 'log' })).toBe('log');
    expect(plotScaleSetting({ globalValue: 'log', workspaceValue: 'linear' })).toBe('linear');
    expect(plotScaleSetting({ globalValue: 'cubic' })).toBe('auto');
  });
});

describe('the panel and the sweep view', () => {
  // A box whose width is swept; the points are the engine's own (see test/client/sweep.test.ts for their checks).
  const TEXT = 'let L = 1.2\nsystem box(0, L)\nstate eigen(1) of box(0, 1)\nbasis 20\nsweep L from 1 to 2 steps 2\n';
  const point = (i: number) => ({ index: [i], at: [1 + i / 2], valid: true, problem: null, findings: [], levels: [{ n: 1, energy: 4.9, weight: 0.5 }], captured: 0.9, continuum: null, mean: 5, spread: 1, bound: null, expects: [] });

  function sweepSetup(answer: (at: number[]) => Promise<unknown>) {
    const vs = makeVscode();
    vs.state.isTrusted = true;
    const store = new ResultStore();
    const sweeps = new SweepStore();
    const asked: number[][] = [];
    const ctl = new SpectrumPanelController({
      api: vs.api,
      extensionUri: FakeUri.file('/ext') as never,
      store,
      plotScale: () => 'auto',
      trusted: () => vs.state.isTrusted,
      sweeps,
      pointResult: (_uri, at) => (asked.push(at), answer(at)),
    });
    const doc = makeDocument('/ws/box.qstate', TEXT);
    vs.openEditor(doc);
    ctl.show();
    const p = vs.panels[0]!;
    store.set({ uri: doc.uri.toString(), version: 1, result: parabolaResult(4) });
    ready(p);
    return { vs, sweeps, ctl, doc, p, asked };
  }

  it('forwards each sweep point with its frame, and the sweep so far to a panel that opens late', () => {
    const { sweeps, ctl, doc, p } = sweepSetup(async () => null);
    const uri = doc.uri.toString();
    const frame = () => sweepFrame(TEXT, [{ name: 'L', unit: null }]);
    sweeps.point({ uri, version: 1, finished: 1, total: 3, point: point(0) }, frame);
    const sent = p.posted.filter((m) => (m as { type: string }).type === 'sweepPoint') as { frame: { axes: { name: string; steps: number }[] } }[];
    expect(sent).toHaveLength(1);
    expect(sent[0]!.frame.axes).toEqual([{ name: 'L', unit: null, steps: 2, spacing: 'linear' }]);
    // Another document's points are not forwarded.
    sweeps.point({ uri: 'file:///ws/other.qstate', version: 1, finished: 1, total: 3, point: point(0) }, frame);
    expect(p.posted.filter((m) => (m as { type: string }).type === 'sweepPoint')).toHaveLength(1);
    // A reload (ready again) gets the result and then the sweep as it stands.
    p.received.fire({ type: 'ready' });
    const last = p.posted[p.posted.length - 1] as { type: string; sweep: { finished: number; points: unknown[] } };
    expect(last.type).toBe('sweep');
    expect(last.sweep.finished).toBe(1);
    expect(last.sweep.points).toHaveLength(3);
    ctl.dispose();
  });

  it('asks the server for a picked point and hands its result, or why there is none, to the panel', async () => {
    const { p, asked, doc, ctl } = sweepSetup(async (at) => (at[0] === 1.5 ? parabolaResult(6) : null));
    // The panel's messages as they arrive from the webview (receive resolves once each is handled).
    await ctl.receive({ type: 'pickPoint', at: [1.5] });
    await ctl.receive({ type: 'pickPoint', at: [9] });
    await ctl.receive({ type: 'pickPoint', at: ['x'] });
    expect(asked).toEqual([[1.5], [9]]);
    const answers = p.posted.filter((m) => (m as { type: string }).type === 'pointResult') as { uri: string; at: number[]; result: { levels: unknown[] } | null; reason: string | null }[];
    expect(answers.map((a) => [a.uri, a.at])).toEqual([[doc.uri.toString(), [1.5]], [doc.uri.toString(), [9]]]);
    expect(answers[0]!.result!.levels).toHaveLength(6);
    expect(answers[0]!.reason).toBeNull();
    expect(answers[1]!.result).toBeNull();
    expect(answers[1]!.reason).toContain('no longer on the sweep');
  });
});
