/**
 * Inference at the end of a two-stage single-arm binomial trial (Simon-type
 * rule, see twoStage.ts), where the plain proportion is biased by the stop.
 *
 * Outcomes are (stage, total responses s). The stage-wise ordering (Fairbanks
 * & Madsen 1982) places every stop after stage 1 below every trial that went
 * on to stage 2, then orders by s within a stage. The p-value is
 * P_p0(outcome ≥ observed); the exact two-sided interval inverts it with equal
 * tails, each probability increasing in p because the events are increasing in
 * the responses (Koyama & Chen 2008, Statistics in Medicine 27:3145-3154).
 * The UMVUE is E[first patient's response | stage, s], the Rao-Blackwell
 * estimate given the complete sufficient statistic (Jung & Kim 2004,
 * Statistics in Medicine 23:881-896): x1/n1 after a stop, otherwise
 * Σ C(n1-1, x1-1) C(n2, s-x1) / Σ C(n1, x1) C(n2, s-x1) over the x1 > r1
 * consistent with s.
 */
import { binomialPmfArray, logChoose } from "../../stats/binomial.js";
import { findRoot } from "../../stats/rootFinding.js";
import { binomialUpperTails, type TwoStageRule } from "./twoStage.js";

export interface TwoStageOutcome {
  stage: 1 | 2;
  /** Total responses among the patients treated (n1 after a stop, n otherwise). */
  responses: number;
}

/** P_p(outcome ≥ observed) in the stage-wise ordering. */
export function probabilityAtLeast(rule: TwoStageRule, outcome: TwoStageOutcome, p: number): number {
  if (outcome.stage === 1) return binomialUpperTails(rule.n1, p)[outcome.responses]!;
  const n2 = rule.n - rule.n1;
  const stage1 = binomialPmfArray(rule.n1, p);
  const stage2 = binomialUpperTails(n2, p);
  let total = 0;
  for (let x = rule.r1 + 1; x <= rule.n1; x++) {
    const need = outcome.responses - x;
    total += stage1[x]! * (need <= 0 ? 1 : need > n2 ? 0 : stage2[need]!);
  }
  return Math.min(1, total);
}

/** P_p(outcome ≤ observed) in the stage-wise ordering. */
export function probabilityAtMost(rule: TwoStageRule, outcome: TwoStageOutcome, p: number): number {
  const stage1 = binomialPmfArray(rule.n1, p);
  if (outcome.stage === 1) {
    let total = 0;
    for (let x = 0; x <= outcome.responses; x++) total += stage1[x]!;
    return Math.min(1, total);
  }
  const n2 = rule.n - rule.n1;
  const stage2Tail = binomialUpperTails(n2, p);
  let total = 0;
  for (let x = 0; x <= rule.r1; x++) total += stage1[x]!;
  for (let x = rule.r1 + 1; x <= rule.n1; x++) {
    const most = outcome.responses - x;
    total += stage1[x]! * (most < 0 ? 0 : most >= n2 ? 1 : 1 - stage2Tail[most + 1]!);
  }
  return Math.min(1, total);
}

export function isLowestOutcome(outcome: TwoStageOutcome): boolean {
  return outcome.stage === 1 && outcome.responses === 0;
}

export function isHighestOutcome(rule: TwoStageRule, outcome: TwoStageOutcome): boolean {
  return outcome.stage === 2 && outcome.responses === rule.n;
}

/** Exact two-sided interval at `level`, (1 - level)/2 in each tail. */
export function stagewiseInterval(rule: TwoStageRule, outcome: TwoStageOutcome, level: number): [number, number] {
  const tail = (1 - level) / 2;
  const edge = 1e-15;
  const lower = isLowestOutcome(outcome)
    ? 0
    : findRoot((p) => probabilityAtLeast(rule, outcome, p) - tail, edge, 1 - edge, { tolerance: 1e-13 });
  const upper = isHighestOutcome(rule, outcome)
    ? 1
    : findRoot((p) => probabilityAtMost(rule, outcome, p) - tail, edge, 1 - edge, { tolerance: 1e-13 });
  return [lower, upper];
}

/** The uniformly minimum variance unbiased estimate of the response rate. */
export function umvue(rule: TwoStageRule, outcome: TwoStageOutcome): number {
  if (outcome.stage === 1) return outcome.responses / rule.n1;
  const n2 = rule.n - rule.n1;
  const s = outcome.responses;
  const from = Math.max(rule.r1 + 1, s - n2);
  const to = Math.min(rule.n1, s);
  const logWeights: number[] = [];
  for (let x = from; x <= to; x++) logWeights.push(logChoose(rule.n1, x) + logChoose(n2, s - x));
  const top = Math.max(...logWeights);
  let numerator = 0;
  let denominator = 0;
  logWeights.forEach((lw, i) => {
    const w = Math.exp(lw - top);
    numerator += (w * (from + i)) / rule.n1;
    denominator += w;
  });
  return numerator / denominator;
}

/** Every outcome the rule can end in, lowest first in the stage-wise ordering. */
export function allOutcomes(rule: TwoStageRule): TwoStageOutcome[] {
  const out: TwoStageOutcome[] = [];
  for (let s = 0; s <= rule.r1; s++) out.push({ stage: 1, responses: s });
  for (let s = rule.r1 + 1; s <= rule.n; s++) out.push({ stage: 2, responses: s });
  return out;
}

/** Probability of each outcome of allOutcomes(rule) when the true rate is p. */
export function outcomeProbabilities(rule: TwoStageRule, p: number): number[] {
  const n2 = rule.n - rule.n1;
  const stage1 = binomialPmfArray(rule.n1, p);
  const stage2 = binomialPmfArray(n2, p);
  const probs: number[] = [];
  for (let s = 0; s <= rule.r1; s++) probs.push(stage1[s]!);
  for (let s = rule.r1 + 1; s <= rule.n; s++) {
    let total = 0;
    for (let x = Math.max(rule.r1 + 1, s - n2); x <= Math.min(rule.n1, s); x++) total += stage1[x]! * stage2[s - x]!;
    probs.push(total);
  }
  return probs;
}
