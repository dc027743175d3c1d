import { bench } from "./harness.js";
import { boin } from "../src/designs/boin.js";

const plan = boin.input.parse({
  doses: ["10 mg", "20 mg", "40 mg", "70 mg", "100 mg"],
  target: 0.3,
  cohortSize: 3,
  maxSampleSize: 30,
  scenarios: [{ name: "MTD at dose 3", dltProbabilities: [0.05, 0.12, 0.3, 0.45, 0.6] }],
  trials: 10000,
  seed: 1,
});
bench("boin: 10,000 simulated trials, 30 patients, 5 doses", () => boin.compute(plan), { runs: 9, warmup: 2, budgetMs: 500 });
bench("boin: catalog example (2 scenarios × 1,000 trials)", () => boin.compute(boin.input.parse(boin.example)), { runs: 9, warmup: 2 });
bench("boin: next dose from data", () => boin.compute(boin.input.parse({
  use: "next-dose", doses: ["10 mg", "20 mg", "40 mg", "70 mg", "100 mg"], target: 0.3,
  data: [{ patients: 3, dlts: 0 }, { patients: 6, dlts: 1 }, { patients: 3, dlts: 2 }, { patients: 0, dlts: 0 }, { patients: 0, dlts: 0 }], currentDose: 3,
})));
