/**
 * The power of the most powerful randomized level-alpha test of p0 against p1
 * on n binomial observations (Neyman-Pearson lemma): reject when X > k, and
 * with probability γ when X = k, so that the size is exactly alpha. No
 * non-randomized rule on at most n patients, one- or two-stage, can do better,
 * and it never falls as n grows (a larger trial may ignore patients), so it
 * bounds exact designs' sizes from below.
 */
import { binomialUpperTails } from "./twoStage.js";

export function mostPowerfulTestPower(n: number, p0: number, p1: number, alpha: number): number {
  const t0 = binomialUpperTails(n, p0);
  const t1 = binomialUpperTails(n, p1);
  let k = 0;
  while (t0[k + 1]! > alpha) k++;
  const atK0 = t0[k]! - t0[k + 1]!;
  const share = atK0 > 0 ? Math.min(1, (alpha - t0[k + 1]!) / atK0) : 0;
  return t1[k + 1]! + share * (t1[k]! - t1[k + 1]!);
}

/** Smallest n in [1, maxN] whose most powerful randomized test reaches the power, or null. */
export function smallestSizeForPower(maxN: number, p0: number, p1: number, alpha: number, power: number): number | null {
  if (mostPowerfulTestPower(maxN, p0, p1, alpha) < power) return null;
  let lo = 1;
  let hi = maxN;
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (mostPowerfulTestPower(mid, p0, p1, alpha) >= power) hi = mid; else lo = mid + 1;
  }
  return lo;
}
