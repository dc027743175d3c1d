// The AB/BA crossover over HTTP: a frozen calculation, 400s naming the bad
// field with a sentence, and 422 naming the bound on the sequence size.
import { describe, expect, it } from "vitest";
import { type Problem, expectFieldError, postCalculation } from "../support/http.js";

const post = (inputs: unknown): Promise<Response> => postCalculation("crossover-2x2", inputs);

describe("crossover-2x2 over HTTP", () => {
  it("freezes a calculation whose normal total is 2σw²(z + z)²/δ² rounded up to even (Julious 2004)", async () => {
    // 2 × 10² × (1.95996 + 1.28155)² / 6² = 58.4, so 30 per sequence.
    const res = await post({ delta: 6, withinSubjectSd: 10, power: 0.9, method: "normal" });
    expect(res.status).toBe(201);
    const body = await res.json<{ result: { n1: number; n2: number } }>();
    expect([body.result.n1, body.result.n2]).toEqual([30, 30]);
  });

  const cases: Array<[string, unknown, string, RegExp]> = [
    ["a within-subject SD of 0", { delta: 2, withinSubjectSd: 0 }, "inputs.withinSubjectSd", /positive number in outcome units/],
    ["a negative non-inferiority margin", { hypothesis: "non-inferiority", delta: 0, margin: -2, withinSubjectSd: 3, sides: 1 }, "inputs.margin", /positive number/],
    ["power below alpha", { delta: 2, withinSubjectSd: 3, power: 0.02, alpha: 0.05 }, "inputs.power", /exceed alpha/],
    ["a one-sided test against benefit", { delta: -2, withinSubjectSd: 3, sides: 1 }, "inputs.delta", /positive favours/],
    ["sequence sizes missing when solving for power", { solveFor: "power", delta: 2, withinSubjectSd: 3 }, "inputs.n1", /sequence AB/],
  ];
  for (const [what, inputs, path, message] of cases) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      await expectFieldError(await post(inputs), path, message);
    });
  }

  it("answers 422 naming the bound when no size up to it reaches the power", async () => {
    const res = await post({ delta: 0.001, withinSubjectSd: 10, power: 0.99 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.bound).toBe(100000);
    expect(problem.detail).toContain("100000 per sequence");
  });
});
