// Beta-binomial kernel against R's definition (test/fixtures/bayesian-monitoring/generate.R),
// and the sequential binomial recursion in its simplest case.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { betaBinomialPmf, betaBinomialPmfArray, betaBinomialUpperTail } from "../../../src/stats/betaBinomial.js";
import { sequentialBinomial } from "../../../src/stats/sequentialBinomial.js";
import { binomialPmf } from "../../../src/stats/binomial.js";

describe("beta-binomial distribution (R 4.2 lchoose, lbeta)", () => {
  const f = loadFixture<{ y: number; m: number; a: number; b: number; pmf: number; upper: number }>("bayesian-monitoring/beta-binomial.json");
  it("pmf, pmf array and upper tail match the definition", () => {
    expect(f.cases.length).toBeGreaterThan(100);
    for (const c of f.cases) {
      expectClose(betaBinomialPmf(c.y, c.m, c.a, c.b), c.pmf, f.tolerance, c, "relative");
      expectClose(betaBinomialPmfArray(c.m, c.a, c.b)[c.y]!, c.pmf, 1e-10, c, "relative");
      expectClose(betaBinomialUpperTail(c.y, c.m, c.a, c.b), c.upper, 1e-10, c, "relative");
    }
  });
});

describe("sequential binomial recursion", () => {
  it("with no checks leaves the Binomial(maxN, p) distribution (common practice, no source)", () => {
    const out = sequentialBinomial(0.37, 25, []);
    for (let x = 0; x <= 25; x++) expectClose(out.completed[x]!, binomialPmf(x, 25, 0.37), 1e-14, { x });
    expectClose(out.expectedSampleSize, 25, 1e-12, { maxN: 25 });
  });
  it("one check after n patients stops with the binomial tail at n (common practice, no source)", () => {
    const out = sequentialBinomial(0.3, 20, [{ patients: 8, atLeast: 4 }]);
    let tail = 0;
    for (let x = 4; x <= 8; x++) tail += binomialPmf(x, 8, 0.3);
    expectClose(out.stopHigh[0]!, tail, 1e-14, { n: 8 });
    expectClose(out.expectedSampleSize, 8 * tail + 20 * (1 - tail), 1e-12, { n: 8 });
  });
  it("refuses checks out of order", () => {
    expect(() => sequentialBinomial(0.3, 10, [{ patients: 5 }, { patients: 5 }])).toThrow(RangeError);
  });
});
