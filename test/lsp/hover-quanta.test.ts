// Hovers show an oscillator's energies also in units of its quantum hbar omega, and the mean quantum
// number. Expected (common practice): E_n = (n + 1/2) hbar omega, so eigen(3) has <E> = 3.5 hbar omega,
// spread 0 and <n> = 3; with hbar omega = 2 meV, E_3 = 7 meV.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Hover } from 'vscode-languageserver-protocol';
import { startClient, type TestClient } from './client';

let c: TestClient;
beforeAll(async () => {
  c = await startClient();
});
afterAll(async () => {
  await c?.stop();
});

const TEXT = 'units nm, meV\nsystem oscillator(quantum = 2 meV)\nstate eigen(3) of oscillator(quantum = 2 meV)\nexpect energy 7 meV +- 1e-9 meV\n';

async function hover(line: number): Promise<string> {
  const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: 'file:///quanta/osc.qstate' }, position: { line, character: 2 } });
  return (h?.contents as { value: string }).value;
}

describe('oscillator hovers', () => {
  it('give energies in hbar omega beside the file unit, and <n>', async () => {
    c.open('file:///quanta/osc.qstate', TEXT);
    await c.result('file:///quanta/osc.qstate', (r) => r.version === 1);
    const state = await hover(2);
    expect(state).toMatch(/⟨E⟩ = 7 meV = 3\.5 ħω/);
    expect(state).toMatch(/⟨n⟩ = 3\b/);
    const system = await hover(1);
    expect(system).toMatch(/quantum ħω = 2 meV/);
    expect(system).toMatch(/\| 3 \| 7 \| 3\.5 \|/);
    expect(await hover(3)).toMatch(/measured 7 meV = 3\.5 ħω/);
  });
});
