// The 3+3 design over HTTP: a frozen calculation, and 400s naming the bad field.
import { describe, expect, it } from "vitest";
import { expectErrorAt, postCalculation } from "../support/http.js";

const post = (inputs: unknown): Promise<Response> => postCalculation("three-plus-three", inputs);

describe("three-plus-three over HTTP", () => {
  it("freezes a calculation whose selection probabilities sum to 1", async () => {
    const res = await post({ doses: ["TW-417 10 mg", "TW-417 20 mg", "TW-417 40 mg"], dltProbabilities: [0.1, 0.2, 0.4], mtdRule: "next-lower-dose-with-six" });
    expect(res.status).toBe(201);
    const body = await res.json<{ result: { selectionProbability: number[]; noDoseProbability: number } }>();
    const total = body.result.selectionProbability.reduce((a, b) => a + b, 0) + body.result.noDoseProbability;
    expect(Math.abs(total - 1)).toBeLessThan(1e-12);
  });

  const cases: Array<[string, unknown, string]> = [
    ["lengths differ", { doses: ["10 mg", "20 mg"], dltProbabilities: [0.1] }, "inputs.dltProbabilities"],
    ["a probability of 1", { doses: ["10 mg", "20 mg"], dltProbabilities: [0.1, 1] }, "inputs.dltProbabilities.1"],
    ["a probability of 0", { doses: ["10 mg"], dltProbabilities: [0] }, "inputs.dltProbabilities.0"],
    ["13 doses", { doses: Array.from({ length: 13 }, (_, i) => `${i + 1} mg`), dltProbabilities: Array.from({ length: 13 }, () => 0.2) }, "inputs.doses"],
    ["a repeated label", { doses: ["10 mg", "10 mg"], dltProbabilities: [0.1, 0.2] }, "inputs.doses.1"],
    ["an unknown field", { doses: ["10 mg"], dltProbabilities: [0.1], cohortSize: 4 }, "inputs.cohortSize"],
  ];
  for (const [what, inputs, path] of cases) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      const res = await post(inputs);
      await expectErrorAt(res, path);
    });
  }
});
