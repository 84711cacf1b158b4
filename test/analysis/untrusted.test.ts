/**
 * The untrusted pipeline: syntax, name and dimension checks, and nothing evaluated. Every compiled or
 * evaluated expression goes through `compileFunction` or `evaluateConstant`; both are wrapped here with
 * counters (the real implementations still run), so the tests prove that untrusted mode calls neither.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';

const calls = vi.hoisted(() => ({ compile: 0, constant: 0 }));

vi.mock('../../server/src/expr/compile', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../server/src/expr/compile')>();
  return {
    ...real,
    compileFunction: (...args: Parameters<typeof real.compileFunction>) => {
      calls.compile++;
      return real.compileFunction(...args);
    },
    evaluateConstant: (...args: Parameters<typeof real.evaluateConstant>) => {
      calls.constant++;
      return real.evaluateConstant(...args);
    },
  };
});

import { analyse, analyseStatic, analyseUntrusted } from '../../server/src/analysis/index';

const UNITS = 'units nm, eV\nlet bad = 3 meV + 2 nm\nsystem box(0 nm, 1 nm)\nstate psi(x) = sin(pi x / (1 nm))\nbasis 3 nm\n';
const span = (text: string, piece: string): [number, number] => [text.indexOf(piece), text.indexOf(piece) + piece.length];

beforeEach(() => {
  calls.compile = 0;
  calls.constant = 0;
});

describe('untrusted mode', () => {
  it('reports the unit mistakes of a file without evaluating anything', () => {
    for (const run of [
      () => analyseUntrusted(UNITS).diagnostics,
      () => analyseStatic(UNITS, { evaluate: false }).diagnostics,
      () => analyse(UNITS, { evaluate: false }).diagnostics,
    ]) {
      const d = run();
      // Adding an energy to a length, and a length as the basis size (common practice: dimensions add only when equal).
      expect(d.map((x) => [x.code, x.start, x.end])).toEqual([
        ['units', ...span(UNITS, '3 meV + 2 nm')],
        ['units', ...span(UNITS, '3 nm')],
      ]);
    }
    expect(calls).toEqual({ compile: 0, constant: 0 });
  });

  it('never calls a compiled function, even for a state and a potential whose evaluation would fail', () => {
    const text = 'system V(x) = 1 / (x - x) over [0, 1]\nstate psi(x) = log(0 * x) / 0\nexpect norm >= 0.5\nevolve to 1\n';
    const r = analyse(text, { evaluate: false });
    expect(r.diagnostics).toEqual([]);
    expect(r.levels).toEqual([]);
    expect(r.values).toEqual([]);
    expect(calls).toEqual({ compile: 0, constant: 0 });
  });

  it('the trusted pipeline does evaluate (the counters see it) and finds the same unit mistakes', () => {
    const d = analyseStatic(UNITS).diagnostics;
    expect(calls.constant).toBeGreaterThan(0);
    expect(d.map((x) => [x.code, x.start, x.end])).toEqual([
      ['units', ...span(UNITS, '3 meV + 2 nm')],
      ['units', ...span(UNITS, '3 nm')],
    ]);
  });

  it('checks syntax, unknown names and the sandbox', () => {
    const text = 'system box(0, 1)\nstate psi(x) = sin(pi x) * wdith\nlet y = import(2)\n';
    const d = analyseUntrusted(text).diagnostics;
    expect(d.some((x) => x.code === 'name' && x.start === text.indexOf('wdith'))).toBe(true);
    expect(d.some((x) => x.code === 'forbidden' || x.code === 'name')).toBe(true);
    expect(calls).toEqual({ compile: 0, constant: 0 });
  });
});
