// One rounding rule (common/precision.ts). Float-noise cases are IEEE 754 double arithmetic as
// any JavaScript engine computes it (0.1 + 0.2 = 0.30000000000000004, 1700.4 + 242.2 =
// 1942.6000000000001); the decimals rules are common practice (no source).
import { describe, expect, it } from 'vitest';
import {
  decimalsFor,
  decimalsInUnit,
  decimalsOf,
  displayNumber,
  exportNumber,
  recordedDecimals,
} from '../../common/precision';

describe('recorded precision', () => {
  it('reads the decimals a value was typed with, ignoring float noise', () => {
    expect(decimalsOf(0.1 + 0.2)).toBe(1);
    expect(decimalsOf(1700.4 + 242.2)).toBe(1);
    expect(decimalsOf(1942)).toBe(0);
    expect(decimalsOf(12.25)).toBe(2);
    expect(recordedDecimals([920, 1010.5, 870.25])).toBe(2);
  });
  it('sums keep the recorded decimals; means get one more; z scores 2; percentages 1', () => {
    expect(decimalsFor('recorded', 1)).toBe(1);
    expect(decimalsFor('mean', 1)).toBe(2);
    expect(decimalsFor('score', 0)).toBe(2);
    expect(decimalsFor('percent', 3)).toBe(1);
  });
  it('keeps the same step in another unit: g to kg adds 3 decimals, mm to cm 1', () => {
    expect(decimalsInUnit(1, 1 / 1000)).toBe(4);
    expect(decimalsInUnit(0, 1 / 10)).toBe(1);
    expect(decimalsInUnit(2, 1)).toBe(2);
  });
});

describe('no float noise in what people read or download', () => {
  it('a season total exports as it was recorded', () => {
    expect(exportNumber(1700.4 + 242.2, 1)).toBe('1942.6');
    expect(exportNumber(null, 1)).toBe('');
  });
  it('a contribution that is zero up to noise reads 0.00, never -0.00 or -0.00000000000000015', () => {
    expect(displayNumber(-1.5e-16, 2)).toBe('0.00');
    expect(displayNumber(-0.004, 2)).toBe('0.00');
    expect(displayNumber(1234.5678, 1)).toBe('1,234.6');
  });
});
