/**
 * Each constructor argument's dimension has one home, its parameter in `SIGNATURES`
 * (server/src/language/signatures.ts): the full analysis and the untrusted pipeline both read it. For
 * every parameter, a value of a wrong dimension is reported by both, on the value, with the same finding,
 * and a value of the right dimension by neither (common practice: a length is not an energy).
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';
import { SIGNATURES, type ParamKind, type Signature } from '../../server/src/language/signatures';

const UNITS = 'units nm, meV, ps\n';
/** A value of each kind in the file's units, and one of another dimension. */
const RIGHT: Record<ParamKind, string> = { length: '1 nm', energy: '50 meV', angularFrequency: '2 / ps', frequency: '1 THz', wavenumber: '1 / nm', dimensionless: '2', mass: '0.09 m_e', temperature: '300 K' };
const WRONG: Record<ParamKind, string> = { length: '7 meV', energy: '7 nm', angularFrequency: '7 nm', frequency: '7 nm', wavenumber: '7 meV', dimensionless: '7 nm', mass: '7 nm', temperature: '7 nm' };

/** A call of `sig` with its required parameters, one of each `oneOf` group, and `tested` set to `value`. */
function call(sig: Signature, tested: string, value: string): string {
  const chosen = new Set(sig.params.filter((p) => p.required).map((p) => p.name));
  chosen.add(tested);
  for (const group of sig.oneOf) if (!group.some((n) => chosen.has(n))) chosen.add(group[0]!);
  const args = sig.params.filter((p) => chosen.has(p.name)).map((p) => `${p.name} = ${p.name === tested ? value : RIGHT[p.kind]}`);
  // A box's right end must exceed its left one.
  return `${sig.name}(${args.join(', ').replace('right = 1 nm', 'right = 9 nm')})`;
}

function fileWith(sig: Signature, c: string): string {
  // A thermal state names the system it is in equilibrium with.
  const of = sig.name === 'thermal' ? ' of oscillator(omega = 2 / ps)' : '';
  return sig.context === 'system' ? `${UNITS}system ${c}\n` : `${UNITS}system box(-5 nm, 5 nm)\nstate ${c}${of}\n`;
}

const cases = Object.values(SIGNATURES).flatMap((sig) => sig.params.map((p) => ({ sig, p })));

describe('constructor arguments', () => {
  it('covers every parameter of every constructor', () => {
    expect(cases.length).toBe(Object.values(SIGNATURES).reduce((n, s) => n + s.params.length, 0));
    expect(cases.length).toBeGreaterThanOrEqual(12);
  });

  it.each(cases.map((c) => [`${c.sig.name}(${c.p.name})`, c] as const))('%s: a wrong dimension is one units finding on the value, the same in both pipelines', (_, { sig, p }) => {
    const text = fileWith(sig, call(sig, p.name, WRONG[p.kind]));
    const at = text.indexOf(WRONG[p.kind]);
    const full = analyse(text).diagnostics.filter((d) => d.code === 'units');
    const untrusted = analyseUntrusted(text).diagnostics.filter((d) => d.code === 'units');
    expect(full.map((d) => [d.start, d.end])).toEqual([[at, at + WRONG[p.kind].length]]);
    expect(untrusted.map((d) => [d.code, d.start, d.end, d.message])).toEqual(full.map((d) => [d.code, d.start, d.end, d.message]));
    const fine = fileWith(sig, call(sig, p.name, RIGHT[p.kind]));
    expect(analyse(fine).diagnostics.filter((d) => d.code === 'units')).toEqual([]);
    expect(analyseUntrusted(fine).diagnostics.filter((d) => d.code === 'units')).toEqual([]);
  });
});
