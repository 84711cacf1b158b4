import { describe, expect, it } from 'vitest';
import { formatDecimals, formatFixed, formatNumber, formatPercent, formatRounded } from '../../server/src/shared/numbers';

// Expected texts follow ECMAScript's Number.prototype.toPrecision / toExponential (ECMA-262, 21.1.3),
// with trailing zeros and the '+' of positive exponents dropped (the project's own convention).
describe('formatNumber', () => {
  it.each([
    [0.37603016262, 6, '0.37603'],
    [2.5, 6, '2.5'],
    [1234567, 6, '1.23457e6'],
    [1.5e-7, 6, '1.5e-7'],
    [-3.9999999999999996, 6, '-4'],
    [47.076259296459625, 4, '47.08'],
    [999999.7, 6, '1e6'],
    [0, 6, '0'],
  ])('%d at %d digits is %s', (x, d, text) => expect(formatNumber(x, d)).toBe(text));
  it('names the values that are not numbers', () => {
    expect([formatNumber(null), formatNumber(NaN), formatNumber(Infinity), formatNumber(-Infinity)]).toEqual(['—', 'NaN', '∞', '-∞']);
  });
});

describe('formatPercent', () => {
  it.each([
    [0.123456, '12.35%'],
    [0.000123456, '0.0123%'],
    [1.2e-7, '1.2e-5%'],
    [0, '0%'],
  ])('%d is %s', (f, text) => expect(formatPercent(f)).toBe(text));
});

describe('formatRounded, formatDecimals, formatFixed', () => {
  // Expected strings by hand from the definitions (common practice: ECMAScript Number-to-String).
  it('rounds to significant digits in the form the file parser reads back', () => {
    expect(formatRounded(0.9999987654, 6)).toBe('0.999999');
    expect(formatRounded(1 / 3, 12)).toBe('0.333333333333');
    expect(formatRounded(1.23456e-7, 3)).toBe('1.23e-7');
    expect(formatRounded(1.5e21, 4)).toBe('1.5e+21');
    expect(Number(formatRounded(Math.PI, 10))).toBe(3.141592654);
  });
  it('rounds to decimals with trailing zeros dropped', () => {
    expect(formatDecimals(0.2500001, 2)).toBe('0.25');
    expect(formatDecimals(1.5, 3)).toBe('1.5');
    expect(formatDecimals(2.0004, 3)).toBe('2');
  });
  it('keeps exactly the decimals asked for', () => {
    expect(formatFixed(0.25, 6)).toBe('0.250000');
    expect(formatFixed(1, 3)).toBe('1.000');
  });
});
