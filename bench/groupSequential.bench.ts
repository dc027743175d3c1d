import { bench } from "./harness.js";
import { groupSequential } from "../src/designs/groupSequential.js";
import { planGroupSequential } from "../src/designs/shared/groupSequentialPlan.js";
import { spendingBoundaries, futilityAndDrift } from "../src/stats/groupSequentialBoundaries.js";
import { errorSpent } from "../src/stats/spending.js";

const ten = Array.from({ length: 10 }, (_, i) => (i + 1) / 10);
const spec = {
  informationFractions: ten,
  efficacyBoundary: "obrien-fleming-type" as const,
  efficacyGamma: -4,
  futilityBoundary: "hwang-shih-decani" as const,
  futilityGamma: -2,
  alpha: 0.025,
  power: 0.9,
  sides: 1 as const,
};
bench("group-sequential: K = 10 boundaries with futility (efficacy + beta spending + drift)", () => {
  const upper = spendingBoundaries(ten, ten.map((t) => errorSpent({ family: "obrien-fleming-type" }, 0.025, t)), 1);
  futilityAndDrift(ten, upper, ten.map((t) => errorSpent({ family: "hwang-shih-decani", gamma: -2 }, 0.1, t)), 1, 0.9);
}, { budgetMs: 50 });
bench("group-sequential: K = 10 full plan with futility (boundaries, exit probabilities, expected information)", () => planGroupSequential(spec), { budgetMs: 50 });
bench("group-sequential: K = 10 two-sided with futility, full plan", () => planGroupSequential({ ...spec, sides: 2, alpha: 0.05 }));
bench("group-sequential: K = 5 classical Pocock, full plan", () => planGroupSequential({ ...spec, informationFractions: ten.filter((_, i) => i % 2 === 1), efficacyBoundary: "pocock", futilityBoundary: "none" }));
const example = groupSequential.input.parse(groupSequential.example);
bench("group-sequential: the catalog example (K = 4, futility)", () => groupSequential.compute(example));
