/**
 * Canonical JSON for hashing a survey report (issue 7 §4): the JSON Canonicalization Scheme of
 * RFC 8785 for the values a report holds (objects, arrays, strings, finite numbers, booleans, null).
 *
 * - object members sorted by key, comparing UTF-16 code units (RFC 8785 §3.2.3; JavaScript's default
 *   string order is exactly that);
 * - no whitespace;
 * - numbers and strings serialised as ECMAScript's JSON.stringify does (RFC 8785 §3.2.2.3 adopts
 *   ECMAScript's Number-to-String, and §3.2.2.2 its string escaping);
 * - members whose value is `undefined` are left out (as JSON.stringify does); NaN and ±Infinity are
 *   refused, since JSON cannot carry them.
 *
 * The report's SHA-256 is the hex digest of the UTF-8 bytes of canonicalJson(report.data).
 */

export class CanonicalJsonError extends Error {
  override name = 'CanonicalJsonError';
}

export function canonicalJson(value: unknown): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'boolean':
      return value ? 'true' : 'false';
    case 'string':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) throw new CanonicalJsonError(`Cannot put ${value} in canonical JSON.`);
      return JSON.stringify(value);
    case 'object': {
      if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
      if (value instanceof Date) return JSON.stringify(value.toISOString());
      const entries = Object.entries(value as Record<string, unknown>)
        .filter(([, v]) => v !== undefined)
        .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
    }
    default:
      throw new CanonicalJsonError(`Cannot put a ${typeof value} in canonical JSON.`);
  }
}
