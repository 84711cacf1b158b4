import { describe, it, expect } from 'vitest';
import { copyLevels, exportCoefficients, normaliseState } from '../../client/src/commands';
import { ResultStore } from '../../client/src/results';
import { makeVscode, makeDocument, FakeUri, FakeRange } from './vscode-stub';
import { parabolaResult } from './fixtures';

function setup() {
  const vs = makeVscode();
  const store = new ResultStore();
  const doc = makeDocument('/ws/parabola.qstate', 'system box(0, 1)\nstate psi(x) = x * (1 - x)\n');
  vs.openEditor(doc);
  store.set({ uri: doc.uri.toString(), version: 1, result: parabolaResult(6) });
  return { vs, store, doc };
}

describe('commands', () => {
  it('exports CSV next to the file after the user picks the format and a name', async () => {
    const { vs, store } = setup();
    vs.answers.quickPick.push('CSV');
    vs.answers.save.push(FakeUri.file('/ws/out.csv'));
    const out = await exportCoefficients(vs.api, store);
    expect(out.kind).toBe('saved');
    const text = new TextDecoder().decode(vs.files.get('file:///ws/out.csv'));
    expect(text.split('\r\n')[0]).toBe('n,energy_natural,re,im,abs,phase_rad,weight,cumulative');
    expect(text.trim().split('\r\n')).toHaveLength(7);
    expect(vs.info.at(-1)).toMatch(/Saved 6 coefficients to out\.csv/);
  });

  it('exports JSON and asks before replacing an existing file', async () => {
    const { vs, store } = setup();
    const target = FakeUri.file('/ws/parabola-coefficients.json');
    vs.files.set(target.toString(), new TextEncoder().encode('keep me'));
    vs.answers.quickPick.push('JSON');
    vs.answers.save.push(target);
    vs.answers.warning.push(undefined);
    expect((await exportCoefficients(vs.api, store)).kind).toBe('cancelled');
    expect(new TextDecoder().decode(vs.files.get(target.toString()))).toBe('keep me');
    vs.answers.quickPick.push('JSON');
    vs.answers.save.push(target);
    vs.answers.warning.push('Replace');
    expect((await exportCoefficients(vs.api, store)).kind).toBe('saved');
    expect(JSON.parse(new TextDecoder().decode(vs.files.get(target.toString()))).levels).toHaveLength(6);
  });

  it('does nothing when the user dismisses the format choice or the dialog', async () => {
    const { vs, store } = setup();
    vs.answers.quickPick.push(undefined);
    expect((await exportCoefficients(vs.api, store)).kind).toBe('cancelled');
    vs.answers.quickPick.push('CSV');
    vs.answers.save.push(undefined);
    expect((await exportCoefficients(vs.api, store)).kind).toBe('cancelled');
    expect(vs.files.size).toBe(0);
  });

  it('says why when there is nothing to export', async () => {
    const { vs, store } = setup();
    vs.openEditor(makeDocument('/ws/fresh.qstate', 'system box(0, 1)\n'));
    expect((await exportCoefficients(vs.api, store)).kind).toBe('cancelled');
    expect(vs.info.at(-1)).toMatch(/fresh\.qstate has not been analysed yet/);
    expect(await copyLevels(vs.api, store)).toBeNull();
  });

  it('copies the level table as Markdown', async () => {
    const { vs, store } = setup();
    const md = await copyLevels(vs.api, store);
    expect(md).not.toBeNull();
    expect(vs.clipboard()).toBe(md);
    expect(md!.trim().split('\n')).toHaveLength(8);
  });

  it("applies the server's quick fix for the norm finding", async () => {
    const { vs, doc } = setup();
    const range = new FakeRange(1, 15, 1, 26);
    const norm = { range, code: 'norm', message: 'integral of |psi|^2 is 0.0333', severity: 1 };
    vs.diagnostics.set(doc.uri.toString(), [{ range, code: { value: 'boundary', target: 'x' }, message: 'other' }, norm]);
    const edit = { replace: 'sqrt(30) * (x * (1 - x))' };
    vs.commandHandlers.set('vscode.executeCodeActionProvider', (uri, r, kind) => {
      expect(String(uri)).toBe(doc.uri.toString());
      expect(r).toBe(range);
      expect(kind).toBe('quickfix');
      return [
        { title: 'Add a basis line', diagnostics: [{ code: 'basis' }], edit: { other: true } },
        { title: 'Normalise the state', diagnostics: [norm], edit },
      ];
    });
    expect(await normaliseState(vs.api)).toBe(true);
    expect(vs.edits).toEqual([edit]);
  });

  it('reports when there is no norm finding or no fix', async () => {
    const { vs, doc } = setup();
    expect(await normaliseState(vs.api)).toBe(false);
    expect(vs.info.at(-1)).toMatch(/already normalised/);
    const range = new FakeRange(1, 0, 1, 5);
    vs.diagnostics.set(doc.uri.toString(), [{ range, code: 'norm', message: 'x' }]);
    vs.commandHandlers.set('vscode.executeCodeActionProvider', () => []);
    expect(await normaliseState(vs.api)).toBe(false);
    expect(vs.warnings.at(-1)!.message).toMatch(/no fix/);
    expect(vs.edits).toHaveLength(0);
  });
});
