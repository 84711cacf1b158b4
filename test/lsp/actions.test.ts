// Quick fixes of a failed `expect norm` over LSP: the preferred fix repairs the state (normalises it),
// "set the expected value to what was measured" is offered too, never preferred.
// Expected physics: the integral of |2 sin(pi x)|^2 over [0, 1] is 2 (derived: the mean of sin^2 over a
// period is 1/2), so the normalising factor is 1/sqrt(2) = 0.707106781187 (12 digits).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CodeAction, Diagnostic } from 'vscode-languageserver-protocol';
import { applyEdits, startClient, type TestClient } from './client';

let c: TestClient;
beforeAll(async () => {
  c = await startClient();
});
afterAll(async () => {
  await c?.stop();
});

const TEXT = 'system box(0, 1)\nstate psi(x) = 2 sin(pi x)\nexpect norm 1 +- 1e-6\n';

async function fullDiagnostics(uri: string, version: number): Promise<Diagnostic[]> {
  await c.result(uri, (q) => q.version === version);
  return c.publishes.filter((q) => q.uri === uri && q.version === version).at(-1)!.diagnostics;
}

describe('a failed expect norm 1', () => {
  it('prefers normalising the state and offers the measured value as a non-preferred alternative', async () => {
    const u = 'file:///actions/norm.qstate';
    c.open(u, TEXT);
    const d = (await fullDiagnostics(u, 1)).find((x) => x.code === 'expect')!;
    expect(d.range.start.line).toBe(2);
    const actions = await c.connection.sendRequest<CodeAction[]>('textDocument/codeAction', { textDocument: { uri: u }, range: d.range, context: { diagnostics: [d], only: ['quickfix'] } });
    const preferred = actions.filter((a) => a.isPreferred);
    expect(preferred).toHaveLength(1);
    expect(preferred[0]!.title).toMatch(/normalise/i);
    const fixed = applyEdits(TEXT, preferred[0]!.edit!.changes![u]!);
    expect(fixed.split('\n')[1]).toBe('state psi(x) = 0.707106781187 * (2 sin(pi x))');
    expect(fixed.split('\n')[2]).toBe('expect norm 1 +- 1e-6');
    const other = actions.filter((a) => !a.isPreferred);
    expect(other.map((a) => a.title)).toEqual(['Set the expected value to 2']);
    expect(applyEdits(TEXT, other[0]!.edit!.changes![u]!).split('\n')[2]).toBe('expect norm 2 +- 1e-6');
    // The preferred fix repairs the file: neither the expectation nor the norm warning is left.
    c.change(u, 2, fixed);
    expect((await fullDiagnostics(u, 2)).filter((x) => x.code === 'expect' || x.code === 'norm')).toEqual([]);
  });

  it('keeps a lone fix preferred where there is nothing to repair in the state', async () => {
    const u = 'file:///actions/energy.qstate';
    // The ground state of a unit box: <E> = pi^2 / 2 = 4.934802 (infinite square well, from memory).
    c.open(u, 'system box(0, 1)\nstate psi(x) = sqrt(2) sin(pi x)\nexpect energy 5 +- 0.01\n');
    const d = (await fullDiagnostics(u, 1)).find((x) => x.code === 'expect')!;
    const actions = await c.connection.sendRequest<CodeAction[]>('textDocument/codeAction', { textDocument: { uri: u }, range: d.range, context: { diagnostics: [d], only: ['quickfix'] } });
    expect(actions.map((a) => [a.title.replace(/[\d.]+$/, 'N'), a.isPreferred])).toEqual([['Set the expected value to N', true]]);
  });
});
