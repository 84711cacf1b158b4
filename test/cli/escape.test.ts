/**
 * The one escaping function of the command line (server/src/cli/escape.ts): which characters it escapes
 * is fixed by the issue (C0, DEL, C1, U+2028/U+2029 and the bidirectional controls of Unicode Standard
 * Annex 9), and nothing else may change.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { escapeJson, escapeLines, escapeText } from '../../server/src/cli/escape';

const UNSAFE = (c: number): boolean =>
  c <= 0x1f || (c >= 0x7f && c <= 0x9f) || c === 0x061c || c === 0x200e || c === 0x200f || c === 0x2028 || c === 0x2029 || (c >= 0x202a && c <= 0x202e) || (c >= 0x2066 && c <= 0x2069);

describe('escapeText', () => {
  it('escapes exactly the unsafe characters, one by one, and keeps every other character', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 40 }), (s) => {
        const e = escapeText(s);
        for (const ch of e) expect(UNSAFE(ch.codePointAt(0)!)).toBe(false);
        // Removing the escapes of the unsafe characters from both sides leaves the same text.
        const safeOnly = [...s].filter((ch) => !UNSAFE(ch.codePointAt(0)!)).join('');
        expect(e.replace(/\\(x[0-9A-F]{2}|u[0-9A-F]{4}|[nrt])/g, '')).toBe(safeOnly.replace(/\\(x[0-9A-F]{2}|u[0-9A-F]{4}|[nrt])/g, ''));
      }),
      { numRuns: 1000, seed: 14 },
    );
  });

  it('writes the forms it promises and leaves units alone', () => {
    expect(escapeText('a\u001b[31mb')).toBe('a\\x1B[31mb');
    expect(escapeText('x\ny\r\tz')).toBe('x\\ny\\r\\tz');
    expect(escapeText('\u0085\u009b\u007f')).toBe('\\x85\\x9B\\x7F');
    expect(escapeText('\u202e\u2066\u200f\u061c\u2028')).toBe('\\u202E\\u2066\\u200F\\u061C\\u2028');
    expect(escapeText('1 µm, 2 Å, ℏω, é, \u00a0')).toBe('1 µm, 2 Å, ℏω, é, \u00a0');
  });
});

describe('escapeLines and escapeJson', () => {
  it('escapeLines keeps the line feeds between lines and nothing else unsafe', () => {
    expect(escapeLines('a\u001b[2K\nb\r\n')).toBe('a\\x1B[2K\nb\\r\n');
  });

  it('escapeJson leaves the same JSON value and no raw unsafe character', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 40 }), (s) => {
        const json = escapeJson(JSON.stringify({ message: s }, null, 2));
        expect(JSON.parse(json)).toEqual({ message: s });
        for (const ch of json.replace(/\n/g, '')) expect(UNSAFE(ch.codePointAt(0)!)).toBe(false);
      }),
      { numRuns: 1000, seed: 15 },
    );
  });
});
