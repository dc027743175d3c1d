// Request bodies as bytes: broken JSON, JSON that parses to odd values,
// duplicate keys, bad encodings, oversize bodies, and the content types they
// arrive under.
import fc from "fast-check";
import { MAX_BODY_BYTES } from "../../../src/api/validation.js";

export interface RawRequest {
  body: string | Uint8Array;
  contentType: string | undefined;
}

/** The example's JSON with one key written twice; JSON.parse keeps the last value, so the second is the one that counts. */
function duplicatedKey(example: Record<string, unknown>): fc.Arbitrary<string> {
  const keys = Object.keys(example);
  return fc.tuple(fc.constantFrom(...keys), fc.jsonValue({ maxDepth: 2 }), fc.boolean()).map(([key, value, secondWins]) => {
    const inner = JSON.stringify(example).slice(1, -1);
    const extra = `${JSON.stringify(key)}:${JSON.stringify(value)}`;
    return `{"inputs":{${secondWins ? `${inner},${extra}` : `${extra},${inner}`}}}`;
  });
}

function textBodies(example: Record<string, unknown>): fc.Arbitrary<string> {
  const good = JSON.stringify({ inputs: example });
  return fc.oneof(
    fc.constantFrom(
      "", " ", "\n", "null", "true", "0", "[]", "{}", "\"inputs\"", "{\"inputs\":null}", "{\"inputs\":[]}", "{\"inputs\":{}}",
      "{\"inputs\":", "{\"inputs\":{}},", "{\"inputs\":NaN}", "{\"inputs\":{\"alpha\":NaN}}", "{\"inputs\":{\"alpha\":Infinity}}",
      "{\"inputs\":{\"alpha\":1e999}}", "{\"inputs\":{\"alpha\":-1e999}}", "{\"inputs\":{}, /* comment */ \"label\":\"x\"}",
      `\uFEFF${good}`, `${good.slice(0, -1)},}`, good.replace(/"/g, "'"), `${good}${good}`, `{"inputs":{},"inputs":${JSON.stringify(example)}}`,
      `{"inputs":${JSON.stringify(example)},"label":"\\ud800"}`, `{"inputs":${JSON.stringify(example)},"label":"${"x".repeat(301)}"}`,
      `{"inputs":${JSON.stringify(example)},"__proto__":{"admin":true}}`, `{"inputs":{"__proto__":{"alpha":0.5}}}`,
    ),
    fc.nat({ max: 200_000 }).map((n) => "[".repeat(n)),
    fc.nat({ max: 10_000 }).map((n) => `{"inputs":${"[".repeat(n)}${"]".repeat(n)}}`),
    fc.nat({ max: 3000 }).map((n) => `${"{\"a\":".repeat(n)}1${"}".repeat(n)}`),
    fc.integer({ min: -16, max: 64 }).map((slack) => `{"inputs":${JSON.stringify(example)},"label":"${"é".repeat(Math.max(0, (MAX_BODY_BYTES - good.length) / 2 + slack))}"}`),
    duplicatedKey(example),
    fc.string({ maxLength: 200, unit: "binary" }),
    fc.jsonValue().map((v) => JSON.stringify(v)),
  );
}

const byteBodies: fc.Arbitrary<Uint8Array> = fc.oneof(
  fc.uint8Array({ maxLength: 300 }),
  fc.constant(new Uint8Array([0x7b, 0x22, 0xff, 0xfe, 0x22, 0x3a, 0x31, 0x7d])),
  fc.constant(new Uint8Array([0xfe, 0xff, 0x00, 0x7b, 0x00, 0x7d])),
  fc.constant(new Uint8Array(MAX_BODY_BYTES + 1).fill(0x20)),
);

export const contentTypes: fc.Arbitrary<string | undefined> = fc.constantFrom(
  undefined, "application/json", "application/json; charset=utf-8", "APPLICATION/JSON", "application/problem+json", "application/vnd.trialwright+json",
  "text/plain", "text/json", "application/x-www-form-urlencoded", "multipart/form-data; boundary=xyz", "application/jsonp", "application/xml", "", "*/*",
);

export function rawRequests(example: Record<string, unknown>): fc.Arbitrary<RawRequest> {
  return fc.record({ body: fc.oneof({ weight: 4, arbitrary: textBodies(example) }, { weight: 1, arbitrary: byteBodies }), contentType: contentTypes });
}
