// Shared display formatting, checked against ECMA-402 Intl.NumberFormat (an
// independent implementation of the same rounding and grouping; tolerance:
// exact strings, apart from the true minus sign U+2212 the planner uses).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  formatCount,
  formatDateTime,
  formatInput,
  formatPoints,
  formatProbability,
  formatReliability,
  formatShare,
  formatSignedPoints,
  NOT_AVAILABLE,
  withMcse,
} from '../../src/report/format';

const intl = (digits: number) =>
  new Intl.NumberFormat('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: false, roundingMode: 'halfExpand' } as Intl.NumberFormatOptions);

/** Intl's text with the planner's minus sign, and "-0.00" shown as "0.00". */
function reference(x: number, digits: number): string {
  const s = intl(digits).format(x);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s.replace('-', '\u2212');
}

describe('number formatting', () => {
  it('matches Intl.NumberFormat for points (2 decimals) on numbers that are exact in binary', () => {
    // Quarter-steps are exact doubles, so toFixed and Intl must agree on every one (no tie ambiguity).
    fc.assert(
      fc.property(fc.integer({ min: -4_000_000, max: 4_000_000 }), (k) => {
        const x = k / 4;
        expect(formatPoints(x)).toBe(reference(x, 2));
      }),
    );
  });

  it('signs biases, never prints "-0.00", and uses the true minus sign', () => {
    expect(formatSignedPoints(1.25)).toBe('+1.25');
    expect(formatSignedPoints(-1.25)).toBe('\u22121.25');
    expect(formatSignedPoints(-0.001)).toBe('0.00');
    expect(formatPoints(-0.004)).toBe('0.00');
  });

  it('shows rates as percentages with one decimal and shares as whole percentages', () => {
    expect(formatProbability(0.0512)).toBe('5.1%');
    expect(formatProbability(0.8)).toBe('80.0%');
    expect(formatShare(0.25)).toBe('25%');
    expect(formatShare(-0.8)).toBe('\u221280%');
  });

  it('shows reliabilities with 3 decimals and no leading zero (common practice in psychometric reporting)', () => {
    expect(formatReliability(0.75)).toBe('.750');
    expect(formatReliability(0.92308)).toBe('.923'); // Spearman–Brown .80 with k = 3 (REFERENCES.md, computed)
  });

  it('groups counts in thousands like Intl en-GB', () => {
    for (const n of [0, 7, 999, 1000, 1200, 65536, 1234567]) {
      expect(formatCount(n)).toBe(new Intl.NumberFormat('en-GB').format(n));
    }
  });

  it('never lets NaN or Infinity through', () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, null, undefined]) {
      expect(formatPoints(bad)).toBe(NOT_AVAILABLE);
      expect(formatSignedPoints(bad)).toBe(NOT_AVAILABLE);
      expect(formatProbability(bad)).toBe(NOT_AVAILABLE);
      expect(formatReliability(bad)).toBe(NOT_AVAILABLE);
      expect(formatCount(bad)).toBe(NOT_AVAILABLE);
      expect(formatInput(bad)).toBe(NOT_AVAILABLE);
    }
    expect(withMcse('+1.00', Number.NaN, (x) => formatPoints(x))).toBe('+1.00');
  });

  it('adds one Monte Carlo SE after ±', () => {
    expect(withMcse(formatSignedPoints(-2.0912), 0.0614, (x) => formatPoints(x))).toBe('\u22122.09 ± 0.06');
  });

  it('writes dates in UTC, independent of the machine’s time zone', () => {
    expect(formatDateTime(new Date('2026-12-01T09:05:00Z'))).toBe('1 December 2026, 09:05 UTC');
    expect(formatDateTime(new Date('2027-01-31T23:59:59+02:00'))).toBe('31 January 2027, 21:59 UTC');
  });
});
