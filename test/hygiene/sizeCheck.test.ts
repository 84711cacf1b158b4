/**
 * The size check that `npm test` runs (scripts/size-check.mjs): no source file over 600 lines and no
 * function over 80 in server/ and client/, the limits issue 11 set. It reads every TypeScript source of
 * both, the panel's (client/webview/) included, and flags a file or function one line over its limit
 * but not one at it.
 */
import { describe, expect, it } from 'vitest';
// @ts-expect-error: a plain ES module script without declarations.
import { checkedFiles, offenders } from '../../scripts/size-check.mjs';

type Offender = { line: number; what: string };
const check = offenders as (file: string, text: string) => Offender[];

/** A function declaration of exactly `lines` lines. */
function fn(name: string, lines: number): string {
  return [`function ${name}() {`, ...Array.from({ length: lines - 2 }, (_, k) => `  const v${k} = ${k};`), '}'].join('\n');
}

describe('the size check', () => {
  it('reads the server, the client and the panel', () => {
    const files = checkedFiles() as string[];
    for (const f of ['server/src/lsp/main.ts', 'server/src/analysis/slots.ts', 'client/src/extension.ts', 'client/webview/main.ts']) expect(files, f).toContain(f);
    expect(files.some((f) => f.startsWith('client/webview/charts/'))).toBe(true);
    expect(files.every((f) => f.endsWith('.ts') && !f.endsWith('.d.ts') && !f.includes('node_modules'))).toBe(true);
  });

  it('flags a function of 81 lines, not one of 80, arrows and methods too', () => {
    expect(check('a.ts', fn('ok', 80))).toEqual([]);
    expect(check('a.ts', fn('long', 81)).map((o) => o.line)).toEqual([1]);
    const arrow = `const f = () => {\n${'  g();\n'.repeat(79)}};\n`;
    expect(check('a.ts', arrow)).toHaveLength(1);
    const method = `class C {\n  m() {\n${'    g();\n'.repeat(79)}  }\n}\n`;
    expect(check('a.ts', method).map((o) => o.line)).toEqual([2]);
  });

  it('flags a file of 601 lines, not one of 600', () => {
    expect(check('a.ts', 'const x = 1;\n'.repeat(600))).toEqual([]);
    expect(check('a.ts', 'const x = 1;\n'.repeat(601)).map((o) => o.line)).toEqual([1]);
  });
});
