// Comparative designs and group-sequential boundaries at the edge of their
// work. None of them can exceed the compute budget within its schema's bounds
// (searches stop at a fixed size, exact scans at 500 per arm, looks at 10), so
// each says why instead of listing refused inputs; the figures are medians
// from `npm run bench designs` and CPU medians on the reference machine while
// other work shared it.
import type { BudgetCaseTable } from "./types.js";

/** Ten looks bunched early, where the recursion's grids are widest apart. */
const earlyLooks = [0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07, 0.08, 0.09, 1];
const tenLooksWithFutility = {
  looks: 10, informationFractions: earlyLooks, efficacyBoundary: "obrien-fleming-type",
  futilityBoundary: "obrien-fleming-type", futilityGamma: -10,
};

export const comparativeCases: BudgetCaseTable = {
  "two-means": {
    heaviest: [
      // The answer, about 70,000 per control arm, puts most of the search above 10⁵ degrees of freedom.
      { name: "equivalence by exact t, margin 0.013 SD, 10 experimental per control", inputs: { hypothesis: "equivalence", sides: 1, delta: 0, sd: 1, margin: 0.013, alpha: 0.05, power: 0.9, allocationRatio: 10 } },
      { name: "detectable equivalence difference at 100,000 per arm", inputs: { solveFor: "difference", hypothesis: "equivalence", sides: 1, sd: 1, margin: 0.05, n1: 100000, n2: 100000, alpha: 0.000001, power: 0.9999 } },
      { name: "superiority with 10 interim looks bunched early, with futility", inputs: { delta: 0.5, sd: 1, alpha: 0.00001, power: 0.9999, interimLooks: tenLooksWithFutility } },
    ],
    overBudget: [],
    boundedBySchema: "Sizes stop at 100,000 per control arm and looks at 10, so no input needs more than 232 power evaluations and 10 looks of boundaries; the heaviest found, 10 interim looks with futility, takes 40 to 70 ms.",
  },
  "two-proportions": {
    heaviest: [
      // The target is first reached near 250 per arm, so the scan runs to its bound of 500.
      { name: "Fisher's exact scan reaching the target near 250 per arm", inputs: { method: "fisher-exact", p1: 0.3, p2: 0.42, power: 0.8 } },
      { name: "Fisher's exact scan first reaching the target at 489 per arm", inputs: { method: "fisher-exact", p1: 0.5, p2: 0.605, power: 0.9 } },
      { name: "Fisher's exact power at 1,000 per arm", inputs: { method: "fisher-exact", solveFor: "power", p1: 0.5, p2: 0.52, n1: 1000, n2: 1000, alpha: 0.000001 } },
    ],
    overBudget: [],
    boundedBySchema: "The exact sample-size scan stops at 500 per arm and exact power takes arms up to 1,000, so no input enumerates more than about 5 million terms; the heaviest found, a scan to 500 per arm, takes 0.15 to 0.25 s.",
  },
  "crossover-2x2": {
    heaviest: [
      { name: "detectable non-inferiority difference at 100,000 per sequence", inputs: { solveFor: "difference", hypothesis: "non-inferiority", sides: 1, withinSubjectSd: 0.001, margin: 0.1, alpha: 0.000001, power: 0.999999999999, n1: 100000, n2: 100000 } },
      { name: "detectable difference at 100,000 per sequence, two-sided", inputs: { solveFor: "difference", withinSubjectSd: 1, n1: 100000, n2: 100000, alpha: 0.05, power: 0.9999 } },
    ],
    overBudget: [],
    boundedBySchema: "Sizes stop at 100,000 per sequence, so no input needs more than 256 power evaluations; the heaviest found takes about 2 ms.",
  },
  "factorial-2x2": {
    heaviest: [
      { name: "power at 50,000 per cell with Holm, an interaction beyond the bound", inputs: { solveFor: "power", sd: 1, effectA: 0.001, effectB: 0.001, interaction: 0.0001, nPerCell: 50000, alpha: 0.000001, power: 0.01, multiplicity: "holm" } },
      { name: "sizes for small main effects with Holm, an interaction beyond the bound", inputs: { sd: 1, effectA: 0.05, effectB: 0.05, interaction: 0.001, multiplicity: "holm", alpha: 0.000001, power: 0.99 } },
    ],
    overBudget: [],
    boundedBySchema: "Each of the three size searches stops at 50,000 per cell, so no input needs more than about 400 power evaluations; the heaviest found takes about 2 ms.",
  },
  "time-to-event": {
    heaviest: [
      { name: "events for a median of 10 against 1,000 years, 10 interim looks with futility", inputs: { controlMedianYears: 1000, experimentalMedianYears: 10, accrualYears: 0.5, followUpYears: 1, alpha: 0.00001, power: 0.9999, interimLooks: tenLooksWithFutility } },
    ],
    overBudget: [],
    boundedBySchema: "The events and enrolment are closed forms and interim looks are at most 10, so no input needs more than 10 looks of boundaries; the heaviest found, 10 looks with futility, takes 40 to 65 ms.",
  },
  "group-sequential": {
    heaviest: [
      { name: "10 looks bunched early with futility, recomputed at 10 observed looks", inputs: { mode: "observed-looks", ...tenLooksWithFutility, sides: 2, alpha: 0.00001, power: 0.9999, observedFractions: [0.006, 0.012, 0.018, 0.024, 0.03, 0.036, 0.042, 0.048, 0.054, 0.06], lastObservedIsFinal: true } },
      { name: "10 looks bunched early with futility, one-sided, power 0.9999", inputs: { ...tenLooksWithFutility, sides: 1, alpha: 0.00001, power: 0.9999 } },
      { name: "10 classical O'Brien-Fleming looks with futility, γ = 10", inputs: { looks: 10, efficacyBoundary: "obrien-fleming", futilityBoundary: "hwang-shih-decani", futilityGamma: 10, sides: 2, alpha: 0.2, power: 0.99 } },
    ],
    overBudget: [],
    boundedBySchema: "Planned and observed looks are at most 10 each, so no input needs more than 20 looks of boundaries; the heaviest found, 10 planned and 10 observed looks with futility, takes 75 to 95 ms.",
  },
};
