// The two-proportions design over HTTP: a frozen calculation, 400s naming the
// bad field with a sentence, and 422 naming the bound of the exact search.
import { describe, expect, it } from "vitest";
import { type Problem, expectFieldError, postCalculation } from "../support/http.js";

const post = (inputs: unknown): Promise<Response> => postCalculation("two-proportions", inputs);

describe("two-proportions over HTTP", () => {
  it("freezes a calculation (97 per arm for 0.40 against 0.60, Fleiss, Levin & Paik 2003, eq. 4.14)", async () => {
    const res = await post({ p1: 0.4, p2: 0.6, method: "normal" });
    expect(res.status).toBe(201);
    const body = await res.json<{ result: { n1: number; n2: number } }>();
    expect([body.result.n1, body.result.n2]).toEqual([97, 97]);
  });

  const cases: Array<[string, unknown, string, RegExp]> = [
    ["a control proportion above 1", { p1: 1.2, p2: 0.5 }, "inputs.p1", /strictly between 0 and 1/],
    ["an experimental proportion of 0", { p1: 0.3, p2: 0 }, "inputs.p2", /strictly between 0 and 1/],
    ["a negative non-inferiority margin", { hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: -0.1, alpha: 0.025 }, "inputs.margin", /positive number/],
    ["power below alpha", { p1: 0.3, p2: 0.5, power: 0.03, alpha: 0.05 }, "inputs.power", /exceed alpha/],
    ["Fisher's test for non-inferiority", { hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: 0.1, method: "fisher-exact" }, "inputs.method", /no non-inferiority form/],
    ["a two-sided non-inferiority test", { hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: 0.1, sides: 2 }, "inputs.sides", /one-sided/],
  ];
  for (const [what, inputs, path, message] of cases) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      await expectFieldError(await post(inputs), path, message);
    });
  }

  it("answers 422 naming the bound when the exact search cannot reach the power", async () => {
    const res = await post({ p1: 0.5, p2: 0.55, method: "fisher-exact" });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.bound).toBe(500);
    expect(problem.detail).toContain("500");
  });

  it("answers 422 naming the bound when no normal-approximation size up to it suffices", async () => {
    const res = await post({ p1: 0.5, p2: 0.5005, power: 0.95 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.bound).toBe(100000);
  });
});
