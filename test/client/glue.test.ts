import { describe, it, expect } from 'vitest';
import { initializationOptions, forwardTrust } from '../../client/src/trust';
import { RestartPolicy } from '../../client/src/restart';
import { StatusController, statusText } from '../../client/src/status';
import { ResultStore } from '../../client/src/results';
import { COMMANDS } from '../../client/src/commands';
import { makeVscode, makeDocument } from './vscode-stub';
import { parabolaResult } from './fixtures';
import { readFileSync } from 'node:fs';
import { DEFAULT_LIMITS, LIMIT_RANGES } from '../../server/src/analysis/index';

describe('workspace trust', () => {
  it('asks for evaluation only in a trusted workspace', () => {
    const vs = makeVscode();
    vs.state.isTrusted = false;
    expect(initializationOptions(vs.api)).toEqual({ evaluate: false, panel: true });
    vs.state.isTrusted = true;
    expect(initializationOptions(vs.api)).toEqual({ evaluate: true, panel: true });
  });

  it('sends eigenspan/setTrust when trust is granted, without a reload', () => {
    const vs = makeVscode();
    const sent: [string, unknown][] = [];
    let refreshed = 0;
    forwardTrust(vs.api, (m, p) => sent.push([m, p]), () => refreshed++);
    expect(sent).toHaveLength(0);
    vs.fire.trustGranted.fire();
    expect(sent).toEqual([['eigenspan/setTrust', { trusted: true }]]);
    expect(refreshed).toBe(1);
  });
});

describe('server restarts', () => {
  it('restarts up to five times in three minutes, then stops', () => {
    const p = new RestartPolicy();
    const t0 = 1_000_000;
    expect([0, 1, 2, 3, 4].map((k) => p.shouldRestart(t0 + k * 1000))).toEqual([true, true, true, true, true]);
    expect(p.shouldRestart(t0 + 5000)).toBe(false);
    // Long after, the old crashes have aged out.
    expect(new RestartPolicy({ maxRestarts: 1, windowMs: 10 }).shouldRestart(0)).toBe(true);
    const q = new RestartPolicy({ maxRestarts: 1, windowMs: 10 });
    q.shouldRestart(0);
    expect(q.shouldRestart(5)).toBe(false);
    expect(q.shouldRestart(100)).toBe(true);
  });
});

describe('status bar', () => {
  it('shows the energy mean and captured weight of the active file and opens the panel on click', () => {
    const vs = makeVscode();
    const store = new ResultStore();
    const doc = makeDocument('/ws/a.qstate', '');
    vs.openEditor(doc);
    const status = new StatusController(vs.api, store, COMMANDS.showPanel);
    const item = vs.statusItems[0]!;
    expect(item.command).toBe('eigenspan.showPanel');
    expect(item.visible).toBe(true);
    expect(status.text).toMatch(/qstate/);
    const r = parabolaResult(9, { energyUnit: 'meV' });
    store.set({ uri: doc.uri.toString(), version: 1, result: r });
    // The fixture's <E> = (10/pi^2) E_1 = 5: Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    expect(status.text).toBe(`$(graph) ⟨E⟩ 5 meV · ${Number((100 * r.captured!).toPrecision(4))} %`);
    vs.openEditor(makeDocument('/ws/readme.md', '', 'markdown'));
    status.update();
    expect(item.visible).toBe(false);
  });

  it('says that only checks run in an untrusted workspace', () => {
    const vs = makeVscode();
    vs.state.isTrusted = false;
    const store = new ResultStore();
    const doc = makeDocument('/ws/a.qstate', '');
    vs.openEditor(doc);
    store.set({ uri: doc.uri.toString(), version: 1, result: { ...parabolaResult(2), levels: [], energy: null, captured: null } });
    const status = new StatusController(vs.api, store, COMMANDS.showPanel);
    expect(status.text).toBe('$(shield) qstate: checks only');
  });

  it('counts errors instead of showing stale figures', () => {
    const r = parabolaResult(3);
    r.diagnostics = [{ start: 0, end: 1, severity: 'error', code: 'syntax', message: 'x' }, { start: 0, end: 1, severity: 'error', code: 'name', message: 'y' }];
    expect(statusText(r).text).toBe('$(error) qstate: 2 errors');
    r.diagnostics = [];
    r.energy = { mean: null, spread: null };
    expect(statusText(r).text).toMatch(/∞/);
  });
});

describe('manifest', () => {
  const pkg = JSON.parse(readFileSync('package.json', 'utf8'));
  it('declares every command the client registers, the settings and limited trust', () => {
    const ids = pkg.contributes.commands.map((c: { command: string }) => c.command).sort();
    expect(ids).toEqual(Object.values(COMMANDS).sort());
    const props = pkg.contributes.configuration.properties;
    expect(props['eigenspan.debounceMs'].default).toBe(100);
    expect(props['eigenspan.timeBudgetMs'].default).toBe(2000);
    expect(props['eigenspan.plotScale'].enum).toEqual(['linear', 'log']);
    expect(props['eigenspan.defaultBasis'].default).toBe(40);
    // Every settable cap is a setting whose default and range are the engine's own.
    for (const [name, [lo, hi]] of Object.entries(LIMIT_RANGES)) {
      const p = props[`eigenspan.limits.${name}`];
      expect(p, name).toBeDefined();
      expect(p.type).toBe('integer');
      expect(p.default).toBe(DEFAULT_LIMITS[name as keyof typeof DEFAULT_LIMITS]);
      expect([p.minimum, p.maximum]).toEqual([lo, hi]);
      expect(p.default).toBeGreaterThanOrEqual(lo);
      expect(p.default).toBeLessThanOrEqual(hi);
    }
    for (const p of Object.values(props) as { description: string }[]) expect(p.description.length).toBeGreaterThan(10);
    expect(pkg.capabilities.untrustedWorkspaces.supported).toBe('limited');
    expect(pkg.capabilities.untrustedWorkspaces.description.length).toBeGreaterThan(20);
    expect(pkg.activationEvents).toContain('onWebviewPanel:eigenspan.spectrum');
    expect(pkg.contributes.languages[0].extensions).toEqual(['.qstate']);
    expect(pkg.engines.vscode).toBe('^1.91.0');
  });
});
