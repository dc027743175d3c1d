// CRM (O'Quigley, Pepe & Fisher 1990) against fixtures computed in R from the
// method's definitions (test/fixtures/crm/generate.R): Lee & Cheung (2009)
// skeletons by root finding, posterior summaries by R integrate(), and exact
// operating characteristics of small trials by enumeration. The fast posterior
// of the simulations is checked against the adaptive Gauss-Kronrod reference.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { COMPUTE_BUDGET_MS, OverBudgetError, assertWithinBudget } from "../../../src/designs/budget.js";
import { computeCrm, costCrm, crm } from "../../../src/designs/crm.js";
import { calibrateSkeleton, type CrmModelKind } from "../../../src/designs/shared/crmModel.js";
import { CrmFastPosterior, crmPosterior, widestPanel } from "../../../src/designs/shared/crmPosterior.js";
import { type RandomSource, createRandom } from "../../../src/stats/random.js";
import { canonicalJson } from "../../../src/store/canonical.js";

const doses = ["d1", "d2", "d3", "d4", "d5"];
const pathsOf = (inputs: Record<string, unknown>): string[] => {
  const r = crm.input.safeParse(inputs);
  expect(r.success).toBe(false);
  return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
};

interface PosteriorCase {
  model: CrmModelKind; skeleton: number[]; intercept: number; priorVariance: number; target: number; patients: number[]; dlts: number[];
  meanProbability: number[]; meanParameter: number; plugInProbability: number[]; credibleLower: number[]; credibleUpper: number[];
  probabilityLowestAboveTarget: number; recommendedPosteriorMean: number; recommendedPlugIn: number;
}
const posteriorFixture = loadFixture<PosteriorCase>("crm/posterior.json");
const modelOf = (c: PosteriorCase) => ({ kind: c.model, skeleton: c.skeleton, intercept: c.intercept, priorVariance: c.priorVariance });

describe("CRM skeleton calibration (Lee & Cheung 2009)", () => {
  it("matches the switching-point construction solved by uniroot in R (skeleton.json)", () => {
    const f = loadFixture<{ model: CrmModelKind; target: number; halfWidth: number; priorMtd: number; doses: number; skeleton: number[] }>("crm/skeleton.json");
    for (const c of f.cases) {
      const s = calibrateSkeleton(c.model, c.target, c.halfWidth, c.priorMtd - 1, c.doses, 3);
      s.forEach((v, i) => expectClose(v, c.skeleton[i]!, f.tolerance, { ...c, dose: i + 1 }));
    }
  });
  it("puts the target at the prior MTD and increases with dose", () => {
    const s = calibrateSkeleton("power", 0.25, 0.05, 2, 5);
    expect(s[2]).toBe(0.25);
    for (let i = 1; i < 5; i++) expect(s[i]!).toBeGreaterThan(s[i - 1]!);
  });
});

