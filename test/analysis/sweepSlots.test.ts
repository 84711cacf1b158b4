/**
 * The sweep line's slots have their one home in server/src/analysis/slots.ts (`sweepLineSlots`,
 * `windowSlots`, `SLOTS.sweepSteps`): the trusted check (sweep/plan.ts) and the untrusted one
 * (sweep/untrusted.ts) both read it. For a length and an energy swept in natural, nm-meV and SI files,
 * the axis's dimension as the sweep reports it is the let's (the dimension its parameter takes,
 * signatures.ts), the value of the right dimension is accepted and one of another dimension refused
 * with the same finding in both pipelines (common practice: an energy is not a length). A source guard
 * fails if the sweep's files grow a dimension rule of their own again.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';
import { prepareSweep } from '../../server/src/analysis/sweep/index';
import { SLOTS, sweepLineSlots, windowSlots } from '../../server/src/analysis/slots';
import { dimensionOf, type ValueKind } from '../../server/src/analysis/dimensions';
import { paramOf } from '../../server/src/language/signatures';
import { makeUnitSystem } from '../../server/src/expr/units';
import type { UnitSystem } from '../../server/src/expr/types';

/** One unit system: its `units` line and a value of each dimension the file uses, written in it. */
interface Units {
  line: string;
  length: (v: number) => string;
  energy: (v: number) => string;
}

const UNITS: Record<string, Units> = {
  natural: { line: '', length: (v) => `${v}`, energy: (v) => `${v}` },
  nm: { line: 'units nm, meV, ps\n', length: (v) => `${v} nm`, energy: (v) => `${v} meV` },
  // 1 meV = 1.602176634e-22 J (SI 2019, exact), so the SI file is the nm-meV one in other numbers.
  SI: { line: 'units m, J, s\n', length: (v) => `${v}e-9 m`, energy: (v) => `${v * 1.602176634}e-22 J` },
};

/** The swept lets: the well's width (a length) and its depth (an energy), with a range and a window inside it. */
const SWEPT = {
  w: { kind: 'length' as const, param: 'width', value: 4, from: 1, to: 5, window: [2, 3] as const },
  d: { kind: 'energy' as const, param: 'depth', value: 100, from: 50, to: 150, window: [60, 70] as const },
};
type Swept = keyof typeof SWEPT;
const other = (k: 'length' | 'energy'): 'length' | 'energy' => (k === 'length' ? 'energy' : 'length');

/** The sweep's five slots, in the order the file writes them. */
const SLOT_NAMES = ['sweepFrom', 'sweepTo', 'sweepSteps', 'windowFrom', 'windowTo'] as const;
type SlotName = (typeof SLOT_NAMES)[number];

/** A file sweeping `name`, with `replace` (when given) written into one slot instead of its right value. */
function file(u: Units, name: Swept, replace?: { slot: SlotName; text: string }): string {
  const s = SWEPT[name];
  const v = (x: number): string => u[s.kind](x);
  const at = (slot: SlotName, right: string): string => (replace?.slot === slot ? replace.text : right);
  return [
    u.line,
    `let w = ${u.length(4)}\n`,
    `let d = ${u.energy(100)}\n`,
    'system well(depth = d, width = w)\n',
    `state gaussian(center = ${u.length(0)}, width = ${u.length(1)})\n`,
    `sweep ${name} from ${at('sweepFrom', v(s.from))} to ${at('sweepTo', v(s.to))} steps ${at('sweepSteps', '4')}\n`,
    `expect window covers ${at('windowFrom', v(s.window[0]))}..${at('windowTo', v(s.window[1]))}\n`,
  ].join('');
}

function unitSystem(u: Units): UnitSystem {
  if (u.line === '') return { mode: 'natural' };
  const names = u.line.replace('units', '').split(',').map((n) => n.trim());
  const made = makeUnitSystem(names.map((name) => ({ name, span: { start: 0, end: 0 } })));
  if (!made.result) throw new Error(`bad units line ${u.line}`);
  return made.result;
}

const units = (text: string, f: typeof analyse | typeof analyseUntrusted) =>
  f(text).diagnostics.filter((d) => d.code === 'units').map((d) => [d.code, d.start, d.end, d.message]);

