// The AB/BA crossover against R base stats (fixtures written by
// test/fixtures/crossover-2x2/generate.R, tolerances stated in each file) and
// the normal-theory formula n = 2σw²(z_{1-α/2} + z_{1-β})²/δ² (Julious 2004, §4.1).
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { documentFact } from "../../support/documentBlocks.js";
import { schemaIssues } from "../../support/validation.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { crossover2x2, crossoverPower, crossoverStandardError } from "../../../src/designs/crossover2x2.js";
import { normalQuantile } from "../../../src/stats/normal.js";

const parse = (inputs: Record<string, unknown>) => crossover2x2.input.parse(inputs);
const compute = (inputs: Record<string, unknown>) => crossover2x2.compute(parse(inputs));

const issuesOf = (inputs: Record<string, unknown>) => schemaIssues(crossover2x2.input, inputs);

describe("exact t against R pt with ncp", () => {
  it("power at given sequence sizes", () => {
    const f = loadFixture<{ n1: number; n2: number; delta: number; sw: number; alpha: number; sides: 1 | 2; margin: number; power: number }>("crossover-2x2/exact-t-power.json");
    for (const c of f.cases) {
      const test = { hypothesis: c.margin > 0 ? "non-inferiority" as const : "superiority" as const, sides: c.sides, alpha: c.alpha, margin: c.margin, method: "exact-t" as const };
      expectClose(crossoverPower(test, c.sw, { n1: c.n1, n2: c.n2 }, c.delta), c.power, f.tolerance, c);
    }
  });
  it("smallest balanced size per sequence, and its power", () => {
    const f = loadFixture<{ ratio: number; alpha: number; power: number; sides: 1 | 2; perSequence: number; powerAtSize: number }>("crossover-2x2/exact-t-size.json");
    for (const c of f.cases) {
      const r = compute({ delta: c.ratio, withinSubjectSd: 1, alpha: c.alpha, power: c.power, sides: c.sides });
      expect([r.n1, r.n2], JSON.stringify(c)).toEqual([c.perSequence, c.perSequence]);
      expectClose(r.power, c.powerAtSize, f.tolerance, c);
    }
  });
});

describe("the printed critical value and its degrees of freedom against R qt and qnorm", () => {
  it("at given sequence sizes for each hypothesis and method, and at the balanced sizes R finds", () => {
    const f = loadFixture<{ solveFor: "power" | "sample-size"; hypothesis: string; sides: 1 | 2; alpha: number; method: string; margin: number; n1: number; n2: number; criticalValue: number; degreesOfFreedom: number | null; ratio?: number; power?: number }>("crossover-2x2/critical-values.json");
    expect(new Set(f.cases.map((c) => `${c.solveFor} ${c.method} ${c.hypothesis}`)).size).toBe(5);
    for (const c of f.cases) {
      const test = { hypothesis: c.hypothesis, sides: c.sides, alpha: c.alpha, method: c.method, ...(c.margin > 0 ? { margin: c.margin } : {}) };
      const input = parse(c.solveFor === "power"
        ? { ...test, solveFor: "power", n1: c.n1, n2: c.n2, delta: 1, withinSubjectSd: 2 }
        : { ...test, delta: c.ratio, withinSubjectSd: 1, power: c.power });
      const r = crossover2x2.compute(input);
      expect([r.n1, r.n2], JSON.stringify(c)).toEqual([c.n1, c.n2]);
      expectClose(r.criticalValue, c.criticalValue, f.tolerance, c, "relative");
      expect(r.degreesOfFreedom, JSON.stringify(c)).toBe(c.degreesOfFreedom);
      const fact = documentFact(crossover2x2.document(input, r), "Critical value")!;
      expectClose(fact.value as number, c.criticalValue, f.tolerance, c, "relative");
      expect(fact.note, JSON.stringify(c)).toBe(c.degreesOfFreedom === null ? "standard normal" : `t on ${c.degreesOfFreedom} degrees of freedom`);
    }
  });
});