describe("CRM posterior (reference quadrature) against R integrate()", () => {
  it("posterior means, plug-in estimates, 90% credible limits and P(p1 > target) agree to 1e-9", () => {
    const tol = posteriorFixture.tolerance;
    for (const c of posteriorFixture.cases) {
      const r = crmPosterior(modelOf(c), c.patients, c.dlts, c.target, 0.9);
      const where = { model: c.model, patients: c.patients, dlts: c.dlts };
      c.meanProbability.forEach((v, i) => expectClose(r.meanProbability[i]!, v, tol, { ...where, dose: i + 1, what: "mean" }));
      c.plugInProbability.forEach((v, i) => expectClose(r.plugInProbability[i]!, v, tol, { ...where, dose: i + 1, what: "plug-in" }));
      c.credibleLower.forEach((v, i) => expectClose(r.credibleLower[i]!, v, tol, { ...where, dose: i + 1, what: "lower" }));
      c.credibleUpper.forEach((v, i) => expectClose(r.credibleUpper[i]!, v, tol, { ...where, dose: i + 1, what: "upper" }));
      expectClose(r.meanParameter, c.meanParameter, tol, { ...where, what: "E[a]" });
      expectClose(r.probabilityLowestAboveTarget, c.probabilityLowestAboveTarget, tol, { ...where, what: "P(p1 > target)" });
    }
    expect(posteriorFixture.cases.length).toBe(32);
  });

  it("recommends the same dose as R, by posterior mean and by plug-in, through the design", () => {
    for (const c of posteriorFixture.cases) {
      for (const [doseEstimate, expected] of [["posterior-mean", c.recommendedPosteriorMean], ["plug-in", c.recommendedPlugIn]] as const) {
        const input = crm.input.parse({
          use: "next-dose", doses, target: c.target, model: c.model, logisticIntercept: c.intercept, priorVariance: c.priorVariance,
          skeleton: c.skeleton, doseEstimate, safetyThreshold: 0.999, data: c.patients.map((p, i) => ({ patients: p, dlts: c.dlts[i]! })),
        });
        const nd = computeCrm(input).nextDose!;
        expect(nd.recommendedDose + 1, JSON.stringify({ doseEstimate, c })).toBe(expected);
      }
    }
  });

  it("stops for safety exactly when P(p1 > target) exceeds the threshold", () => {
    // 3 of 3 at the lowest dose, power model, calibrated skeleton: R gives P(p1 > 0.25) below.
    const c = posteriorFixture.cases.find((x) => x.model === "power" && x.priorVariance === 1.34 && x.dlts[0] === 3 && x.patients[0] === 3)!;
    const base = { use: "next-dose", doses, target: 0.25, skeleton: c.skeleton, data: c.patients.map((p, i) => ({ patients: p, dlts: c.dlts[i]! })) };
    const p = c.probabilityLowestAboveTarget;
    expect(computeCrm(crm.input.parse({ ...base, safetyThreshold: Math.max(0.5, p - 0.01) })).nextDose).toMatchObject({ stoppedForSafety: true, recommendedDose: -1 });
    expect(computeCrm(crm.input.parse({ ...base, safetyThreshold: Math.min(0.999, p + 0.01) })).nextDose!.stoppedForSafety).toBe(false);
  });
});

/**
 * Data sets over 5 doses of up to 150, 30 or 10 patients a dose, some doses
 * untried, every seventh with no DLT and every eleventh with nothing but DLTs.
 */
function* randomDataSets(random: RandomSource, count: number): Generator<[number[], number[]]> {
  for (let t = 0; t < count; t++) {
    const most = [150, 30, 10][t % 3]!;
    const n = Array.from({ length: 5 }, () => (random.uniform() < 0.6 ? random.integer(most) : 0));
    const y = n.map((m) => random.integer(m + 1));
    if (t % 7 === 0) y.fill(0);
    if (t % 11 === 0) n.forEach((m, i) => { y[i] = m; });
    yield [n, y];
  }
}

describe("CRM fast posterior of the simulations", () => {
  it("agrees with the adaptive reference to 1e-9 on 300 random data sets per model", () => {
    for (const kind of ["power", "logistic"] as const) {
      const random = createRandom(kind === "power" ? 11 : 12);
      const model = { kind, skeleton: calibrateSkeleton(kind, 0.25, 0.05, 2, 5), intercept: 3, priorVariance: 1.34 };
      const fast = new CrmFastPosterior(model, 0.25);
      for (const [n, y] of randomDataSets(random, 300)) {
        const ref = crmPosterior(model, n, y, 0.25);
        fast.update(n, y);
        const where = { kind, n, y };
        for (let i = 0; i < 5; i++) expectClose(fast.meanProbability[i]!, ref.meanProbability[i]!, 1e-9, { ...where, dose: i + 1 });
        expectClose(fast.meanParameter, ref.meanParameter, 1e-8, { ...where, what: "E[a]" });
        expectClose(fast.probabilityLowestAboveTarget, ref.probabilityLowestAboveTarget, 1e-9, { ...where, what: "P(p1 > target)" });
      }
    }
  });
});

