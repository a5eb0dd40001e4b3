import { describe, expect, it } from 'vitest';
import { layoutOffsets } from '../../src/sim/layoutOffsets';

// Packing arrays into one buffer at cache-line starts with distinct page offsets:
// common practice (Intel 64 and IA-32 Optimization Reference Manual, "4 KByte aliasing").
// Exact integer arithmetic, so exact equality (tolerance 0).
describe('layoutOffsets', () => {
  it('matches the hand-worked example', () => {
    expect(layoutOffsets([100, 100])).toEqual([0, 1088, 1188]);
  });

  it('never overlaps, starts on 64-byte multiples, spreads starts over the page', () => {
    for (const sizes of [[9600, 9600, 2400, 4800], [1, 4096, 8192, 3, 0, 70000], [64, 64, 64, 64]]) {
      const at = layoutOffsets(sizes);
      expect(at).toHaveLength(sizes.length + 1);
      const pageSlots = new Set<number>();
      for (let i = 0; i < sizes.length; i++) {
        expect((at[i] as number) % 64).toBe(0);
        pageSlots.add((at[i] as number) % 4096);
        const end = (at[i] as number) + (sizes[i] as number);
        expect(end).toBeLessThanOrEqual(at[i + 1] as number);
      }
      expect(pageSlots.size).toBe(sizes.length);
    }
  });
});
