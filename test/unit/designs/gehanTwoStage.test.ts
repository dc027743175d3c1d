// Gehan's two-stage design (Gehan 1961) against common practice and a fixture
// from R 4.2 (stats::qbeta for the exact upper confidence limit;
// test/fixtures/activity/generate.R).
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { gehanTwoStage } from "../../../src/designs/gehanTwoStage.js";
import { createRandom } from "../../../src/stats/random.js";

const parse = (inputs: Record<string, unknown>) => gehanTwoStage.input.parse(inputs);

describe("Gehan's two-stage design", () => {
  it("p1 0.20 and beta 0.05 give n1 = 14 (common practice: 0.8^14 = 0.044, 0.8^13 = 0.055)", () => {
    const result = gehanTwoStage.compute(parse({ p1: 0.2, beta: 0.05 }));
    expect(result.n1).toBe(14);
    expectClose(result.probabilityOfEarlyTerminationAtP1, 0.044, 0.0005, { p1: 0.2 });
  });

  it("p1 0.20 and beta 0.10 give n1 = 11, and p1 0.15 and beta 0.05 give n1 = 19 (common practice: 0.8^11 = 0.086, 0.85^19 = 0.046)", () => {
    expect(gehanTwoStage.compute(parse({ p1: 0.2, beta: 0.1 })).n1).toBe(11);
    expect(gehanTwoStage.compute(parse({ p1: 0.15, beta: 0.05 })).n1).toBe(19);
  });

  it("stage-2 sizes by stage-1 responses match R (qbeta upper limit, moved to 1/2 inside the interval)", () => {
    const f = loadFixture<{ p1: number; beta: number; targetSE: number; level: number; n1: number; x1: number; rateForSE: number; n2: number }>("activity/gehan.json");
    const cache = new Map<string, ReturnType<typeof gehanTwoStage.compute>>();
    for (const c of f.cases) {
      const key = `${c.p1}/${c.beta}/${c.targetSE}/${c.level}`;
      if (!cache.has(key)) cache.set(key, gehanTwoStage.compute(parse({ p1: c.p1, beta: c.beta, targetSE: c.targetSE, confidenceLevel: c.level })));
      const result = cache.get(key)!;
      expect(result.n1).toBe(c.n1);
      const row = result.rows.find((r) => r.stage1Responses === c.x1)!;
      expectClose(row.rateForStandardError, c.rateForSE, f.tolerance, c);
      expect(row.stage2Size).toBe(c.n2);
      expect(row.standardError).toBeLessThanOrEqual(c.targetSE + 1e-12);
    }
  });

  it("with the stage-1 proportion, n1 + n2 is the smallest total with p(1-p)/n ≤ SE² (common practice: 1 of 14, SE 0.05 → 0.0663/0.0025 → 27 in all)", () => {
    const result = gehanTwoStage.compute(parse({ p1: 0.2, beta: 0.05, targetSE: 0.05, rateForStandardError: "stage-one-proportion" }));
    const row = result.rows.find((r) => r.stage1Responses === 1)!;
    expect(row.totalSize).toBe(27);
    expect(row.stage2Size).toBe(13);
  });

  it("the probability of stopping after stage 1 agrees with a seeded Monte Carlo at p1 (within 4 standard errors)", () => {
    const result = gehanTwoStage.compute(parse({ p1: 0.2, beta: 0.05 }));
    const random = createRandom(1961);
    const trials = 20000;
    let stops = 0;
    for (let t = 0; t < trials; t++) {
      let any = false;
      for (let i = 0; i < result.n1; i++) if (random.bernoulli(0.2)) any = true;
      if (!any) stops++;
    }
    const exact = result.probabilityOfEarlyTerminationAtP1;
    expect(Math.abs(stops / trials - exact)).toBeLessThan(4 * Math.sqrt((exact * (1 - exact)) / trials));
  });

  it("names the bad field", () => {
    const r = gehanTwoStage.input.safeParse({ p1: 1.2, beta: 0, targetSE: 5e-324 });
    const paths = r.success ? [] : r.error.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["p1", "beta", "targetSE"]));
  });
});
