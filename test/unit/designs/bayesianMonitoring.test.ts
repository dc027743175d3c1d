// Bayesian monitoring: boundaries and exact operating characteristics against
// an R implementation written from the definitions, a recalled published
// example, a seeded Monte Carlo of the same rules, and the 400/422 paths.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { type BayesianMonitoringInput, bayesianMonitoring } from "../../../src/designs/bayesianMonitoring.js";
import { predictiveProbability } from "../../../src/designs/shared/bayesianRules.js";
import { thresholdSearchWork } from "../../../src/designs/shared/predictiveSearch.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { betaCdf, betaSurvival } from "../../../src/stats/beta.js";
import { betaBinomialPmf } from "../../../src/stats/betaBinomial.js";
import { type RandomSource, createRandom } from "../../../src/stats/random.js";

interface RuleCase {
  rule: "posterior" | "predictive";
  checks: number[];
  stopAt: Array<number | null>;
  rates: number[];
  probabilityOfStopping?: number[];
  probabilityPromising?: number[];
  probabilityOfEarlyTermination: number[];
  expectedSampleSize: number[];
  finalSuccessCount?: number;
  alpha?: number;
  power?: number;
  [field: string]: unknown;
}

const INPUT_FIELDS = ["rule", "monitor", "limit", "threshold", "p0", "p1", "efficacyThreshold", "futilityThreshold", "priorA", "priorB", "maxN", "cohortSize", "firstCheck"];
const parse = (v: unknown): BayesianMonitoringInput => bayesianMonitoring.input.parse(v);

describe("bayesian-monitoring against R (test/fixtures/bayesian-monitoring/generate.R: pbeta, lbeta, explicit recursion)", () => {
  const f = loadFixture<RuleCase>("bayesian-monitoring/rules.json");
  it("has both rules", () => {
    expect(f.cases.filter((c) => c.rule === "posterior").length).toBe(6);
    expect(f.cases.filter((c) => c.rule === "predictive").length).toBe(4);
  });
  for (const c of f.cases) {
    const raw = Object.fromEntries(INPUT_FIELDS.filter((k) => c[k] !== undefined).map((k) => [k, c[k]]));
    it(`${c.rule} ${JSON.stringify(raw)}`, () => {
      const r = bayesianMonitoring.compute(parse({ ...raw, trueRates: c.rates }));
      expect(r.boundary.map((b) => b.patients)).toEqual(c.checks);
      expect(r.boundary.map((b) => b.stopAt)).toEqual(c.stopAt);
      if (c.rule === "predictive") {
        expect(r.finalSuccessCount).toBe(c.finalSuccessCount);
        expectClose(r.alpha!, c.alpha!, f.tolerance, { ...raw, alpha: true });
        expectClose(r.power!, c.power!, f.tolerance, { ...raw, power: true });
      }
      c.rates.forEach((rate, i) => {
        const o = r.operatingCharacteristics.find((row) => row.rate === rate)!;
        expect(o).toBeDefined();
        const at = { ...raw, rate };
        if (c.rule === "posterior") expectClose(o.probabilityOfStopping, c.probabilityOfStopping![i]!, f.tolerance, at);
        else expectClose(o.probabilityPromising!, c.probabilityPromising![i]!, f.tolerance, at);
        expectClose(o.probabilityOfEarlyTermination, c.probabilityOfEarlyTermination[i]!, f.tolerance, at);
        expectClose(o.expectedSampleSize, c.expectedSampleSize[i]!, f.tolerance * 100, at);
      });
    });
  }
});

interface SearchCase {
  feasible: boolean;
  chosenEfficacyThreshold: number | null;
  chosenFutilityThreshold: number | null;
  chosenFinalSuccessCount: number | null;
  chosenAlpha: number | null;
  chosenPower: number | null;
  chosenExpectedSizeAtP0: number | null;
  bestPowerWithinAlpha: number | null;
  [field: string]: unknown;
}

