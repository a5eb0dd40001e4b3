import { describe, expect, it } from 'vitest';
import { centralCutOffVarianceInflation } from '../../src/core/design/centralCutOffVarianceInflation';

describe('centralCutOffVarianceInflation', () => {
  it('is Goldberger\u2019s 2.75 for a cut-off at the mean of a normal score', () => {
    // Goldberger 1972 (from memory), also Cappelleri, Darlington & Trochim 1994: 2.75.
    // REFERENCES (computed): 1/(1 − 2/π) = 2.7519. Tolerance 5e-5 (the value's 4 decimals).
    expect(centralCutOffVarianceInflation()).toBeCloseTo(2.7519, 4);
    expect(centralCutOffVarianceInflation().toFixed(2)).toBe('2.75');
  });
});
