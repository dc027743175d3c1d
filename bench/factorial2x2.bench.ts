import { bench } from "./harness.js";
import { factorial2x2 } from "../src/designs/factorial2x2.js";

const base = factorial2x2.input.parse(factorial2x2.example);
bench("factorial-2x2: exact-t means (example, with power curves)", () => factorial2x2.compute(base));
bench("factorial-2x2: proportions with Holm", () =>
  factorial2x2.compute(factorial2x2.input.parse({ outcome: "proportions", controlRate: 0.3, rateA: 0.4, rateB: 0.38, multiplicity: "holm" })));
bench("factorial-2x2: report document", () => factorial2x2.document(base, factorial2x2.compute(base)));
