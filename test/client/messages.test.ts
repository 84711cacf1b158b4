import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { isPanelResult, parseHostMessage, parsePanelMessage } from '../../client/src/messages';
import { ResultStore } from '../../client/src/results';
import { parabolaResult } from './fixtures';

const good = () => ({ type: 'result', uri: 'file:///a.qstate', version: 1, fileName: 'a.qstate', result: parabolaResult(4, { samples: true }) });

describe('message checks', () => {
  it('accepts well-formed host messages, also after a JSON round trip', () => {
    expect(parseHostMessage(good())?.type).toBe('result');
    expect(parseHostMessage(JSON.parse(JSON.stringify(good())))?.type).toBe('result');
    expect(parseHostMessage({ type: 'theme', kind: 'high-contrast' })).toEqual({ type: 'theme', kind: 'high-contrast' });
    expect(parseHostMessage({ type: 'empty', reason: 'x' })).toEqual({ type: 'empty', reason: 'x' });
    expect(parseHostMessage({ type: 'settings', plotScale: 'log' })).toEqual({ type: 'settings', plotScale: 'log' });
    expect(parseHostMessage({ type: 'settings', plotScale: 'auto' })).toEqual({ type: 'settings', plotScale: 'auto' });
  });

  it('rejects each kind of damage to a result', () => {
    const damage: ((m: ReturnType<typeof good>) => void)[] = [
      (m) => ((m.result as { levels: unknown }).levels = 'many'),
      (m) => ((m.result.levels[0] as { weight: unknown }).weight = '0.5'),
      (m) => ((m.result.samples!.re as unknown[]) = m.result.samples!.re.slice(1)),
      (m) => ((m.result.samples!.phi[0] as unknown[]) = [1, 2]),
      (m) => ((m.result.diagnostics as unknown[]) = [{ start: 0, end: 1, severity: 'fatal', code: 'x', message: 'y' }]),
      (m) => ((m.result as { parity: unknown }).parity = 'sideways'),
      (m) => ((m.result as { units: unknown }).units = null),
      (m) => ((m as { version: unknown }).version = '1'),
      (m) => ((m as { fileName: unknown }).fileName = { toString: 'x' }),
      (m) => ((m as { diagnosticLines?: unknown }).diagnosticLines = [1, 2, 3]),
    ];
    for (const d of damage) {
      const m = good();
      d(m);
      expect(parseHostMessage(m)).toBeNull();
    }
    expect(parseHostMessage({ type: 'theme', kind: 'sepia' })).toBeNull();
    expect(parseHostMessage({ type: 'settings', plotScale: 'cubic' })).toBeNull();
  });

  it('never throws and never accepts arbitrary values (property test)', () => {
    fc.assert(
      fc.property(fc.anything(), (v) => {
        expect(() => parseHostMessage(v)).not.toThrow();
        expect(() => parsePanelMessage(v)).not.toThrow();
        const r = parseHostMessage(v);
        if (r !== null) expect(['result', 'theme', 'empty', 'settings']).toContain(r.type);
      }),
      { numRuns: 500 },
    );
  });

  it('checks panel messages strictly', () => {
    expect(parsePanelMessage({ type: 'ready' })).toEqual({ type: 'ready' });
    expect(parsePanelMessage({ type: 'reveal', line: 3 })).toEqual({ type: 'reveal', line: 3 });
    expect(parsePanelMessage({ type: 'export', format: 'svg', view: 'time', data: '<svg></svg>' })).not.toBeNull();
    expect(parsePanelMessage({ type: 'export', format: 'svg', view: 'time', data: '<script>' })).toBeNull();
    expect(parsePanelMessage({ type: 'export', format: 'png', view: 'Time 1', data: 'data:image/png;base64,AA' })).toBeNull();
  });

  it('keeps only the latest version of a result per file', () => {
    const s = new ResultStore();
    const seen: string[] = [];
    s.onChange((u) => seen.push(u));
    expect(s.set({ uri: 'u', version: 2, result: parabolaResult(2) })).toBe(true);
    expect(s.set({ uri: 'u', version: 1, result: parabolaResult(3) })).toBe(false);
    expect(s.set({ uri: 'u', version: 3, result: { levels: 5 } })).toBe(false);
    expect(s.get('u')!.result.levels).toHaveLength(2);
    expect(seen).toEqual(['u']);
    expect(isPanelResult(parabolaResult(2))).toBe(true);
  });
});

describe('the survival on its own time grid', () => {
  const withEvolution = (extra: Record<string, unknown>) => {
    const r = parabolaResult(4) as unknown as Record<string, unknown>;
    r.evolution = { times: [0, 1, 2], meanX: [0, 0, 0], meanP: [0, 0, 0], survival: [1, 0.5, 1], revival: null, ...extra };
    return r;
  };

  it('accepts survivalTimes with survivalFine beside the evolve arrays, or with survival itself on the fine grid', () => {
    expect(isPanelResult(withEvolution({}))).toBe(true);
    expect(isPanelResult(withEvolution({ survivalTimes: [0, 0.5, 1, 1.5, 2], survivalFine: [1, 0.8, 0.5, 0.8, 1] }))).toBe(true);
    expect(isPanelResult(withEvolution({ survivalTimes: [0, 0.5, 1, 1.5, 2], survival: [1, 0.8, 0.5, 0.8, 1] }))).toBe(true);
  });

  it('rejects a survival that matches neither grid, or a fine survival of the wrong length', () => {
    expect(isPanelResult(withEvolution({ survival: [1, 0.5] }))).toBe(false);
    expect(isPanelResult(withEvolution({ survivalTimes: [0, 1, 2, 3], survival: [1, 0.5, 1, 0.5, 1] }))).toBe(false);
    expect(isPanelResult(withEvolution({ survivalTimes: [0, 1, 2, 3], survivalFine: [1, 0.5] }))).toBe(false);
    expect(isPanelResult(withEvolution({ survivalTimes: 'fine' }))).toBe(false);
  });
});