describe("normal approximation against the normal-theory formula", () => {
  const f = loadFixture<{ ratio: number; alpha: number; power: number; sides: 1 | 2; total: number }>("crossover-2x2/normal-size.json");
  it("the closed form computed in R matches 2σw²(z + z)²/δ² computed here", () => {
    for (const c of f.cases) {
      const z = normalQuantile(1 - c.alpha / c.sides) + normalQuantile(c.power);
      expectClose((2 * z * z) / (c.ratio * c.ratio), c.total, f.tolerance, c, "relative");
    }
  });
  it("the design's total is the formula's rounded up to two equal sequences", () => {
    for (const c of f.cases) {
      const r = compute({ delta: c.ratio, withinSubjectSd: 1, alpha: c.alpha, power: c.power, sides: c.sides, method: "normal" });
      expect(r.total, JSON.stringify(c)).toBe(2 * Math.ceil(c.total / 2));
    }
  });
  it("exact t needs at least as many subjects as the normal approximation", () => {
    for (const c of f.cases) {
      const inputs = { delta: c.ratio, withinSubjectSd: 1, alpha: c.alpha, power: c.power, sides: c.sides };
      expect(compute(inputs).total).toBeGreaterThanOrEqual(compute({ ...inputs, method: "normal" }).total);
    }
  });
});

describe("variance convention", () => {
  it("SE of the period-adjusted difference is σw √(2/n) for n split evenly (Jones & Kenward 2014, §2.3)", () => {
    expectClose(crossoverStandardError(10, { n1: 15, n2: 15 }), 10 * Math.sqrt(2 / 30), 1e-14, {});
  });
  it("a crossover needs a quarter of the subjects of a parallel trial whose SD equals σw (common practice, no source)", () => {
    // Parallel groups, normal theory: 4σ²(z + z)²/δ² in total; crossover: 2σw²(z + z)²/δ².
    const r = compute({ delta: 0.25, withinSubjectSd: 1, method: "normal", power: 0.8 });
    const z = normalQuantile(0.975) + normalQuantile(0.8);
    const parallelTotal = (4 * z * z) / 0.0625;
    expect(Math.abs(r.total - parallelTotal / 2)).toBeLessThanOrEqual(2);
  });
});

describe("design", () => {
  it("solving for the difference inverts the power", () => {
    const r = compute({ solveFor: "difference", n1: 12, n2: 11, withinSubjectSd: 4, power: 0.85 });
    const back = compute({ solveFor: "power", n1: 12, n2: 11, withinSubjectSd: 4, delta: r.delta });
    expectClose(back.power, 0.85, 1e-8, { delta: r.delta });
  });
  it("dropout inflates each sequence", () => {
    const r = compute({ delta: 3, withinSubjectSd: 5, dropout: 0.2 });
    expect(r.enrolled1).toBe(Math.ceil(r.n1 / 0.8));
    expect(r.enrolledTotal).toBe(r.enrolled1 + r.enrolled2);
  });
  it("the report states the variance convention and that the washout must rule out carryover", () => {
    const input = parse(crossover2x2.example);
    const r = crossover2x2.compute(input);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    const text = JSON.stringify(crossover2x2.document(input, r));
    expect(text).toMatch(/washout/i);
    expect(text).toMatch(/carryover/);
    expect(text).toMatch(/within-subject standard deviation/);
    expect(crossover2x2.cautions.join(" ")).toMatch(/carryover/);
  });
  it("is infeasible when no size up to the bound reaches the power, naming it", () => {
    try {
      compute({ delta: 0.001, withinSubjectSd: 10, power: 0.99 });
      expect.fail("expected an infeasible design");
    } catch (error) {
      expect(error).toBeInstanceOf(InfeasibleDesignError);
      expect((error as InfeasibleDesignError).details.bound).toBe(100000);
    }
  });
});

