/**
 * Error-spending functions: the cumulative type I (or type II) error allowed to
 * be spent by information fraction t, with f(0) = 0 and f(1) = total.
 *
 * - O'Brien-Fleming type: f(t) = 2 − 2Φ(Φ⁻¹(1 − total/2)/√t)  (Lan & DeMets 1983)
 * - Pocock type:          f(t) = total · log(1 + (e − 1) t)    (Lan & DeMets 1983)
 * - Hwang-Shih-DeCani:    f(t) = total · (1 − e^{−γt})/(1 − e^{−γ}), γ ≠ 0; total · t at γ = 0
 *                         (Hwang, Shih & DeCani 1990)
 *
 * `total` is the error spent in one direction: a two-sided test at level alpha
 * spends the function at alpha/2 in each tail (so the alpha spent in both tails
 * together is twice errorSpent(f, alpha/2, t)).
 */
import { normalCdf, normalQuantile } from "./normal.js";

export type SpendingFamily = "obrien-fleming-type" | "pocock-type" | "hwang-shih-decani";

export interface SpendingFunction {
  family: SpendingFamily;
  /** Only for Hwang-Shih-DeCani. */
  gamma?: number;
}

/** Cumulative error spent by information fraction t (t ≥ 1 spends the total). */
export function errorSpent(spending: SpendingFunction, total: number, t: number): number {
  if (t <= 0) return 0;
  if (t >= 1) return total;
  switch (spending.family) {
    case "obrien-fleming-type":
      return 2 * normalCdf(-normalQuantile(1 - total / 2) / Math.sqrt(t));
    case "pocock-type":
      return total * Math.log(1 + (Math.E - 1) * t);
    case "hwang-shih-decani": {
      const g = spending.gamma ?? 0;
      if (Math.abs(g) < 1e-12) return total * t;
      return total * (-Math.expm1(-g * t) / -Math.expm1(-g));
    }
  }
}
