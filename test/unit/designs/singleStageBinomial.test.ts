// Single-stage exact binomial design (A'Hern 2001) against a scan in R 4.2
// (stats::pbinom; test/fixtures/activity/generate.R) and recalled table values.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { singleStageBinomial } from "../../../src/designs/singleStageBinomial.js";
import { createRandom } from "../../../src/stats/random.js";
import { binomialUpperTails } from "../../../src/designs/shared/twoStage.js";

const parse = (inputs: Record<string, unknown>) => singleStageBinomial.input.parse(inputs);

describe("single-stage exact binomial design", () => {
  it("matches the smallest n and critical count found by scanning n in R (R 4.2 stats::pbinom fixture)", () => {
    const f = loadFixture<{ p0: number; p1: number; alpha: number; power: number; n: number; r: number; exactAlpha: number; exactPower: number }>("activity/single-stage.json");
    for (const c of f.cases) {
      const result = singleStageBinomial.compute(parse({ p0: c.p0, p1: c.p1, alpha: c.alpha, power: c.power }));
      expect({ n: result.n, r: result.r }).toEqual({ n: c.n, r: c.r });
      expectClose(result.alpha, c.exactAlpha, f.tolerance, c);
      expectClose(result.power, c.exactPower, f.tolerance, c);
    }
  });

  // From memory of A'Hern (2001) table 1 (alpha 0.05, power 0.8): n and r, "declare promising if at least r respond".
  const recalled: Array<[number, number, number, number]> = [[0.05, 0.2, 27, 4], [0.1, 0.3, 25, 6], [0.2, 0.4, 35, 12]];
  for (const [p0, p1, n, r] of recalled) {
    it(`p0 ${p0}, p1 ${p1}: n = ${n}, r = ${r} (from memory of A'Hern 2001 table 1)`, () => {
      const result = singleStageBinomial.compute(parse({ p0, p1, alpha: 0.05, power: 0.8 }));
      expect([result.n, result.r]).toEqual([n, r]);
    });
  }

  it("lists larger sizes with their own rule, marking those that miss the targets (exact power is saw-toothed)", () => {
    const result = singleStageBinomial.compute(parse({ p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8 }));
    expect(result.nearbySizes[0]).toMatchObject({ n: result.n, r: result.r, meetsTargets: true });
    // Common practice, no source: with p0 0.1 and p1 0.3 some n just above 25 fall short of power 0.8.
    expect(result.nearbySizes.some((s) => !s.meetsTargets)).toBe(true);
  });

  it("agrees with a seeded Monte Carlo of the rule at p0 and p1 (within 4 standard errors)", () => {
    const result = singleStageBinomial.compute(parse({ p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8 }));
    const random = createRandom(2001);
    const trials = 20000;
    for (const [rate, exact] of [[0.1, result.alpha], [0.3, result.power]] as const) {
      let hits = 0;
      for (let t = 0; t < trials; t++) {
        let x = 0;
        for (let i = 0; i < result.n; i++) if (random.bernoulli(rate)) x++;
        if (x >= result.r) hits++;
      }
      expect(Math.abs(hits / trials - exact)).toBeLessThan(4 * Math.sqrt((exact * (1 - exact)) / trials));
    }
  });

  it("rejects p1 at or below p0 on p1, and is infeasible beyond its size bound", () => {
    const r = singleStageBinomial.input.safeParse({ p0: 0.4, p1: 0.2 });
    expect(r.success).toBe(false);
    expect(r.success ? [] : r.error.issues.map((i) => i.path.join("."))).toContain("p1");
    expect(() => singleStageBinomial.compute(parse({ p0: 0.5, p1: 0.501, alpha: 0.01, power: 0.99 }))).toThrow(InfeasibleDesignError);
  });

  it("refuses an alpha below 1e-6 or a power above 0.999999, which the 1e-12 precision cannot honour (found by the degenerate-input audit)", () => {
    // Common practice, no source: alpha 5e-324 used to return a design with exact alpha 7.8e-13, far above the target.
    for (const [field, value] of [["alpha", 5e-324], ["alpha", 1e-9], ["power", 1 - 1e-15], ["power", 1 - 1e-9]] as const) {
      const r = singleStageBinomial.input.safeParse({ p0: 0.15, p1: 0.35, alpha: 0.05, power: 0.8, [field]: value });
      expect(r.success).toBe(false);
      expect(r.success ? [] : r.error.issues.map((i) => i.path.join("."))).toEqual([field]);
    }
    const smallest = singleStageBinomial.compute(parse({ p0: 0.15, p1: 0.35, alpha: 1e-6, power: 0.8 }));
    expect(smallest.alpha).toBeLessThanOrEqual(1e-6);
  });

  it("never reports a probability above 1, though a tail summed over 5000 terms can round past it (found by the degenerate-input audit)", () => {
    // Common practice, no source: a probability lies in [0, 1]; summing Binomial(5000, 0.35) from the top overshoots 1 by about 7e-12.
    const tails = binomialUpperTails(5000, 0.35);
    expect(Math.max(...tails)).toBeLessThanOrEqual(1);
    const result = singleStageBinomial.compute(parse({ p0: 0.15, p1: 0.35, alpha: 0.5, power: 0.999999 }));
    for (const rule of [result, ...result.nearbySizes]) expect(rule.power).toBeLessThanOrEqual(1);
    for (const [, y] of result.curve) expect(y).toBeLessThanOrEqual(1);
  });
});
