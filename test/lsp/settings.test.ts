/**
 * The settings' ranges and defaults in package.json (what the editor shows and validates) are the
 * ones the server and the engine apply: `eigenspan.limits.*` against the engine's LIMIT_RANGES and
 * DEFAULT_LIMITS, the plain number settings against the server's SETTING_RANGES and DEFAULT_SETTINGS.
 * And each range is applied: its ends are accepted, one step outside keeps the default.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { DEFAULT_LIMITS, LIMIT_RANGES, type SettableLimit } from '../../server/src/analysis/index';
import { DEFAULT_SETTINGS, SETTING_RANGES, readSettings } from '../../server/src/lsp/settings';

interface Property {
  type: string;
  default: unknown;
  minimum?: number;
  maximum?: number;
}
const properties = (JSON.parse(readFileSync('package.json', 'utf8')) as { contributes: { configuration: { properties: Record<string, Property> } } }).contributes.configuration.properties;
const LIMIT = 'eigenspan.limits.';
const limitNames = Object.keys(properties).filter((k) => k.startsWith(LIMIT)).map((k) => k.slice(LIMIT.length));

describe('eigenspan.limits.* in package.json', () => {
  it('names exactly the limits the engine lets a user set', () => {
    expect([...limitNames].sort()).toEqual(Object.keys(LIMIT_RANGES).sort());
  });

  it.each(Object.keys(LIMIT_RANGES) as SettableLimit[])('%s: whole number, range and default as in the engine', (name) => {
    const p = properties[LIMIT + name]!;
    expect(p.type).toBe('integer');
    expect([p.minimum, p.maximum]).toEqual([...LIMIT_RANGES[name]]);
    expect(p.default).toBe(DEFAULT_LIMITS[name]);
  });

  it.each(Object.keys(LIMIT_RANGES) as SettableLimit[])('%s: both ends are kept, one outside falls back to the default', (name) => {
    const [lo, hi] = LIMIT_RANGES[name];
    expect(readSettings({ limits: { [name]: lo } }).limits[name]).toBe(lo);
    expect(readSettings({ limits: { [name]: hi } }).limits[name]).toBe(hi);
    for (const v of [lo - 1, hi + 1]) {
      const s = readSettings({ limits: { [name]: v } });
      expect(s.limits[name]).toBeUndefined();
      expect(s.limitProblems).toHaveLength(1);
    }
  });
});

describe('the plain number settings in package.json', () => {
  const names = Object.keys(SETTING_RANGES) as (keyof typeof SETTING_RANGES)[];

  it('are every numeric setting outside the limits', () => {
    const numeric = Object.entries(properties)
      .filter(([k, p]) => !k.startsWith(LIMIT) && (p.type === 'integer' || p.type === 'number'))
      .map(([k]) => k.slice('eigenspan.'.length));
    expect(numeric.sort()).toEqual([...names].sort());
  });

  it.each(names)('%s: range and default as the server applies them', (name) => {
    const p = properties[`eigenspan.${name}`]!;
    expect([p.minimum, p.maximum]).toEqual([...SETTING_RANGES[name]]);
    expect(p.default).toBe(DEFAULT_SETTINGS[name]);
  });

  it.each(names)('%s: both ends are kept, one outside falls back to the default', (name) => {
    const [lo, hi] = SETTING_RANGES[name];
    expect(readSettings({ [name]: lo })[name]).toBe(lo);
    expect(readSettings({ [name]: hi })[name]).toBe(hi);
    expect(readSettings({ [name]: lo - 1 })[name]).toBe(DEFAULT_SETTINGS[name]);
    expect(readSettings({ [name]: hi + 1 })[name]).toBe(DEFAULT_SETTINGS[name]);
  });
});

describe('the switch settings in package.json', () => {
  // The boolean settings the server reads: type and default as the server applies them.
  const switches = ['sweepInBackground'] as const;

  it('are every boolean setting', () => {
    const booleans = Object.entries(properties)
      .filter(([, p]) => p.type === 'boolean')
      .map(([k]) => k.slice('eigenspan.'.length));
    expect(booleans.sort()).toEqual([...switches].sort());
  });

  it.each(switches)('%s: default as the server applies it; true and false kept, anything else falls back', (name) => {
    expect(properties[`eigenspan.${name}`]!.default).toBe(DEFAULT_SETTINGS[name]);
    expect(readSettings({ [name]: true })[name]).toBe(true);
    expect(readSettings({ [name]: false })[name]).toBe(false);
    for (const v of ['false', 0, null, {}]) expect(readSettings({ [name]: v })[name]).toBe(DEFAULT_SETTINGS[name]);
  });
});
