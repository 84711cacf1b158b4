/**
 * A frequency (or the wavenumber invcm) as the energy unit of the `units` line: energies are stored and
 * shown as E / h in that frequency unit, and every front end says so.
 * Expected values: h = 6.62607015e-34 J s and e = 1.602176634e-19 C (exact, SI 2019; CODATA 2018), so
 * 1 ueV / h = 241.7989242 MHz and 1 eV / (h c) = 8065.543937 cm^-1 (the CODATA 2018 electron volt-hertz
 * and electron volt-inverse metre relationships, both exact); an oscillator's levels are
 * E_n = (n + 1/2) h f and its revival is 1 / f (closed forms, common practice).
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseStatic } from '../../server/src/analysis/index';
import { analyseWithSweep } from '../../server/src/analysis/sweep/index';
import { makeUnitSystem } from '../../server/src/expr/units';
import { renderCsv, renderTable } from '../../server/src/cli/render';
import { renderSweepCsv } from '../../server/src/cli/sweepRender';
import { hoverAt } from '../../server/src/lsp/hover';
import { lineTable } from '../../server/src/lsp/positions';
import type { DocView } from '../../server/src/lsp/view';
import { hbarInFileUnits } from '../../client/webview/charts/facts';
import { DEFAULT_SETTINGS, spectrumOption, stateOption } from '../../client/webview/charts';
import { readPalette } from '../../client/webview/theme';
import type { PanelResult } from '../../client/src/messages';

const span = { start: 0, end: 1 };
const line = (...names: string[]) => makeUnitSystem(names.map((name) => ({ name, span })));
const errors = (t: string) => analyse(t).diagnostics.filter((d) => d.severity === 'error');

const ION = 'units um, MHz\nmass 40 u\nsystem oscillator(frequency = 1.2 MHz)\nstate eigen(0) of oscillator(frequency = 1.2 MHz, center = 0.025 um)\nevolve to 2.5 us steps 250\n';

function hover(text: string, at: number): string {
  const s = analyseStatic(text);
  const view: DocView = { uri: 'file:///t.qstate', version: 1, text, lines: lineTable(text), file: s.file, diagnostics: s.diagnostics, result: analyse(text), evaluate: true };
  const h = hoverAt(view, at);
  return h ? (h.contents as { value: string }).value : '';
}

describe('a frequency unit on the units line', () => {
  it('is the energy h f, and its reciprocal is the default time unit', () => {
    const u = line('um', 'MHz');
    expect(u.diagnostics).toEqual([]);
    expect(u.result).toMatchObject({ mode: 'physical', energy: { name: 'MHz', frequency: true }, time: { name: 'us', si: 1e-6 } });
    if (u.result?.mode !== 'physical') throw new Error('physical expected');
    // h x 1 MHz in J (h exact, SI 2019).
    expect(u.result.energy.si).toBeCloseTo(6.62607015e-28, 40);
    expect(u.result.energy.si / 6.62607015e-28).toBeCloseTo(1, 15);
    // A time unit that is named stays; GHz gives ns.
    expect(line('um', 'MHz', 'ms').result).toMatchObject({ time: { name: 'ms' } });
    expect(line('nm', 'GHz').result).toMatchObject({ time: { name: 'ns' } });
  });

  it('gives oscillator levels (n + 1/2) f and the revival 1 / f, in MHz and us', () => {
    const r = analyse(ION);
    expect(errors(ION)).toEqual([]);
    expect(r.units).toEqual({ length: 'um', energy: 'MHz', time: 'us', energyKind: 'frequency' });
    r.system!.energies.slice(0, 5).forEach((e, n) => expect(e).toBeCloseTo((n + 0.5) * 1.2, 10));
    expect(r.evolution!.revival).toBeCloseTo(1 / 1.2, 6);
    // hbar in MHz x us is 1 / (2 pi): the panel's beat periods come out right.
    expect(hbarInFileUnits(r.units)!).toBeCloseTo(1 / (2 * Math.PI), 14);
  });

  it('converts other energies by CODATA: 1 ueV is 241.7989242 MHz, 1 eV is 8065.543937 invcm', () => {
    const v = analyse('units um, MHz\nlet d = 1 ueV\nlet f = 2 MHz\n').values!;
    expect(v.find((x) => x.name === 'd')!.re).toBeCloseTo(241.7989242, 6);
    expect(v.find((x) => x.name === 'd')!.unit).toBe('MHz');
    const w = analyse('units angstrom, invcm\nlet d = 1 eV\n');
    expect(w.values!.find((x) => x.name === 'd')!.re).toBeCloseTo(8065.543937, 5);
    expect(w.units.energyKind).toBe('wavenumber');
    expect(analyse('units nm, meV\nlet d = 1 eV\n').units.energyKind).toBe('energy');
    expect(analyse('let d = 1\n').units.energyKind).toBeUndefined();
  });

  it('refuses a second energy and names what the line takes', () => {
    const two = line('um', 'MHz', 'meV');
    expect(two.result).toBeNull();
    expect(two.diagnostics.map((d) => d.message)).toEqual(["A second energy unit 'meV'; the units line already has 'MHz'."]);
    expect(line('um', 'K').diagnostics[0]!.message).toMatch(/frequency standing for h f/);
  });

  it('is named as a frequency by the table, the CSV comment, the sweep CSV and the hover', () => {
    const r = analyse(ION);
    const table = renderTable(r, ION, 'ion.qstate');
    expect(table).toMatch(/E_n\/h \[MHz\]/);
    expect(table).toMatch(/energy mean: 2\.\d+ MHz/);
    expect(table).toMatch(/revival 0\.8333333\d* us/);
    expect(renderCsv(r).split('\n')[0]).toBe('# energy in MHz (energy as the frequency E/h)');
    expect(renderCsv(analyse('units nm, meV\nsystem box(0, 1 nm)\nstate psi(x) = x (1 nm - x)\n')).split('\n')[0]).toBe('# energy in meV');
    const swept = 'units um, MHz\nmass 40 u\nlet f = 1.2 MHz\nsweep f from 1 MHz to 1.4 MHz steps 2\nsystem oscillator(frequency = f)\nstate eigen(0) of oscillator(frequency = 1.2 MHz)\n';
    expect(renderSweepCsv(analyseWithSweep(swept)).split('\n')[0]).toContain('energy in MHz (energy as the frequency E/h)');
    const h = hover(ION, 1);
    expect(h).toContain('`MHz`: energies as the frequency E/h');
    expect(h).toContain('h = 6.62607015e-34 J s');
    expect(h).toContain('times in `us`');
    expect(hover(ION, ION.indexOf('state'))).toMatch(/⟨E⟩ = 2\.\d+ MHz/);
  });

  it('names the panel axes E/h in MHz', () => {
    const { file: _f, ...r } = analyse(ION, { samples: true });
    const ctx = (tab: 'spectrum' | 'state') => ({ result: JSON.parse(JSON.stringify(r)) as PanelResult, settings: { ...DEFAULT_SETTINGS, tab, axis: 'energy' as const }, palette: readPalette(() => '', 'dark'), tooltip: () => '' });
    const spectrum = spectrumOption(ctx('spectrum')) as { xAxis: { name: string } };
    expect(spectrum.xAxis.name).toBe('E_n/h (MHz)');
    const state = stateOption(ctx('state')) as { yAxis: { name: string }[] };
    expect(state.yAxis[1]!.name).toBe('E/h, V/h (MHz)');
  });
});
