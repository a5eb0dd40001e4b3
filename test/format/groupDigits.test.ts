import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { groupDigits } from '../../src/format/groupDigits';
import { fmtInt } from '../../src/format/numbers';

// groupDigits replaces Math.round(n).toLocaleString('en-GB') so the command line need not load
// the locale data at start. The reference is the ECMA-402 number formatting built into Node
// (Intl, with the ICU data Node ships), an implementation outside this project: the two texts
// must be identical, character for character.
const reference = (n: number): string => Math.round(n).toLocaleString('en-GB');

describe('groupDigits: whole numbers grouped in threes with commas, as en-GB formats them (ECMA-402 via Node\u2019s Intl)', () => {
  it('agrees on hand-picked values: zero and negative zero, halves, group boundaries, 2^53 and beyond, 1e21 and above', () => {
    const values = [0, -0, -0.4, 0.5, -0.5, 1.5, -1.5, 999, 1000, -1000, 999_999.5, 1_000_000, 1234.5, -1234.5, 2 ** 53, 2 ** 53 + 2, 1e20, 1e21, 1.2345678901234569e23, -1e300, Number.MAX_VALUE];
    for (const v of values) expect(groupDigits(v), String(v)).toBe(reference(v));
    // Worked examples (common practice for English thousands separators).
    expect(groupDigits(1200)).toBe('1,200');
    expect(groupDigits(-1234567.4)).toBe('-1,234,567');
  });

  it('agrees on 20,000 seeded random finite numbers of every magnitude (fast-check, seed 16)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => groupDigits(x) === reference(x)),
      { seed: 16, numRuns: 10_000 },
    );
    fc.assert(
      fc.property(fc.integer({ min: -1e9, max: 1e9 }), (x) => groupDigits(x) === reference(x)),
      { seed: 16, numRuns: 10_000 },
    );
  });

  it('fmtInt uses it for finite numbers and shows an em dash otherwise', () => {
    expect(fmtInt(1380)).toBe(reference(1380));
    expect(fmtInt(Number.NaN)).toBe('—');
    expect(fmtInt(null)).toBe('—');
  });
});