describe("predictive threshold search against R's full grid search (test/fixtures/bayesian-monitoring/generate.R)", () => {
  const f = loadFixture<SearchCase>("bayesian-monitoring/threshold-search.json");
  const fields = ["rule", "thresholds", "p0", "p1", "priorA", "priorB", "maxN", "cohortSize", "firstCheck", "alpha", "power"];
  for (const c of f.cases) {
    const raw = Object.fromEntries(fields.map((k) => [k, c[k]]));
    it(`${c.feasible ? "chooses the same thresholds" : "finds no design, with the same best power"} for ${JSON.stringify(raw)}`, () => {
      if (!c.feasible) {
        let error: unknown;
        try { bayesianMonitoring.compute(parse(raw)); } catch (e) { error = e; }
        expect(error).toBeInstanceOf(InfeasibleDesignError);
        expectClose((error as InfeasibleDesignError).details.bestPower as number, c.bestPowerWithinAlpha!, f.tolerance, raw);
        return;
      }
      const r = bayesianMonitoring.compute(parse(raw));
      expect(r.efficacyThreshold).toBe(c.chosenEfficacyThreshold);
      expect(r.futilityThreshold).toBe(c.chosenFutilityThreshold);
      expect(r.finalSuccessCount).toBe(c.chosenFinalSuccessCount);
      expectClose(r.alpha!, c.chosenAlpha!, f.tolerance, { ...raw, alpha: true });
      expectClose(r.power!, c.chosenPower!, f.tolerance, { ...raw, power: true });
      expectClose(r.search!.chosen!.expectedSizeAtP0, c.chosenExpectedSizeAtP0!, f.tolerance * 100, raw);
      expect(r.search!.best[0]).toEqual(r.search!.chosen);
    });
  }
});

describe("published example", () => {
  it("Lee & Liu 2008, Table 1: 16 responses of 23, Nmax 40, Beta(0.6, 0.4) prior, p0 0.6, θT 0.9 gives PP 0.5656 (from memory of Lee & Liu 2008, Table 1)", () => {
    const input = parse({ rule: "predictive", p0: 0.6, p1: 0.8, priorA: 0.6, priorB: 0.4, maxN: 40, firstCheck: 10, efficacyThreshold: 0.9 });
    const r = bayesianMonitoring.compute(input);
    expectClose(predictiveProbability({ p0: input.p0!, priorA: input.priorA, priorB: input.priorB, maxN: input.maxN }, r.finalSuccessCount!, 16, 23), 0.5656, 5e-5, { x: 16, n: 23 });
  });
});

/** f(x, n) computed once per count pair (n below 1000). */
function memoized(f: (x: number, n: number) => number): (x: number, n: number) => number {
  const memo = new Map<number, number>();
  return (x, n) => {
    const key = x * 1000 + n;
    let v = memo.get(key);
    if (v === undefined) {
      v = f(x, n);
      memo.set(key, v);
    }
    return v;
  };
}

/** One simulated single-arm trial: patients one at a time until maxN or until `stops(x, n)` after a patient. */
function simulateTrial(random: RandomSource, rate: number, maxN: number, stops: (x: number, n: number) => boolean): { x: number; n: number; stopped: boolean } {
  let x = 0;
  let n = 0;
  let stopped = false;
  while (n < maxN && !stopped) {
    n++;
    if (random.bernoulli(rate)) x++;
    if (stops(x, n)) stopped = true;
  }
  return { x, n, stopped };
}

/** The posterior rule applied directly: at each check, compute the posterior probability. */
function simulatePosterior(input: BayesianMonitoringInput, rate: number, trials: number, seed: number) {
  const random = createRandom(seed);
  const beyond = memoized((x, n) => input.monitor === "response"
    ? betaCdf(input.limit!, input.priorA + x, input.priorB + n - x)
    : betaSurvival(input.limit!, input.priorA + x, input.priorB + n - x));
  const isCheck = (n: number): boolean => n === input.maxN || (n >= input.firstCheck && (n - input.firstCheck) % input.cohortSize === 0);
  let stops = 0;
  let early = 0;
  let size = 0;
  for (let t = 0; t < trials; t++) {
    const trial = simulateTrial(random, rate, input.maxN, (x, n) => isCheck(n) && beyond(x, n) > input.threshold!);
    if (trial.stopped) { stops++; if (trial.n < input.maxN) early++; }
    size += trial.n;
  }
  return { stop: stops / trials, early: early / trials, size: size / trials };
}

