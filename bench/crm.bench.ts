import { bench } from "./harness.js";
import { COMPUTE_BUDGET_MS } from "../src/designs/budget.js";
import { crm } from "../src/designs/crm.js";

const doses = ["10 mg", "20 mg", "40 mg", "70 mg", "100 mg"];
const scenarios = [{ name: "MTD at dose 3", dltProbabilities: [0.05, 0.12, 0.25, 0.4, 0.55] }];
for (const model of ["power", "logistic"] as const) {
  const plan = crm.input.parse({ doses, target: 0.25, model, cohortSize: 3, maxSampleSize: 30, scenarios, trials: 10000, seed: 1 });
  bench(`crm (${model}): 10,000 simulated trials, 30 patients, 5 doses`, () => crm.compute(plan), { runs: 5, warmup: 1, budgetMs: 2000 });
}
{
  // The most trials of 150 patients one by one over 10 doses the compute budget admits (crm.cost): every trial runs to 150 patients.
  const tenDoses = Array.from({ length: 10 }, (_, i) => `dose ${i + 1}`);
  const plan = crm.input.parse({ doses: tenDoses, target: 0.25, cohortSize: 1, maxSampleSize: 150, trials: 365, seed: 1, scenarios: [{ name: "all safe", dltProbabilities: tenDoses.map(() => 0.001) }] });
  bench("crm: worst case at the compute budget (365 trials, 150 patients one by one, 10 doses)", () => crm.compute(plan), { runs: 3, warmup: 1, budgetMs: COMPUTE_BUDGET_MS });
}
bench("crm: catalog example (2 scenarios × 500 trials)", () => crm.compute(crm.input.parse(crm.example)), { runs: 5, warmup: 1 });
bench("crm: next dose with credible intervals (adaptive quadrature)", () => crm.compute(crm.input.parse({
  use: "next-dose", doses, target: 0.25,
  data: [{ patients: 3, dlts: 0 }, { patients: 6, dlts: 1 }, { patients: 3, dlts: 2 }, { patients: 0, dlts: 0 }, { patients: 0, dlts: 0 }],
})), { runs: 9 });
