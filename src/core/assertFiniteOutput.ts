/**
 * Walks a result object and throws if any number in it is NaN or ±Infinity,
 * naming the field, so that no non-finite figure ever reaches a screen or a report.
 *
 * Reference: common practice (fail loudly rather than display NaN).
 *
 * @param value the result (objects, arrays, numbers, strings, booleans, null).
 * @param path name of the value for the message.
 * @returns the value, unchanged.
 * @throws Error "… could not be computed (got NaN) at analyses.ancova.se …".
 * @example assertFiniteOutput({ a: 1 }, 'result') // { a: 1 }
 */
export function assertFiniteOutput<T>(value: T, path = 'result'): T {
  const bad = firstNonFinite(value, path);
  if (bad !== null) {
    throw new Error(
      `A figure for this plan could not be computed (got ${String(bad.value)} at ${bad.path}). ` +
        'The inputs may be at an extreme: check the reliability, SDs, correlation and pool sizes.',
    );
  }
  return value;
}

/**
 * The first number in a result (depth first, in key order) that is NaN or
 * ±Infinity, with its dotted path; null when every number is finite. The one
 * walk behind assertFiniteOutput, the CLI's output check and the fuzz tests.
 *
 * Reference: common practice.
 *
 * @param value the result (objects, arrays, numbers, strings, booleans, null).
 * @param path name of the value, the start of every path.
 * @returns { path, value } of the first non-finite number, or null.
 * @throws never.
 * @example firstNonFinite({ a: [1, NaN] }, 'r') // { path: 'r.a[1]', value: NaN }
 */
export function firstNonFinite(value: unknown, path = 'result'): { path: string; value: number } | null {
  if (typeof value === 'number') return Number.isFinite(value) ? null : { path, value };
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const r = firstNonFinite(value[i], `${path}[${i}]`);
      if (r !== null) return r;
    }
    return null;
  }
  if (value !== null && typeof value === 'object') {
    for (const [k, x] of Object.entries(value)) {
      const r = firstNonFinite(x, `${path}.${k}`);
      if (r !== null) return r;
    }
  }
  return null;
}
