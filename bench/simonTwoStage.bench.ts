import { bench } from "./harness.js";
import { simonTwoStage } from "../src/designs/simonTwoStage.js";
import { searchSimon } from "../src/designs/shared/simonSearch.js";
import { twoStageInference } from "../src/designs/twoStageInference.js";

// The search alone, then the whole design (search, summaries, curves).
const scenarios: Array<[string, { p0: number; p1: number; alpha: number; power: number }]> = [
  ["p0 0.1, p1 0.3, alpha 0.05, power 0.8", { p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8 }],
  ["p0 0.2, p1 0.4, alpha 0.05, power 0.9", { p0: 0.2, p1: 0.4, alpha: 0.05, power: 0.9 }],
  ["p0 0.5, p1 0.7, alpha 0.05, power 0.9", { p0: 0.5, p1: 0.7, alpha: 0.05, power: 0.9 }],
];
for (const [label, targets] of scenarios) {
  bench(`simon search maxN 100: ${label}`, () => searchSimon({ ...targets, maxN: 100 }), { budgetMs: 100 });
  bench(`simon search maxN 200: ${label}`, () => searchSimon({ ...targets, maxN: 200 }), { budgetMs: 1000, runs: 7 });
}
bench("simon search maxN 300 (the largest accepted): p0 0.5, p1 0.7", () => searchSimon({ p0: 0.5, p1: 0.7, alpha: 0.05, power: 0.9, maxN: 300 }), { runs: 5, warmup: 1 });
bench("simon-two-stage: the catalog example (maxN 60, full result)", () => simonTwoStage.compute(simonTwoStage.input.parse(simonTwoStage.example)));
bench("simon-two-stage: infeasible maxN 20, finding the smallest maxN", () => {
  try { simonTwoStage.compute(simonTwoStage.input.parse({ p0: 0.1, p1: 0.3, maxN: 20 })); } catch { /* expected */ }
});
bench("two-stage-inference: every outcome of 5/60, then 20/120", () =>
  twoStageInference.compute(twoStageInference.input.parse({ r1: 5, n1: 60, r: 20, n: 120, p0: 0.1, stage1Responses: 8, stage2Responses: 9 })), { runs: 7 });
