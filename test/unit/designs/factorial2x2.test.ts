// factorial-2x2 against handbook formulas and R base stats fixtures
// (test/fixtures/factorial-2x2/generate.R).
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { documentTable, tableCell } from "../../support/documentBlocks.js";
import { factorial2x2 } from "../../../src/designs/factorial2x2.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";

const parse = (inputs: Record<string, unknown>) => factorial2x2.input.parse(inputs);
const solve = (inputs: Record<string, unknown>) => factorial2x2.compute(parse(inputs));

type SizeCase = {
  alpha: number; power: number; sides: 1 | 2; multiplicity: string;
  requiredA: number; requiredB: number; nPerCell: number; powerA: number; powerB: number;
  interactionPerCell: number; interactionPower: number;
};

function checkSizes(c: SizeCase, inputs: Record<string, unknown>, tolerance: number): void {
  const r = solve(inputs);
  const [a, b] = r.mainEffects;
  expect([a!.requiredPerCell, b!.requiredPerCell, r.nPerCell, r.interaction.requiredPerCell], JSON.stringify(c))
    .toEqual([c.requiredA, c.requiredB, c.nPerCell, c.interactionPerCell]);
  expectClose(a!.power, c.powerA, tolerance, c);
  expectClose(b!.power, c.powerB, tolerance, c);
  expectClose(r.interaction.power, c.interactionPower, tolerance, c);
}

describe("factorial-2x2: handbook facts", () => {
  it("normal method, 0.5 SD main effects, two-sided 0.05, power 0.80: 63 per margin (2(1.96 + 0.8416)²/0.25 = 62.8) so 32 per cell (handbook formula)", () => {
    const r = solve({ sd: 1, effectA: 0.5, effectB: 0.5, method: "normal" });
    expect(r.nPerCell).toBe(32);
    expect(r.total).toBe(128);
  });
  it("an interaction as large as the main effect needs about 4 times the participants: 16(1.96 + 0.8416)²/0.25 = 502.3, so 126 per cell against 32 (variance 4σ²/m against σ²/m; common practice, from memory of Montgomery, Peters & Little 2003)", () => {
    const r = solve({ sd: 1, effectA: 0.5, effectB: 0.5, method: "normal" });
    expect(r.interaction.requiredPerCell).toBe(126);
    expectClose(r.interaction.sizeRatio!, 4, 0.1, {});
  });
  it("a trial sized for main effects has about 29% power for an interaction of the same size: Φ((1.96 + 0.8416)/2 − 1.96) = 0.288 (common practice, no source)", () => {
    const input = parse({ sd: 1, effectA: 0.5, effectB: 0.5, method: "normal", solveFor: "power", nPerCell: 32 });
    const r = factorial2x2.compute(input);
    expectClose(r.interaction.power, 0.293, 0.01, {});
  });
  it("Bonferroni and Holm size each main effect at α/2; Holm's full procedure has more power than its first step", () => {
    const bonferroni = solve({ sd: 1, effectA: 0.5, effectB: 0.5, multiplicity: "bonferroni" });
    const holm = solve({ sd: 1, effectA: 0.5, effectB: 0.5, multiplicity: "holm" });
    expect(holm.nPerCell).toBe(bonferroni.nPerCell);
    expect(holm.mainEffects[0]!.alpha).toBe(0.025);
    expect(holm.mainEffects[0]!.powerUnderHolm!).toBeGreaterThan(holm.mainEffects[0]!.power);
    expect(bonferroni.mainEffects[0]!.powerUnderHolm).toBeNull();
  });
});

