/**
 * The search behind Simon's two-stage designs (Simon 1989, Controlled Clinical
 * Trials 10:1-10) and the admissible designs between them (Jung, Lee, Kim &
 * George 2004, Statistics in Medicine 23:561-569).
 *
 * For every stage-1 rule (n1, r1) the search walks the total size n upwards.
 * Two facts keep it from scanning r: the probability of declaring promise
 * falls as r rises, so the best r at each n is the smallest with alpha within
 * the limit; and adding one patient raises that smallest r by 0 or 1 (the
 * total grows by at most one), so one alpha evaluation per n suffices. Stage-1
 * probabilities are computed once per n1, second-stage tails once per n2.
 * A design matters only if its expected size under p0 is below that of every
 * design found at the same or a smaller n (otherwise that design is at least
 * as good on both n and E(N | p0), so it is neither optimal, minimax nor
 * admissible). E(N | p0) grows with n for a fixed stage 1 while that bound
 * only falls, so once a stage 1 fails it, larger n are skipped; power is only
 * computed for designs that pass it. r1 stops growing once P(X1 > r1 | p1) is
 * already below the target power.
 *
 * Before searching, the power of the most powerful randomized level-alpha
 * test on maxN patients (shared/powerCeiling.ts) bounds the power of every
 * two-stage rule up to maxN; below the target no design exists and the search
 * is skipped.
 *
 * Conventions: r1 ranges over 0..n1-1 (stage 1 can always stop the trial) and
 * n2 = n - n1 ≥ 1. Constraints are met within an absolute 1e-12, so that
 * rounding in the last digit does not flip a design on its boundary. Ties in
 * expected size at the same n keep the smaller n1, then the smaller r1.
 */
import { binomialPmfArray } from "../../stats/binomial.js";
import { binomialUpperTails, type TwoStageRule } from "./twoStage.js";
import { mostPowerfulTestPower } from "./powerCeiling.js";
import { singleStageRuleAt } from "./singleStageRule.js";
import { TARGET_SLACK } from "./responseRates.js";

export interface SimonTargets {
  p0: number;
  p1: number;
  alpha: number;
  power: number;
  maxN: number;
}

export interface SimonCandidate extends TwoStageRule {
  expectedSampleSize0: number;
}

export interface AdmissibleCandidate extends SimonCandidate {
  /** The design minimizes q·n + (1 - q)·E(N | p0) for every weight q in [lowestWeight, highestWeight]. */
  lowestWeight: number;
  highestWeight: number;
}

export interface SimonSearchResult {
  optimal: SimonCandidate;
  minimax: SimonCandidate;
  /** From the minimax design (highest weights) to the optimal one (weight 0). */
  admissible: AdmissibleCandidate[];
}

/**
 * The optimal, minimax and admissible designs; null when no design up to maxN meets the targets.
 *
 * `smallestN` skips totals below it, for a caller that already knows no
 * design with a smaller total meets the targets (a search up to smallestN - 1
 * came back empty): every skipped total would have stayed empty and bounded
 * nothing, so the designs found are those of the full search, without
 * repeating its work.
 */
export function searchSimon(t: SimonTargets, smallestN = 1): SimonSearchResult | null {
  const { p0, p1, maxN } = t;
  const alphaLimit = t.alpha + TARGET_SLACK;
  const powerLimit = t.power - TARGET_SLACK;
  if (smallestN > maxN || !searchCanSucceed(t)) return null;
  const tails0: Float64Array[] = [];
  const tails1: Float64Array[] = [];
  for (let m = 0; m < maxN; m++) {
    tails0.push(binomialUpperTails(m, p0));
    tails1.push(binomialUpperTails(m, p1));
  }
  const bestEN = new Float64Array(maxN + 1).fill(Infinity);
  const bestN1 = new Int32Array(maxN + 1);
  const bestR1 = new Int32Array(maxN + 1);
  const bestR = new Int32Array(maxN + 1);

  for (let n1 = 1; n1 < maxN; n1++) {
    const pmf0 = binomialPmfArray(n1, p0);
    const pmf1 = binomialPmfArray(n1, p1);
    const stage1Tail0 = tails0[n1]!;
    const stage1Tail1 = tails1[n1]!;
    for (let r1 = 0; r1 < n1; r1++) {
      // Power never exceeds the chance of passing stage 1.
      if (stage1Tail1[r1 + 1]! < powerLimit) break;
      const continue0 = stage1Tail0[r1 + 1]!;
      const firstN = Math.max(n1 + 1, smallestN);
      let bound = Infinity;
      for (let n = 1; n < firstN; n++) bound = Math.min(bound, bestEN[n]!);
      let r = r1;
      for (let n = firstN; n <= maxN; n++) {
        bound = Math.min(bound, bestEN[n]!);
        const en0 = n1 + continue0 * (n - n1);
        if (en0 >= bound) break;
        const n2 = n - n1;
        const second0 = tails0[n2]!;
        // Entering at a total above n1 + 1 there is no count from the last total to walk up from.
        if (n === firstN && n > n1 + 1) r = smallestCountWithinAlpha(pmf0, stage1Tail0, second0, r1, n1, n2, alphaLimit);
        while (promiseProbability(pmf0, stage1Tail0, second0, r1, n1, n2, r) > alphaLimit) r++;
        const pw = promiseProbability(pmf1, stage1Tail1, tails1[n2]!, r1, n1, n2, r);
        if (pw < powerLimit) continue;
        bestEN[n] = en0;
        bound = en0;
        bestN1[n] = n1;
        bestR1[n] = r1;
        bestR[n] = r;
      }
    }
  }

  // Per n, the best design not beaten by one at a smaller n: E(N | p0) falls along the list.
  const records: SimonCandidate[] = [];
  for (let n = 0; n <= maxN; n++) {
    const en0 = bestEN[n]!;
    if (Number.isFinite(en0) && (records.length === 0 || en0 < records[records.length - 1]!.expectedSampleSize0)) {
      records.push({ r1: bestR1[n]!, n1: bestN1[n]!, r: bestR[n]!, n, expectedSampleSize0: en0 });
    }
  }
  if (records.length === 0) return null;
  const minimax = records[0]!;
  const optimal = records[records.length - 1]!;
  return { optimal, minimax, admissible: admissibleDesigns(records, optimal) };
}

