/**
 * Canonical JSON: object keys sorted by UTF-16 code units, no insignificant
 * whitespace, numbers in ECMAScript's shortest round-trip form, -0 written as 0.
 * The same value always gives the same bytes, so its hash can be an id
 * (the number and string rules are those of RFC 8785, JSON Canonicalization Scheme).
 */

export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue };

export class NonCanonicalValueError extends Error {}

export function canonicalJson(value: unknown): string {
  if (value === null) return "null";
  switch (typeof value) {
    case "boolean":
      return value ? "true" : "false";
    case "number":
      if (!Number.isFinite(value)) throw new NonCanonicalValueError(`non-finite number ${value}`);
      return Object.is(value, -0) ? "0" : JSON.stringify(value);
    case "string":
      return JSON.stringify(value);
    case "object": {
      if (Array.isArray(value)) return `[${value.map((v) => canonicalJson(v)).join(",")}]`;
      const entries = Object.entries(value as Record<string, unknown>)
        .filter(([, v]) => v !== undefined)
        .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
    }
    default:
      throw new NonCanonicalValueError(`cannot canonicalize a ${typeof value}`);
  }
}
