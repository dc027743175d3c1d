// Bayesian monitoring over HTTP: a frozen calculation, 400s naming the bad
// field, and 422s saying what would make the rule workable.
import { SELF } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import { type Problem, expectErrorAt, postCalculation } from "../support/http.js";

const post = (inputs: unknown): Promise<Response> => postCalculation("bayesian-monitoring", inputs);

describe("bayesian-monitoring over HTTP", () => {
  it("freezes a predictive-probability calculation with its exact alpha and power", async () => {
    const res = await post({ rule: "predictive", p0: 0.2, p1: 0.4, priorA: 0.2, priorB: 0.8, maxN: 40, firstCheck: 10 });
    expect(res.status).toBe(201);
    const body = await res.json<{ result: { finalSuccessCount: number; alpha: number; power: number } }>();
    expect(body.result.finalSuccessCount).toBe(12);
    expect(body.result.alpha).toBeGreaterThan(0);
    expect(body.result.power).toBeGreaterThan(body.result.alpha);
  });

  it("freezes a threshold search, reporting the thresholds it chose", async () => {
    const res = await post({ rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.4, priorA: 0.2, priorB: 0.8, maxN: 40, firstCheck: 10, alpha: 0.1, power: 0.8 });
    expect(res.status).toBe(201);
    const body = await res.json<{ id: string; result: { efficacyThreshold: number; futilityThreshold: number; alpha: number; power: number } }>();
    expect(body.result.alpha).toBeLessThanOrEqual(0.1);
    expect(body.result.power).toBeGreaterThanOrEqual(0.8);
    expect(body.result.efficacyThreshold).toBeGreaterThanOrEqual(0.8);
    // The report of a searched design carries its search table, in HTML and in the PDF.
    const html = await SELF.fetch(`https://example.com/c/${body.id}`);
    expect(html.status).toBe(200);
    expect(await html.text()).toContain("Threshold search");
    const pdf = await SELF.fetch(`https://example.com/c/${body.id}.pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
  });

  const bad: Array<[string, unknown, string]> = [
    ["a futility threshold alongside a search", { rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.4, maxN: 30, futilityThreshold: 0.1 }, "inputs.futilityThreshold"],
    ["a missing limit", { maxN: 30 }, "inputs.limit"],
    ["a limit outside (0, 1)", { limit: 1.5, maxN: 30 }, "inputs.limit"],
    ["too many patients", { limit: 0.3, maxN: 1000 }, "inputs.maxN"],
    ["a cohort larger than the trial", { limit: 0.3, maxN: 10, cohortSize: 12 }, "inputs.cohortSize"],
    ["a predictive field under the posterior rule", { limit: 0.3, maxN: 30, futilityThreshold: 0.1 }, "inputs.futilityThreshold"],
    ["a target rate not above p0", { rule: "predictive", p0: 0.4, p1: 0.3, maxN: 30 }, "inputs.p1"],
    ["a first interim check at the last patient", { rule: "predictive", p0: 0.2, p1: 0.4, maxN: 30, firstCheck: 30 }, "inputs.firstCheck"],
    ["a true rate of 0", { limit: 0.3, maxN: 30, trueRates: [0.1, 0] }, "inputs.trueRates.1"],
  ];
  for (const [what, inputs, path] of bad) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      const res = await post(inputs);
      await expectErrorAt(res, path);
    });
  }

  const infeasible: Array<[string, unknown, Partial<Problem>]> = [
    ["a rule that can never stop", { limit: 0.5, threshold: 0.999, maxN: 5 }, { field: "maxN", bound: 9 }],
    ["a prior that stops at once", { limit: 0.3, priorA: 9, priorB: 1, maxN: 20 }, { field: "threshold" }],
    ["a final rule no result can meet", { rule: "predictive", p0: 0.5, p1: 0.7, efficacyThreshold: 0.99, maxN: 5, firstCheck: 2 }, { field: "maxN", bound: 6 }],
    ["a futility rule that always stops", { rule: "predictive", p0: 0.3, p1: 0.5, maxN: 40, firstCheck: 2, futilityThreshold: 0.99 }, { field: "futilityThreshold" }],
    ["a threshold search with no design meeting the targets", { rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.35, priorA: 0.2, priorB: 0.8, maxN: 20, firstCheck: 5, alpha: 0.05, power: 0.9 }, { field: "maxN" }],
  ];
  for (const [what, inputs, details] of infeasible) {
    it(`answers 422 for ${what}`, async () => {
      const res = await post(inputs);
      expect(res.status).toBe(422);
      const problem = await res.json<Problem>();
      expect(problem).toMatchObject({ status: 422, ...details });
      expect(problem.detail.length).toBeGreaterThan(20);
    });
  }
});
