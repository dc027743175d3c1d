import { bench } from "./harness.js";
import { bayesianMonitoring } from "../src/designs/bayesianMonitoring.js";

const run = (raw: unknown) => () => {
  const input = bayesianMonitoring.input.parse(raw);
  return bayesianMonitoring.document(input, bayesianMonitoring.compute(input));
};
bench("bayesian-monitoring: example (posterior, maxN 40), with report", run(bayesianMonitoring.example));
bench("bayesian-monitoring: posterior, every patient, maxN 300", run({ limit: 0.2, maxN: 300 }), { runs: 5, warmup: 1 });
bench("bayesian-monitoring: predictive, every patient, maxN 40", run({ rule: "predictive", p0: 0.2, p1: 0.4, priorA: 0.2, priorB: 0.8, maxN: 40, firstCheck: 10 }));
bench("bayesian-monitoring: predictive, every patient, maxN 300", run({ rule: "predictive", p0: 0.2, p1: 0.4, priorA: 0.2, priorB: 0.8, maxN: 300, firstCheck: 10 }), { runs: 5, warmup: 1 });
bench("bayesian-monitoring: predictive threshold search, maxN 40", run({ rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.4, priorA: 0.2, priorB: 0.8, maxN: 40, firstCheck: 10 }), { runs: 5, warmup: 1 });
bench("bayesian-monitoring: predictive threshold search, maxN 100", run({ rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.35, priorA: 0.2, priorB: 0.8, maxN: 100, firstCheck: 10 }), { runs: 3, warmup: 1 });
bench("bayesian-monitoring: predictive threshold search, maxN 300", run({ rule: "predictive", thresholds: "search", p0: 0.2, p1: 0.3, priorA: 0.2, priorB: 0.8, maxN: 300, firstCheck: 10 }), { runs: 3, warmup: 1 });
