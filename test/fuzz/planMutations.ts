import fc from 'fast-check';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { firstNonFinite as findNonFinite } from '../../src/core/assertFiniteOutput';

/**
 * Seeded plan mutations for the fuzz suites: one of the invented example plans
 * with one to three numeric fields rescaled (by 1e-7 to 1e7, or negated) or
 * replaced by a value from a mix of the ends
 * of double precision (1e308, 5e-324), the ends of the documented ranges
 * (±1e6, 1e-6), ordinary values and wrong types. Values are finite, as JSON
 * can hold nothing else.
 */

/** Text a researcher should never see in a message: library wording, NaN, a stack frame, an internal-fault label. */
export const PROGRAM_TEXT = /Matrix|\bNaN\b|\bundefined\b|Infinity|Internal fault|\bat \S+ \(|TypeError|RangeError|\n\s+at /;

/** Control characters that must never reach a terminal unescaped (line feeds between lines are fine). */
export const RAW_CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/;

type Json = Record<string, unknown>;

function numericPaths(o: unknown, pre: string[] = []): string[][] {
  if (typeof o === 'number') return [pre];
  if (o === null || typeof o !== 'object') return [];
  return Object.entries(o as Json).flatMap(([k, v]) => numericPaths(v, [...pre, k]));
}

const EDGES = [
  1.7976931348623157e308, -1e308, 1e200, 1e124, 1e15, 1e12, 1e7, 1_000_001, 1_000_000, -1_000_000, 999_999.5, 1e-6, 9.99e-7, 1e-9,
  1e-160, 1e-300, 5e-324, 0, -0.5, 0.5, 0.999999, 1 - 1e-15, -0.999999, 1, 2, 3, 5, 100_000, 100_001, 250, 2000, 4_294_967_295, 0.0001,
  0.01,
];

/** A replacement value: an edge, any finite double, a plausible number, an integer, or a wrong type. */
export const mutationValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 5, arbitrary: fc.constantFrom(...EDGES).chain((x) => fc.constantFrom(x, -x)) },
  { weight: 3, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true }) },
  { weight: 3, arbitrary: fc.double({ min: -10, max: 10, noNaN: true }) },
  { weight: 1, arbitrary: fc.integer({ min: -5, max: 200_000 }) },
  { weight: 1, arbitrary: fc.constantFrom<unknown>(null, '12', true, [], {}) },
);

/** One mutated plan (a plain JSON object) and a description of the change, for failure messages. */
export interface Mutation {
  plan: Json;
  changes: string;
}

/**
 * Mutations of the example plans.
 * @param options.maxPool cap both pool sizes (keeps the quick simulation short); none by default.
 */
export function planMutation(options: { maxPool?: number } = {}): fc.Arbitrary<Mutation> {
  return fc
    .record({
      base: fc.integer({ min: 0, max: EXAMPLE_PLANS.length - 1 }),
      picks: fc.array(
        fc.record({
          at: fc.nat(),
          value: mutationValue,
          // Half the time the value is the old one rescaled instead, which keeps more plans valid.
          scale: fc.option(fc.constantFrom(1e-7, 1e-6, 1e-3, 0.5, 0.999, 1.001, 2, 1e3, 1e6, 1e7, -1), { freq: 2 }),
        }),
        { minLength: 1, maxLength: 3 },
      ),
    })
    .map(({ base, picks }) => {
      const plan = structuredClone(EXAMPLE_PLANS[base]!.plan) as unknown as Json;
      if (options.maxPool !== undefined) {
        const groups = plan.groups as Record<string, Json>;
        for (const g of ['programme', 'comparison']) groups[g]!.poolSize = Math.min(groups[g]!.poolSize as number, options.maxPool);
      }
      const paths = numericPaths(plan);
      const changes: string[] = [];
      for (const { at, value: drawn, scale } of picks) {
        const path = paths[at % paths.length]!;
        let o = plan as Json;
        for (const k of path.slice(0, -1)) o = o[k] as Json;
        const old = o[path.at(-1)!];
        const value = scale !== null && typeof old === 'number' ? old * scale : drawn;
        const v = options.maxPool !== undefined && path.at(-1) === 'poolSize' && typeof value === 'number' ? Math.min(value, options.maxPool) : value;
        o[path.at(-1)!] = v;
        changes.push(`${path.join('.')}=${JSON.stringify(v)}`);
      }
      return { plan, changes: `${EXAMPLE_PLANS[base]!.id}: ${changes.join(', ')}` };
    });
}

/** Dotted path of the first number in `x` that is NaN or infinite, or null (the core's walk). */
export const firstNonFinite = (x: unknown, path = 'result'): string | null => findNonFinite(x, path)?.path ?? null;