describe("factorial-2x2: R base stats fixtures", () => {
  it("means, exact t: main effects from power.t.test on the margins, interaction from the noncentral t on 4m − 4 df", () => {
    const f = loadFixture<SizeCase & { sd: number; effectA: number; effectB: number; detectableMainEffect: number }>("factorial-2x2/means-exact.json");
    expect(f.cases.length).toBeGreaterThan(40);
    for (const c of f.cases) {
      const inputs = { sd: c.sd, effectA: c.effectA, effectB: c.effectB, alpha: c.alpha, power: c.power, sides: c.sides, multiplicity: c.multiplicity };
      checkSizes(c, inputs, f.tolerance);
      expectClose(solve(inputs).detectableMainEffect!, c.detectableMainEffect, f.tolerance, c);
    }
  });
  it("means, normal approximation (pnorm)", () => {
    const f = loadFixture<SizeCase & { sd: number; effectA: number; effectB: number; interaction: number }>("factorial-2x2/means-normal.json");
    for (const c of f.cases) {
      checkSizes(c, { method: "normal", sd: c.sd, effectA: c.effectA, effectB: c.effectB, interaction: c.interaction, alpha: c.alpha, power: c.power, sides: c.sides, multiplicity: c.multiplicity }, f.tolerance);
    }
  });
  it("proportions: main effects from power.prop.test on the margins, interaction by a Wald z test", () => {
    const f = loadFixture<SizeCase & { controlRate: number; rateA: number; rateB: number; interaction: number | null }>("factorial-2x2/proportions.json");
    expect(f.cases.length).toBeGreaterThan(100);
    for (const c of f.cases) {
      checkSizes(c, {
        outcome: "proportions", controlRate: c.controlRate, rateA: c.rateA, rateB: c.rateB,
        ...(c.interaction === null ? {} : { interaction: c.interaction }),
        alpha: c.alpha, power: c.power, sides: c.sides, multiplicity: c.multiplicity,
      }, f.tolerance);
    }
  });
  it("proportions with continuity correction: power on the margins matches the corrected statistic written out in R", () => {
    const f = loadFixture<{ controlRate: number; rateA: number; rateB: number; nPerCell: number; alpha: number; sides: 1 | 2; multiplicity: string; powerA: number; powerB: number }>("factorial-2x2/proportions-corrected.json");
    for (const c of f.cases) {
      const r = solve({ outcome: "proportions", method: "normal-corrected", solveFor: "power", nPerCell: c.nPerCell, controlRate: c.controlRate, rateA: c.rateA, rateB: c.rateB, alpha: c.alpha, sides: c.sides, multiplicity: c.multiplicity });
      expectClose(r.mainEffects[0]!.power, c.powerA, f.tolerance, c);
      expectClose(r.mainEffects[1]!.power, c.powerB, f.tolerance, c);
    }
  });
  it("power under Holm's procedure agrees with a seeded simulation of the whole trial in R", () => {
    const f = loadFixture<{ nPerCell: number; effectA: number; effectB: number; alpha: number; powerUnderHolmA: number; powerUnderHolmB: number }>("factorial-2x2/holm-simulation.json");
    for (const c of f.cases) {
      const r = solve({ solveFor: "power", nPerCell: c.nPerCell, sd: 1, effectA: c.effectA, effectB: c.effectB, alpha: c.alpha, multiplicity: "holm" });
      expectClose(r.mainEffects[0]!.powerUnderHolm!, c.powerUnderHolmA, f.tolerance, c);
      expectClose(r.mainEffects[1]!.powerUnderHolm!, c.powerUnderHolmB, f.tolerance, c);
    }
  });
});

