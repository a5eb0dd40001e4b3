/**
 * Whether two plans (or any JSON values) are the same, ignoring key order.
 * Used to tell whether a simulation result still belongs to the plan on screen.
 */
export function samePlan(a: unknown, b: unknown): boolean {
  return canonical(a) === canonical(b);
}

function canonical(x: unknown): string {
  if (Array.isArray(x)) return `[${x.map(canonical).join(',')}]`;
  if (typeof x === 'object' && x !== null) {
    const entries = Object.entries(x as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`;
  }
  return JSON.stringify(x) ?? 'undefined';
}
