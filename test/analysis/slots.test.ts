/**
 * Each statement slot's dimension has one home, its entry in `SLOTS` (server/src/analysis/slots.ts):
 * the full analysis and the untrusted pipeline both read it. For every slot, a value of a wrong
 * dimension is reported by both, on the value, with the same finding, and a value of the right
 * dimension by neither (common practice: a time is not a length). The constructor arguments are the
 * sibling test arguments.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';
import { SLOTS } from '../../server/src/analysis/slots';
import type { ValueKind } from '../../server/src/analysis/dimensions';

type SlotName = keyof typeof SLOTS;

const UNITS = 'units nm, meV, ps\n';
const BOX = 'system box(0 nm, 8 nm)\n';
const PACKET = 'state gaussian(center = 4 nm, width = 0.5 nm)\n';

/** A value of each kind in the file's units, and one of another dimension (the tested slot gets it). */
const RIGHT: Partial<Record<ValueKind, string>> = { length: '1 nm', energy: '50 meV', time: '1 ps', wavenumber: '1 / nm', dimensionless: '2', mass: '0.09 m_e' };
const WRONG: Partial<Record<ValueKind, string>> = { length: '7 meV', energy: '7 nm', time: '7 nm', wavenumber: '7 meV', dimensionless: '7 nm', mass: '7 nm' };

/** A file with the slot holding `v`: every slot of `SLOTS` must have one (the record's type says so). */
const FILES: Record<SlotName, (v: string) => string> = {
  mass: (v) => `mass ${v}\n${BOX}${PACKET}`,
  basis: (v) => `${BOX}${PACKET}basis ${v}\n`,
  evolveTime: (v) => `${BOX}${PACKET}evolve to ${v}\n`,
  evolveSteps: (v) => `${BOX}${PACKET}evolve to 1 ps steps ${v}\n`,
  intervalLeft: (v) => `system V(x) = 0 meV over [${v}, 8 nm]\n${PACKET}`,
  intervalRight: (v) => `system V(x) = 0 meV over [0 nm, ${v}]\n${PACKET}`,
  potential: (v) => `system V(x) = ${v} over [0 nm, 8 nm]\n${PACKET}`,
  massProfile: (v) => `system V(x) = 0 meV over [0 nm, 8 nm] with mass(x) = ${v}\n${PACKET}`,
  eigenLevel: (v) => `${BOX}state eigen(${v}) of box(1 nm, 7 nm)\n`,
  mixtureWeight: (v) => `${BOX}state mixture(${v}: eigen(1) of box(0 nm, 8 nm), 1: eigen(2) of box(0 nm, 8 nm))\n`,
  expectNorm: (v) => `${BOX}${PACKET}expect norm 1 +- ${v}\n`,
  expectEnergy: (v) => `${BOX}${PACKET}expect energy ${v} +- 1000 meV\n`,
  expectSpread: (v) => `${BOX}${PACKET}expect spread ${v} +- 1000 meV\n`,
  expectWeightFrom: (v) => `${BOX}${PACKET}expect weight (${v})..9 >= 0\n`,
  expectWeightTo: (v) => `${BOX}${PACKET}expect weight 1..(${v}) >= 0\n`,
  expectWeight: (v) => `${BOX}${PACKET}expect weight 1..9 >= ${v}\n`,
  expectLevel: (v) => `${BOX}${PACKET}expect level (${v}) energy 50 meV +- 1000 meV\n`,
  expectLevelEnergy: (v) => `${BOX}${PACKET}expect level 1 energy ${v} +- 1000 meV\n`,
  expectContinuum: (v) => `system well(depth = 500 meV, width = 6 nm)\n${PACKET}expect continuum <= ${v}\n`,
  expectRevival: (v) => `${BOX}${PACKET}expect revival ${v} +- 1000 ps\n`,
  expectMeanTime: (v) => `${BOX}${PACKET}expect mean x(${v}) 4 nm +- 10 nm\n`,
  expectMeanX: (v) => `${BOX}${PACKET}expect mean x(0 ps) ${v} +- 10 nm\n`,
  expectMeanP: (v) => `${BOX}${PACKET}expect mean p(0 ps) ${v} +- 10 / nm\n`,
  sweepSteps: (v) => `let w = 8 nm\nsystem box(0 nm, w)\n${PACKET}sweep w from 6 nm to 9 nm steps ${v}\n`,
};

/** Slots whose right value must differ from the table's (a norm's tolerance is a plain number; a level range must not be empty). */
const RIGHT_FOR: Partial<Record<SlotName, string>> = { expectNorm: '0.5', expectWeightTo: '3', expectWeightFrom: '1' };

const names = Object.keys(SLOTS) as SlotName[];

describe('statement slots', () => {
  it('covers every slot, each with a value of its kind', () => {
    expect(names.length).toBe(Object.keys(FILES).length);
    expect(names.length).toBeGreaterThanOrEqual(20);
    for (const n of names) expect(WRONG[SLOTS[n].kind], n).toBeDefined();
  });

  it.each(names)('%s: a wrong dimension is one units finding on the value, the same in both pipelines', (name) => {
    const kind = SLOTS[name].kind;
    const wrong = WRONG[kind]!;
    const text = UNITS + FILES[name](wrong);
    const at = text.indexOf(wrong);
    const full = analyse(text).diagnostics.filter((d) => d.code === 'units');
    const untrusted = analyseUntrusted(text).diagnostics.filter((d) => d.code === 'units');
    expect(full.map((d) => [d.start, d.end])).toEqual([[at, at + wrong.length]]);
    expect(untrusted.map((d) => [d.code, d.start, d.end, d.message])).toEqual(full.map((d) => [d.code, d.start, d.end, d.message]));
    const fine = UNITS + FILES[name](RIGHT_FOR[name] ?? RIGHT[kind]!);
    // The file with the right value is valid: no error but a failed expect line.
    expect(analyse(fine).diagnostics.filter((d) => d.severity === 'error' && d.code !== 'expect').map((d) => `${d.code}: ${d.message}`)).toEqual([]);
    expect(analyseUntrusted(fine).diagnostics.filter((d) => d.code === 'units')).toEqual([]);
  });
});
