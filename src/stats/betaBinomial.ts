/**
 * The beta-binomial distribution: the predictive distribution of the number of
 * events Y among m future patients when the event probability has a Beta(a, b)
 * distribution, P(Y = y) = C(m, y) B(y + a, m - y + b) / B(a, b)
 * (Johnson, Kemp & Kotz, Univariate Discrete Distributions, 3rd ed., 2005, chapter 6).
 * Probabilities are formed in log space from log B, so no term overflows for
 * the sizes of a clinical trial.
 */
import { logBeta } from "./beta.js";
import { logChoose } from "./binomial.js";

/**
 * P(Y = y) for Y ~ BetaBinomial(m, a, b).
 * @param y number of events, integer
 * @param m number of trials, integer ≥ 0
 * @param a first shape, > 0
 * @param b second shape, > 0
 */
export function betaBinomialPmf(y: number, m: number, a: number, b: number): number {
  if (y < 0 || y > m || !Number.isInteger(y)) return 0;
  return Math.exp(logChoose(m, y) + logBeta(y + a, m - y + b) - logBeta(a, b));
}

/**
 * All probabilities P(Y = 0..m), by the ratio
 * P(y + 1) / P(y) = (m - y)(y + a) / ((y + 1)(m - y - 1 + b)),
 * started from the mode so that no term underflows before it matters.
 */
export function betaBinomialPmfArray(m: number, a: number, b: number): Float64Array {
  const out = new Float64Array(m + 1);
  const mode = Math.min(m, Math.max(0, Math.round((m * a) / (a + b))));
  out[mode] = betaBinomialPmf(mode, m, a, b);
  for (let y = mode; y < m; y++) out[y + 1] = (out[y]! * ((m - y) * (y + a))) / ((y + 1) * (m - y - 1 + b));
  for (let y = mode; y > 0; y--) out[y - 1] = (out[y]! * (y * (m - y + b))) / ((m - y + 1) * (y - 1 + a));
  return out;
}

/**
 * P(Y ≥ y) for Y ~ BetaBinomial(m, a, b), summed over the shorter tail so
 * that the small tail keeps its relative precision.
 */
export function betaBinomialUpperTail(y: number, m: number, a: number, b: number): number {
  const k = Math.ceil(y);
  if (k <= 0) return 1;
  if (k > m) return 0;
  const pmf = betaBinomialPmfArray(m, a, b);
  let sum = 0;
  if (m - k + 1 <= k) {
    for (let j = k; j <= m; j++) sum += pmf[j]!;
    return Math.min(1, sum);
  }
  for (let j = 0; j < k; j++) sum += pmf[j]!;
  return Math.max(0, 1 - sum);
}
