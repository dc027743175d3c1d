// Distribution kernels against R base stats (fixtures written by
// test/fixtures/distributions/generate.R; tolerances are stated in each file).
import { describe, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import {
  betaCdf, betaQuantile, betaSurvival, binomialCdf, binomialPmf, binomialPmfArray, binomialUpperTail,
  noncentralTCdf, normalCdf, normalQuantile, studentTCdf, studentTQuantile,
} from "../../../src/stats/index.js";

describe("normal distribution (R pnorm, qnorm)", () => {
  it("CDF matches pnorm in both tails", () => {
    const f = loadFixture<{ x: number; p: number }>("distributions/normal-cdf.json");
    for (const c of f.cases) expectClose(normalCdf(c.x), c.p, f.tolerance, c, "relative");
  });
  it("quantile matches qnorm", () => {
    const f = loadFixture<{ p: number; x: number }>("distributions/normal-quantile.json");
    for (const c of f.cases) expectClose(normalQuantile(c.p), c.x, f.tolerance * Math.max(1, Math.abs(c.x)), c);
  });
});

describe("Student t distribution (R pt, qt)", () => {
  it("CDF matches pt", () => {
    const f = loadFixture<{ t: number; df: number; p: number }>("distributions/student-t-cdf.json");
    for (const c of f.cases) expectClose(studentTCdf(c.t, c.df), c.p, f.tolerance, c, "relative");
  });
  it("quantile matches qt", () => {
    const f = loadFixture<{ p: number; df: number; t: number }>("distributions/student-t-quantile.json");
    for (const c of f.cases) expectClose(studentTQuantile(c.p, c.df), c.t, f.tolerance, c, "relative");
  });
});

describe("noncentral t distribution (AS 243 against R pt with ncp)", () => {
  it("CDF matches pt(t, df, ncp)", () => {
    const f = loadFixture<{ t: number; df: number; ncp: number; p: number }>("distributions/noncentral-t-cdf.json");
    for (const c of f.cases) expectClose(noncentralTCdf(c.t, c.df, c.ncp), c.p, f.tolerance, c);
  });
});

describe("binomial distribution (R dbinom, pbinom)", () => {
  const f = loadFixture<{ k: number; n: number; p: number; pmf: number; cdf: number; upper: number }>("distributions/binomial.json");
  it("pmf, CDF and upper tail match", () => {
    for (const c of f.cases) {
      expectClose(binomialPmf(c.k, c.n, c.p), c.pmf, f.tolerance, c, "relative");
      expectClose(binomialCdf(c.k, c.n, c.p), c.cdf, f.tolerance, c, "relative");
      expectClose(binomialUpperTail(c.k, c.n, c.p), c.upper, f.tolerance, c, "relative");
    }
  });
  it("the pmf array by recurrence matches dbinom", () => {
    for (const c of f.cases) expectClose(binomialPmfArray(c.n, c.p)[c.k]!, c.pmf, 1e-10, c, "relative");
  });
});

describe("beta distribution (R pbeta, qbeta)", () => {
  it("CDF and upper tail match pbeta", () => {
    const f = loadFixture<{ x: number; a: number; b: number; cdf: number; upper: number }>("distributions/beta-cdf.json");
    for (const c of f.cases) {
      expectClose(betaCdf(c.x, c.a, c.b), c.cdf, f.tolerance, c, "relative");
      expectClose(betaSurvival(c.x, c.a, c.b), c.upper, f.tolerance, c, "relative");
    }
  });
  it("quantile matches qbeta", () => {
    const f = loadFixture<{ p: number; a: number; b: number; x: number }>("distributions/beta-quantile.json");
    for (const c of f.cases) expectClose(betaQuantile(c.p, c.a, c.b), c.x, f.tolerance, c);
  });
});