/** The predictive rule applied directly from Lee & Liu's sum over future responses. */
function simulatePredictive(input: BayesianMonitoringInput, rate: number, trials: number, seed: number) {
  const random = createRandom(seed);
  const N = input.maxN;
  const success = (x: number): boolean => betaSurvival(input.p0!, input.priorA + x, input.priorB + N - x) > input.efficacyThreshold!;
  const pp = memoized((x, n) => {
    let v = 0;
    for (let y = 0; y <= N - n; y++) if (success(x + y)) v += betaBinomialPmf(y, N - n, input.priorA + x, input.priorB + n - x);
    return v;
  });
  let promising = 0;
  let early = 0;
  let size = 0;
  for (let t = 0; t < trials; t++) {
    const trial = simulateTrial(random, rate, N, (x, n) => n < N && n >= input.firstCheck && (n - input.firstCheck) % input.cohortSize === 0 && pp(x, n) < input.futilityThreshold!);
    if (trial.stopped) early++; else if (success(trial.x)) promising++;
    size += trial.n;
  }
  return { promising: promising / trials, early: early / trials, size: size / trials };
}

describe("exact operating characteristics against a seeded Monte Carlo of the same rules (within 4.5 standard errors)", () => {
  const trials = 20000;
  const within = (simulated: number, exact: number, sd: number, at: Record<string, unknown>): void =>
    expectClose(simulated, exact, 4.5 * sd / Math.sqrt(trials) + 1e-9, at);
  it(`posterior toxicity rule, the design's example, at true rates 0.2 and 0.4 (seeds 11, 12; ${trials} trials)`, () => {
    const input = parse(bayesianMonitoring.example);
    const r = bayesianMonitoring.compute(parse({ ...bayesianMonitoring.example, trueRates: [0.2, 0.4] }));
    [0.2, 0.4].forEach((rate, i) => {
      const sim = simulatePosterior(input, rate, trials, 11 + i);
      const exact = r.operatingCharacteristics.find((o) => o.rate === rate)!;
      within(sim.stop, exact.probabilityOfStopping, Math.sqrt(exact.probabilityOfStopping * (1 - exact.probabilityOfStopping)), { rate, stop: true });
      within(sim.early, exact.probabilityOfEarlyTermination, Math.sqrt(exact.probabilityOfEarlyTermination * (1 - exact.probabilityOfEarlyTermination)), { rate, early: true });
      within(sim.size, exact.expectedSampleSize, input.maxN / 2, { rate, size: true });
    });
  });
  it(`posterior futility rule checked by cohorts of 5, at 0.1 (seed 13; ${trials} trials)`, () => {
    const raw = { rule: "posterior", monitor: "response", limit: 0.2, threshold: 0.95, maxN: 30, cohortSize: 5 };
    const input = parse(raw);
    const exact = bayesianMonitoring.compute(parse({ ...raw, trueRates: [0.1] })).operatingCharacteristics.find((o) => o.rate === 0.1)!;
    const sim = simulatePosterior(input, 0.1, trials, 13);
    within(sim.stop, exact.probabilityOfStopping, Math.sqrt(exact.probabilityOfStopping * (1 - exact.probabilityOfStopping)), { stop: true });
    within(sim.size, exact.expectedSampleSize, input.maxN / 2, { size: true });
  });
  it(`predictive rule: alpha at p0 and power at p1 (seeds 21, 22; ${trials} trials)`, () => {
    const raw = { rule: "predictive", p0: 0.2, p1: 0.4, priorA: 0.2, priorB: 0.8, maxN: 40, firstCheck: 10 };
    const input = parse(raw);
    const r = bayesianMonitoring.compute(parse({ ...raw, trueRates: [0.2, 0.4] }));
    [0.2, 0.4].forEach((rate, i) => {
      const sim = simulatePredictive(input, rate, trials, 21 + i);
      const exact = r.operatingCharacteristics[i]!;
      within(sim.promising, exact.probabilityPromising!, Math.sqrt(exact.probabilityPromising! * (1 - exact.probabilityPromising!)), { rate, promising: true });
      within(sim.early, exact.probabilityOfEarlyTermination, Math.sqrt(exact.probabilityOfEarlyTermination * (1 - exact.probabilityOfEarlyTermination)), { rate, early: true });
      within(sim.size, exact.expectedSampleSize, input.maxN / 2, { rate, size: true });
    });
    expect(r.alpha).toBe(r.operatingCharacteristics[0]!.probabilityPromising);
    expect(r.power).toBe(r.operatingCharacteristics[1]!.probabilityPromising);
  });
});

