/**
 * Student's t distribution (central).
 *
 * CDF through the incomplete beta function: for t > 0,
 * P(T > t) = I_{ν/(ν+t²)}(ν/2, 1/2) / 2 (Abramowitz & Stegun 1964, 26.7.1).
 * Quantile by safeguarded Newton iteration on the CDF.
 */
import { incompleteBeta } from "./beta.js";
import { normalQuantile } from "./normal.js";
import { findRoot } from "./rootFinding.js";

/** Upper tail P(T > t) with ν degrees of freedom. */
export function studentTSurvival(t: number, df: number): number {
  if (Number.isNaN(t)) return NaN;
  if (t === Infinity) return 0;
  if (t === -Infinity) return 1;
  const tail = incompleteBeta(df / (df + t * t), df / 2, 0.5).lower / 2;
  return t >= 0 ? tail : 1 - tail;
}

/** CDF P(T ≤ t) with ν degrees of freedom. */
export function studentTCdf(t: number, df: number): number {
  return studentTSurvival(-t, df);
}

/** Quantile: the t with P(T ≤ t) = p. */
export function studentTQuantile(p: number, df: number): number {
  if (p <= 0) return -Infinity;
  if (p >= 1) return Infinity;
  if (p === 0.5) return 0;
  if (p < 0.5) return -studentTQuantile(1 - p, df);
  const tail = 1 - p;
  // The normal quantile bounds the t quantile from below; widen until bracketed.
  const z = normalQuantile(p);
  let hi = Math.max(2 * z, 1);
  while (studentTSurvival(hi, df) > tail) hi *= 2;
  return findRoot((t) => studentTSurvival(t, df) - tail, z * 0.999, hi, { tolerance: 1e-14 });
}
