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
  visit(value, path);
  return value;
}

function visit(v: unknown, path: string): void {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) {
      throw new Error(
        `A figure for this plan could not be computed (got ${String(v)} at ${path}). ` +
          'The inputs may be at an extreme: check the reliability, SDs, correlation and pool sizes.',
      );
    }
    return;
  }
  if (Array.isArray(v)) {
    v.forEach((x, i) => visit(x, `${path}[${i}]`));
    return;
  }
  if (v !== null && typeof v === 'object') {
    for (const [k, x] of Object.entries(v)) visit(x, `${path}.${k}`);
  }
}
