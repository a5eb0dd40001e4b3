import { describe, expect, it } from 'vitest';
import { drawReplicationVariates } from '../../src/sim/drawReplicationVariates';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

function isAscending(a: Float64Array): boolean {
  for (let i = 1; i < a.length; i++) if ((a[i] as number) < (a[i - 1] as number)) return false;
  return true;
}

describe('one replication’s variates (layout used by the engine and the benchmark)', () => {
  it('draws the comparison pretest ascending, and the programme pretest ascending only when asked', () => {
    const nC = 400;
    const nP = 60;
    for (const sorted of [false, true]) {
      const g = Xoshiro128StarStar.forReplication(7, 2);
      const z = new Float64Array(3 * (nC + nP));
      drawReplicationVariates(new NormalSampler(g), z, nC, nP, sorted);
      expect(isAscending(z.subarray(0, nC))).toBe(true);
      expect(isAscending(z.subarray(nC, 2 * nC))).toBe(false); // iid draws: ascending with probability 1/400!
      expect(isAscending(z.subarray(3 * nC, 3 * nC + nP))).toBe(sorted);
      expect(z.every(Number.isFinite)).toBe(true);
    }
  });

  it('is reproducible: the same stream gives the same numbers bit for bit', () => {
    const draw = () => {
      const z = new Float64Array(3 * 150);
      drawReplicationVariates(new NormalSampler(Xoshiro128StarStar.forReplication(1, 9)), z, 100, 50, false);
      return Array.from(z);
    };
    expect(draw()).toEqual(draw());
  });
});
