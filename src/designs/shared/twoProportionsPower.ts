/**
 * Power of the comparison of two independent proportions, shared by every
 * design that compares response or event rates between arms.
 *
 * Rates are oriented so that higher is better (a design whose outcome is an
 * event passes 1 - p); p1 is control, p2 experimental, Δ = p2 - p1, and the null
 * difference is 0 (superiority) or -margin (non-inferiority).
 *
 * - Normal approximation (Fleiss, Levin & Paik 2003, §4.2 and §4.4): the test
 *   statistic's variance is taken under H0 and the estimate's under H1, so
 *   power = Φ((Δ - Δ0 - z σ0) / σ1), σ1² = p1q1/n1 + p2q2/n2, σ0² the same at
 *   the rates restricted to the null. Under Δ0 = 0 the restricted rates are the
 *   pooled rate p̄ = (n1p1 + n2p2)/(n1 + n2); under Δ0 = -margin they are the
 *   maximum-likelihood rates on the null boundary (Farrington & Manning 1990,
 *   Statistics in Medicine 9:1447-1454), at their large-sample limits.
 * - Continuity correction: |p̂2 - p̂1| is reduced by (1/n1 + 1/n2)/2, which is
 *   exactly what the Fleiss, Tytun & Ury (1980, Biometrics 36:343-346) sample
 *   size n' = (n/4)(1 + √(1 + 2(k + 1)/(k n |Δ - Δ0|)))² inverts.
 * - Exact: Fisher's exact test (src/stats/fisherExact.ts), superiority only:
 *   it tests equality of the proportions, not a shifted null.
 * - Two-sided power counts both tails.
 */
import { fisherExactPower } from "../../stats/fisherExact.js";
import { normalCdf, normalQuantile } from "../../stats/normal.js";
import type { ArmSizes } from "./sizing.js";

export type ProportionsHypothesis = "superiority" | "non-inferiority";
export type ProportionsMethod = "normal" | "normal-corrected" | "fisher-exact";

export interface ProportionsTest {
  hypothesis: ProportionsHypothesis;
  sides: 1 | 2;
  alpha: number;
  /** Non-inferiority margin on the risk difference (positive); ignored for superiority. */
  margin?: number | undefined;
}

/** The difference under the null hypothesis, on the higher-is-better scale. */
export function nullDifference(test: ProportionsTest): number {
  return test.hypothesis === "non-inferiority" ? -(test.margin ?? 0) : 0;
}

/**
 * Maximum-likelihood rates under the constraint p2 - p1 = nullDiff, evaluated at
 * the rates p1, p2 (the closed-form root of the likelihood cubic, Farrington &
 * Manning 1990, §2; Miettinen & Nurminen 1985).
 */
export function restrictedRates(p1: number, n1: number, p2: number, n2: number, nullDiff: number): [number, number] {
  if (nullDiff === 0) {
    const pooled = (n1 * p1 + n2 * p2) / (n1 + n2);
    return [pooled, pooled];
  }
  // Farrington & Manning's notation: group A (here experimental) minus group B
  // (control) equals d0 under H0, θ = nB / nA.
  const theta = n1 / n2;
  const d0 = nullDiff;
  const a = 1 + theta;
  const b = -(1 + theta + p2 + theta * p1 + d0 * (theta + 2));
  const c = d0 * d0 + d0 * (2 * p2 + theta + 1) + p2 + theta * p1;
  const d = -p2 * d0 * (1 + d0);
  const v = b ** 3 / (27 * a ** 3) - (b * c) / (6 * a * a) + d / (2 * a);
  const u = (v >= 0 ? 1 : -1) * Math.sqrt(Math.max(0, (b * b) / (9 * a * a) - c / (3 * a)));
  const cosine = u === 0 ? 0 : Math.max(-1, Math.min(1, v / u ** 3));
  const w = (Math.PI + Math.acos(cosine)) / 3;
  const pA = 2 * u * Math.cos(w) - b / (3 * a);
  return [pA - d0, pA];
}

