// Every design in the catalog, through the real Worker: its description, its
// example frozen and served, and a battery of hostile bodies that must never
// produce a 500.
import { describe, expect, it } from "vitest";
import { catalog } from "../../src/designs/catalog.js";
import { createRandom } from "../../src/stats/random.js";
import { type RecordBody, createCalculation, get, post } from "../support/http.js";

describe("the catalog", () => {
  it("lists every design with its schema and example", async () => {
    const res = await get("/api/v1/designs");
    expect(res.status).toBe(200);
    const body = await res.json<{ designs: Array<{ id: string; inputSchema: { type: string }; example: unknown; stage: string }> }>();
    expect(body.designs.map((d) => d.id)).toEqual(catalog.map((d) => d.id));
    for (const d of body.designs) {
      expect(d.inputSchema.type).toBe("object");
      expect(["dose-finding", "activity", "comparative", "monitoring"]).toContain(d.stage);
    }
  });

  for (const design of catalog) {
    it(`${design.id}: the example is frozen and served`, async () => {
      const res = await createCalculation(design.id, design.example, "Catalog example");
      expect(res.status, await res.clone().text()).toBe(201);
      const record = await res.json<RecordBody>();
      expect(record.design).toBe(design.id);
      const page = await get(`/c/${record.id}`);
      expect(page.status).toBe(200);
      expect(await page.text()).toContain(design.title.replace(/&/g, "&amp;"));
    });
  }
});

// Values that break naive handlers: wrong types, extremes, deep nesting.
const HOSTILE: unknown[] = [
  null, -1, 0, 1e308, 5e-324, 1.5, 1000001, "NaN", [], [-1, 2], { a: 1 }, Array.from({ length: 200 }, () => 0.5),
];

describe("no request a client can send gives 500", () => {
  for (const design of catalog) {
    it(`${design.id}: mutated examples get 2xx, 400, 413 or 422`, async () => {
      const rng = createRandom(20261201);
      const example = design.example as Record<string, unknown>;
      const keys = Object.keys(example);
      const bodies: unknown[] = [];
      for (const key of keys) {
        // Four hostile values per field, drawn afresh for each field, keep the run short but varied.
        for (let j = 0; j < 4; j++) bodies.push({ inputs: { ...example, [key]: HOSTILE[rng.integer(HOSTILE.length)] } });
      }
      for (let i = 0; i < 10; i++) {
        const mutated: Record<string, unknown> = { ...example };
        for (let j = 0; j < 3; j++) mutated[keys[rng.integer(keys.length)]!] = HOSTILE[rng.integer(HOSTILE.length)];
        bodies.push({ inputs: mutated });
      }
      bodies.push({ inputs: example, label: 12 }, { inputs: { ...example, extra: 1 } }, "[".repeat(5000), JSON.stringify({ inputs: example }).slice(0, 20));
      for (const body of bodies) {
        const res = await post(`/api/v1/designs/${design.id}/calculations`, body);
        expect([200, 201, 400, 413, 422], `${res.status} for ${JSON.stringify(body).slice(0, 300)}: ${(await res.clone().text()).slice(0, 300)}`).toContain(res.status);
        await res.arrayBuffer();
      }
    }, 120_000);
  }
});