describe('the sweep line reads its slots from slots.ts', () => {
  for (const [label, u] of Object.entries(UNITS)) {
    for (const name of Object.keys(SWEPT) as Swept[]) {
      const s = SWEPT[name];
      it(`${label}: sweeping the ${s.kind} '${name}' reports the let's dimension, the one slots.ts gives every slot`, () => {
        const text = file(u, name);
        expect(analyse(text).diagnostics.filter((d) => d.severity === 'error').map((d) => `${d.code}: ${d.message}`)).toEqual([]);
        expect(analyseUntrusted(text).diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
        const job = prepareSweep(text);
        expect(job).not.toBeNull();
        const axis = job!.setting.axes[0]!;
        const us = unitSystem(u);
        // The let's dimension is the one its parameter of well(...) takes (signatures.ts).
        const want = dimensionOf(paramOf('well', s.param)!.kind, us);
        expect(axis.dimension).toEqual(want);
        expect(dimensionOf(s.kind, us)).toEqual(want);
        const [from, to, steps] = sweepLineSlots(axis.spec, axis.dimension, us);
        expect([from!.dimension, to!.dimension]).toEqual([want, want]);
        expect(steps!.dimension).toEqual(dimensionOf(SLOTS.sweepSteps.kind, us));
        expect(windowSlots({ from: axis.spec.from, to: axis.spec.to }, name, axis.dimension).map((w) => w.dimension)).toEqual([want, want]);
      });
    }
  }

  for (const [label, u] of Object.entries(UNITS).filter(([l]) => l !== 'natural')) {
    for (const name of Object.keys(SWEPT) as Swept[]) {
      const s = SWEPT[name];
      it.each(SLOT_NAMES)(`${label}, '${name}' (a ${s.kind}): a wrong dimension in %s is one units finding on it, the same in both pipelines`, (slot) => {
        const wrong = slot === 'sweepSteps' ? u.length(7) : u[other(s.kind)](7);
        const text = file(u, name, { slot, text: wrong });
        const at = text.lastIndexOf(wrong);
        const full = units(text, analyse);
        expect(full.map(([, start, end]) => [start, end])).toEqual([[at, at + wrong.length]]);
        expect(units(text, analyseUntrusted)).toEqual(full);
        // The finding names the slot with slots.ts's words (the one home of what the slot is called).
        const words = slot === 'sweepSteps' ? SLOTS.sweepSteps.what : slot.startsWith('sweep') ? `sweep of '${name}'` : `window of '${name}'`;
        expect(String(full[0]![3]).toLowerCase()).toContain(words);
        // A wrong value on the sweep line leaves no sweep to run; a wrong window leaves the sweep.
        expect(prepareSweep(text) === null).toBe(!slot.startsWith('window'));
      });
    }
  }

  describe('the name rules (sweep/names.ts) give the same findings in both pipelines', () => {
    const u = UNITS.nm!;
    const head = `${u.line}let w = 4 nm\nlet d = 100 meV\nsystem well(depth = d, width = w)\nstate gaussian(center = 0 nm, width = 1 nm)\n`;
    const findings = (text: string, f: typeof analyse | typeof analyseUntrusted) =>
      f(text).diagnostics.filter((d) => d.severity === 'error').map((d) => [d.code, text.slice(d.start, d.end), d.message, d.fixes ?? []]);
    it.each([
      ['a name no let defines, with the nearest let as its fix', 'sweep ww from 1 nm to 5 nm steps 4\n', [['name', 'ww']]],
      ['a let defined after the swept one in its range', 'sweep w from 1 nm to (d / 25 meV) * 1 nm steps 4\n', [['name', 'd']]],
      ['the swept let itself in its range', 'sweep w from 1 nm to 2 w steps 4\n', [['name', 'w']]],
      ['a later let in the window', 'sweep w from 1 nm to 5 nm steps 4\nexpect window covers 2 nm..(d / 50 meV) * 1 nm\n', [['name', 'd']]],
      ['an earlier let in the range is fine', 'sweep d from (w / 4 nm) * 50 meV to 150 meV steps 4\n', []],
    ])('%s', (_label, line, want) => {
      const text = head + line;
      const full = findings(text, analyse);
      expect(full.map(([code, at]) => [code, at])).toEqual(want);
      expect(findings(text, analyseUntrusted)).toEqual(full);
    });
    it('offers the nearest let name as a replacement in both', () => {
      const text = `${head}sweep ww from 1 nm to 5 nm steps 4\n`;
      for (const f of [analyse, analyseUntrusted]) {
        const d = f(text).diagnostics.find((x) => x.code === 'name')!;
        expect(d.fixes?.map((x) => [x.kind, 'text' in x ? x.text : null])).toEqual([['replace', 'w']]);
      }
    });
  });

  it('keeps the sweep files free of dimension rules of their own', () => {
    for (const f of ['plan.ts', 'untrusted.ts', 'names.ts']) {
      const src = readFileSync(new URL(`../../server/src/analysis/sweep/${f}`, import.meta.url), 'utf8');
      // A dimension literal, a kind looked up directly or a mismatch worded here would be a second home.
      expect(src, f).not.toMatch(/\[\s*-?\d+\s*,\s*-?\d+\s*,\s*-?\d+\s*,\s*-?\d+\s*[,\]]/);
      expect(src, f).not.toMatch(/dimensionOf\(|withArticle|isDimensionless/);
      const kinds: ValueKind[] = ['length', 'energy', 'mass', 'time', 'dimensionless', 'wavenumber'];
      for (const k of kinds) expect(src, f).not.toContain(`'${k}'`);
    }
  });
});
