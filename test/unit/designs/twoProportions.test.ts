// The two-proportions design against R base stats (fixtures written by
// test/fixtures/two-proportions/generate.R, tolerances stated in each file),
// a handbook value, and a seeded Monte Carlo of Fisher's exact test.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { documentChart, documentFact, documentTable, tableCell } from "../../support/documentBlocks.js";
import { schemaIssues } from "../../support/validation.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { EXACT_SEARCH_MAX_PER_ARM, twoProportions, twoProportionsDesignPower } from "../../../src/designs/twoProportions.js";
import { inflateArms, scanSampleSizes } from "../../../src/designs/shared/sizing.js";
import {
  restrictedRates, twoProportionsControlSize, twoProportionsPowerNormal,
} from "../../../src/designs/shared/twoProportionsPower.js";
import { fisherExactPValue, fisherExactPower } from "../../../src/stats/fisherExact.js";
import { createRandom } from "../../../src/stats/random.js";

const parse = (inputs: Record<string, unknown>) => twoProportions.input.parse(inputs);
const compute = (inputs: Record<string, unknown>) => twoProportions.compute(parse(inputs));

const issuesOf = (inputs: Record<string, unknown>) => schemaIssues(twoProportions.input, inputs);

describe("normal approximation against R stats::power.prop.test", () => {
  const f = loadFixture<{ p1: number; p2: number; alpha: number; sides: 1 | 2; power: number; nR: number; powerAtCeiling: number; powerBelow: number }>(
    "two-proportions/power-prop-test.json");
  it("power at a given n matches power.prop.test(strict = TRUE)", () => {
    for (const c of f.cases) {
      const test = { hypothesis: "superiority" as const, sides: c.sides, alpha: c.alpha };
      const n = Math.ceil(c.nR);
      expectClose(twoProportionsPowerNormal(c.p1, c.p2, { n1: n, n2: n }, test, false), c.powerAtCeiling, f.tolerance, c);
      expectClose(twoProportionsPowerNormal(c.p1, c.p2, { n1: n - 1, n2: n - 1 }, test, false), c.powerBelow, f.tolerance, c);
    }
  });
  it("the sample size per arm is power.prop.test's n rounded up", () => {
    for (const c of f.cases) {
      const r = compute({ p1: c.p1, p2: c.p2, alpha: c.alpha, sides: c.sides, power: c.power, method: "normal" });
      expect(r.n1, JSON.stringify(c)).toBe(Math.ceil(c.nR));
      expect(r.n2).toBe(r.n1);
    }
  });
  it("the detectable experimental rate matches power.prop.test solving for p2", () => {
    const g = loadFixture<{ p1: number; n: number; power: number; p2: number }>("two-proportions/power-prop-test-p2.json");
    for (const c of g.cases) {
      const r = compute({ solveFor: "difference", p1: c.p1, n1: c.n, n2: c.n, power: c.power, alpha: 0.05 });
      expectClose(r.p2, c.p2, g.tolerance, c);
    }
  });
});

describe("normal approximation at unequal arms, with continuity correction, and non-inferiority (R, from the definition)", () => {
  const f = loadFixture<{ p1: number; p2: number; n1: number; n2: number; alpha: number; sides: 1 | 2; margin: number; cc: number; power: number; r1: number; r2: number }>(
    "two-proportions/normal-power.json");
  it("rates restricted to the null boundary match R's likelihood maximization (Farrington & Manning 1990)", () => {
    for (const c of f.cases) {
      const [r1, r2] = restrictedRates(c.p1, c.n1, c.p2, c.n2, -c.margin);
      expectClose(r1, c.r1, 1e-8, c);
      expectClose(r2, c.r2, 1e-8, c);
    }
  });
  it("power matches", () => {
    for (const c of f.cases) {
      const test = { hypothesis: c.margin > 0 ? "non-inferiority" as const : "superiority" as const, sides: c.sides, alpha: c.alpha, margin: c.margin };
      expectClose(twoProportionsPowerNormal(c.p1, c.p2, { n1: c.n1, n2: c.n2 }, test, c.cc === 1), c.power, f.tolerance, c);
    }
  });
});

