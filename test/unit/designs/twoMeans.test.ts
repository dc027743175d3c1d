// two-means against published values and R base stats fixtures
// (test/fixtures/two-means/generate.R).
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { documentFact } from "../../support/documentBlocks.js";
import { twoMeans, twoMeansPower } from "../../../src/designs/twoMeans.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";

const solve = (inputs: Record<string, unknown>) => twoMeans.compute(twoMeans.input.parse(inputs));

describe("two-means: published values", () => {
  it("0.5 SD, two-sided 0.05, power 0.80 needs 64 per group by the t test (Cohen 1988, table 2.4.1)", () => {
    const r = solve({ delta: 0.5, sd: 1, alpha: 0.05, power: 0.8 });
    expect(r.n1).toBe(64);
    expect(r.n2).toBe(64);
  });
  it("the same by the normal approximation needs 63 per group (2(1.96 + 0.8416)² / 0.25 = 62.8, handbook formula)", () => {
    const r = solve({ delta: 0.5, sd: 1, alpha: 0.05, power: 0.8, method: "normal" });
    expect(r.n1).toBe(63);
  });
  it("a difference of 0.8 SD needs 26 per group and 0.2 SD needs 394 (Cohen 1988, table 2.4.1)", () => {
    expect(solve({ delta: 0.8, sd: 1, power: 0.8 }).n1).toBe(26);
    expect(solve({ delta: 0.2, sd: 1, power: 0.8 }).n1).toBe(394);
  });
});

describe("two-means: R stats::power.t.test and pt(ncp) fixtures", () => {
  it("equal allocation, one- and two-sided, matches the ceiling of power.t.test", () => {
    const f = loadFixture<{ delta: number; sd: number; alpha: number; power: number; sides: 1 | 2; n: number; achievedPower: number }>("two-means/superiority-equal.json");
    expect(f.cases.length).toBeGreaterThan(20);
    for (const c of f.cases) {
      const r = solve({ delta: c.delta, sd: c.sd, alpha: c.alpha, power: c.power, sides: c.sides });
      expect(r.n1, JSON.stringify(c)).toBe(c.n);
      expectClose(r.power, c.achievedPower, f.tolerance, c);
    }
  });
  it("power at given n matches power.t.test", () => {
    const f = loadFixture<{ n: number; delta: number; sd: number; alpha: number; sides: 1 | 2; power: number }>("two-means/power-at-n.json");
    for (const c of f.cases) {
      const r = solve({ solveFor: "power", delta: c.delta, sd: c.sd, alpha: c.alpha, sides: c.sides, n1: c.n, n2: c.n });
      expectClose(r.power, c.power, f.tolerance, c);
    }
  });
  it("unequal allocation matches the search over pt(ncp) in R", () => {
    const f = loadFixture<{ allocationRatio: number; delta: number; sd: number; alpha: number; power: number; sides: 1 | 2; n1: number; n2: number; achievedPower: number }>("two-means/unequal-allocation.json");
    for (const c of f.cases) {
      const r = solve({ delta: c.delta, sd: c.sd, alpha: c.alpha, power: c.power, sides: c.sides, allocationRatio: c.allocationRatio });
      expect([r.n1, r.n2], JSON.stringify(c)).toEqual([c.n1, c.n2]);
      expectClose(r.power, c.achievedPower, f.tolerance, c);
    }
  });
  it("normal approximation matches the pnorm search in R", () => {
    const f = loadFixture<{ delta: number; sd: number; alpha: number; power: number; sides: 1 | 2; n: number; achievedPower: number }>("two-means/normal-approximation.json");
    for (const c of f.cases) {
      const r = solve({ delta: c.delta, sd: c.sd, alpha: c.alpha, power: c.power, sides: c.sides, method: "normal" });
      expect(r.n1, JSON.stringify(c)).toBe(c.n);
      expectClose(r.power, c.achievedPower, f.tolerance, c);
    }
  });
  it("non-inferiority matches power.t.test with delta + margin, one-sided", () => {
    const f = loadFixture<{ delta: number; margin: number; sd: number; alpha: number; power: number; n: number; achievedPower: number }>("two-means/non-inferiority.json");
    for (const c of f.cases) {
      const r = solve({ hypothesis: "non-inferiority", sides: 1, delta: c.delta, margin: c.margin, sd: c.sd, alpha: c.alpha, power: c.power });
      expect(r.n1, JSON.stringify(c)).toBe(c.n);
      expectClose(r.power, c.achievedPower, f.tolerance, c);
    }
  });
  it("equivalence (TOST) exact power matches integrate() over the chi-square law in R", () => {
    const f = loadFixture<{ delta: number; margin: number; sd: number; alpha: number; power?: number; n?: number; achievedPower?: number; powerAtN?: number }>("two-means/equivalence.json");
    for (const c of f.cases) {
      if (c.powerAtN !== undefined) {
        const input = twoMeans.input.parse({ hypothesis: "equivalence", sides: 1, delta: c.delta, margin: c.margin, sd: c.sd, alpha: c.alpha, solveFor: "power", n1: c.n, n2: c.n });
        expectClose(twoMeansPower(input, { n1: c.n!, n2: c.n! }, c.delta), c.powerAtN, f.tolerance, c);
        continue;
      }
      const r = solve({ hypothesis: "equivalence", sides: 1, delta: c.delta, margin: c.margin, sd: c.sd, alpha: c.alpha, power: c.power });
      expect(r.n1, JSON.stringify(c)).toBe(c.n);
      expectClose(r.power, c.achievedPower!, f.tolerance, c);
    }
  });
});

