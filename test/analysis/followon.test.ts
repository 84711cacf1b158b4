/**
 * One mistake, one finding: a system line that fails (an unknown name or a unit mistake in an
 * argument, an unclosed bracket) adds no follow-on finding for the `phi(n, x)` of the state, in the
 * full analysis and in the untrusted pipeline alike. Each file marks its one expected diagnostic.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';
import { readMarkers } from './helpers';
import { numbersIn } from '../hardening/helpers';

const dir = join(__dirname, '..', 'fixtures', 'diagnostics');

describe.each(['typo-in-system.qstate', 'unit-in-system.qstate'])('%s', (name) => {
  const { text, expected } = readMarkers(readFileSync(join(dir, name), 'utf8'));
  it.each([
    ['analyse', (t: string) => analyse(t).diagnostics],
    ['analyseUntrusted', (t: string) => analyseUntrusted(t).diagnostics],
  ])('%s gives exactly the one marked finding', (_stage, run) => {
    expect(expected).toHaveLength(1);
    expect(run(text).map((d) => ({ code: d.code, start: d.start, end: d.end }))).toEqual(expected);
  });
});

describe('a system line the parser rejects', () => {
  it('gives its syntax error and nothing about phi', () => {
    const text = 'system well(depth = 5, width = 2\nstate psi(x) = phi(1, x) + phi(2, x)\n';
    for (const d of [analyse(text).diagnostics, analyseUntrusted(text).diagnostics]) {
      // The unclosed '(' of well( at offset 11 (counted in this string).
      expect(d.map((x) => [x.code, x.start])).toEqual([['syntax', 11]]);
    }
  });

  it('still reports phi in a file with no system line at all, at each use', () => {
    const text = 'state psi(x) = phi(1, x) + phi(2, x)\n';
    expect(analyse(text).diagnostics.map((x) => [x.code, x.start])).toEqual([['name', 15], ['name', 27]]);
  });
});

describe('a let whose value fails', () => {
  it('gives its one finding; later uses of its name add none', () => {
    const text = 'units nm, meV\nlet E = 3 mev\nsystem oscillator(quantum = E)\nstate eigen(0) of oscillator(quantum = E)\n';
    // 'mev' (a misspelt meV) starts at offset 24 (counted in this string).
    for (const d of [analyse(text).diagnostics, analyseUntrusted(text).diagnostics]) {
      expect(d.filter((x) => x.severity === 'error').map((x) => [x.code, x.start, x.end])).toEqual([['name', 24, 27]]);
    }
  });
});

describe('an expect weight past the bound states of a finite well', () => {
  it('says the well has no more levels instead of asking for a larger basis', () => {
    // A 220 meV, 10 nm GaAs-like well (m = 0.067 m_e) holds 2 bound states (the example gaas-well-packet.qstate).
    const text = 'units nm, meV\nmass 0.067 m_e\nsystem well(depth = 220 meV, width = 10 nm)\nstate gaussian(center = 1.5 nm, width = 1.6 nm)\nexpect weight 1..4 >= 0.9\n';
    const d = analyse(text).diagnostics.filter((x) => x.code === 'expect');
    expect(d.map((x) => [x.severity, text.slice(x.start, x.end)])).toEqual([['error', 'expect weight 1..4 >= 0.9']]);
    // The finding counts the well's 2 bound levels; no fix raises the basis (more levels do not exist).
    expect(numbersIn(d[0]!.message)).toContain(2);
    expect((d[0]!.fixes ?? []).filter((f) => /basis/.test(f.text))).toEqual([]);
  });
});
