import { describe, expect, it } from 'vitest';
import * as d3 from 'd3';
import { matchedSampleMeans } from '../../src/core/matchedSampleMeans';

describe('matchedSampleMeans', () => {
  const sets = [
    { programme: { observed: 40, trueScore: 41 }, comparison: [{ observed: 40.5, trueScore: 44 }] },
    {
      programme: { observed: 50, trueScore: 49 },
      comparison: [
        { observed: 49.5, trueScore: 52 },
        { observed: 50.5, trueScore: 50 },
      ],
    },
  ];

  it('weights each matched set once (partners 1/k), checked against d3.mean of set means', () => {
    // Common practice for 1:k matched sets (Stuart 2010): each set's partners are averaged first.
    // Reference values from the independent d3-array mean. Tolerance 1e-12 (rounding only).
    const r = matchedSampleMeans(sets);
    const setMean = (s: (typeof sets)[number], key: 'observed' | 'trueScore') => d3.mean(s.comparison, (c) => c[key])!;
    expect(r.observed.comparison).toBeCloseTo(d3.mean(sets, (s) => setMean(s, 'observed'))!, 12);
    expect(r.trueScore.comparison).toBeCloseTo(d3.mean(sets, (s) => setMean(s, 'trueScore'))!, 12);
    expect(r.trueScore.comparison).toBeCloseTo(47.5, 12); // by hand: (44 + 51) / 2
    expect(r.observed.programme).toBeCloseTo(45, 12);
    expect(r.n).toEqual({ programme: 2, comparison: 3 });
  });

  it('explains an empty matched sample', () => {
    expect(() => matchedSampleMeans([])).toThrow(/No programme member found a partner/);
  });
});