describe("continuity correction (Fleiss, Tytun & Ury 1980)", () => {
  it("0.40 against 0.60, two-sided 0.05, power 0.80 needs 97 per arm uncorrected and 107 corrected", () => {
    // From memory of the sample-size table for two proportions in Fleiss (1981,
    // 2nd ed., Table A.3; Fleiss, Levin & Paik 2003, appendix table): 107 per
    // group with the correction. The uncorrected 97 is eq. 4.14 of Fleiss,
    // Levin & Paik (2003); both are confirmed by the R formula in
    // continuity-corrected-size.json (96.9 and 106.7).
    expect(compute({ p1: 0.4, p2: 0.6, method: "normal" }).n1).toBe(97);
    expect(compute({ p1: 0.4, p2: 0.6, method: "normal-corrected" }).n1).toBe(107);
  });
  it("closed forms and the design's sizes match the R formulas", () => {
    const f = loadFixture<{ p1: number; p2: number; alpha: number; sides: 1 | 2; power: number; k: number; n: number; nCorrected: number }>(
      "two-proportions/continuity-corrected-size.json");
    for (const c of f.cases) {
      const test = { hypothesis: "superiority" as const, sides: c.sides, alpha: c.alpha };
      expectClose(twoProportionsControlSize(c.p1, c.p2, test, c.k, c.power, false), c.n, f.tolerance, c, "relative");
      expectClose(twoProportionsControlSize(c.p1, c.p2, test, c.k, c.power, true), c.nCorrected, f.tolerance, c, "relative");
      // The design searches the power function, which the correction formula inverts.
      const r = compute({ p1: c.p1, p2: c.p2, alpha: c.alpha, sides: c.sides, power: c.power, allocationRatio: c.k, method: "normal-corrected" });
      expect(r.n1, JSON.stringify(c)).toBe(Math.ceil(c.nCorrected));
    }
  });
});

describe("Fisher's exact test", () => {
  it("p-values match R stats::fisher.test", () => {
    const f = loadFixture<{ x1: number; n1: number; x2: number; n2: number; twoSided: number; greater: number }>("two-proportions/fisher-exact-p-values.json");
    for (const c of f.cases) {
      expectClose(fisherExactPValue(c.x1, c.n1, c.x2, c.n2, "two-sided"), c.twoSided, f.tolerance, c, "relative");
      expectClose(fisherExactPValue(c.x1, c.n1, c.x2, c.n2, "greater"), c.greater, f.tolerance, c, "relative");
    }
  });
  it("exact power matches R's brute-force enumeration with fisher.test at small n", () => {
    const f = loadFixture<{ n1: number; n2: number; p1: number; p2: number; alpha: number; alternative: "greater" | "two-sided"; power: number }>(
      "two-proportions/fisher-exact-power.json");
    for (const c of f.cases) expectClose(fisherExactPower(c.n1, c.n2, c.p1, c.p2, c.alpha, c.alternative), c.power, f.tolerance, c);
  });
  it("exact power equals the sum over every table the direct p-value rejects, at small and large alpha", () => {
    // The direct p-value is checked against R above; this covers levels and shapes the R fixture does not.
    const binomialPmf = (x: number, n: number, p: number): number => {
      let c = 1;
      for (let i = 0; i < x; i++) c = (c * (n - i)) / (i + 1);
      return c * p ** x * (1 - p) ** (n - x);
    };
    for (const [n1, n2, p1, p2, alpha] of [[20, 35, 0.15, 0.5, 0.001], [33, 17, 0.6, 0.95, 0.2], [40, 40, 0.4, 0.55, 0.01], [3, 30, 0.2, 0.9, 0.05]] as const) {
      for (const alternative of ["two-sided", "greater"] as const) {
        let brute = 0;
        for (let x1 = 0; x1 <= n1; x1++) {
          for (let x2 = 0; x2 <= n2; x2++) {
            if (fisherExactPValue(x1, n1, x2, n2, alternative) <= alpha) brute += binomialPmf(x1, n1, p1) * binomialPmf(x2, n2, p2);
          }
        }
        expectClose(fisherExactPower(n1, n2, p1, p2, alpha, alternative), brute, 1e-11, { n1, n2, p1, p2, alpha, alternative });
      }
    }
  });
  it("exact power agrees with a seeded Monte Carlo of the same test (common practice: 4 standard errors)", () => {
    const random = createRandom(20261201);
    const binomial = (n: number, p: number): number => { let x = 0; for (let i = 0; i < n; i++) if (random.bernoulli(p)) x++; return x; };
    const settings = [
      { n1: 25, n2: 30, p1: 0.3, p2: 0.6, alpha: 0.05, alternative: "two-sided" as const },
      { n1: 40, n2: 20, p1: 0.2, p2: 0.45, alpha: 0.025, alternative: "greater" as const },
    ];
    const replicates = 4000;
    for (const s of settings) {
      let rejected = 0;
      for (let r = 0; r < replicates; r++) {
        if (fisherExactPValue(binomial(s.n1, s.p1), s.n1, binomial(s.n2, s.p2), s.n2, s.alternative) <= s.alpha) rejected++;
      }
      const exact = fisherExactPower(s.n1, s.n2, s.p1, s.p2, s.alpha, s.alternative);
      const se = Math.sqrt((exact * (1 - exact)) / replicates);
      expectClose(rejected / replicates, exact, 4 * se, { ...s, replicates });
    }
  });
  it("the size of the test never exceeds alpha (Fisher's test is conservative)", () => {
    for (const p of [0.1, 0.3, 0.5, 0.8]) {
      expect(fisherExactPower(30, 45, p, p, 0.05, "two-sided")).toBeLessThanOrEqual(0.05);
      expect(fisherExactPower(30, 45, p, p, 0.05, "greater")).toBeLessThanOrEqual(0.05);
    }
  });
});

