import { describe, it, expect } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { CATALOGUE } from '../../server/src/language/catalogue';
import type { ExprText, Statement } from '../../server/src/language/ast';
import { parse } from '../../server/src/language/parser';
import { scan } from '../../server/src/language/scanner';
import { withWorkMeter, workCounter } from '../../server/src/language/meter';

const FIXTURES = join(__dirname, '..', 'fixtures', 'syntax');
const samples = readdirSync(FIXTURES)
  .filter((f) => f.endsWith('.qstate'))
  .sort()
  .map((f) => ({ name: f, text: readFileSync(join(FIXTURES, f), 'utf8') }));

/** Every ExprText reachable from a statement. */
function exprs(s: Statement): ExprText[] {
  const out: ExprText[] = [];
  const walk = (v: unknown): void => {
    if (v === null || typeof v !== 'object') return;
    if ('text' in v && 'start' in v && 'end' in v && typeof (v as ExprText).text === 'string') out.push(v as ExprText);
    for (const w of Object.values(v)) walk(w);
  };
  walk(s);
  return out;
}

/** The invariants every parse must satisfy; returns the diagnostics for further checks. */
function invariants(text: string) {
  const r = parse(text);
  const masked = scan(text).masked;
  for (const d of r.diagnostics) {
    expect(d.start).toBeGreaterThanOrEqual(0);
    expect(d.end).toBeGreaterThanOrEqual(d.start);
    expect(d.end).toBeLessThanOrEqual(text.length);
    expect(d.code in CATALOGUE).toBe(true);
    expect(['syntax', 'name']).toContain(d.code);
    // Wording on purpose: an internal parser error has no code of its own, only its sentence.
    expect(d.message).not.toMatch(/Internal parser error/);
  }
  let last = 0;
  for (const s of r.file.statements) {
    expect(s.span.start).toBeGreaterThanOrEqual(last);
    expect(s.span.end).toBeLessThanOrEqual(text.length);
    last = s.span.end;
    for (const e of exprs(s)) {
      expect(e.text.length).toBeGreaterThan(0);
      expect(e.text).toBe(masked.slice(e.start, e.end));
      expect(e.start).toBeGreaterThanOrEqual(s.span.start);
      expect(e.end).toBeLessThanOrEqual(s.span.end);
    }
  }
  return r.diagnostics;
}

const WORDS = [
  'units', 'mass', 'let', 'system', 'state', 'basis', 'expect', 'evolve', 'box', 'well', 'oscillator', 'V', 'x', 'psi',
  'eigen', 'gaussian', 'of', 'over', 'to', 'steps', 'norm', 'parity', 'weight', 'energy', 'spread', 'even', 'center',
  'depth', 'width', 'omega', '(', ')', '[', ']', '{', '}', ',', '=', '==', '<=', '>=', '+-', '±', '..', '#', ' ', '  ',
  '\t', '\n', '\r\n', '\r', '\n  ', '"', '\\', '1', '-2.5', 'nm', 'µm', 'Å', '\ufeff', '𝛼', '\ud800',
];

describe('parse never throws and keeps its ranges inside the text', () => {
  it('on random strings', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 200 }), (t) => {
        invariants(t);
      }),
      { numRuns: 2000 },
    );
  });

  it('on random sequences of format words', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...WORDS), { maxLength: 60 }), (parts) => {
        invariants(parts.join(''));
      }),
      { numRuns: 3000 },
    );
  });

  it('the sample files parse without diagnostics', () => {
    expect(samples.map((s) => s.name)).toHaveLength(3);
    for (const s of samples) {
      const r = parse(s.text);
      expect(r.diagnostics, s.name).toEqual([]);
      expect(r.file.statements.length, s.name).toBeGreaterThanOrEqual(8);
    }
  });

  it('on every prefix of the sample files', () => {
    for (const s of samples) {
      for (let k = 0; k <= s.text.length; k++) invariants(s.text.slice(0, k));
    }
  });

  it('one deleted character gives at most one diagnostic', () => {
    for (const s of samples) {
      for (let k = 0; k < s.text.length; k++) {
        const t = s.text.slice(0, k) + s.text.slice(k + 1);
        expect(invariants(t).length, `${s.name} without offset ${k}`).toBeLessThanOrEqual(1);
      }
    }
  });

  it('on single-character replacements and insertions', () => {
    const alphabet = fc.constantFrom(...'abxyz019 \t\n\r#()[]{},=<>+-±.;"\\µ\ufeff'.split(''));
    for (const s of samples) {
      fc.assert(
        fc.property(fc.nat({ max: s.text.length }), alphabet, fc.boolean(), (k, c, insert) => {
          const t = s.text.slice(0, k) + c + s.text.slice(insert ? k : k + 1);
          invariants(t);
        }),
        { numRuns: 800 },
      );
    }
  });

  it('stays linear: the parser counts about the same work per character at twice the size', () => {
    const body = samples.map((s) => s.text.replace(/^(units|mass|system|state|basis|evolve) .*$/gm, '')).join('\n');
    const big = (k: number) => body.repeat(200 * k);
    const wide = (k: number) => `state psi(x) = ${'(x + 1) * '.repeat(10000 * k)}1\nsystem V(x) = ${'x over [0, 1] '.repeat(2500 * k)}`;
    // Operations counted by the scanner and the parser on the work meter (server/src/language/meter.ts),
    // per character. Common practice: a quadratic parser would double this at twice the size; a linear one
    // stays within a quarter. Nothing is timed.
    const perChar = (text: string): number => {
      const meter = workCounter();
      withWorkMeter(meter, () => parse(text));
      expect(meter.ops).toBeGreaterThan(0);
      return meter.ops / text.length;
    };
    for (const shape of [big, wide]) expect(perChar(shape(2))).toBeLessThanOrEqual(1.25 * perChar(shape(1)));
  });
});