describe("bayesian-monitoring inputs", () => {
  const paths = (v: unknown): string[] => {
    const r = bayesianMonitoring.input.safeParse(v);
    return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
  };
  it("the example parses, computes to finite JSON and documents", () => {
    const input = parse(bayesianMonitoring.example);
    const result = bayesianMonitoring.compute(input);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
    expect(bayesianMonitoring.document(input, result).map((s) => s.id)).toEqual(["design", "operating-characteristics", "protocol"]);
  });
  it("documents a predictive rule whose futility threshold never acts (one response at the end suffices)", () => {
    const input = parse({ rule: "predictive", p0: 1e-12, p1: 0.05, priorA: 1, priorB: 1000, maxN: 40, firstCheck: 1, efficacyThreshold: 0.9999999999999999, futilityThreshold: 1e-300 });
    const result = bayesianMonitoring.compute(input);
    expect(result.finalSuccessCount).toBe(1);
    expect(result.runs).toEqual([]);
    const text = JSON.stringify(bayesianMonitoring.document(input, result));
    expect(text).toContain("No interim count stops the trial");
  });
  it("fills defaults by rule", () => {
    expect(parse({ limit: 0.3, maxN: 20 })).toMatchObject({ rule: "posterior", monitor: "toxicity", threshold: 0.9, firstCheck: 1, cohortSize: 1 });
    const p = parse({ rule: "predictive", p0: 0.1, p1: 0.3, maxN: 20, cohortSize: 4 });
    expect(p).toMatchObject({ efficacyThreshold: 0.9, futilityThreshold: 0.05, firstCheck: 4 });
    expect(p.threshold).toBeUndefined();
    expect(parse({ rule: "predictive", p0: 0.1, p1: 0.3, maxN: 20, thresholds: "search" })).toMatchObject({ alpha: 0.1, power: 0.8 });
  });
  it("names the field of each bad input", () => {
    expect(paths({ maxN: 20 })).toEqual(["limit"]);
    expect(paths({ limit: 1.2, maxN: 20 })).toEqual(["limit"]);
    expect(paths({ limit: 0.3, maxN: 301 })).toEqual(["maxN"]);
    expect(paths({ limit: 0.3, maxN: 20, cohortSize: 25 })).toEqual(["cohortSize"]);
    expect(paths({ limit: 0.3, maxN: 20, p0: 0.2 })).toEqual(["p0"]);
    expect(paths({ limit: 0.3, maxN: 20, trueRates: [0.2, 0] })).toEqual(["trueRates.1"]);
    expect(paths({ rule: "predictive", p0: 0.3, p1: 0.3, maxN: 20 })).toEqual(["p1"]);
    expect(paths({ rule: "predictive", p0: 0.3, p1: 0.5, maxN: 20, firstCheck: 20 })).toEqual(["firstCheck"]);
    expect(paths({ rule: "predictive", p0: 0.3, p1: 0.5, maxN: 20, limit: 0.2, threshold: 0.8 })).toEqual(["limit", "threshold"]);
    expect(paths({ rule: "predictive", p0: 0.3, p1: 0.5, maxN: 20, thresholds: "search", futilityThreshold: 0.1 })).toEqual(["futilityThreshold"]);
    expect(paths({ rule: "predictive", p0: 0.3, p1: 0.5, maxN: 20, alpha: 0.1 })).toEqual(["alpha"]);
    expect(paths({ rule: "predictive", p0: 0.3, p1: 0.5, maxN: 20, thresholds: "search", alpha: 0.2, power: 0.1 })).toEqual(["power"]);
    expect(paths({ limit: 0.3, maxN: 20, thresholds: "search" })).toEqual(["thresholds"]);
  });
  const infeasible = (raw: unknown): InfeasibleDesignError => {
    try {
      bayesianMonitoring.compute(parse(raw));
    } catch (e) {
      if (e instanceof InfeasibleDesignError) return e;
      throw e;
    }
    throw new Error("expected an InfeasibleDesignError");
  };
  it("is infeasible when no outcome can stop the trial, and says the smallest maxN that would (common practice: 1 - 0.5^(n+1) > 0.999 first at n = 9)", () => {
    const e = infeasible({ limit: 0.5, threshold: 0.999, maxN: 5 });
    expect(e.details).toMatchObject({ field: "maxN", bound: 9 });
  });
  it("is infeasible when the prior alone stops the trial at the first check", () => {
    expect(infeasible({ limit: 0.3, priorA: 9, priorB: 1, maxN: 20 }).details).toMatchObject({ field: "threshold" });
  });
  it("is infeasible when no final result can be promising (common practice: 1 - 0.5^(n+1) > 0.99 first at n = 6)", () => {
    expect(infeasible({ rule: "predictive", p0: 0.5, p1: 0.7, efficacyThreshold: 0.99, maxN: 5, firstCheck: 2 }).details).toMatchObject({ field: "maxN", bound: 6 });
  });
  it("is infeasible when the futility rule stops at the first check whatever the outcomes", () => {
    expect(infeasible({ rule: "predictive", p0: 0.3, p1: 0.5, maxN: 40, firstCheck: 2, futilityThreshold: 0.99 }).details).toMatchObject({ field: "futilityThreshold" });
  });
});