describe("exact sample-size scan", () => {
  const input = parse({ p1: 0.35, p2: 0.55, method: "fisher-exact" });
  const r = twoProportions.compute(input);
  const e = r.exactSearch!;
  const powerAt = (n: number): number => fisherExactPower(n, n, 0.35, 0.55, 0.05, "two-sided");
  it("reports the first size reaching the target and the size from which every larger one does", () => {
    expect(powerAt(e.firstN1)).toBeGreaterThanOrEqual(0.8);
    for (let n = 2; n < e.firstN1; n++) expect(powerAt(n)).toBeLessThan(0.8);
    // Power is not monotone here: the first size is followed by a dip.
    expect(e.stableN1!).toBeGreaterThan(e.firstN1);
    expect(powerAt(e.stableN1! - 1)).toBeLessThan(0.8);
    for (let n = e.stableN1!; n <= e.boundN1; n += 7) expect(powerAt(n)).toBeGreaterThanOrEqual(0.8);
    expect(e.boundN1).toBe(2 * e.firstN1);
    expect([r.n1, r.n2]).toEqual([e.stableN1, e.stableN2]);
  });
  it("needs more participants than the normal approximation, as a conservative test must", () => {
    expect(r.n1).toBeGreaterThan(compute({ p1: 0.35, p2: 0.55, method: "normal" }).n1);
  });
  it("is infeasible beyond the stated bound, naming it", () => {
    try {
      compute({ p1: 0.5, p2: 0.55, method: "fisher-exact" });
      expect.fail("expected an infeasible design");
    } catch (error) {
      expect(error).toBeInstanceOf(InfeasibleDesignError);
      expect((error as InfeasibleDesignError).details.bound).toBe(EXACT_SEARCH_MAX_PER_ARM);
      expect((error as Error).message).toContain(String(EXACT_SEARCH_MAX_PER_ARM));
    }
  });
});

describe("exact sample-size search, its power curve and the normal curve beside it, against an R scan (dhyper and dbinom enumeration, power.prop.test)", () => {
  type Design = { p1: number; p2: number; betterWhen: string; alpha: number; sides: 1 | 2; power: number; allocationRatio: number };
  const search = loadFixture<Design & { firstN1: number; firstN2: number; firstPower: number; stableN1: number | null; stableN2: number | null; stablePower: number | null; boundN1: number }>("two-proportions/exact-search.json");
  const scan = loadFixture<Design & { n1: number; n2: number; exactPower: number; normalPower: number }>("two-proportions/exact-scan.json");
  const designOf = (c: Design) => ({ p1: c.p1, p2: c.p2, betterWhen: c.betterWhen, alpha: c.alpha, sides: c.sides, power: c.power, allocationRatio: c.allocationRatio, method: "fisher-exact" });
  const computed = search.cases.map((c) => {
    const input = parse(designOf(c));
    const result = twoProportions.compute(input);
    const rows = scan.cases.filter((s) => JSON.stringify(designOf(s)) === JSON.stringify(designOf(c)));
    return { c, input, result, rows };
  });

  it("covers a saw-tooth (the stable size past the first), unequal allocation both ways and an event outcome", () => {
    expect(search.cases.some((c) => c.stableN1 !== null && c.stableN1 > c.firstN1)).toBe(true);
    expect(search.cases.some((c) => c.allocationRatio > 1) && search.cases.some((c) => c.allocationRatio < 1)).toBe(true);
    expect(search.cases.some((c) => c.betterWhen === "lower")).toBe(true);
  });
  it("firstPower and stablePower, the sizes and the bound match, in the result and in the printed table", () => {
    for (const { c, input, result } of computed) {
      const e = result.exactSearch!;
      expect([e.firstN1, e.firstN2, e.stableN1, e.stableN2, e.boundN1], JSON.stringify(c)).toEqual([c.firstN1, c.firstN2, c.stableN1, c.stableN2, c.boundN1]);
      expectClose(e.firstPower, c.firstPower, search.tolerance, c);
      expectClose(e.stablePower!, c.stablePower!, search.tolerance, c);
      expectClose(result.power, c.stablePower!, search.tolerance, c);
      const table = documentTable(twoProportions.document(input, result), "exact-search");
      expectClose(tableCell(table, "Smallest reaching the target", "power") as number, c.firstPower, search.tolerance, c);
      expectClose(tableCell(table, `Smallest from which every size up to ${c.boundN1} control reaches it`, "power") as number, c.stablePower!, search.tolerance, c);
    }
  });
  it("every point of the exact power curve and of the normal-approximation curve beside it matches R at its sizes", () => {
    for (const { c, input, result, rows } of computed) {
      expect(rows.at(-1)!.n1, JSON.stringify(c)).toBe(c.boundN1);
      const byTotal = new Map(rows.map((r) => [r.n1 + r.n2, r]));
      const normal = result.normalPowerCurve!;
      expect(normal.map(([total]) => total)).toEqual(result.powerCurve.map(([total]) => total));
      expect(result.powerCurve.at(-1)![0]).toBe(c.boundN1 + rows.at(-1)!.n2);
      result.powerCurve.forEach(([total, power], i) => {
        const row = byTotal.get(total)!;
        expect(row, `${JSON.stringify(c)} total ${total}`).toBeDefined();
        if (i > 0) expect(row.n1).toBe(byTotal.get(result.powerCurve[i - 1]![0])!.n1 + 1);
        expectClose(power, row.exactPower, scan.tolerance, row);
        expectClose(normal[i]![1], row.normalPower, scan.tolerance, row);
      });
      const chart = documentChart(twoProportions.document(input, result), "power-curve");
      expect(chart.series.find((s) => s.name === "Normal approximation")!.points).toEqual(normal);
    }
  });
});

