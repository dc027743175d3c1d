// Property-based tests of every POST route (calculations and previews of every
// design) through the real Worker: arbitrary JSON, hostile values in each
// field, values anywhere inside the schema's bounds, and raw bodies under
// every content type. Whatever is sent, the answer keeps the contract in
// test/support/fuzz/contract.ts: no 5xx, no hang, a problem+json naming the
// field on refusal. The seeds are fixed so a failure replays; fast-check prints
// the seed and the shrunk counterexample.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { catalog } from "../../src/designs/catalog.js";
import { inputJsonSchema } from "../../src/designs/schema.js";
import { expectContract } from "../support/fuzz/contract.js";
import { type RawRequest, rawRequests } from "../support/fuzz/rawBodies.js";
import { hostileValue, mutatedExample, validObject, validValue } from "../support/fuzz/schemaValues.js";
import { fetchWorker } from "../support/http.js";

const SEED = 20261202;
/** Runs per property and route: sized to the 2-core CI machine (about a minute for the whole file). */
const RUNS = { arbitraryJson: 60, hostileFields: 150, rawBodies: 60, validInputs: 150 };

type Route = "calculations" | "previews";

/** Sends one request and checks the answer against the contract; returns its status. */
async function send(design: string, route: Route, request: RawRequest): Promise<number> {
  const started = performance.now();
  const response = await fetchWorker(`/api/v1/designs/${design}/${route}`, {
    method: "POST",
    headers: request.contentType === undefined ? {} : { "content-type": request.contentType },
    body: request.body as BodyInit,
  });
  const shown = typeof request.body === "string" ? request.body : `bytes ${Array.from(request.body.slice(0, 40)).join(",")}… (${request.body.length})`;
  await expectContract(response, performance.now() - started, route, `${route} ${request.contentType ?? "(no content-type)"} ${shown}`);
  return response.status;
}

const json = (body: unknown): RawRequest => ({ body: JSON.stringify(body), contentType: "application/json" });

catalog.forEach((design, index) => {
  const schema = inputJsonSchema(design);
  const example = design.example as Record<string, unknown>;
  const fields = Object.keys(schema.properties ?? {});
  const fieldSchema = (name: string) => (schema.properties ?? {})[name] ?? {};
  const params = (numRuns: number, salt: number) => ({ seed: SEED + index * 101 + salt, numRuns, endOnFailure: true });

  describe(`${design.id}: every POST answer keeps the contract`, () => {
    for (const [salt, route] of (["calculations", "previews"] as const).entries()) {
      it(`${route}: arbitrary JSON bodies`, async () => {
        const bodies = fc.oneof(fc.jsonValue(), fc.record({ inputs: fc.jsonValue() }), fc.record({ inputs: fc.dictionary(fc.string(), fc.jsonValue({ maxDepth: 2 })), label: fc.jsonValue({ maxDepth: 1 }) }, { requiredKeys: ["inputs"] }));
        await fc.assert(fc.asyncProperty(bodies, async (body) => { await send(design.id, route, json(body)); }), params(RUNS.arbitraryJson, salt));
      }, 120_000);

      it(`${route}: hostile values in one to three fields of the example`, async () => {
        const bodies = mutatedExample(example, [...fields, "noSuchField"], () => hostileValue);
        await fc.assert(fc.asyncProperty(bodies, fc.option(fc.string({ maxLength: 400 })), async (inputs, label) => { await send(design.id, route, json(label === null ? { inputs } : { inputs, label })); }), params(RUNS.hostileFields, 10 + salt));
      }, 120_000);

      it(`${route}: raw bodies under every content type`, async () => {
        await fc.assert(fc.asyncProperty(rawRequests(example), async (request) => { await send(design.id, route, request); }), params(RUNS.rawBodies, 20 + salt));
      }, 120_000);
    }

    it("previews and calculations: values anywhere inside the schema's bounds", async () => {
      const inputs = fc.oneof({ weight: 3, arbitrary: mutatedExample(example, fields, (name) => validValue(fieldSchema(name))) }, { weight: 1, arbitrary: validObject(schema) });
      let computed = 0;
      await fc.assert(fc.asyncProperty(inputs, fc.boolean(), async (values, freeze) => {
        if ((await send(design.id, freeze ? "calculations" : "previews", json({ inputs: values }))) !== 400) computed++;
      }), params(RUNS.validInputs, 30));
      // Most random combinations break a cross-field rule (400); enough must reach the computation for the property to mean something.
      expect(computed, "runs that reached the computation").toBeGreaterThanOrEqual(RUNS.validInputs / 10);
    }, 300_000);
  });
});