/** Whether a search up to t.maxN can run at all: the most powerful test on maxN patients reaches the power. */
export function searchCanSucceed(t: SimonTargets): boolean {
  return mostPowerfulTestPower(t.maxN, t.p0, t.p1, t.alpha + TARGET_SLACK) >= t.power - TARGET_SLACK;
}

/** How many of the largest sizes up to maxN surelyFindsDesign tries (each two binomial distributions). */
const WITNESS_SIZES = 8;

/**
 * Whether a search up to t.maxN is sure to find a design, without running it:
 * some single-stage rule "promising if at least R of n respond" on one of the
 * largest sizes n ≤ maxN meets the targets with R ≥ 2. The two-stage rule
 * that enrols n − R + 1, stops if none responds and is otherwise promising
 * above R − 1 responses of n has exactly its alpha and power (after no
 * stage-1 response the R − 1 stage-2 patients cannot reach R), and the search
 * covers it. False means only "not shown", not "no design".
 */
export function surelyFindsDesign(t: SimonTargets): boolean {
  for (let n = t.maxN; n >= Math.max(2, t.maxN - WITNESS_SIZES + 1); n--) {
    // Met without the search's 1e-12 slack, so that rounding in its sums cannot undo the witness.
    const rule = singleStageRuleAt(n, t.p0, t.p1, t.alpha - 2 * TARGET_SLACK);
    if (rule.r >= 2 && rule.r <= n && rule.power >= t.power) return true;
  }
  return false;
}

/**
 * At most how many binomial terms (the alpha and power sums of the candidate
 * rules) a search up to maxN adds: maxN⁴/16. The most counted, over inputs for
 * which no design exists so that nothing prunes the search, was 0.056·maxN⁴
 * at maxN = 50 and 0.048·maxN⁴ at 300 (an empty search up to 299 followed by
 * the search of total 300 included).
 */
export function searchTermsBound(maxN: number): number {
  return maxN ** 4 / 16;
}

/**
 * P(declare promise) of the rule (r1/n1, then r/n1 + n2) from the stage-1
 * distribution and the stage-2 upper tails: every X1 > r, plus X1 in (r1, r]
 * followed by at least r + 1 - X1 more.
 */
function promiseProbability(stage1Pmf: Float64Array, stage1Tail: Float64Array, stage2Tail: Float64Array, r1: number, n1: number, n2: number, r: number): number {
  let total = r + 1 <= n1 ? stage1Tail[r + 1]! : 0;
  const from = Math.max(r1 + 1, r + 1 - n2);
  const to = Math.min(n1, r);
  for (let x = from; x <= to; x++) total += stage1Pmf[x]! * stage2Tail[r + 1 - x]!;
  return total;
}

/** The smallest final count r in [r1, n1 + n2] keeping alpha, by bisection: promise falls as r rises, and is 0 at r = n1 + n2. */
function smallestCountWithinAlpha(pmf0: Float64Array, stage1Tail0: Float64Array, stage2Tail0: Float64Array, r1: number, n1: number, n2: number, alphaLimit: number): number {
  let lo = r1;
  let hi = n1 + n2;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (promiseProbability(pmf0, stage1Tail0, stage2Tail0, r1, n1, n2, mid) <= alphaLimit) hi = mid; else lo = mid + 1;
  }
  return lo;
}

/**
 * The designs that minimize q·n + (1 - q)·E(N | p0) for some q in [0, 1]: the
 * vertices of the lower convex hull of (n, smallest E(N | p0) at n), from the
 * minimax design to the optimal one. Points on a hull edge but not at a vertex
 * are best at a single weight only, where they tie with both neighbours, and
 * are left out.
 */
function admissibleDesigns(feasible: SimonCandidate[], optimal: SimonCandidate): AdmissibleCandidate[] {
  const hull: SimonCandidate[] = [];
  for (const d of feasible) {
    if (d.n > optimal.n) break;
    while (hull.length >= 2) {
      const a = hull[hull.length - 2]!;
      const b = hull[hull.length - 1]!;
      const cross = (b.n - a.n) * (d.expectedSampleSize0 - a.expectedSampleSize0) - (b.expectedSampleSize0 - a.expectedSampleSize0) * (d.n - a.n);
      if (cross <= 0) hull.pop(); else break;
    }
    hull.push(d);
  }
  // Neighbours on the hull tie at q = s/(1 + s), s the fall in E(N | p0) per extra patient.
  const tie = (a: SimonCandidate, b: SimonCandidate): number => {
    const s = (a.expectedSampleSize0 - b.expectedSampleSize0) / (b.n - a.n);
    return s / (1 + s);
  };
  return hull.map((d, i) => ({
    ...d,
    highestWeight: i === 0 ? 1 : tie(hull[i - 1]!, d),
    lowestWeight: i === hull.length - 1 ? 0 : tie(d, hull[i + 1]!),
  }));
}