describe("validation", () => {
  it("names the field with a sentence", () => {
    expect(issuesOf({ delta: 2, withinSubjectSd: 0 }).map((i) => i.path)).toContain("withinSubjectSd");
    expect(issuesOf({ hypothesis: "non-inferiority", delta: 0, withinSubjectSd: 3, margin: -1, sides: 1 }).find((i) => i.path === "margin")?.message).toMatch(/positive/);
    expect(issuesOf({ delta: 2, withinSubjectSd: 3, power: 0.04, alpha: 0.05 }).find((i) => i.path === "power")?.message).toMatch(/exceed alpha/);
    expect(issuesOf({ delta: -2, withinSubjectSd: 3, sides: 1 }).map((i) => i.path)).toContain("delta");
    expect(issuesOf({ hypothesis: "non-inferiority", delta: -3, margin: 2, withinSubjectSd: 3, sides: 1 }).map((i) => i.path)).toContain("delta");
    expect(issuesOf({ solveFor: "power", delta: 2, withinSubjectSd: 3 }).map((i) => i.path)).toEqual(expect.arrayContaining(["n1", "n2"]));
    // Both sequences are randomized equally: an allocation ratio is an unknown field.
    const unknown = crossover2x2.input.safeParse({ delta: 2, withinSubjectSd: 3, allocationRatio: 2 });
    expect(unknown.success ? [] : unknown.error.issues.flatMap((i) => (i.code === "unrecognized_keys" ? i.keys : []))).toContain("allocationRatio");
  });
});

describe("degenerate inputs", () => {
  it("resolves the detectable difference in standard errors, so a within-subject SD of 1e-9 gives the same standardized answer as 1 (found by the compute-budget audit)", () => {
    // (z_0.975 + z_0.8) σw √((1/n1 + 1/n2)/2) = 2.801585 × √(1/100000) = 0.00885939 σw (handbook formula, standard
    // normal table); on 199,998 degrees of freedom the t test is within 1e-5 of it. Before the fix the search
    // stopped at an absolute 1e-10, which with σw = 1e-9 answered 0.054 σw, where power is 1.
    for (const sd of [1e-9, 1, 1e9]) {
      const r = compute({ solveFor: "difference", withinSubjectSd: sd, n1: 100000, n2: 100000, power: 0.8 });
      expectClose(r.delta / sd, 0.008859390348296596, 1e-5, { sd }, "relative");
      expectClose(r.power, 0.8, 1e-8, { sd });
    }
  });
  it("refuses a within-subject SD below 1e-9, where the standard error underflows and power became NaN (found by the degenerate-input audit)", () => {
    expect(issuesOf({ delta: 1e-15, withinSubjectSd: 5e-324 }).find((i) => i.path === "withinSubjectSd")?.message).toMatch(/at least 1e-9/);
    expect(crossover2x2.input.safeParse({ delta: 1e-8, withinSubjectSd: 1e-9 }).success).toBe(true);
  });
  it("refuses a difference or margin of more than 100 within-subject SDs, naming the field (found by the degenerate-input audit)", () => {
    expect(issuesOf({ delta: 1e9, withinSubjectSd: 1 }).map((i) => i.path)).toEqual(["delta"]);
    expect(issuesOf({ hypothesis: "non-inferiority", delta: 0, margin: 1e9, withinSubjectSd: 1, sides: 1 }).map((i) => i.path)).toEqual(["margin"]);
  });
  it("keeps a two-sided power within [0, 1] when the two tails sum past 1 by rounding (found by the degenerate-input audit)", () => {
    // A probability cannot exceed 1 (definition): before the fix this gave power 1.000000000002.
    const r = compute({ delta: 6, withinSubjectSd: 10, alpha: 1e-6, power: 0.999999999999999 });
    expect(r.power).toBeLessThanOrEqual(1);
    for (const [, p] of [...r.powerCurve, ...r.effectCurve]) expect(p).toBeLessThanOrEqual(1);
  });
});
