/**
 * A thermal mixture's populations are only as good as the share its sum leaves out: the spectrum does
 * not draw levels below that share, and says why (pure chart builders, no browser).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { describeView, DEFAULT_SETTINGS } from '../../client/webview/charts';
import { readPalette } from '../../client/webview/theme';
import { resultOf } from './driver';

const palette = readPalette(() => '', 'light');

describe('thermal mixture: the floor of the populations drawn', () => {
  it('leaves out the levels below the omitted share of the thermal sum, and names that share', () => {
    const { result } = resultOf(readFileSync('examples/thermal-ion-shift.qstate', 'utf8'));
    const omitted = result.mixture!.omitted;
    // The sum stops where the left-out Boltzmann weight is tiny but well above rounding (1e-16).
    expect(omitted).toBeGreaterThan(1e-15);
    expect(omitted).toBeLessThan(1e-9);
    const below = result.levels.filter((l) => l.weight !== null && l.weight <= omitted).length;
    expect(below).toBeGreaterThan(0);
    const view = describeView({ result, settings: { ...DEFAULT_SETTINGS, tab: 'spectrum', scale: 'log' }, palette, tooltip: () => '' });
    const drawn = (view.option!.series as { id: string; data: (number | null)[] }[])
      .filter((s) => s.id.startsWith('bars-'))
      .reduce((n, s) => n + s.data.filter((v) => v !== null).length, 0);
    expect(drawn).toBe(result.levels.length - below);
    expect(view.notes.some((t) => t.includes('thermal sum leaves out'))).toBe(true);
  });

  it('a pure state keeps the numerical-zero floor', () => {
    const { result } = resultOf('system box(0, 1)\nstate psi(x) = x * (1 - x)\nbasis 40\n');
    const view = describeView({ result, settings: { ...DEFAULT_SETTINGS, tab: 'spectrum', scale: 'log' }, palette, tooltip: () => '' });
    // x (1 - x) is symmetric about 1/2: its even-n coefficients are numerical zeros and are not drawn.
    expect(view.notes.some((t) => t.includes('numerical zero'))).toBe(true);
    expect(view.notes.some((t) => t.includes('thermal'))).toBe(false);
  });
});
