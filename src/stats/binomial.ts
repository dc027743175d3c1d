/**
 * The binomial distribution: probabilities computed in log space from the
 * gamma function, tails summed exactly or through the incomplete beta identity
 * P(X ≥ k) = I_p(k, n - k + 1) (Abramowitz & Stegun 1964, 26.5.24).
 */
import { incompleteBeta } from "./beta.js";
import { logGamma } from "./gamma.js";

/** log C(n, k). */
export function logChoose(n: number, k: number): number {
  return logGamma(n + 1) - logGamma(k + 1) - logGamma(n - k + 1);
}

/** P(X = k) for X ~ Binomial(n, p). */
export function binomialPmf(k: number, n: number, p: number): number {
  if (k < 0 || k > n || !Number.isInteger(k)) return 0;
  if (p === 0) return k === 0 ? 1 : 0;
  if (p === 1) return k === n ? 1 : 0;
  return Math.exp(logChoose(n, k) + k * Math.log(p) + (n - k) * Math.log1p(-p));
}

/**
 * All probabilities P(X = 0..n), by the stable multiplicative recurrence started
 * from the mode so that no term underflows before it matters.
 */
export function binomialPmfArray(n: number, p: number): Float64Array {
  const out = new Float64Array(n + 1);
  if (p === 0) { out[0] = 1; return out; }
  if (p === 1) { out[n] = 1; return out; }
  const mode = Math.min(n, Math.floor((n + 1) * p));
  out[mode] = binomialPmf(mode, n, p);
  const ratio = p / (1 - p);
  for (let k = mode + 1; k <= n; k++) out[k] = (out[k - 1]! * ((n - k + 1) / k)) * ratio;
  for (let k = mode - 1; k >= 0; k--) out[k] = (out[k + 1]! * ((k + 1) / (n - k))) / ratio;
  return out;
}

/** P(X ≤ k). */
export function binomialCdf(k: number, n: number, p: number): number {
  if (k < 0) return 0;
  if (k >= n) return 1;
  const kk = Math.floor(k);
  return incompleteBeta(p, kk + 1, n - kk).upper;
}

/** P(X ≥ k). */
export function binomialUpperTail(k: number, n: number, p: number): number {
  if (k <= 0) return 1;
  if (k > n) return 0;
  const kk = Math.ceil(k);
  return incompleteBeta(p, kk, n - kk + 1).lower;
}