describe("two-means: the printed critical value, degrees of freedom and standardized effect (R qt, qnorm, power.t.test)", () => {
  it("critical value and degrees of freedom for every hypothesis and both methods, at given arms and at power.t.test's sizes", () => {
    const f = loadFixture<{ solveFor: string; hypothesis: string; sides: 1 | 2; alpha: number; method: string; delta: number; sd: number; margin?: number; power?: number; n1: number; n2: number; criticalValue: number; degreesOfFreedom: number | null; standardizedEffect: number }>("two-means/critical-values.json");
    expect(new Set(f.cases.map((c) => c.hypothesis))).toEqual(new Set(["superiority", "non-inferiority", "equivalence"]));
    for (const c of f.cases) {
      const { criticalValue, degreesOfFreedom, standardizedEffect, n1, n2, ...inputs } = c;
      const input = twoMeans.input.parse(c.solveFor === "power" ? { ...inputs, n1, n2 } : inputs);
      const r = twoMeans.compute(input);
      expect([r.n1, r.n2], JSON.stringify(c)).toEqual([c.n1, c.n2]);
      expectClose(r.criticalValue, criticalValue, f.tolerance, c, "relative");
      expect(r.degreesOfFreedom, JSON.stringify(c)).toBe(degreesOfFreedom);
      expectClose(r.standardizedEffect, standardizedEffect, f.tolerance, c, "relative");
      const fact = documentFact(twoMeans.document(input, r), "Critical value")!;
      expectClose(fact.value as number, criticalValue, f.tolerance, c, "relative");
      expect(fact.note, JSON.stringify(c)).toBe(degreesOfFreedom === null ? "standard normal" : `t on ${degreesOfFreedom} degrees of freedom`);
    }
  });
  it("the detectable difference, its standardized effect and the critical value match power.t.test(delta = NULL)", () => {
    const f = loadFixture<{ n: number; sd: number; alpha: number; power: number; sides: 1 | 2; delta: number; standardizedEffect: number; criticalValue: number }>("two-means/detectable-difference.json");
    for (const c of f.cases) {
      const input = twoMeans.input.parse({ solveFor: "difference", sd: c.sd, alpha: c.alpha, power: c.power, sides: c.sides, n1: c.n, n2: c.n });
      const r = twoMeans.compute(input);
      expectClose(r.delta, c.delta, f.tolerance, c, "relative");
      expectClose(r.standardizedEffect, c.standardizedEffect, f.tolerance, c, "relative");
      expectClose(documentFact(twoMeans.document(input, r), "Standardized effect (δ/σ)")!.value as number, c.standardizedEffect, f.tolerance, c, "relative");
      expectClose(r.criticalValue, c.criticalValue, f.tolerance, c, "relative");
      expect(r.degreesOfFreedom).toBe(2 * c.n - 2);
    }
  });
});

describe("two-means: other modes", () => {
  it("the detectable difference at n gives back the target power", () => {
    const r = solve({ solveFor: "difference", sd: 2, power: 0.9, n1: 50, n2: 75 });
    const check = solve({ solveFor: "power", delta: r.delta, sd: 2, n1: 50, n2: 75 });
    expectClose(check.power, 0.9, 1e-8, { delta: r.delta });
    // And it agrees with the sample-size mode: solving n for that difference gives back about 50 in the smaller arm.
    const n = solve({ delta: r.delta, sd: 2, power: 0.9, allocationRatio: 1.5 });
    expect(n.n1).toBe(50);
  });
  it("dropout inflates each arm to ceil(n / (1 - dropout)) (common practice)", () => {
    const r = solve({ delta: 0.5, sd: 1, dropout: 0.15 });
    expect(r.enrolled1).toBe(Math.ceil(64 / 0.85));
    expect(r.enrolledTotal).toBe(2 * Math.ceil(64 / 0.85));
  });
  it("the power curve rises with n and passes the target at the chosen size", () => {
    const r = solve({ delta: 0.5, sd: 1 });
    for (let i = 1; i < r.powerCurve.length; i++) expect(r.powerCurve[i]![1]).toBeGreaterThanOrEqual(r.powerCurve[i - 1]![1]);
    const atN = r.powerCurve.find(([n]) => n === r.total);
    expect(atN?.[1]).toBeGreaterThanOrEqual(0.8);
    const below = r.powerCurve.find(([n]) => n === r.total - 2);
    if (below) expect(below[1]).toBeLessThan(0.8);
  });
  it("an effect too small for the size bound is infeasible, naming the bound", () => {
    expect(() => solve({ delta: 0.001, sd: 10, power: 0.99 })).toThrow(InfeasibleDesignError);
  });
  it("cross-field rules name their field", () => {
    const bad = twoMeans.input.safeParse({ hypothesis: "non-inferiority", sides: 2, delta: 0, sd: 1 });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join("."));
    expect(paths).toContain("margin");
    expect(paths).toContain("sides");
  });
  it("the example computes and its question names the numbers", () => {
    const input = twoMeans.input.parse(twoMeans.example);
    const r = twoMeans.compute(input);
    expect(r.n1).toBeGreaterThan(0);
    expect(twoMeans.question(input)).toContain(String(input.delta));
  });
});

