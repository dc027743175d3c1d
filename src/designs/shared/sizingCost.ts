/**
 * The work of the comparative designs' sizing (sizing.ts), counted in
 * evaluations of a design's power function before any is made, and the cost
 * of one evaluation of the power functions several designs share.
 *
 * The counts are upper bounds read off the algorithms:
 * - smallestSampleSize from m to M evaluates m, 2m, 4m, … up to M
 *   (⌈log2(M/m)⌉ + 1 sizes), the lower end of the last doubling if it was not
 *   one of them, and bisects at most M/2 sizes (⌈log2 M⌉ more);
 * - a power curve evaluates its CURVE_POINTS sizes and the design's own, an
 *   effect curve its points;
 * - detectableEffect evaluates both ends of its bracket, both again inside
 *   Brent's method, and at most ROOT_MAX_ITERATIONS iterations (10 to 70 in
 *   practice: the bound is loose, and cheap beside the budget).
 */
import { ROOT_MAX_ITERATIONS } from "../../stats/rootFinding.js";
import { CURVE_POINTS } from "./sizing.js";
import { formatCount } from "./workEstimate.js";

/**
 * CPU of one power evaluation. The noncentral t power (a t quantile and the
 * AS 243 series, both tails for a two-sided test) took 1 to 34 µs from 2 to
 * 10⁶ degrees of freedom, timed alone (the t quantile at 2 to 10 degrees of
 * freedom is the slowest part); within the searches of the heaviest
 * crossover-2x2 and factorial-2x2 cases of `npm run bench designs` an
 * evaluation took 5 to 25 µs. The normal power took up to 10 µs. These
 * designs' heaviest cases take a few milliseconds, far below the budget, so
 * the margins are generous.
 */
export const T_POWER_MS = 0.05;
export const NORMAL_POWER_MS = 0.01;

export const POWER_CURVE_EVALUATIONS = CURVE_POINTS + 1;
export const EFFECT_CURVE_EVALUATIONS = CURVE_POINTS;
export const DETECTABLE_EFFECT_EVALUATIONS = 4 + ROOT_MAX_ITERATIONS;

export function sizeSearchEvaluations(minimum: number, maximum: number): number {
  return Math.ceil(Math.log2(maximum / minimum)) + 2 + Math.ceil(Math.log2(maximum));
}

export type SolveFor = "sample-size" | "power" | "difference";

/**
 * Evaluations of the power function for the sizes, the power at them and the
 * power curve, searching up to `maximum` (per control arm or per sequence).
 */
export function sizingEvaluations(solveFor: SolveFor, maximum: number): number {
  switch (solveFor) {
    case "sample-size": return sizeSearchEvaluations(2, maximum) + POWER_CURVE_EVALUATIONS;
    case "power": return 1 + POWER_CURVE_EVALUATIONS;
    case "difference": return DETECTABLE_EFFECT_EVALUATIONS + 1 + POWER_CURVE_EVALUATIONS;
  }
}

/** What the evaluations of sizingEvaluations are for, in words. */
export function sizingWords(solveFor: SolveFor, maximum: number, unit: string): string {
  switch (solveFor) {
    case "sample-size": return `a search of sizes up to ${formatCount(maximum)} ${unit} and the power curve`;
    case "power": return "the power at the given sizes and the power curve";
    case "difference": return "a root search for the difference and the power curve";
  }
}