describe("the printed critical value against R qnorm", () => {
  it("two-sided, one-sided and non-inferiority for both normal methods; none for Fisher's exact test", () => {
    const f = loadFixture<{ hypothesis: string; sides: 1 | 2; alpha: number; method: string; margin?: number; criticalValue: number | null }>("two-proportions/critical-values.json");
    for (const c of f.cases) {
      const { criticalValue, ...test } = c;
      const input = parse({ ...test, solveFor: "power", p1: 0.6, p2: 0.7, n1: 40, n2: 50 });
      const r = twoProportions.compute(input);
      const fact = documentFact(twoProportions.document(input, r), "Critical value");
      if (criticalValue === null) {
        expect(r.criticalValue, JSON.stringify(c)).toBeNull();
        expect(fact).toBeUndefined();
        continue;
      }
      expectClose(r.criticalValue!, criticalValue, f.tolerance, c, "relative");
      expectClose(fact!.value as number, criticalValue, f.tolerance, c, "relative");
    }
  });
});

describe("design conventions", () => {
  it("an event outcome (lower is better) is the mirror of a response outcome (common practice: symmetry of 1 - p)", () => {
    for (const method of ["normal", "normal-corrected", "fisher-exact"]) {
      const events = compute({ p1: 0.25, p2: 0.1, betterWhen: "lower", method, sides: 1, alpha: 0.025 });
      const responses = compute({ p1: 0.75, p2: 0.9, betterWhen: "higher", method, sides: 1, alpha: 0.025 });
      expect(events.n1).toBe(responses.n1);
      expectClose(events.power, responses.power, 1e-12, { method });
    }
  });
  it("unequal allocation follows n2 = ceil(k n1), and dropout inflates each arm", () => {
    const r = compute({ p1: 0.3, p2: 0.45, allocationRatio: 1.5, dropout: 0.15 });
    expect(r.n2).toBe(Math.ceil(1.5 * r.n1));
    expect(r.enrolled1).toBe(Math.ceil(r.n1 / 0.85));
    expect(r.enrolled2).toBe(Math.ceil(r.n2 / 0.85));
  });
  it("solving for power returns the power of the given arms", () => {
    const r = compute({ solveFor: "power", p1: 0.4, p2: 0.6, n1: 97, n2: 97 });
    expectClose(r.power, twoProportionsDesignPower(parse({ p1: 0.4, p2: 0.6 }), { n1: 97, n2: 97 }, 0.6), 1e-15, {});
  });
  it("non-inferiority with equal true rates: power rises with the margin", () => {
    const narrow = compute({ hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: 0.08, alpha: 0.025 });
    const wide = compute({ hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: 0.12, alpha: 0.025 });
    expect(wide.n1).toBeLessThan(narrow.n1);
    expect(narrow.power).toBeGreaterThanOrEqual(0.8);
  });
  it("the example parses, computes, and its report carries a power curve and a protocol paragraph", () => {
    const input = parse(twoProportions.example);
    const r = twoProportions.compute(input);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    const sections = twoProportions.document(input, r);
    const blocks = sections.flatMap((s) => s.blocks);
    expect(blocks.some((b) => b.kind === "chart" && b.chart.id === "power-curve" && b.chart.series[0]!.points.length > 10)).toBe(true);
    const protocol = blocks.find((b) => b.kind === "protocol");
    expect(protocol && protocol.kind === "protocol" && protocol.text).toContain(String(r.n1));
  });
});

