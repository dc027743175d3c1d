// Pool-adjacent-violators against R base stats::isoreg (fixture written by
// test/fixtures/isotonic/generate.R; weighted cases by replicating each value
// weight times) and a hand-checked example.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { isotonicRegression } from "../../../src/stats/isotonic.js";

describe("isotonic regression by pool adjacent violators", () => {
  it("matches R stats::isoreg on replicated data", () => {
    const f = loadFixture<{ values: number[]; weights: number[]; fitted: number[] }>("isotonic/isotonic.json");
    expect(f.cases.length).toBeGreaterThan(50);
    for (const c of f.cases) {
      const fit = isotonicRegression(c.values, c.weights);
      expect(fit).toHaveLength(c.fitted.length);
      fit.forEach((v, i) => expectClose(v, c.fitted[i]!, f.tolerance, { ...c, index: i }));
    }
  });

  it("pools a violating pair to its weighted mean (hand-checked)", () => {
    // 1/3 at 3 patients and 0/6 at 6 patients pool to 1/9; then 2/3 stays.
    const fit = isotonicRegression([0, 1 / 3, 0, 2 / 3], [3, 3, 6, 3]);
    expectClose(fit[0]!, 0, 1e-15, { index: 0 });
    expectClose(fit[1]!, 1 / 9, 1e-15, { index: 1 });
    expectClose(fit[2]!, 1 / 9, 1e-15, { index: 2 });
    expectClose(fit[3]!, 2 / 3, 1e-15, { index: 3 });
  });

  it("leaves an increasing sequence alone and refuses bad weights", () => {
    expect(isotonicRegression([0.1, 0.2, 0.3])).toEqual([0.1, 0.2, 0.3]);
    expect(isotonicRegression([])).toEqual([]);
    expect(() => isotonicRegression([0.1, 0.2], [1, 0])).toThrow(RangeError);
    expect(() => isotonicRegression([0.1, 0.2], [1])).toThrow(RangeError);
  });
});