describe("CRM fast posterior with much data or a tight prior", () => {
  it("agrees with the adaptive reference to 1e-9 with up to 1,500 patients over 8 doses", () => {
    for (const [kind, priorVariance] of [["power", 0.05], ["logistic", 4], ["power", 9]] as const) {
      const random = createRandom(21);
      const model = { kind, skeleton: calibrateSkeleton(kind, 0.3, 0.06, 3, 8), intercept: 3, priorVariance };
      const fast = new CrmFastPosterior(model, 0.3);
      for (let t = 0; t < 40; t++) {
        const n = Array.from({ length: 8 }, () => (random.uniform() < 0.7 ? random.integer(151) : 0));
        const y = n.map((m, i) => Math.min(m, Math.round(m * model.skeleton[i]! * (0.5 + random.uniform()))));
        const ref = crmPosterior(model, n, y, 0.3);
        fast.update(n, y);
        for (let i = 0; i < 8; i++) expectClose(fast.meanProbability[i]!, ref.meanProbability[i]!, 1e-9, { kind, priorVariance, n, y, dose: i + 1 });
        expectClose(fast.probabilityLowestAboveTarget, ref.probabilityLowestAboveTarget, 1e-9, { kind, priorVariance, n, y, what: "P(p1 > target)" });
      }
    }
  });
});

describe("CRM fast posterior with a logistic intercept above 3", () => {
  it("agrees with the adaptive reference to 1e-9 at intercept 10 (regression: panels of 0.8 against poles 0.30 from the real axis were 2.4e-5 off)", () => {
    // The poles of p_i(a) lie atan(π/a0) from the real axis (a0 + e^a x_i = ±iπ): 0.30 at a0 = 10.
    for (const priorVariance of [1.34, 4]) {
      const random = createRandom(31);
      const model = { kind: "logistic" as const, skeleton: calibrateSkeleton("logistic", 0.25, 0.05, 2, 5, 10), intercept: 10, priorVariance };
      const fast = new CrmFastPosterior(model, 0.25);
      for (const [n, y] of randomDataSets(random, 200)) {
        const ref = crmPosterior(model, n, y, 0.25);
        fast.update(n, y);
        for (let i = 0; i < 5; i++) expectClose(fast.meanProbability[i]!, ref.meanProbability[i]!, 1e-9, { priorVariance, n, y, dose: i + 1 });
        expectClose(fast.probabilityLowestAboveTarget, ref.probabilityLowestAboveTarget, 1e-9, { priorVariance, n, y, what: "P(p1 > target)" });
      }
    }
  }, 30_000);

  it("keeps panels of 0.8 up to intercept 3.05 and narrows them above", () => {
    expect(widestPanel({ kind: "power", intercept: 3 })).toBe(0.8);
    expect(widestPanel({ kind: "logistic", intercept: 3 })).toBe(0.8);
    // atan(π/10) = 0.3043958, the poles' distance from the real axis at a0 = 10 (Python's math.atan).
    expect(widestPanel({ kind: "logistic", intercept: 10 })).toBeCloseTo(0.3043958, 6);
  });
});

