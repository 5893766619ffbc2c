/**
 * Leaf-by-leaf comparison of two JSON values, for checking a recomputed results.json against an
 * archived one. Numbers must be exactly equal (the same tool on the same inputs gives the same
 * bits); every difference is reported with its JSON path, e.g. `$.tops[0].probability.exact`.
 */

export interface JsonDifference {
  path: string;
  /** The archived value (undefined: absent). */
  expected: unknown;
  /** The recomputed value (undefined: absent). */
  actual: unknown;
}

export interface JsonDiffResult {
  /** All differences found, up to `limit`. */
  differences: JsonDifference[];
  /** How many there are in all (may exceed the list). */
  count: number;
  /** How many of them are between two numbers. */
  numeric: number;
}

export function diffJson(expected: unknown, actual: unknown, options: { ignore?: string[]; limit?: number } = {}): JsonDiffResult {
  const ignore = new Set(options.ignore ?? []);
  const limit = options.limit ?? 50;
  const out: JsonDiffResult = { differences: [], count: 0, numeric: 0 };
  const record = (path: string, a: unknown, b: unknown) => {
    out.count += 1;
    if (typeof a === 'number' && typeof b === 'number') out.numeric += 1;
    if (out.differences.length < limit) out.differences.push({ path, expected: a, actual: b });
  };
  const walk = (a: unknown, b: unknown, path: string) => {
    if (ignore.has(path)) return;
    if (Array.isArray(a) && Array.isArray(b)) {
      const n = Math.max(a.length, b.length);
      for (let i = 0; i < n; i++) walk(a[i], b[i], `${path}[${i}]`);
      return;
    }
    if (isObject(a) && isObject(b)) {
      const keys = [...Object.keys(a), ...Object.keys(b).filter((k) => !(k in a))];
      for (const k of keys) walk(a[k], b[k], `${path}${/^[A-Za-z_$][\w$]*$/.test(k) ? `.${k}` : `[${JSON.stringify(k)}]`}`);
      return;
    }
    if (Object.is(a, b)) return;
    record(path, a, b);
  };
  walk(expected, actual, '$');
  return out;
}

function isObject(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

/** A value for a difference list: numbers in full (shortest round-trip form), absent as "(absent)". */
export function showValue(x: unknown): string {
  if (x === undefined) return '(absent)';
  const text = JSON.stringify(x);
  return text.length > 80 ? `${text.slice(0, 77)}...` : text;
}
