/**
 * Every front end with a mixed state, whose levels have null re and im: the command line's JSON, CSV,
 * table and summary, and the editor's hover. Nothing may print NaN, "null" in a CSV cell, or crash.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { analyse } from '../../server/src/analysis/index';
import { renderCsv, renderTable, toJson } from '../../server/src/cli/render';
import { renderSummary } from '../../server/src/cli/summary';
import { hoverAt } from '../../server/src/lsp/hover';
import { lineTable } from '../../server/src/language/positions';
import type { DocView } from '../../server/src/lsp/view';

const PATH = 'examples/thermal-ion-shift.qstate';
const text = readFileSync(PATH, 'utf8');
const result = analyse(text);

describe('a mixed state in the command line', () => {
  it('JSON: levels with re and im null, the purity and the thermal weights', () => {
    const j = JSON.parse(JSON.stringify(toJson(result, text))) as { levels: { n: number; re: unknown; im: unknown; weight: number }[]; purity: number; mixture: { kind: string; weights: number[]; omitted: number } };
    expect(j.levels.length).toBeGreaterThan(20);
    for (const l of j.levels) {
      expect(l.re).toBeNull();
      expect(l.im).toBeNull();
      expect(Number.isFinite(l.weight)).toBe(true);
    }
    // 1 / (2 nbar + 1) with nbar = 1 / (exp(hbar omega / k_B T) - 1) = 0.171853975937 (the example's comment).
    expect(Math.abs(j.purity - 1 / (2 * 0.17185397593695434 + 1))).toBeLessThan(1e-9);
    expect(j.mixture.kind).toBe('thermal');
    expect(j.mixture.omitted).toBeLessThan(1e-12);
    // A pure state says purity 1 and has no mixture field.
    const pure = toJson(analyse('system box(0, 1)\nstate eigen(2) of box(0, 1)\n'), '');
    expect(pure.purity).toBe(1);
    expect('mixture' in pure).toBe(false);
  });

  it('CSV leaves the re and im cells empty; the table and summary show P_n and the purity, never NaN', () => {
    const csv = renderCsv(result).split('\n');
    expect(csv[1]).toBe('n,energy,re,im,weight');
    expect(csv[2]).toMatch(/^0,[\d.e-]+,,,0\.430264833/);
    const table = renderTable(result, text, PATH);
    const summary = renderSummary(result);
    for (const out of [csv.join('\n'), table, summary]) {
      expect(out).not.toMatch(/NaN|null|undefined/);
    }
    expect(table).toContain('P_n');
    expect(table).toMatch(/purity Tr rho\^2 = 0\.744209334/);
    expect(summary).toContain('purity: 0.7442');
    expect(summary).toContain('level 0: energy 0.00413567 ueV, weight 0.4303');
  });

  it('the built command line prints the same JSON and exits 0 on the example (its expects hold)', () => {
    const r = spawnSync(process.execPath, ['dist/cli.js', 'expand', PATH, '--json'], { encoding: 'utf8' });
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout) as { levels: { re: unknown }[]; purity: number; diagnostics: unknown[] };
    expect(j.levels[0]!.re).toBeNull();
    expect(j.diagnostics).toEqual([]);
    const c = spawnSync(process.execPath, ['dist/cli.js', 'check', PATH], { encoding: 'utf8' });
    expect(c.status).toBe(0);
  });
});

describe('a mixed state in the editor', () => {
  it('the hover on the state line gives the purity and the populations, without phases or NaN', () => {
    const view: DocView = { uri: 'file:///x.qstate', version: 1, text, lines: lineTable(text), file: result.file!, diagnostics: result.diagnostics, result, evaluate: true };
    const at = text.indexOf('state thermal') + 2;
    const h = hoverAt(view, at)!;
    const md = typeof h.contents === 'string' ? h.contents : 'value' in h.contents ? h.contents.value : JSON.stringify(h.contents);
    expect(md).toContain('purity Tr ρ² = 0.744209');
    expect(md).toContain('P_n');
    expect(md).not.toMatch(/NaN|null|norm ∫/);
  });
});