describe("CRM simulation", () => {
  it("agrees with exact enumeration of small trials computed in R (within 4.5 Monte Carlo standard errors)", () => {
    const f = loadFixture<{ name: string; model: CrmModelKind; skeleton: number[]; target: number; dltProbabilities: number[]; cohortSize: number; maxSampleSize: number;
      startDose: number; safetyThreshold: number; selectionProbability: number[]; noSelectionProbability: number; meanPatients: number[]; meanSquaredPatients: number[] }>("crm/exact-operating-characteristics.json");
    const trials = 12000;
    for (const c of f.cases) {
      const k = c.dltProbabilities.length;
      const input = crm.input.parse({ doses: doses.slice(0, k), target: c.target, model: c.model, skeleton: c.skeleton, cohortSize: c.cohortSize, maxSampleSize: c.maxSampleSize,
        startDose: c.startDose, safetyThreshold: c.safetyThreshold, scenarios: [{ name: c.name, dltProbabilities: c.dltProbabilities }], trials, seed: 3 });
      const oc = computeCrm(input).operatingCharacteristics![0]!;
      const se = (p: number): number => Math.sqrt((p * (1 - p)) / trials);
      c.selectionProbability.forEach((p, i) => expectClose(oc.selectionProbability[i]!, p, f.tolerance * Math.max(se(p), 1 / trials), { name: c.name, dose: i + 1, what: "selection" }));
      expectClose(oc.noSelectionProbability, c.noSelectionProbability, f.tolerance * Math.max(se(c.noSelectionProbability), 1 / trials), { name: c.name, what: "no selection" });
      c.meanPatients.forEach((m, i) => {
        const sd = Math.sqrt(Math.max(0, c.meanSquaredPatients[i]! - m * m));
        expectClose(oc.meanPatients[i]!, m, f.tolerance * Math.max(sd, 1) / Math.sqrt(trials), { name: c.name, dose: i + 1, what: "patients" });
      });
    }
  });

  it("is reproducible: the same seed gives the same bytes, another seed other numbers", () => {
    const a = canonicalJson(computeCrm(crm.input.parse(crm.example)));
    expect(canonicalJson(computeCrm(crm.input.parse(crm.example)))).toBe(a);
    expect(canonicalJson(computeCrm(crm.input.parse({ ...crm.example, seed: 5 })))).not.toBe(a);
  });

  it("never escalates by more than one dose above the highest tried", () => {
    // All doses very safe: the trial must climb one dose per cohort from the lowest.
    const input = crm.input.parse({ doses, target: 0.25, cohortSize: 1, maxSampleSize: 5, scenarios: [{ name: "safe", dltProbabilities: [0.001, 0.001, 0.001, 0.001, 0.001] }], trials: 200 });
    const oc = computeCrm(input).operatingCharacteristics![0]!;
    for (const m of oc.meanPatients.slice(0, 4)) expect(m).toBeGreaterThan(0.99);
  });

  it("estimates a plan above the compute budget and is refused naming trials first, before any simulation", () => {
    const scenario = { name: "s", dltProbabilities: [0.1, 0.2, 0.3, 0.4, 0.5] };
    const input = crm.input.parse({ doses, cohortSize: 1, maxSampleSize: 150, trials: 20000, scenarios: [scenario] });
    const estimate = costCrm(input);
    expect(estimate.milliseconds).toBeGreaterThan(COMPUTE_BUDGET_MS);
    expect(estimate.reduce).toEqual(["trials", "maxSampleSize"]);
    expect(estimate.breakdown).toBe("20,000 trials × 150 dose decisions (150 patients in cohorts of 1) over 5 doses, each decision a posterior by up to 302 quadrature nodes");
    expect(() => assertWithinBudget(crm, input)).toThrow(/Reduce "trials" or "maxSampleSize"/);
    // Fields already at their least are not offered: 100 trials is the fewest, one scenario the fewest.
    expect(costCrm(crm.input.parse({ doses, maxSampleSize: 150, trials: 100, scenarios: [scenario] })).reduce).toEqual(["maxSampleSize"]);
    expect(costCrm(crm.input.parse({ doses, maxSampleSize: 150, trials: 100, scenarios: [scenario, scenario] })).reduce).toEqual(["scenarios", "maxSampleSize"]);
  });

  it("admits 10,000 trials of 30 patients over 5 doses, power or logistic, and refuses 500 trials of 150 patients one by one over 10 doses (found by the degenerate-input audit)", () => {
    // The figure the budget was set for (bench/crm.bench.ts: about 1.2 s and 1.3 s of CPU); 1,333 trials of the
    // second plan took about 6 s, 300 take about 1.2 s of CPU (bench/designs.bench.ts, heaviest cases).
    for (const model of ["power", "logistic"] as const) {
      const plan = crm.input.parse({ doses, model, cohortSize: 3, maxSampleSize: 30, trials: 10000, scenarios: [{ name: "s", dltProbabilities: [0.05, 0.12, 0.25, 0.4, 0.55] }] });
      expect(() => assertWithinBudget(crm, plan), model).not.toThrow();
    }
    const tenDoses = Array.from({ length: 10 }, (_, i) => `dose ${i + 1}`);
    const plan = (trials: number) => crm.input.parse({ doses: tenDoses, cohortSize: 1, maxSampleSize: 150, trials, scenarios: [{ name: "all safe", dltProbabilities: tenDoses.map(() => 0.001) }] });
    expect(() => assertWithinBudget(crm, plan(500))).toThrow(OverBudgetError);
    expect(() => assertWithinBudget(crm, plan(300))).not.toThrow();
  });

  it("counts more work for a wider prior and for a logistic intercept above 3.05 (more quadrature nodes)", () => {
    const base = { doses, cohortSize: 3, maxSampleSize: 30, trials: 1000, scenarios: [{ name: "s", dltProbabilities: [0.05, 0.12, 0.25, 0.4, 0.55] }] };
    const ms = (inputs: Record<string, unknown>) => costCrm(crm.input.parse({ ...base, ...inputs })).milliseconds;
    expect(ms({ priorVariance: 10 })).toBeGreaterThan(ms({ priorVariance: 1.34 }));
    expect(ms({ model: "logistic", logisticIntercept: 10 })).toBeGreaterThan(ms({ model: "logistic", logisticIntercept: 3 }));
    expect(ms({ model: "logistic", logisticIntercept: 3 })).toBe(ms({ model: "logistic", logisticIntercept: 1 }));
  });
});

