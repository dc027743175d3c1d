// The side-by-side comparison: the 3+3 column against the clearing formula
// (common practice) and the exact 3+3 kernel, the CRM and BOIN columns against
// the standalone designs run with the same settings and seed, and validation.
import { describe, expect, it } from "vitest";
import { expectClose } from "../../support/fixtures.js";
import { computeDoseFindingComparison, costDoseFindingComparison, doseFindingComparison } from "../../../src/designs/doseFindingComparison.js";
import { computeCrm, crm } from "../../../src/designs/crm.js";
import { boin, computeBoin } from "../../../src/designs/boin.js";
import { threePlusThreeOperatingCharacteristics } from "../../../src/designs/threePlusThree.js";
import { COMPUTE_BUDGET_MS, assertWithinBudget } from "../../../src/designs/budget.js";
import { canonicalJson } from "../../../src/store/canonical.js";

const example = doseFindingComparison.input.parse(doseFindingComparison.example);
const result = computeDoseFindingComparison(example);
const byDesign = (name: string) => result.designs.find((d) => d.design === name)!.operatingCharacteristics;

describe("dose-finding comparison", () => {
  it("3+3: no dose is selected exactly when the lowest dose fails to clear, 1 - [(1-p)^3 + 3p(1-p)^2 (1-p)^3] (common practice)", () => {
    const p = example.scenario.dltProbabilities[0]!;
    const clears = (1 - p) ** 3 + 3 * p * (1 - p) ** 2 * (1 - p) ** 3;
    expectClose(byDesign("3+3").noSelectionProbability, 1 - clears, 1e-14, { p });
  });

  it("3+3: the column is the exact enumeration of the 3+3 rules", () => {
    const oc = threePlusThreeOperatingCharacteristics(example.scenario.dltProbabilities, example.threePlusThreeRule);
    expect(byDesign("3+3").selectionProbability).toEqual(oc.selectionProbability);
    expect(byDesign("3+3").meanPatients).toEqual(oc.expectedPatients);
    const sum = byDesign("3+3").selectionProbability.reduce((a, b) => a + b, 0) + byDesign("3+3").noSelectionProbability;
    expectClose(sum, 1, 1e-12, { what: "selection probabilities sum to 1" });
  });

  it("CRM and BOIN columns equal the standalone designs with the same settings and seed", () => {
    const common = { doses: example.doses, target: example.target, cohortSize: example.cohortSize, startDose: example.startDose, maxSampleSize: example.maxSampleSize,
      scenarios: [example.scenario], trials: example.trials, seed: example.seed };
    const crmAlone = computeCrm(crm.input.parse({ ...common, model: example.crmModel, priorVariance: example.crmPriorVariance, skeletonHalfWidth: example.crmSkeletonHalfWidth,
      priorMtd: example.crmPriorMtd, safetyThreshold: example.crmSafetyThreshold })).operatingCharacteristics![0]!;
    const boinAlone = computeBoin(boin.input.parse({ ...common, eliminationCutoff: example.boinEliminationCutoff })).operatingCharacteristics![0]!;
    expect(canonicalJson(byDesign("CRM"))).toBe(canonicalJson(crmAlone));
    expect(canonicalJson(byDesign("BOIN"))).toBe(canonicalJson(boinAlone));
  });

  it("reports the true MTD, the boundaries and a selection chart with one series per design", () => {
    expect(result.trueMtd).toBe(2);
    expectClose(result.boinBoundaries.escalation, 0.197, 0.001, { note: "from memory of Liu & Yuan 2015, target 0.25" });
    const sections = doseFindingComparison.document(example, result);
    const chart = sections.flatMap((s) => s.blocks).find((b) => b.kind === "chart");
    expect(chart && chart.kind === "chart" ? chart.chart.series.map((s) => s.name) : []).toEqual(["3+3", "CRM", "BOIN"]);
  });

  it("validates with field paths and refuses plans above the compute budget", () => {
    const bad = (inputs: Record<string, unknown>) => {
      const r = doseFindingComparison.input.safeParse({ ...doseFindingComparison.example, ...inputs });
      return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
    };
    expect(bad({ scenario: { name: "s", dltProbabilities: [0.1, 0.3, 0.2, 0.4, 0.5] } })).toContain("scenario.dltProbabilities.2");
    expect(bad({ scenario: { name: "s", dltProbabilities: [0.1, 0.3] } })).toContain("scenario.dltProbabilities");
    expect(bad({ target: 1.5 })).toContain("target");
    expect(bad({ crmSkeleton: [0.1, 0.2] })).toContain("crmSkeleton");
    expect(bad({ crmSkeleton: [0.1, 0.2, 0.3, 0.4, 0.9995] })).toContain("crmSkeleton.4");
    expect(bad({ doses: Array.from({ length: 10 }, (_, i) => `d${i + 1}`), scenario: { name: "s", dltProbabilities: Array.from({ length: 10 }, () => 0.1) }, target: 0.5, crmSkeletonHalfWidth: 0.25, crmPriorMtd: 1 })).toContain("crmSkeletonHalfWidth");
    const big = doseFindingComparison.input.parse({ ...doseFindingComparison.example, cohortSize: 1, maxSampleSize: 150, trials: 20000 });
    expect(costDoseFindingComparison(big).milliseconds).toBeGreaterThan(COMPUTE_BUDGET_MS);
    expect(() => assertWithinBudget(doseFindingComparison, big)).toThrow(/Reduce "trials" or "maxSampleSize"/);
  });
});