describe("validation: a field path and a sentence for each bad input", () => {
  it("a proportion outside (0, 1)", () => {
    expect(issuesOf({ p1: 1.2, p2: 0.5 }).map((i) => i.path)).toContain("p1");
    expect(issuesOf({ p1: 0.3, p2: 0 }).map((i) => i.path)).toContain("p2");
  });
  it("a margin of the wrong sign", () => {
    const issue = issuesOf({ hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: -0.1, alpha: 0.025 }).find((i) => i.path === "margin");
    expect(issue?.message).toMatch(/positive/);
  });
  it("power at or below alpha", () => {
    expect(issuesOf({ p1: 0.3, p2: 0.5, power: 0.04, alpha: 0.05 }).find((i) => i.path === "power")?.message).toMatch(/exceed alpha/);
  });
  it("rules that depend on the hypothesis and the method", () => {
    expect(issuesOf({ hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: 0.1, sides: 2 }).map((i) => i.path)).toContain("sides");
    expect(issuesOf({ hypothesis: "non-inferiority", p1: 0.8, p2: 0.8, margin: 0.1, method: "fisher-exact", sides: 1 }).map((i) => i.path)).toContain("method");
    expect(issuesOf({ p1: 0.3, p2: 0.3 }).map((i) => i.path)).toContain("p2");
    expect(issuesOf({ p1: 0.3, p2: 0.2, sides: 1 }).map((i) => i.path)).toContain("p2");
    expect(issuesOf({ hypothesis: "non-inferiority", p1: 0.8, p2: 0.65, margin: 0.1, sides: 1 }).map((i) => i.path)).toContain("p2");
    expect(issuesOf({ hypothesis: "non-inferiority", p1: 0.05, p2: 0.05, margin: 0.1, sides: 1 }).map((i) => i.path)).toContain("margin");
    expect(issuesOf({ solveFor: "power", p1: 0.3, p2: 0.5, n1: 1200, n2: 1200, method: "fisher-exact" }).map((i) => i.path)).toContain("n1");
  });
});

describe("shared sizing: the saw-tooth scan and the inflation hook (common practice, no source)", () => {
  // A made-up power function rising with n but dipping below 0.8 at n1 = 23 and 31 after first reaching it at 20.
  const powerOf = (n1: number): number => Math.min(0.99, 0.3 + n1 / 40 - ([23, 31].includes(n1) ? 0.3 : 0));
  const scan = (maximum: number) => scanSampleSizes({
    powerAt: (arms) => powerOf(arms.n1), target: 0.8, allocationRatio: 1.5, minimum: 2, maximum, stabilityMultiple: 2,
  });
  it("finds the first size, the stable size and the bound", () => {
    const r = scan(500);
    expect(r.first.n1).toBe(20);
    expect(r.stable?.n1).toBe(32);
    expect(r.stable?.n2).toBe(48);
    expect(r.bound).toBe(40);
    expect(r.powers.at(-1)![0]).toBe(40);
  });
  it("caps the bound at the maximum, and reports no stable size when the bound itself falls short", () => {
    expect(scan(31).stable).toBeNull();
    expect(scan(31).bound).toBe(31);
  });
  it("throws an infeasible design naming the maximum when nothing reaches the target", () => {
    expect(() => scan(19)).toThrow(InfeasibleDesignError);
    try { scan(19); } catch (error) { expect((error as InfeasibleDesignError).details.bound).toBe(19); }
  });
  it("inflates the control arm by a factor and rebuilds the experimental arm from the ratio", () => {
    expect(inflateArms({ n1: 100, n2: 150 }, 1, 1.5)).toEqual({ n1: 100, n2: 150 });
    expect(inflateArms({ n1: 100, n2: 150 }, 1.1, 1.5)).toEqual({ n1: 110, n2: 165 });
    expect(inflateArms({ n1: 97, n2: 97 }, 1.0158, 1)).toEqual({ n1: 99, n2: 99 });
  });
});
