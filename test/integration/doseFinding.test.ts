// CRM, BOIN and the dose-finding comparison through the real Worker: the
// recorded simulations reproduced byte for byte (a REPRODUCIBILITY check
// against our own output recorded in Node, not a correctness check), next-dose
// decisions, 400s that name the field and 422s that say what to reduce.
import { describe, expect, it } from "vitest";
import fixture from "../fixtures/dose-finding-reproducibility/simulations.json";
import { canonicalJson } from "../../src/store/canonical.js";
import { type ProblemBody, type RecordBody, createCalculation } from "../support/http.js";

const doses = ["TW-417 10 mg", "TW-417 20 mg", "TW-417 40 mg", "TW-417 70 mg", "TW-417 100 mg"];
const scenarios = [{ name: "s", dltProbabilities: [0.05, 0.1, 0.2, 0.3, 0.45] }];

describe("dose-finding simulations in the Workers runtime", () => {
  for (const [i, c] of fixture.cases.entries()) {
    it(`${c.design} plan ${i + 1} reproduces the bytes recorded in Node`, async () => {
      const res = await createCalculation(c.design, c.inputs);
      expect([200, 201]).toContain(res.status);
      const record = await res.json<RecordBody>();
      expect(canonicalJson(record.result)).toBe(c.result);
    });
  }
});

describe("next dose over HTTP", () => {
  it("crm recommends a dose with posterior means and 90% credible limits", async () => {
    const data = [{ patients: 3, dlts: 0 }, { patients: 3, dlts: 0 }, { patients: 3, dlts: 1 }, { patients: 0, dlts: 0 }, { patients: 0, dlts: 0 }];
    const res = await createCalculation("crm", { use: "next-dose", doses, target: 0.25, data });
    expect(res.status).toBe(201);
    const nd = (await res.json<RecordBody>()).result.nextDose as { recommendedDose: number; meanProbability: number[]; credibleLower: number[]; credibleUpper: number[] };
    expect(nd.recommendedDose).toBeGreaterThanOrEqual(0);
    expect(nd.recommendedDose).toBeLessThanOrEqual(3);
    nd.meanProbability.forEach((m, i) => {
      expect(nd.credibleLower[i]!).toBeLessThan(m);
      expect(nd.credibleUpper[i]!).toBeGreaterThan(m);
    });
  });
  it("boin de-escalates after 2 of 3 at target 0.3 (decision table)", async () => {
    const data = [{ patients: 3, dlts: 0 }, { patients: 3, dlts: 2 }, { patients: 0, dlts: 0 }, { patients: 0, dlts: 0 }, { patients: 0, dlts: 0 }];
    const res = await createCalculation("boin", { use: "next-dose", doses, target: 0.3, data, currentDose: 2 });
    expect(res.status).toBe(201);
    expect((await res.json<RecordBody>()).result.nextDose).toMatchObject({ action: "de-escalate", nextDose: 0 });
  });
});

describe("bad input and infeasible plans", () => {
  const cases: Array<[string, string, Record<string, unknown>, string]> = [
    ["crm", "a target outside (0, 1)", { doses, target: 1.3, scenarios }, "inputs.target"],
    ["crm", "a skeleton of the wrong length", { doses, skeleton: [0.1, 0.2, 0.3], scenarios }, "inputs.skeleton"],
    ["crm", "a skeleton that does not increase", { doses, skeleton: [0.1, 0.2, 0.15, 0.3, 0.4], scenarios }, "inputs.skeleton.2"],
    ["crm", "more DLTs than patients", { doses, use: "next-dose", data: doses.map((_, i) => ({ patients: 3, dlts: i === 1 ? 4 : 0 })) }, "inputs.data.1.dlts"],
    ["boin", "a decreasing scenario", { doses, scenarios: [{ name: "s", dltProbabilities: [0.1, 0.3, 0.2, 0.4, 0.5] }] }, "inputs.scenarios.0.dltProbabilities.2"],
    ["boin", "a target of 0", { doses, target: 0, scenarios }, "inputs.target"],
    ["dose-finding-comparison", "a scenario of the wrong length", { doses, scenario: { name: "s", dltProbabilities: [0.1, 0.2] } }, "inputs.scenario.dltProbabilities"],
  ];
  for (const [design, what, inputs, path] of cases) {
    it(`${design}: 400 naming ${path} for ${what}`, async () => {
      const res = await createCalculation(design, inputs);
      expect(res.status).toBe(400);
      const problem = await res.json<ProblemBody>();
      expect(problem.errors?.map((e) => e.path)).toContain(path);
    });
  }
  it("crm: 422 over-compute-budget naming trials for a plan above the compute budget", async () => {
    const res = await createCalculation("crm", { doses, cohortSize: 1, maxSampleSize: 150, trials: 20000, scenarios });
    expect(res.status).toBe(422);
    const problem = await res.json<ProblemBody>();
    expect(problem.type).toMatch(/over-compute-budget$/);
    expect(problem.field).toBe("trials");
    expect(problem.breakdown).toMatch(/^20,000 trials × 150 dose decisions/);
    expect(problem.estimatedMilliseconds).toBeGreaterThan(problem.budgetMilliseconds as number);
    expect(problem.detail).toMatch(/Reduce "trials" or "maxSampleSize"/);
  });
  it("boin and dose-finding-comparison: 422 over-compute-budget naming trials", async () => {
    const tenDoses = Array.from({ length: 10 }, (_, i) => `TW-417 ${(i + 1) * 10} mg`);
    const safe = { name: "s", dltProbabilities: tenDoses.map(() => 0.01) };
    const boinRes = await createCalculation("boin", { doses: tenDoses, cohortSize: 1, maxSampleSize: 150, trials: 20000, scenarios: Array(6).fill(safe) });
    const comparisonRes = await createCalculation("dose-finding-comparison", { doses, cohortSize: 1, maxSampleSize: 150, trials: 20000, scenario: scenarios[0] });
    for (const res of [boinRes, comparisonRes]) {
      expect(res.status).toBe(422);
      expect(await res.json<ProblemBody>()).toMatchObject({ status: 422, field: "trials" });
    }
  });
});