describe("two-means: input bounds", () => {
  it("refuses a standard deviation so small that the standard error underflows (found by the hostile-input test)", () => {
    expect(twoMeans.input.safeParse({ delta: 5e-324, sd: 5e-324 }).success).toBe(false);
    expect(twoMeans.input.safeParse({ delta: 4, sd: 5e-324 }).success).toBe(false);
  });
  it("keeps a two-sided power within [0, 1] when the two tails sum past 1 by rounding (found by the degenerate-input audit)", () => {
    // A probability cannot exceed 1 (definition, no source needed): before the fix this target gave power 1.000000000001.
    const r = solve({ delta: 4, sd: 9, alpha: 0.05, power: 0.999999999999999 });
    expect(r.power).toBeLessThanOrEqual(1);
    for (const [, p] of r.powerCurve) expect(p).toBeLessThanOrEqual(1);
  });
  it("refuses an alpha below 1e-6, whose quantiles are beyond double precision, naming alpha (found by the degenerate-input audit)", () => {
    const bad = twoMeans.input.safeParse({ delta: 4, sd: 9, alpha: 1e-300 });
    expect(bad.error?.issues.map((i) => i.path.join("."))).toEqual(["alpha"]);
    expect(bad.error?.issues[0]?.message).toMatch(/at least 0\.000001/);
    expect(twoMeans.input.safeParse({ delta: 4, sd: 9, alpha: 1e-6, power: 0.9 }).success).toBe(true);
  });
  it("refuses a difference of more than 100 standard deviations, naming delta", () => {
    const bad = twoMeans.input.safeParse({ delta: 1000, sd: 1 });
    expect(bad.error?.issues.map((i) => i.path.join("."))).toContain("delta");
  });
});

describe("two-means: precision at the edges (found by the compute-budget audit)", () => {
  // (z_0.975 + z_0.8) √(2/n) = (1.959964 + 0.841621) × √(2/100000) = 0.01252907 SD (handbook formula,
  // standard normal table); on 199,998 degrees of freedom the t test's answer lies within 1e-5 of it.
  const normalTheory = 0.012529069984918345;
  it("resolves the detectable difference in standard errors, so an SD of 1e-9 gives the same standardized answer as an SD of 1", () => {
    // Before the fix the search stopped at an absolute 1e-10: with SD 1e-9 it answered 0.087 SD, where power is 1.
    for (const sd of [1e-9, 1, 1e9]) {
      const r = solve({ solveFor: "difference", sd, n1: 100000, n2: 100000, power: 0.8 });
      expectClose(r.delta / sd, normalTheory, 1e-5, { sd }, "relative");
      expectClose(r.power, 0.8, 1e-8, { sd });
    }
  });
  it("keeps the exact equivalence power within [0, 1] when the quadrature's error passes 1", () => {
    // Margin 0.05 is 11.2 standard errors at 100,000 per arm, so power is 1 - 2Φ(-(11.18 - 1.645)) = 1 to 1e-20
    // (normal theory); before the fix the quadrature gave 1.00000000024.
    const input = twoMeans.input.parse({ solveFor: "power", hypothesis: "equivalence", sides: 1, delta: 0, sd: 1, margin: 0.05, n1: 100000, n2: 100000 });
    const power = twoMeansPower(input, { n1: 100000, n2: 100000 }, 0);
    expect(power).toBeLessThanOrEqual(1);
    expectClose(power, 1, 1e-9, { margin: 0.05 });
  });
});

describe("two-means: normalization", () => {
  it("sides defaults to 2 for superiority and 1 for non-inferiority and equivalence", () => {
    expect(twoMeans.input.parse({ delta: 1, sd: 1 }).sides).toBe(2);
    expect(twoMeans.input.parse({ hypothesis: "non-inferiority", delta: 0, margin: 1, sd: 1 }).sides).toBe(1);
  });
});
