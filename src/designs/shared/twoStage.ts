/**
 * Operating characteristics of a two-stage single-arm binomial rule, by exact
 * enumeration of the stage-1 responses: enrol n1, stop if at most r1 respond;
 * otherwise enrol to n and declare promise if more than r respond in all
 * (Simon 1989, Controlled Clinical Trials 10:1-10).
 */
import { binomialPmfArray } from "../../stats/binomial.js";

/** Largest total size of a two-stage rule the service searches or evaluates (a search there takes 0.5 to 0.9 s of CPU: simon-two-stage budget cases). */
export const TWO_STAGE_MAX_N = 300;

export interface TwoStageRule {
  /** Stop after stage 1 when at most r1 of the first n1 respond. */
  r1: number;
  n1: number;
  /** Declare promise when more than r of all n respond. */
  r: number;
  n: number;
}

export interface TwoStagePoint {
  rate: number;
  probabilityOfEarlyTermination: number;
  probabilityOfPromise: number;
  expectedSampleSize: number;
}

/** T[k] = P(X ≥ k) for X ~ Binomial(m, p), k = 0..m+1, summed from the top so small tails keep their digits. */
export function binomialUpperTails(m: number, p: number): Float64Array {
  const pmf = binomialPmfArray(m, p);
  const tails = new Float64Array(m + 2);
  // Rounding in the sum can pass 1 by a few 1e-12 near the bottom; a probability cannot.
  for (let k = m; k >= 0; k--) tails[k] = Math.min(1, tails[k + 1]! + pmf[k]!);
  tails[0] = 1;
  return tails;
}

/** P(stop after stage 1), P(declare promise) and E(N) when the true response rate is `rate`. */
export function evaluateTwoStage(rule: TwoStageRule, rate: number): TwoStagePoint {
  const n2 = rule.n - rule.n1;
  const stage1 = binomialPmfArray(rule.n1, rate);
  const stage2 = binomialUpperTails(n2, rate);
  let early = 0;
  for (let x = 0; x <= rule.r1; x++) early += stage1[x]!;
  let promise = 0;
  for (let x = rule.r1 + 1; x <= rule.n1; x++) {
    const need = rule.r + 1 - x;
    promise += stage1[x]! * (need <= 0 ? 1 : need > n2 ? 0 : stage2[need]!);
  }
  early = Math.min(1, early);
  return {
    rate,
    probabilityOfEarlyTermination: early,
    probabilityOfPromise: Math.min(1, promise),
    expectedSampleSize: rule.n1 + (1 - early) * n2,
  };
}

/** The operating characteristics at p0 and p1 that a two-stage design is judged by. */
export interface TwoStageSummary extends TwoStageRule {
  alpha: number;
  power: number;
  probabilityOfEarlyTermination0: number;
  probabilityOfEarlyTermination1: number;
  expectedSampleSize0: number;
  expectedSampleSize1: number;
}

export function summarizeTwoStage(rule: TwoStageRule, p0: number, p1: number): TwoStageSummary {
  const at0 = evaluateTwoStage(rule, p0);
  const at1 = evaluateTwoStage(rule, p1);
  return {
    r1: rule.r1, n1: rule.n1, r: rule.r, n: rule.n,
    alpha: at0.probabilityOfPromise,
    power: at1.probabilityOfPromise,
    probabilityOfEarlyTermination0: at0.probabilityOfEarlyTermination,
    probabilityOfEarlyTermination1: at1.probabilityOfEarlyTermination,
    expectedSampleSize0: at0.expectedSampleSize,
    expectedSampleSize1: at1.expectedSampleSize,
  };
}

/** Rates 0, 0.02, ..., 1 plus p0 and p1, for the operating-characteristic chart. */
export function rateGrid(...extra: number[]): number[] {
  const rates = new Set<number>(extra);
  for (let i = 0; i <= 50; i++) rates.add(i / 50);
  return [...rates].sort((a, b) => a - b);
}