describe("degenerate priors", () => {
  it("refuses a prior shape below 0.001, where a shape of 5e-324 turned P(rate > limit | no toxicity) = 0 into 1 (found by the degenerate-input audit)", () => {
    const base = { rule: "posterior", monitor: "toxicity", limit: 0.25, threshold: 0.9, maxN: 40, cohortSize: 1 };
    for (const field of ["priorA", "priorB"] as const) {
      const r = bayesianMonitoring.input.safeParse({ ...base, priorA: 1, priorB: 1, [field]: 5e-324 });
      expect(r.success ? [] : r.error.issues.map((i) => i.path.join("."))).toEqual([field]);
    }
    // Closed form for Beta(a, 1): P(X > x) = 1 - x^a (common practice, no source); at the smallest shape allowed the kernel keeps it.
    expectClose(betaSurvival(0.25, 0.001, 1), -Math.expm1(0.001 * Math.log(0.25)), 1e-10, { x: 0.25, a: 0.001, b: 1 });
    const result = bayesianMonitoring.compute(parse({ ...base, priorA: 0.001, priorB: 0.001 }));
    // A near-empty prior: one toxicity in the first patient is enough to stop, none is not.
    expect(result.boundary[0]).toMatchObject({ patients: 1, stopAt: 1 });
  });
});

describe("degenerate first check", () => {
  it("words the futility-at-first-check refusal for a single patient (found by the degenerate-input audit)", () => {
    // Common practice, no source: the message used to read "(1 patients) ... even 1 responses give".
    const input = parse({ rule: "predictive", p0: 0.2, p1: 0.4, priorA: 0.001, priorB: 1000, maxN: 300, firstCheck: 1 });
    expect(() => bayesianMonitoring.compute(input)).toThrow(InfeasibleDesignError);
    expect(() => bayesianMonitoring.compute(input)).toThrow(/\(1 patient\) whatever the outcomes: even a response in that patient gives/);
  });
});

describe("compute budget estimate", () => {
  const searched = { rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.35, priorA: 0.2, priorB: 0.8, maxN: 60, firstCheck: 1 };

  it("counts at least the threshold pairs the search evaluates, two recursions each", () => {
    const r = bayesianMonitoring.compute(parse(searched));
    expect(r.search!.evaluated).toBeGreaterThan(0);
    expect(r.search!.evaluated).toBeLessThanOrEqual(thresholdSearchWork(60).recursions / 2);
  });

  it("grows with the patients, the rates and a threshold search", () => {
    const cost = (raw: Record<string, unknown>) => bayesianMonitoring.cost(parse(raw)).milliseconds;
    expect(cost({ limit: 0.2, maxN: 300 })).toBeGreaterThan(cost({ limit: 0.2, maxN: 100 }));
    expect(cost({ limit: 0.2, maxN: 300, trueRates: [0.1, 0.2, 0.3, 0.4, 0.5, 0.6] })).toBeGreaterThan(cost({ limit: 0.2, maxN: 300, trueRates: [0.1] }));
    const { thresholds: _search, ...given } = searched;
    expect(cost(searched)).toBeGreaterThan(cost(given));
  });
});
