// Gehan's two-stage design (Gehan 1961) against common practice and fixtures
// from R 4.2 (stats::qbeta for the exact upper confidence limit, dbinom for the
// probabilities, sizes and standard errors from their definitions;
// test/fixtures/activity/generate.R).
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { gehanTwoStage } from "../../../src/designs/gehanTwoStage.js";
import { documentTable, tableCell } from "../../support/documentBlocks.js";
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

  type GehanDesign = { p1: number; beta: number; targetSE: number; level: number; rateForStandardError: string };
  const computeDesign = (d: GehanDesign) => {
    const input = parse({ p1: d.p1, beta: d.beta, targetSE: d.targetSE, confidenceLevel: d.level, rateForStandardError: d.rateForStandardError });
    const result = gehanTwoStage.compute(input);
    return { result, table: documentTable(gehanTwoStage.document(input, result), "stage-two-sizes") };
  };

  it("the P(x1 | p1) column, the total sizes and the standard-error column match R (dbinom; √(p(1 − p)/total) at the rate used), in the result and in the printed table", () => {
    const f = loadFixture<GehanDesign & { n1: number; x1: number; probabilityAtP1: number; rateForSE: number; totalSize: number; standardError: number }>("activity/gehan-rows.json");
    expect(new Set(f.cases.map((c) => c.rateForStandardError))).toEqual(new Set(["upper-confidence-limit", "stage-one-proportion"]));
    for (const c of f.cases) {
      const { result, table } = computeDesign(c);
      expect(result.n1, JSON.stringify(c)).toBe(c.n1);
      expect(result.rows).toHaveLength(c.n1);
      const row = result.rows.find((r) => r.stage1Responses === c.x1)!;
      expect(row.totalSize, JSON.stringify(c)).toBe(c.totalSize);
      expectClose(row.probabilityAtP1, c.probabilityAtP1, f.tolerance, c);
      expectClose(row.standardError, c.standardError, f.tolerance, c);
      expect(tableCell(table, c.x1, "total"), JSON.stringify(c)).toBe(c.totalSize);
      expectClose(tableCell(table, c.x1, "prob") as number, c.probabilityAtP1, f.tolerance, c);
      expectClose(tableCell(table, c.x1, "se") as number, c.standardError, f.tolerance, c);
    }
  });

  it("the expected total size at p1, the largest total size and P(no response) match R (Σ dbinom(x1, n1, p1) × total)", () => {
    const f = loadFixture<GehanDesign & { n1: number; probabilityNoResponse: number; largestTotalSize: number; expectedSampleSizeAtP1: number }>("activity/gehan-summary.json");
    for (const c of f.cases) {
      const { result, table } = computeDesign(c);
      expect(result.n1, JSON.stringify(c)).toBe(c.n1);
      expect(result.largestTotalSize, JSON.stringify(c)).toBe(c.largestTotalSize);
      expectClose(result.expectedSampleSizeAtP1, c.expectedSampleSizeAtP1, f.tolerance, c);
      expectClose(result.probabilityOfEarlyTerminationAtP1, c.probabilityNoResponse, f.tolerance, c);
      expectClose(tableCell(table, 0, "prob") as number, c.probabilityNoResponse, f.tolerance, c);
    }
  });

  it("the stopping curve matches R's dbinom(0, n1, p) at p = 0, 0.02, …, 1", () => {
    const f = loadFixture<{ p1: number; beta: number; n1: number; rate: number; probability: number }>("activity/gehan-stopping-curve.json");
    const byDesign = new Map<string, typeof f.cases>();
    for (const c of f.cases) byDesign.set(`${c.p1}/${c.beta}`, [...(byDesign.get(`${c.p1}/${c.beta}`) ?? []), c]);
    expect(byDesign.size).toBe(4);
    for (const cases of byDesign.values()) {
      const { p1, beta, n1 } = cases[0]!;
      const result = gehanTwoStage.compute(parse({ p1, beta }));
      expect(result.n1).toBe(n1);
      expect(result.stoppingCurve.map(([rate]) => rate)).toEqual(cases.map((c) => c.rate));
      cases.forEach((c, i) => expectClose(result.stoppingCurve[i]![1], c.probability, f.tolerance, c));
    }
  });

  it("names the bad field", () => {
    const r = gehanTwoStage.input.safeParse({ p1: 1.2, beta: 0, targetSE: 5e-324 });
    const paths = r.success ? [] : r.error.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["p1", "beta", "targetSE"]));
  });
});
