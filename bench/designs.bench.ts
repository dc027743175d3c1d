// Every design's example, and its heaviest cases at the edge of the compute
// budget, timed in this process (wall and CPU medians). The example budget is
// 50 ms, except for simulations, whose figures are their own (crm.bench.ts,
// boin.bench.ts). Each heaviest case also prints its estimate, so the
// estimators can be checked against the CPU the computation really takes.
import { bench } from "./harness.js";
import { COMPUTE_BUDGET_MS } from "../src/designs/budget.js";
import { catalog } from "../src/designs/catalog.js";
import { InfeasibleDesignError } from "../src/designs/design.js";
import { budgetCases } from "../test/support/budgetCases/index.js";

const EXAMPLE_BUDGET_MS = 50;
/** Designs whose example is a seeded simulation; their figures are set per simulation size. */
const SIMULATIONS = new Set(["crm", "boin", "dose-finding-comparison"]);

/** Computes, counting a search that ends infeasible as done: the 422 comes after the whole search. */
function computeOrRefuse(compute: () => unknown): () => unknown {
  return () => {
    try {
      return compute();
    } catch (error) {
      if (error instanceof InfeasibleDesignError) return error;
      throw error;
    }
  };
}

console.log(`Compute budget of one calculation: ${COMPUTE_BUDGET_MS} ms of CPU`);
for (const design of catalog) {
  const example = design.input.parse(design.example);
  const simulated = SIMULATIONS.has(design.id);
  bench(`${design.id}: example${simulated ? " (simulation)" : ""}`, () => design.compute(example), simulated ? { runs: 5, warmup: 1 } : { budgetMs: EXAMPLE_BUDGET_MS });
}
for (const design of catalog) {
  for (const c of budgetCases[design.id]?.heaviest ?? []) {
    const inputs = design.input.parse(c.inputs);
    const result = bench(`${design.id}: ${c.name}`, computeOrRefuse(() => design.compute(inputs)), { runs: 3, warmup: 1, budgetMs: COMPUTE_BUDGET_MS });
    const estimate = design.cost(inputs);
    console.log(`${"".padEnd(60)} estimate ${estimate.milliseconds.toFixed(0)} ms; CPU/estimate ${(result.medianCpuMs / estimate.milliseconds).toFixed(2)}`);
  }
}
