// The single-arm activity designs over HTTP: frozen calculations, 400s naming
// the bad field, and 422s naming maxN with the smallest maxN that works.
import { SELF } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import { type Problem, expectErrorAt, postCalculation as post } from "../support/http.js";

describe("activity designs over HTTP", () => {
  it("freezes Simon's optimal design 1/10, then 5/29 for p0 0.1 and p1 0.3 (from memory of Simon 1989 table 1) and serves its report", async () => {
    const res = await post("simon-two-stage", { p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8, maxN: 40 });
    expect(res.status).toBe(201);
    const body = await res.json<{ id: string; result: { optimal: { r1: number; n1: number; r: number; n: number } } }>();
    expect(body.result.optimal).toMatchObject({ r1: 1, n1: 10, r: 5, n: 29 });
    const page = await SELF.fetch(`https://example.com/c/${body.id}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Simon");
  });

  const bad: Array<[string, string, Record<string, unknown>, string]> = [
    ["simon-two-stage", "p1 equal to p0", { p0: 0.3, p1: 0.3 }, "inputs.p1"],
    ["simon-two-stage", "p1 below p0", { p0: 0.3, p1: 0.2 }, "inputs.p1"],
    ["simon-two-stage", "a rate of 0", { p0: 0, p1: 0.2 }, "inputs.p0"],
    ["simon-two-stage", "a rate above 1", { p0: 0.1, p1: 1.3 }, "inputs.p1"],
    ["simon-two-stage", "alpha above 0.5", { p0: 0.1, p1: 0.3, alpha: 0.6 }, "inputs.alpha"],
    ["simon-two-stage", "power of 1", { p0: 0.1, p1: 0.3, power: 1 }, "inputs.power"],
    ["simon-two-stage", "maxN above the limit", { p0: 0.1, p1: 0.3, maxN: 5000 }, "inputs.maxN"],
    ["single-stage-binomial", "p1 below p0", { p0: 0.3, p1: 0.2 }, "inputs.p1"],
    ["single-stage-binomial", "power below alpha", { p0: 0.1, p1: 0.3, alpha: 0.2, power: 0.1 }, "inputs.power"],
    ["gehan-two-stage", "a rate above 1", { p1: 1.2 }, "inputs.p1"],
    ["two-stage-inference", "stage-2 responses after a stop", { r1: 1, n1: 10, r: 5, n: 29, p0: 0.1, stage1Responses: 0, stage2Responses: 3 }, "inputs.stage2Responses"],
  ];
  for (const [design, what, inputs, path] of bad) {
    it(`${design}: answers 400 naming ${path} for ${what}`, async () => {
      const res = await post(design, inputs);
      await expectErrorAt(res, path);
    });
  }

  it("answers 422 naming maxN and the smallest maxN that works (25, the minimax size; from memory of Simon 1989 table 1)", async () => {
    const res = await post("simon-two-stage", { p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8, maxN: 20 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem).toMatchObject({ field: "maxN", bound: 20, smallestMaxN: 25 });
    expect(problem.detail).toContain("25");
  });

  it("answers 422 without a smallest maxN when no allowed maxN works", async () => {
    const res = await post("simon-two-stage", { p0: 0.5, p1: 0.55, alpha: 0.01, power: 0.99, maxN: 100 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.field).toBe("maxN");
    expect(problem.smallestMaxN).toBeUndefined();
  });
});
