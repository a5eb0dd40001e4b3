import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { sortNormalSample } from '../../src/sim/sortNormalSample';

describe('sortNormalSample', () => {
  it('sorts exactly like the built-in numeric sort, whatever the data (fast-check, 300 cases)', () => {
    // Reference: Float64Array.prototype.sort (ECMAScript numeric order). Exact equality.
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { maxLength: 300 }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        (xs, mean, sd) => {
          const a = Float64Array.from(xs);
          const n = a.length;
          sortNormalSample(a, n, mean, sd, new Float64Array(n), new Int32Array(n + 1), new Int32Array(n));
          expect(Array.from(a)).toEqual(Array.from(Float64Array.from(xs).sort()));
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });
});