/** Standard deviations of p̂2 - p̂1 under H0 (restricted) and under H1. */
export function differenceStandardErrors(p1: number, p2: number, arms: ArmSizes, nullDiff: number): { null: number; alternative: number } {
  const [r1, r2] = restrictedRates(p1, arms.n1, p2, arms.n2, nullDiff);
  return {
    null: Math.sqrt((r1 * (1 - r1)) / arms.n1 + (r2 * (1 - r2)) / arms.n2),
    alternative: Math.sqrt((p1 * (1 - p1)) / arms.n1 + (p2 * (1 - p2)) / arms.n2),
  };
}

/** Normal-approximation power, with or without the continuity correction. */
export function twoProportionsPowerNormal(p1: number, p2: number, arms: ArmSizes, test: ProportionsTest, continuityCorrection: boolean): number {
  const d0 = nullDifference(test);
  const se = differenceStandardErrors(p1, p2, arms, d0);
  const correction = continuityCorrection ? (1 / arms.n1 + 1 / arms.n2) / 2 : 0;
  const delta = p2 - p1;
  if (test.hypothesis === "superiority" && test.sides === 2) {
    const z = normalQuantile(1 - test.alpha / 2);
    return normalCdf((delta - correction - z * se.null) / se.alternative) + normalCdf((-delta - correction - z * se.null) / se.alternative);
  }
  const z = normalQuantile(1 - test.alpha);
  return normalCdf((delta - d0 - correction - z * se.null) / se.alternative);
}

/** Exact power of Fisher's exact test (superiority; one-sided looks for p2 > p1). */
export function twoProportionsPowerFisher(p1: number, p2: number, arms: ArmSizes, test: ProportionsTest): number {
  if (test.hypothesis !== "superiority") throw new RangeError("Fisher's exact test has no non-inferiority form");
  return fisherExactPower(arms.n1, arms.n2, p1, p2, test.alpha, test.sides === 2 ? "two-sided" : "greater");
}

/** Power by the named method. */
export function twoProportionsPower(p1: number, p2: number, arms: ArmSizes, test: ProportionsTest, method: ProportionsMethod): number {
  switch (method) {
    case "normal": return twoProportionsPowerNormal(p1, p2, arms, test, false);
    case "normal-corrected": return twoProportionsPowerNormal(p1, p2, arms, test, true);
    case "fisher-exact": return twoProportionsPowerFisher(p1, p2, arms, test);
  }
}

/**
 * Unrounded control-arm size from the closed form (Fleiss, Levin & Paik 2003,
 * eq. 4.19 for allocation ratio k = n2/n1; Fleiss, Tytun & Ury 1980 with the
 * correction): n1 = [z_α σ0 + z_β σ1]² / (Δ - Δ0)², σ0 and σ1 per unit n1.
 * Counts one tail only; a fixed-design size that a group-sequential inflation
 * factor can multiply.
 */
export function twoProportionsControlSize(p1: number, p2: number, test: ProportionsTest, allocationRatio: number, power: number, continuityCorrection: boolean): number {
  const d0 = nullDifference(test);
  const unit = { n1: 1, n2: allocationRatio };
  const se = differenceStandardErrors(p1, p2, unit, d0);
  const zAlpha = normalQuantile(1 - (test.hypothesis === "superiority" && test.sides === 2 ? test.alpha / 2 : test.alpha));
  const zBeta = normalQuantile(power);
  const effect = Math.abs(p2 - p1 - d0);
  const n = (zAlpha * se.null + zBeta * se.alternative) ** 2 / effect ** 2;
  if (!continuityCorrection) return n;
  const k = allocationRatio;
  return (n / 4) * (1 + Math.sqrt(1 + (2 * (k + 1)) / (k * n * effect))) ** 2;
}
