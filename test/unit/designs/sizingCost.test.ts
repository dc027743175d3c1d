// The evaluation counts behind the comparative designs' cost estimates
// (src/designs/shared/sizingCost.ts) against the algorithms they count
// (src/designs/shared/sizing.ts): a count below what an algorithm does would
// let a calculation run past its estimate.
import { describe, expect, it } from "vitest";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { type ArmSizes, curveSizes, detectableEffect, smallestSampleSize } from "../../../src/designs/shared/sizing.js";
import {
  DETECTABLE_EFFECT_EVALUATIONS, POWER_CURVE_EVALUATIONS, sizeSearchEvaluations,
} from "../../../src/designs/shared/sizingCost.js";
import { workEstimate } from "../../../src/designs/shared/workEstimate.js";
import { normalCdf } from "../../../src/stats/normal.js";

/** Two-sided 0.05 normal-theory power for a standardized difference: Φ(δ √(n/2) − z_0.975), z_0.975 = 1.959964 (normal table). */
const normalPower = (effect: number) => (arms: ArmSizes): number => normalCdf(Math.abs(effect) * Math.sqrt(1 / (1 / arms.n1 + 1 / arms.n2)) - 1.959964);

const effects = Array.from({ length: 40 }, (_, i) => 3 * 10 ** (-i / 8)); // 3 SD down to 0.0003 SD

describe("size search", () => {
  it("never evaluates more sizes than counted, wherever the answer falls, infeasible searches included", () => {
    for (const maximum of [100000, 50000]) {
      let most = 0;
      let infeasible = 0;
      for (const effect of effects) for (const target of [0.5, 0.8, 0.99]) for (const allocationRatio of [0.1, 1, 10]) {
        let evaluations = 0;
        const powerAt = (arms: ArmSizes): number => { evaluations++; return normalPower(effect)(arms); };
        try {
          smallestSampleSize({ powerAt, target, allocationRatio, minimum: 2, maximum });
        } catch (error) {
          expect(error).toBeInstanceOf(InfeasibleDesignError);
          infeasible++;
        }
        most = Math.max(most, evaluations);
      }
      expect(infeasible, "the grid reaches past the bound").toBeGreaterThan(0);
      expect(most).toBeLessThanOrEqual(sizeSearchEvaluations(2, maximum));
      // The count is the algorithm's, not a loose guess: the costliest search comes within 3 of it.
      expect(most).toBeGreaterThanOrEqual(sizeSearchEvaluations(2, maximum) - 3);
    }
  });
});

describe("curves and root searches", () => {
  it("a power curve has at most the counted sizes, the design's own among them", () => {
    for (const n1 of [2, 3, 7, 64, 1000, 99999, 100000]) expect(curveSizes(n1, 2).length).toBeLessThanOrEqual(POWER_CURVE_EVALUATIONS);
  });
  it("a detectable effect takes at most the counted evaluations, whatever the units", () => {
    for (const sd of [1e-9, 1, 1e9]) for (const n of [2, 100, 100000]) for (const target of [0.06, 0.8, 0.999999]) {
      const arms = { n1: n, n2: n };
      const se = sd * Math.sqrt(2 / n);
      let evaluations = 0;
      detectableEffect((e) => { evaluations++; return normalPower(e / sd)(arms); }, target, 0, 50 * se, "n1", se);
      expect(evaluations, JSON.stringify({ sd, n, target })).toBeLessThanOrEqual(DETECTABLE_EFFECT_EVALUATIONS);
    }
  });
});

describe("work estimate", () => {
  it("names each counted part with its count, thousands separated, and leaves out empty parts", () => {
    const estimate = workEstimate([
      { count: 1234567, msEach: 1e-5, what: "terms of the enumeration" },
      { count: 0, msEach: 1, what: "looks" },
      { count: 61, msEach: 0.1, what: "power evaluations" },
    ], ["n1"]);
    expect(estimate.breakdown).toBe("1,234,567 terms of the enumeration + 61 power evaluations");
    // Each part's count × cost, plus the fixed 4 ms, times the safety factor 1.5 (workEstimate.ts).
    expect(estimate.milliseconds).toBeCloseTo(1.5 * (4 + 12.34567 + 6.1), 9);
    expect(estimate.reduce).toEqual(["n1"]);
  });
});