describe("factorial-2x2: the printed margin and cell rates and the interaction's spread (R, from the 2×2 table of cell rates)", () => {
  type Rates = {
    outcome: "proportions" | "means"; controlRate: number; rateA: number; rateB: number; interaction: number | null; sd: number;
    marginAWithout: number; marginAWith: number; marginBWithout: number; marginBWith: number; effectA: number; effectB: number;
    cellBothNoInteraction: number; cellBoth: number; interactionEffect: number; standardErrorPerRootCell: number;
  };
  const f = loadFixture<Rates>("factorial-2x2/rates.json");
  const proportions = f.cases.filter((c) => c.outcome === "proportions");
  const inputsOf = (c: Rates) => ({
    outcome: "proportions", solveFor: "power", nPerCell: 100, controlRate: c.controlRate, rateA: c.rateA, rateB: c.rateB,
    ...(c.interaction === null ? {} : { interaction: c.interaction }),
  });

  it("margin rates, main effects, cell rates under the interaction and standardErrorPerRootCell for proportions", () => {
    expect(proportions.length).toBeGreaterThan(30);
    for (const c of proportions) {
      const r = solve(inputsOf(c));
      const [a, b] = r.mainEffects;
      const close = (actual: number, expected: number) => expectClose(actual, expected, f.tolerance, c);
      close(a!.marginRates![0], c.marginAWithout);
      close(a!.marginRates![1], c.marginAWith);
      close(b!.marginRates![0], c.marginBWithout);
      close(b!.marginRates![1], c.marginBWith);
      close(a!.effect, c.effectA);
      close(b!.effect, c.effectB);
      const [neither, aAlone, bAlone, both] = r.interaction.cellRates!;
      expect([neither, aAlone, bAlone], JSON.stringify(c)).toEqual([c.controlRate, c.rateA, c.rateB]);
      close(both, c.cellBoth);
      close(r.interaction.effect, c.interactionEffect);
      close(r.interaction.standardErrorPerRootCell, c.standardErrorPerRootCell);
    }
  });
  it("the cells table prints the no-interaction rates and the effects table the main effects and the interaction", () => {
    for (const c of proportions) {
      const input = parse(inputsOf(c));
      const sections = factorial2x2.document(input, factorial2x2.compute(input));
      const cells = documentTable(sections, "cells");
      expect(tableCell(cells, "Neither", "rate")).toBe(c.controlRate);
      expect(tableCell(cells, "A alone", "rate")).toBe(c.rateA);
      expect(tableCell(cells, "B alone", "rate")).toBe(c.rateB);
      expectClose(tableCell(cells, "A and B", "rate") as number, c.cellBothNoInteraction, f.tolerance, c);
      const effects = documentTable(sections, "effects");
      expectClose(tableCell(effects, "Main effect of A (margins)", "effect") as number, c.effectA, f.tolerance, c);
      expectClose(tableCell(effects, "Main effect of B (margins)", "effect") as number, c.effectB, f.tolerance, c);
      expectClose(tableCell(effects, "Interaction (AB − A) − (B − neither)", "effect") as number, c.interactionEffect, f.tolerance, c);
    }
  });
  it("standardErrorPerRootCell for means is √(Σ c²) σ = 2σ", () => {
    const means = f.cases.filter((c) => c.outcome === "means");
    expect(means.length).toBeGreaterThan(0);
    for (const c of means) {
      const r = solve({ solveFor: "power", nPerCell: 20, sd: c.sd, effectA: c.sd, effectB: c.sd });
      expectClose(r.interaction.standardErrorPerRootCell, c.standardErrorPerRootCell, f.tolerance, c);
      expect(r.mainEffects[0]!.marginRates).toBeNull();
      expect(r.interaction.cellRates).toBeNull();
    }
  });
});

