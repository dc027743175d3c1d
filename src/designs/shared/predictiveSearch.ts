/**
 * Choosing the thresholds of the predictive-probability design (Lee & Liu
 * 2008) for a fixed maximum size: every efficacy threshold θT and futility
 * threshold θL on a grid is evaluated exactly, and among the pairs with
 * alpha ≤ target and power ≥ target the one with the smallest expected size at
 * p0 is chosen (ties: higher power, then smaller θT, then smaller θL).
 * Lee & Liu search θT and θL, and Nmax, the same way; the grid and the
 * criterion at a given Nmax are this module's convention.
 *
 * θT acts only through the final count s it implies, so thresholds giving the
 * same s share one table of predictive probabilities.
 */
import { sequentialBinomial } from "../../stats/sequentialBinomial.js";
import { type BoundaryCheck, type PredictiveRule, finalSuccessCount, futilityBoundary, predictiveTable } from "./bayesianRules.js";

/** θT from 0.80 to 0.99 by 0.01. */
export const EFFICACY_GRID: readonly number[] = Array.from({ length: 20 }, (_, i) => (80 + i) / 100);
/** θL: 0.001, 0.005, then 0.01 to 0.20 by 0.01. */
export const FUTILITY_GRID: readonly number[] = [0.001, 0.005, ...Array.from({ length: 20 }, (_, i) => (i + 1) / 100)];

export interface ThresholdCandidate {
  efficacyThreshold: number;
  futilityThreshold: number;
  finalSuccessCount: number;
  alpha: number;
  power: number;
  expectedSizeAtP0: number;
  probabilityOfEarlyTerminationAtP0: number;
}

export interface ThresholdSearch {
  evaluated: number;
  feasible: number;
  chosen: ThresholdCandidate | null;
  /** Up to 10 feasible pairs, best first. */
  best: ThresholdCandidate[];
  /** When none is feasible: the most powerful pair with alpha at or below the target, if any. */
  mostPowerfulWithinAlpha: ThresholdCandidate | null;
}

/** Alpha, power and behaviour at p0 of one boundary with final count s. */
export function evaluatePredictive(rule: PredictiveRule, p1: number, s: number, boundary: readonly BoundaryCheck[]) {
  const regions = boundary.filter((c) => c.stopAt !== null).map((c) => ({ patients: c.patients, atMost: c.stopAt! }));
  const promising = (rate: number) => {
    const out = sequentialBinomial(rate, rule.maxN, regions);
    let p = 0;
    for (let x = s; x <= rule.maxN; x++) p += out.completed[x]!;
    return { promising: p, early: out.stopLow.reduce((a, b) => a + b, 0), size: out.expectedSampleSize };
  };
  const atP0 = promising(rule.p0);
  return { alpha: atP0.promising, power: promising(p1).promising, expectedSizeAtP0: atP0.size, probabilityOfEarlyTerminationAtP0: atP0.early };
}

/** Work of the search at most, in the units of the design's cost: recursions over the patients, tables of predictive probabilities, posterior tail probabilities. */
export interface ThresholdSearchWork {
  recursions: number;
  tables: number;
  posteriorProbabilities: number;
}

/** Every efficacy threshold giving its own final count, every pair evaluated at p0 and p1. */
export function thresholdSearchWork(maxN: number): ThresholdSearchWork {
  return {
    recursions: 2 * EFFICACY_GRID.length * FUTILITY_GRID.length,
    tables: EFFICACY_GRID.length,
    posteriorProbabilities: EFFICACY_GRID.length * (maxN + 1),
  };
}

const better = (a: ThresholdCandidate, b: ThresholdCandidate): number =>
  a.expectedSizeAtP0 - b.expectedSizeAtP0 || b.power - a.power || a.efficacyThreshold - b.efficacyThreshold || a.futilityThreshold - b.futilityThreshold;

export function searchThresholds(rule: PredictiveRule, p1: number, checks: readonly number[], alphaTarget: number, powerTarget: number): ThresholdSearch {
  const feasible: ThresholdCandidate[] = [];
  let evaluated = 0;
  let mostPowerful: ThresholdCandidate | null = null;
  const ceiling = FUTILITY_GRID[FUTILITY_GRID.length - 1]!;
  let previous: number | null = null;
  for (const efficacyThreshold of EFFICACY_GRID) {
    const s = finalSuccessCount(rule, efficacyThreshold);
    // s is non-decreasing in θT: a repeated s is the same design, already met at a smaller θT.
    if (s === null || s === 0 || s === previous) continue;
    previous = s;
    const table = predictiveTable(rule, s, checks, ceiling);
    for (const futilityThreshold of FUTILITY_GRID) {
      const boundary = futilityBoundary(table, checks, futilityThreshold);
      if (boundary.length > 0 && boundary[0]!.stopAt === boundary[0]!.patients) continue;
      evaluated++;
      const candidate: ThresholdCandidate = { efficacyThreshold, futilityThreshold, finalSuccessCount: s, ...evaluatePredictive(rule, p1, s, boundary) };
      if (candidate.alpha > alphaTarget) continue;
      if (candidate.power >= powerTarget) feasible.push(candidate);
      else if (!mostPowerful || candidate.power > mostPowerful.power) mostPowerful = candidate;
    }
  }
  feasible.sort(better);
  return { evaluated, feasible: feasible.length, chosen: feasible[0] ?? null, best: feasible.slice(0, 10), mostPowerfulWithinAlpha: feasible.length ? null : mostPowerful };
}
