import { bench } from "./harness.js";
import { twoProportions } from "../src/designs/twoProportions.js";
import { fisherExactPower } from "../src/stats/fisherExact.js";

const parse = (inputs: Record<string, unknown>) => twoProportions.input.parse(inputs);
bench("two-proportions: example (Fisher exact scan, with curves)", () => twoProportions.compute(parse(twoProportions.example)), { runs: 5, warmup: 1 });
bench("two-proportions: normal sample size", () => twoProportions.compute(parse({ p1: 0.3, p2: 0.45 })));
bench("fisher exact power: one evaluation at 500 per arm, two-sided", () => fisherExactPower(500, 500, 0.3, 0.4, 0.05, "two-sided"));
bench("two-proportions: Fisher exact scan to the 500-per-arm bound", () => twoProportions.compute(parse({ p1: 0.2, p2: 0.3, method: "fisher-exact" })), { runs: 3, warmup: 1, budgetMs: 2000 });
bench("two-proportions: Fisher exact, infeasible (full scan, 422)", () => {
  try { twoProportions.compute(parse({ p1: 0.5, p2: 0.55, method: "fisher-exact" })); } catch { /* the 422 path */ }
}, { runs: 3, warmup: 1, budgetMs: 2000 });
