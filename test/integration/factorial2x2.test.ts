// The factorial-2x2 design over HTTP: a frozen calculation, 400s naming the bad
// field with a sentence, and a 422 naming the bound.
import { SELF } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import { type Problem, expectFieldError, postCalculation } from "../support/http.js";

const post = (inputs: unknown): Promise<Response> => postCalculation("factorial-2x2", inputs);

describe("factorial-2x2 over HTTP", () => {
  it("freezes a calculation: 32 per cell for 0.5 SD main effects by the normal method (2(1.96 + 0.8416)²/0.25 = 62.8 per margin), 126 per cell for the interaction", async () => {
    const res = await post({ sd: 1, effectA: 0.5, effectB: 0.5, method: "normal" });
    expect(res.status).toBe(201);
    const body = await res.json<{ id: string; result: { nPerCell: number; interaction: { requiredPerCell: number } } }>();
    expect(body.result.nPerCell).toBe(32);
    expect(body.result.interaction.requiredPerCell).toBe(126);
    const page = await SELF.fetch(`https://example.com/c/${body.id}`);
    expect(page.status).toBe(200);
  });

  it("freezes a proportions calculation", async () => {
    const res = await post({ outcome: "proportions", controlRate: 0.3, rateA: 0.42, rateB: 0.4, multiplicity: "holm" });
    expect(res.status).toBe(201);
  });

  const cases: Array<[string, unknown, string, RegExp]> = [
    ["a zero main effect", { sd: 1, effectA: 0, effectB: 0.5 }, "inputs.effectA", /no effect to detect/],
    ["a non-positive standard deviation", { sd: 0, effectA: 1, effectB: 0.5 }, "inputs.sd", /positive number/],
    ["no standard deviation", { effectA: 1, effectB: 0.5 }, "inputs.sd", /standard deviation/],
    ["a zero interaction", { sd: 1, effectA: 1, effectB: 0.5, interaction: 0 }, "inputs.interaction", /absence of one/],
    ["a rate of 1", { outcome: "proportions", controlRate: 0.3, rateA: 1, rateB: 0.4 }, "inputs.rateA", /.+/],
    ["no effect of A on a rate", { outcome: "proportions", controlRate: 0.3, rateA: 0.3, rateB: 0.4 }, "inputs.rateA", /no main effect of A/],
    ["rates that cannot add", { outcome: "proportions", controlRate: 0.2, rateA: 0.7, rateB: 0.8 }, "inputs.rateB", /outside 0 to 1/],
    ["means fields with proportions", { outcome: "proportions", controlRate: 0.3, rateA: 0.4, rateB: 0.4, sd: 2 }, "inputs.sd", /apply to means/],
    ["the exact t method for proportions", { outcome: "proportions", controlRate: 0.3, rateA: 0.4, rateB: 0.4, method: "exact-t" }, "inputs.method", /applies to means/],
    ["harm with a one-sided test", { sd: 1, effectA: -1, effectB: 0.5, sides: 1 }, "inputs.effectA", /looks for benefit/],
    ["power below alpha", { sd: 1, effectA: 1, effectB: 0.5, power: 0.02 }, "inputs.power", /Power must exceed alpha/],
    ["power without a size", { sd: 1, effectA: 1, effectB: 0.5, solveFor: "power" }, "inputs.nPerCell", /per cell/],
  ];
  for (const [what, inputs, path, message] of cases) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      await expectFieldError(await post(inputs), path, message);
    });
  }

  it("answers 422 with the per-cell bound when a main effect is too small to detect", async () => {
    const res = await post({ sd: 1, effectA: 0.5, effectB: 0.001 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.bound).toBe(50000);
    expect(problem.field).toBe("effectB");
    expect(problem.detail).toMatch(/50000 per cell/);
  });
});
