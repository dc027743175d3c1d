// The compute budget: every design estimates its work from its inputs, admits
// its heaviest listed case and refuses the listed cases beyond the budget,
// naming what to reduce. The timings behind the estimates are in
// `npm run bench` (bench/designs.bench.ts), never in a test.
import { describe, expect, it } from "vitest";
import { COMPUTE_BUDGET_MS, OverBudgetError, assertWithinBudget } from "../../../src/designs/budget.js";
import { catalog } from "../../../src/designs/catalog.js";
import { inputJsonSchema } from "../../../src/designs/schema.js";
import { budgetCases } from "../../support/budgetCases/index.js";

describe.each(catalog.map((d) => [d.id, d] as const))("%s: compute budget", (_id, design) => {
  const fields = Object.keys(inputJsonSchema(design).properties ?? {});
  const cases = budgetCases[design.id];

  it("estimates the work of its example, well within the budget, naming real fields", () => {
    const estimate = design.cost(design.input.parse(design.example));
    expect(Number.isFinite(estimate.milliseconds) && estimate.milliseconds > 0, JSON.stringify(estimate)).toBe(true);
    expect(estimate.milliseconds).toBeLessThan(COMPUTE_BUDGET_MS);
    expect(estimate.breakdown.length).toBeGreaterThan(0);
    for (const name of estimate.reduce) expect(fields).toContain(name);
  });

  it("lists its heaviest admitted cases and its refused ones", () => {
    expect(cases, `no budget cases for ${design.id} in test/support/budgetCases`).toBeDefined();
    expect(cases!.heaviest.length).toBeGreaterThan(0);
    if (cases!.overBudget.length === 0) expect(cases!.boundedBySchema, "no over-budget case and no reason why none exists").toBeTruthy();
  });

  it.each((cases?.heaviest ?? []).map((c) => [c.name, c] as const))("admits %s", (_name, c) => {
    const inputs = design.input.parse(c.inputs);
    const estimate = design.cost(inputs);
    expect(estimate.milliseconds, estimate.breakdown).toBeLessThanOrEqual(COMPUTE_BUDGET_MS);
    expect(() => assertWithinBudget(design, inputs)).not.toThrow();
  });

  it.each((cases?.overBudget ?? []).map((c) => [c.name, c] as const))("refuses %s, naming what to reduce", (_name, c) => {
    const inputs = design.input.parse(c.inputs);
    const estimate = design.cost(inputs);
    expect(estimate.milliseconds, estimate.breakdown).toBeGreaterThan(COMPUTE_BUDGET_MS);
    expect(estimate.reduce).toContain(c.reduces);
    for (const name of estimate.reduce) expect(fields).toContain(name);
    expect(() => assertWithinBudget(design, inputs)).toThrow(OverBudgetError);
  });
});
