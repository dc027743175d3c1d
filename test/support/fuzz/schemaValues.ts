// fast-check arbitraries for a design's inputs, read from its JSON Schema:
// values inside every bound (biased to the bounds themselves, where numerical
// trouble lives), and hostile values of every other kind.
import fc from "fast-check";
// The JSON Schema subset the form pages read is the one these generators need.
import type { JsonSchema } from "../../../static/src/api.js";

type Schema = JsonSchema;

/** Numbers in [lo, hi] (open ends moved in by a relative step), with the ends, their neighbours and round values favoured. */
function boundedNumber(s: Schema, integer: boolean): fc.Arbitrary<number> {
  const step = (x: number): number => Math.max(Math.abs(x) * 1e-9, 1e-12);
  let lo = s.minimum ?? (s.exclusiveMinimum !== undefined ? s.exclusiveMinimum + step(s.exclusiveMinimum) : -1e6);
  let hi = s.maximum ?? (s.exclusiveMaximum !== undefined ? s.exclusiveMaximum - step(s.exclusiveMaximum) : 1e6);
  if (integer) {
    lo = Math.ceil(lo);
    hi = Math.floor(hi);
    return fc.oneof(
      { weight: 2, arbitrary: fc.constantFrom(lo, hi, Math.min(hi, lo + 1), Math.max(lo, hi - 1)) },
      { weight: 3, arbitrary: fc.integer({ min: lo, max: hi }) },
    );
  }
  const edges = [lo, hi, lo + step(lo) * 10, hi - step(hi) * 10, (lo + hi) / 2].filter((x) => x >= lo && x <= hi);
  return fc.oneof(
    { weight: 2, arbitrary: fc.constantFrom(...edges) },
    { weight: 3, arbitrary: fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true }) },
    { weight: 1, arbitrary: fc.integer({ min: 0, max: 1000 }).map((k) => lo + ((hi - lo) * k) / 1000) },
  );
}

/** A value the schema accepts (before the design's cross-field rules). */
export function validValue(schema: Schema, depth = 0): fc.Arbitrary<unknown> {
  if (schema.const !== undefined) return fc.constant(schema.const);
  if (schema.enum) return fc.constantFrom(...schema.enum);
  const alternatives = schema.anyOf ?? schema.oneOf;
  if (alternatives) return fc.oneof(...alternatives.map((a) => validValue(a, depth + 1)));
  switch (schema.type) {
    case "number":
      return boundedNumber(schema, false);
    case "integer":
      return boundedNumber(schema, true);
    case "boolean":
      return fc.boolean();
    case "string":
      return fc.string({ minLength: schema.minLength ?? 0, maxLength: Math.min(schema.maxLength ?? 60, 60), unit: "grapheme" });
    case "array":
      return fc.array(validValue(schema.items ?? {}, depth + 1), { minLength: schema.minItems ?? 0, maxLength: Math.min(schema.maxItems ?? 8, 12) });
    case "object":
      return validObject(schema, depth + 1);
    default:
      return fc.jsonValue({ maxDepth: 2 });
  }
}

/** An object with every required property and a random choice of the optional ones. */
export function validObject(schema: Schema, depth = 0): fc.Arbitrary<Record<string, unknown>> {
  const properties = schema.properties ?? {};
  const required = new Set(schema.required ?? []);
  const record: Record<string, fc.Arbitrary<unknown>> = {};
  for (const [key, sub] of Object.entries(properties)) record[key] = validValue(sub, depth);
  return fc.record(record, { requiredKeys: Object.keys(properties).filter((k) => required.has(k)) });
}

/** Values that break naive handlers: wrong types, extremes, numbers spelled as text, long and strange strings, deep nesting. */
export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(null, true, false, 0, -0, -1, 1, 0.5, 1e308, -1e308, 5e-324, -5e-324, 2 ** 53, 2 ** 53 + 2, Number.MAX_SAFE_INTEGER, 1e-300, 1 - 1e-16, 1000001),
  fc.constantFrom("NaN", "nan", "Infinity", "-Infinity", "1e309", "0x10", "1_000", " 0.5 ", "", "null", "undefined", "true", "٣", "0.5\u0000", "\uD800", "<script>alert(1)</script>", "=1+1", "__proto__", "constructor"),
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 40, unit: "binary" }),
  fc.string({ minLength: 1000, maxLength: 20000 }),
  fc.array(fc.double(), { maxLength: 300 }),
  fc.array(fc.oneof(fc.constant(null), fc.string(), fc.integer()), { maxLength: 12 }),
  fc.integer({ min: 1, max: 5000 }).map((depth) => JSON.parse("[".repeat(depth) + "]".repeat(depth)) as unknown),
  fc.dictionary(fc.string({ maxLength: 12 }), fc.jsonValue({ maxDepth: 3 }), { maxKeys: 6 }),
  fc.constant(Object.fromEntries([["__proto__", { polluted: true }]])),
  fc.jsonValue({ maxDepth: 4 }),
);

/** The example with one to three fields given the values `values` draws. */
export function mutatedExample(example: Record<string, unknown>, fields: string[], values: (field: string) => fc.Arbitrary<unknown>): fc.Arbitrary<Record<string, unknown>> {
  const changes = fc.uniqueArray(fc.constantFrom(...fields), { minLength: 1, maxLength: Math.min(3, fields.length) })
    .chain((keys) => fc.tuple(...keys.map((k) => values(k).map((v) => [k, v] as const))));
  return changes.map((pairs) => {
    const out: Record<string, unknown> = { ...example };
    for (const [k, v] of pairs) {
      // A `__proto__` key must become an own property, as JSON.parse would make it.
      Object.defineProperty(out, k, { value: v, enumerable: true, writable: true, configurable: true });
    }
    return out;
  });
}
