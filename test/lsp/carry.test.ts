// Diagnostics do not flicker: between an edit and its full analysis the server keeps publishing the
// last full analysis's numerical findings (ranges mapped through the edit, `data.stale` true), and
// replaces them as soon as the new analysis lands; a syntax error drops them at once.
// Counted over stdio from the publishDiagnostics notifications themselves (events, no sleeps).
// Expected physics: the integral of |2 sin(pi x)|^2 over [0, 1] is 2 (derived: the mean of sin^2 over a
// period is 1/2), so the state line carries a `norm` warning.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Diagnostic, PublishDiagnosticsParams } from 'vscode-languageserver-protocol';
import { startClient, type TestClient } from './client';
import { editBetween, mapRange } from '../../server/src/lsp/carry';
import { numbersIn } from '../hardening/helpers';

describe('mapping a range through an edit', () => {
  const map = (a: string, b: string, s: number, e: number) => mapRange(s, e, editBetween(a, b));
  it('keeps ranges before the edit, shifts those after, stretches one holding it, drops one deleted', () => {
    expect(editBetween('abcdef', 'abXYef')).toEqual({ start: 2, oldEnd: 4, newEnd: 4 });
    expect(map('abcdef', 'abXYZef', 0, 2)).toEqual({ start: 0, end: 2 });
    expect(map('abcdef', 'abXYZef', 4, 6)).toEqual({ start: 5, end: 7 });
    expect(map('abcdef', 'abXYZef', 1, 5)).toEqual({ start: 1, end: 6 });
    expect(map('abcdef', 'abef', 2, 4)).toBeNull();
    // An insertion at a range's start moves it; one at its end leaves it.
    expect(map('abcdef', 'abQcdef', 2, 4)).toEqual({ start: 3, end: 5 });
    expect(map('abcdef', 'abcdQef', 2, 4)).toEqual({ start: 2, end: 4 });
  });
});

let c: TestClient;
beforeAll(async () => {
  c = await startClient();
});
afterAll(async () => {
  await c?.stop();
});

const TEXT = 'system box(0, 1)\nstate psi(x) = 2 sin(pi x)\n';
const norm = (p: PublishDiagnosticsParams): Diagnostic | undefined => p.diagnostics.find((d) => d.code === 'norm');
const stale = (d: Diagnostic | undefined): boolean => (d?.data as { stale?: boolean } | undefined)?.stale === true;

/** Every publish of `version`, once its full analysis has been published. */
async function publishesOf(uri: string, version: number): Promise<PublishDiagnosticsParams[]> {
  await c.result(uri, (r) => r.version === version);
  return c.publishes.filter((p) => p.uri === uri && p.version === version);
}

describe('findings between an edit and its full analysis', () => {
  it('keeps the norm warning in every publish, mapped and marked stale until the new analysis replaces it', async () => {
    const u = 'file:///carry/norm.qstate';
    c.open(u, TEXT);
    const first = await publishesOf(u, 1);
    expect(norm(first.at(-1)!)!.range.start).toEqual({ line: 1, character: 15 });
    // A line inserted above: the warning moves down one line at once.
    c.change(u, 2, 'let a = 1\n' + TEXT);
    const second = await publishesOf(u, 2);
    expect(second.length).toBeGreaterThanOrEqual(2);
    for (const p of second) expect(norm(p), JSON.stringify(p.diagnostics)).toBeDefined();
    expect(stale(norm(second[0]!))).toBe(true);
    expect(norm(second[0]!)!.range).toEqual({ start: { line: 2, character: 15 }, end: { line: 2, character: 26 } });
    expect(norm(second[0]!)!.data).toEqual({ stale: true });
    const last = norm(second.at(-1)!)!;
    expect(stale(last)).toBe(false);
    expect(last.range.start).toEqual({ line: 2, character: 15 });
    // Editing the formula itself: the warning stays while the new analysis runs.
    c.change(u, 3, 'let a = 1\nsystem box(0, 1)\nstate psi(x) = 3 sin(pi x)\n');
    const third = await publishesOf(u, 3);
    for (const p of third) expect(norm(p)).toBeDefined();
    expect(stale(norm(third[0]!))).toBe(true);
    // The new analysis's norm: the integral of 9 sin^2(pi x) over [0, 1] is 4.5 (closed form).
    expect(numbersIn(String(norm(third.at(-1)!)!.message))).toContain(4.5);
  });

  it('drops the carried findings at once when the quick stage finds an error', async () => {
    const u = 'file:///carry/syntax.qstate';
    c.open(u, TEXT);
    await publishesOf(u, 1);
    c.change(u, 2, 'system box(0, 1\nstate psi(x) = 2 sin(pi x)\n');
    const second = await publishesOf(u, 2);
    expect(second[0]!.diagnostics.map((d) => d.code)).toContain('syntax');
    for (const p of second) expect(norm(p)).toBeUndefined();
  });
});
