import { describe, it, expect } from 'vitest';
import { levelsToCsv, levelsToJson, levelsToMarkdown, cumulativeWeights, formatNumber, phaseOf } from '../../client/src/format';
import { parabolaResult } from './fixtures';

/** Splits RFC 4180 CSV text into rows of fields (quoted fields may hold commas and doubled quotes). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') ((field += '"'), i++);
      else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') (row.push(field), (field = ''));
    else if (c === '\r' && text[i + 1] === '\n') (row.push(field), rows.push(row), (row = []), (field = ''), i++);
    else field += c;
  }
  return rows;
}

describe('coefficient exports', () => {
  const result = parabolaResult(15);

  it('writes CSV with CRLF rows, a header and exact numbers', () => {
    const csv = levelsToCsv(result);
    expect(csv.endsWith('\r\n')).toBe(true);
    const rows = parseCsv(csv);
    expect(rows[0]).toEqual(['n', 'energy_natural', 're', 'im', 'abs', 'phase_rad', 'weight', 'cumulative']);
    expect(rows).toHaveLength(16);
    // |c_1|^2 = 960/pi^6 = 0.998555014364018 — Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    expect(Number(rows[1]![6])).toBeCloseTo(0.998555014364018, 14);
    for (let k = 0; k < 15; k++) {
      const r = rows[k + 1]!.map(Number);
      expect(r[0]).toBe(result.levels[k]!.n);
      expect(r[2]).toBe(result.levels[k]!.re); // full precision survives the round trip
      expect(r[6]).toBe(result.levels[k]!.weight);
    }
    // Invariant: the last cumulative weight is the captured weight.
    expect(Number(rows[15]![7])).toBeCloseTo(result.captured!, 15);
  });

  it('quotes CSV fields that need it (RFC 4180, section 2)', () => {
    const r = { ...result, units: { ...result.units, energy: 'meV, "scaled"' } };
    const rows = parseCsv(levelsToCsv(r));
    expect(rows[0]![1]).toBe('energy_meV, "scaled"');
    expect(rows[0]).toHaveLength(8);
  });

  it('writes JSON that parses back, with NaN and infinities as null', () => {
    const r = { ...result, levels: [...result.levels, { n: 16, energy: Infinity, re: NaN, im: 0, weight: NaN }] };
    const doc = JSON.parse(levelsToJson(r, { fileName: 'parabola.qstate' }));
    expect(doc.file).toBe('parabola.qstate');
    expect(doc.levels).toHaveLength(16);
    expect(doc.levels[0].weight).toBe(result.levels[0]!.weight);
    expect(doc.levels[15].energy).toBeNull();
    expect(doc.levels[15].weight).toBeNull();
    // Odd levels only: even coefficients of this even state vanish (same source); phase of a positive real is 0.
    expect(doc.levels[1].weight).toBe(0);
    expect(doc.levels[0].phase).toBe(0);
    expect(doc.captured).toBe(result.captured);
  });

  it('writes a Markdown table with one row per level and escaped pipes', () => {
    const md = levelsToMarkdown(parabolaResult(5, { energyUnit: 'meV' }));
    const lines = md.trim().split('\n');
    expect(lines).toHaveLength(7);
    expect(lines[0]).toContain('\\|c_n\\|²');
    expect(lines[0]).toContain('E_n (meV)');
    // Every row has the same number of unescaped cell separators as the header.
    const cells = (l: string) => l.replace(/\\\|/g, '').split('|').length;
    for (const l of lines) expect(cells(l)).toBe(cells(lines[0]!));
    expect(lines[2]).toMatch(/^\| 1 \| 4\.9348 \| 0\.999277 \| 0 \| 0\.998555 \| 0\.998555 \|$/);
  });

  it('formats numbers and phases', () => {
    expect(formatNumber(0.998555014364018, 6)).toBe('0.998555');
    expect(formatNumber(1.2345e-9, 3)).toBe('1.23e-9');
    expect(formatNumber(null)).toBe('—'); // the shared formatter's mark for a missing value
    expect(phaseOf(-1, 0)).toBeCloseTo(Math.PI, 15);
    expect(phaseOf(0, -1)).toBeCloseTo(-Math.PI / 2, 15);
    const cum = cumulativeWeights(result.levels);
    for (let k = 1; k < cum.length; k++) expect(cum[k]!).toBeGreaterThanOrEqual(cum[k - 1]!);
  });
});
