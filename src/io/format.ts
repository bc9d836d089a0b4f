/** Number formatting shared by the writers. */

/**
 * Shortest decimal form that parses back to the same double (ECMAScript Number::toString is
 * specified to produce it); non-finite values as inf / -inf / nan.
 */
export function num(x: number): string {
  if (x === Infinity) return 'inf';
  if (x === -Infinity) return '-inf';
  if (x !== x) return 'nan';
  if (x === 0 && 1 / x < 0) return '-0';
  return String(x);
}

/** JSON.stringify with non-finite numbers written as null (JSON has no Infinity). */
export function toJson(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n';
}
