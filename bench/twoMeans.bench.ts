import { bench } from "./harness.js";
import { twoMeans } from "../src/designs/twoMeans.js";

const base = twoMeans.input.parse(twoMeans.example);
bench("two-means: exact-t sample size (example, with power curve)", () => twoMeans.compute(base));
bench("two-means: normal sample size", () => twoMeans.compute({ ...base, method: "normal" }));
bench("two-means: exact-t equivalence (TOST by quadrature)", () =>
  twoMeans.compute(twoMeans.input.parse({ hypothesis: "equivalence", sides: 1, delta: 0.5, sd: 5, margin: 3, alpha: 0.05, power: 0.9 })), { runs: 5, warmup: 1 });
