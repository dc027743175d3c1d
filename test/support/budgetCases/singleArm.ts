// Single-arm and monitoring designs at the edge of their work. None of them
// can exceed the compute budget within its schema's bounds, so each says why
// instead of listing refused inputs. The times are CPU medians of 3 runs of
// these cases (process.cpuUsage) while other work shared the machine; the
// estimates are each design's cost() at its largest.
import type { BudgetCaseTable } from "./types.js";

export const singleArmCases: BudgetCaseTable = {
  "single-stage-binomial": {
    heaviest: [
      // The exact rule reaches the power 1,891 sizes after the randomized test does.
      { name: "a rare response, scanned from 2,232 to 4,123 patients", inputs: { p0: 0.0001, p1: 0.0002, alpha: 0.1, power: 0.2 } },
      { name: "a rare response, scanned from 3,979 to 4,990 patients", inputs: { p0: 0.00005, p1: 0.0006, alpha: 0.1, power: 0.8 } },
    ],
    overBudget: [],
    boundedBySchema: "The scan stops at 5,000 patients, so no input sums more than about 26 million binomial terms (estimated at 0.49 s for every input); the heaviest found scans 1,891 sizes in 0.16 to 0.19 s.",
  },
  "simon-two-stage": {
    heaviest: [
      // The only designs are at 300 patients, so nothing prunes the search before it.
      { name: "search up to 300 whose only design has 300 patients", inputs: { p0: 0.65, p1: 0.717, alpha: 0.05, power: 0.8, maxN: 300 } },
      { name: "search up to 299 whose smallest design has 298 patients", inputs: { p0: 0.7, p1: 0.755, alpha: 0.1, power: 0.8, maxN: 299 } },
      // Nothing within 299, so the whole search runs and then the totals above it are searched for the smallest maxN (a 422).
      // p1 = 0.7171, not 0.717: at 0.717 the most powerful test on 299 patients already falls short, so the search would stop before it starts.
      { name: "empty search up to 299, then the totals above it", inputs: { p0: 0.65, p1: 0.7171, alpha: 0.05, power: 0.8, maxN: 299 } },
    ],
    overBudget: [],
    boundedBySchema: "maxN is at most 300 and a search that finds nothing is continued over the larger totals only, so no input adds more than one search up to 300: 0.5 to 0.9 s for each of these cases (the empty search up to 299 as much as the search up to 300) as the machine's load varied, estimated at 1.38 s at most.",
  },
  "gehan-two-stage": {
    heaviest: [
      { name: "688 stage-1 patients, each row from a 99.99% upper limit", inputs: { p1: 0.01, beta: 0.001, targetSE: 0.01, confidenceLevel: 0.9999 } },
    ],
    overBudget: [],
    boundedBySchema: "p1 ≥ 0.01 and beta ≥ 0.001 allow at most 688 stage-1 patients, one beta quantile each: 7 to 16 ms, estimated at 37 ms at most.",
  },
  "two-stage-inference": {
    heaviest: [
      { name: "every outcome of 0/150 then 100/300, 99.9% intervals", inputs: { r1: 0, n1: 150, r: 100, n: 300, p0: 0.3, confidenceLevel: 0.999, stage1Responses: 40, stage2Responses: 50 } },
      { name: "every outcome of 100/200 then 120/300, 99.9% intervals", inputs: { r1: 100, n1: 200, r: 120, n: 300, p0: 0.5, confidenceLevel: 0.999, stage1Responses: 110, stage2Responses: 40 } },
    ],
    overBudget: [],
    boundedBySchema: "n is at most 300, so there are at most 301 outcomes, each with two root searches over 300 patients: 45 to 77 ms, estimated at 172 ms at most.",
  },
  "bayesian-monitoring": {
    heaviest: [
      {
        name: "predictive threshold search, 300 patients checked one by one, 30 rates",
        inputs: {
          rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.3, priorA: 0.2, priorB: 0.8, maxN: 300, cohortSize: 1, firstCheck: 1,
          trueRates: Array.from({ length: 30 }, (_, i) => (i + 1) / 31),
        },
      },
      {
        name: "posterior futility rule, 300 patients checked one by one, 30 rates",
        inputs: { rule: "posterior", monitor: "response", limit: 0.3, threshold: 0.95, maxN: 300, cohortSize: 1, trueRates: Array.from({ length: 30 }, (_, i) => (i + 1) / 31) },
      },
    ],
    overBudget: [],
    boundedBySchema: "maxN is at most 300 and a threshold search evaluates at most 440 pairs: the heaviest input takes 73 to 79 ms, estimated at 216 ms at most.",
  },
};
