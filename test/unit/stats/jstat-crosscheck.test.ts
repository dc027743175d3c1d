// A second, independent reference for the kernels: the general-purpose jStat
// library (jstat 1.9.6). It is less accurate than R, so tolerances are looser
// and set from its observed accuracy (continued fractions and series to
// about 1e-9: at t = -1 with 1 df it gives 0.2499999985 where the exact value is
// 1/4); R's fixtures remain the primary check.
import { jStat } from "jstat";
import { describe, it } from "vitest";
import { expectClose } from "../../support/fixtures.js";
import { betaCdf, binomialCdf, noncentralTCdf, normalQuantile, studentTCdf } from "../../../src/stats/index.js";

describe("kernels against jStat", () => {
  it("normal quantile", () => {
    for (const p of [0.001, 0.025, 0.1, 0.5, 0.8, 0.975, 0.9999]) expectClose(normalQuantile(p), jStat.normal.inv(p, 0, 1), 1e-8, { p });
  });
  it("t CDF", () => {
    for (const df of [1, 3, 12, 60]) for (const t of [-4, -1, 0.3, 2.2, 6]) expectClose(studentTCdf(t, df), jStat.studentt.cdf(t, df), 1e-8, { t, df });
  });
  it("beta CDF", () => {
    for (const a of [0.5, 2, 9]) for (const b of [0.7, 3, 20]) for (const x of [0.05, 0.3, 0.77]) expectClose(betaCdf(x, a, b), jStat.beta.cdf(x, a, b), 1e-8, { x, a, b });
  });
  it("binomial CDF", () => {
    for (const n of [5, 20, 60]) for (const p of [0.1, 0.45]) for (const k of [0, 2, 4]) expectClose(binomialCdf(k, n, p), jStat.binomial.cdf(k, n, p), 1e-9, { k, n, p });
  });
  it("noncentral t CDF", () => {
    for (const df of [4, 20, 80]) for (const ncp of [0.5, 2, 3.5]) for (const t of [0.5, 1.7, 2.5]) expectClose(noncentralTCdf(t, df, ncp), jStat.noncentralt.cdf(t, df, ncp), 1e-7, { t, df, ncp });
  });
});