describe("factorial-2x2: report and bounds", () => {
  it("the report shows main effects beside the interaction, a three-curve power chart and a protocol paragraph with the numbers", () => {
    const input = parse(factorial2x2.example as Record<string, unknown>);
    const r = factorial2x2.compute(input);
    const blocks = factorial2x2.document(input, r).flatMap((s) => s.blocks);
    const chart = blocks.find((b) => b.kind === "chart");
    expect(chart && chart.kind === "chart" && chart.chart.series.map((s) => s.name)).toEqual(["Main effect of A", "Main effect of B", "Interaction"]);
    const protocol = blocks.find((b) => b.kind === "protocol");
    const text = protocol && protocol.kind === "protocol" ? protocol.text : "";
    expect(text).toContain(`${r.nPerCell} evaluable participants in each of the four cells`);
    expect(text).toContain(`${r.interaction.requiredTotal} in total`);
  });
  it("dropout inflates each cell", () => {
    const r = solve({ sd: 1, effectA: 0.5, effectB: 0.5, dropout: 0.2 });
    expect(r.enrolledPerCell).toBe(Math.ceil(r.nPerCell / 0.8));
  });
  const issues = (inputs: Record<string, unknown>) => factorial2x2.input.safeParse(inputs).error?.issues.map((i) => i.path.join(".")) ?? [];
  it("refuses missing or meaningless effects with their field", () => {
    expect(issues({ sd: 1, effectA: 0, effectB: 0.5 })).toEqual(["effectA"]);
    expect(issues({ effectA: 1, effectB: 0.5 })).toEqual(["sd"]);
    expect(issues({ sd: 1, effectA: 1, effectB: 0.5, interaction: 0 })).toEqual(["interaction"]);
    expect(issues({ outcome: "proportions", controlRate: 0.3, rateA: 0.3, rateB: 0.4 })).toEqual(["rateA"]);
    expect(issues({ outcome: "proportions", controlRate: 0.2, rateA: 0.7, rateB: 0.8 })).toEqual(["rateB"]);
    expect(issues({ outcome: "proportions", controlRate: 0.2, rateA: 0.5, rateB: 0.5, interaction: 0.3 })).toEqual(["interaction"]);
    expect(issues({ outcome: "proportions", controlRate: 0.2, rateA: 1.2, rateB: 0.5 })).toEqual(["rateA"]);
    expect(issues({ sd: 1, effectA: 1, effectB: 0.5, method: "normal-corrected" })).toEqual(["method"]);
    expect(issues({ sd: 1, effectA: 1, effectB: 0.5, solveFor: "power" })).toEqual(["nPerCell"]);
    expect(issues({ sd: 1, effectA: 1, effectB: 0.5, power: 0.01 })).toEqual(["power"]);
  });
  it("a main effect too small for the bound is infeasible (422 with the bound and the field)", () => {
    try {
      solve({ sd: 1, effectA: 0.001, effectB: 0.5 });
      expect.fail("expected an infeasible design");
    } catch (error) {
      expect(error).toBeInstanceOf(InfeasibleDesignError);
      expect((error as InfeasibleDesignError).details).toMatchObject({ bound: 50000, field: "effectA" });
    }
  });
  it("an interaction too small for the bound is reported as beyond it, not as a failure of the design", () => {
    const r = solve({ sd: 1, effectA: 0.5, effectB: 0.5, interaction: 0.005 });
    expect(r.interaction.requiredPerCell).toBeNull();
    expect(r.nPerCell).toBeGreaterThan(0);
  });});

describe("factorial-2x2: precision at the edges (found by the compute-budget audit)", () => {
  it("keeps a two-sided interaction power within [0, 1] when the two tails sum past 1", () => {
    // Interaction 1 with SD 1 at 615 per cell has noncentrality √615/2 = 12.4, so its power is Φ(12.4 - 1.96) = 1 to
    // 1e-24 (normal theory); before the fix the two separately computed tails summed to 1.0000000000007.
    const r = solve({ solveFor: "power", sd: 1, effectA: 1, effectB: 1, interaction: 1, nPerCell: 615 });
    expect(r.interaction.power).toBeLessThanOrEqual(1);
    expectClose(r.interaction.power, 1, 1e-9, { nPerCell: 615 });
    for (const [, p] of r.powerCurves.interaction) expect(p).toBeLessThanOrEqual(1);
  });
  it("resolves the detectable main effect in standard errors, so an SD of 1e-9 gives the same standardized answer as 1", () => {
    // (z_0.975 + z_0.8) σ/√m = 2.801585 × √(1/50000) = 0.01252907 σ at 50,000 per cell (handbook formula, standard
    // normal table; the margins' t test on 199,998 degrees of freedom is within 1e-5 of it). Before the fix the
    // search stopped at an absolute 1e-10, coarse beside σ = 1e-9.
    for (const sd of [1e-9, 1, 1e9]) {
      const r = solve({ solveFor: "power", sd, effectA: sd, effectB: sd, nPerCell: 50000 });
      expectClose(r.detectableMainEffect! / sd, 0.012529069984918345, 1e-5, { sd }, "relative");
    }
  });
});
