/**
 * Paths where two values differ, walking objects and arrays and comparing every
 * number with Object.is (so 0 and −0, or two NaNs, are told apart as bits are),
 * every other leaf with ===. An empty list means the two are the same bit for bit.
 * @example differingPaths({ a: [1, -0] }, { a: [1, 0] }) // ['$.a[1]']
 */
export function differingPaths(a: unknown, b: unknown, path = '$', out: string[] = []): string[] {
  if (out.length >= 10) return out;
  if (typeof a === 'number' || typeof b === 'number') {
    if (!Object.is(a, b)) out.push(`${path}: ${String(a)} vs ${String(b)}`);
    return out;
  }
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') {
    if (a !== b) out.push(`${path}: ${String(a)} vs ${String(b)}`);
    return out;
  }
  if (Array.isArray(a) !== Array.isArray(b) || ArrayBuffer.isView(a) !== ArrayBuffer.isView(b)) {
    out.push(`${path}: different kinds`);
    return out;
  }
  if (Array.isArray(a) || ArrayBuffer.isView(a)) {
    const x = a as unknown as ArrayLike<unknown>;
    const y = b as unknown as ArrayLike<unknown>;
    if (x.length !== y.length) out.push(`${path}: length ${x.length} vs ${y.length}`);
    for (let i = 0; i < Math.min(x.length, y.length); i++) differingPaths(x[i], y[i], `${path}[${i}]`, out);
    return out;
  }
  const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
  for (const k of keys) differingPaths((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`, out);
  return out;
}