describe("CRM input validation (400 with the field path)", () => {
  const base = { doses, scenarios: [{ name: "s", dltProbabilities: [0.1, 0.2, 0.3, 0.4, 0.5] }] };
  it("rejects a skeleton of the wrong length or not increasing", () => {
    expect(pathsOf({ ...base, skeleton: [0.1, 0.2, 0.3] })).toContain("skeleton");
    expect(pathsOf({ ...base, skeleton: [0.1, 0.2, 0.2, 0.4, 0.5] })).toContain("skeleton.2");
    expect(pathsOf({ ...base, model: "logistic", skeleton: [0.1, 0.2, 0.3, 0.5, 0.96] })).toContain("skeleton.4");
  });
  it("rejects a target outside (0, 1) and a half-width the target cannot carry", () => {
    expect(pathsOf({ ...base, target: 1 })).toContain("target");
    expect(pathsOf({ ...base, target: -0.2 })).toContain("target");
    expect(pathsOf({ ...base, target: 0.1, skeletonHalfWidth: 0.1 })).toContain("skeletonHalfWidth");
  });
  it("rejects more DLTs than patients, decreasing scenarios, and a plan without scenarios", () => {
    const data = doses.map(() => ({ patients: 3, dlts: 0 }));
    data[1] = { patients: 3, dlts: 5 };
    expect(pathsOf({ doses, use: "next-dose", data })).toContain("data.1.dlts");
    expect(pathsOf({ doses, scenarios: [{ name: "s", dltProbabilities: [0.1, 0.3, 0.2, 0.4, 0.5] }] })).toContain("scenarios.0.dltProbabilities.2");
    expect(pathsOf({ doses })).toContain("scenarios");
  });
  it("refuses skeleton values within 0.001 of the model's ceiling (regression: a skeleton value of 1 - 1e-12 gave NaN posterior means in simulations)", () => {
    expect(pathsOf({ ...base, skeleton: [0.05, 0.1, 0.2, 0.3, 1 - 1e-12] })).toContain("skeleton.4");
    // The logistic ceiling with intercept 3 is 1/(1 + e^-3) = 0.952574; 0.999 of it is 0.951622.
    expect(pathsOf({ ...base, model: "logistic", skeleton: [0.05, 0.1, 0.2, 0.3, 0.9517] })).toContain("skeleton.4");
    expect(crm.input.safeParse({ ...base, skeleton: [0.05, 0.1, 0.2, 0.3, 0.999] }).success).toBe(true);
    expect(crm.input.safeParse({ ...base, model: "logistic", skeleton: [0.05, 0.1, 0.2, 0.3, 0.9516] }).success).toBe(true);
  });
  it("refuses a calibrated skeleton that underflows to 0 or climbs to the ceiling (regression: it gave -Infinity logistic dose labels)", () => {
    const tenDoses = Array.from({ length: 10 }, (_, i) => `d${i + 1}`);
    const scenarios = [{ name: "s", dltProbabilities: tenDoses.map((_, i) => 0.05 + 0.05 * i) }];
    // δ = 0.25 around 0.3 with intercept 0.5: each dose below the prior MTD divides x by about 0.09, so dose 1 underflows.
    expect(pathsOf({ doses: tenDoses, scenarios, model: "logistic", logisticIntercept: 0.5, target: 0.3, skeletonHalfWidth: 0.25, priorMtd: 10 })).toContain("skeletonHalfWidth");
    expect(pathsOf({ doses: tenDoses, scenarios, target: 0.5, skeletonHalfWidth: 0.45, priorMtd: 1 })).toContain("skeletonHalfWidth");
    expect(crm.input.safeParse({ doses: tenDoses, scenarios, target: 0.25, skeletonHalfWidth: 0.05, priorMtd: 5 }).success).toBe(true);
  });
  it("accepts its own example", () => {
    expect(crm.input.safeParse(crm.example).success).toBe(true);
  });
});
