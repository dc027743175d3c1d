/**
 * Fisher's exact test for a 2×2 table of two independent binomial samples
 * (Fisher 1935, Journal of the Royal Statistical Society 98:39-82), and its exact power
 * by full enumeration of both binomials.
 *
 * Given the total number of successes t, the experimental-arm count X2 is
 * hypergeometric under H0: p1 = p2. One-sided ("greater": experimental higher)
 * p-value P(X2 ≥ x2 | t). Two-sided p-value by probability ordering: the sum of
 * the conditional probabilities of all tables no more probable than the one
 * observed, with a relative tie tolerance of 1e-7 so that tables equal in exact
 * arithmetic count as equal in floating point (the convention of R's
 * stats::fisher.test, which most trial statisticians will run).
 *
 * Power = Σ_t Σ_{x2 rejected given t} b(t − x2; n1, p1) b(x2; n2, p2): every one
 * of the (n1 + 1)(n2 + 1) tables is visited once, so the cost is O(n1 n2).
 */
import { binomialPmfArray, logChoose } from "./binomial.js";

export type FisherAlternative = "greater" | "two-sided";

const RELATIVE_TIE = 1 + 1e-7;

/**
 * Conditional null distribution of X2 given t, unnormalized (mode = 1), written
 * into `out[0..m)` for x2 = lo..lo+m-1, with its total. Built by the ratio
 * recurrence from the mode, so no term underflows before it is negligible;
 * leaving it unnormalized saves a pass (every comparison below is scaled).
 */
function conditionalNull(n1: number, n2: number, t: number, out: Float64Array): { lo: number; m: number; total: number } {
  const lo = Math.max(0, t - n1);
  const hi = Math.min(t, n2);
  const m = hi - lo + 1;
  const mode = Math.min(hi, Math.max(lo, Math.floor(((t + 1) * (n2 + 1)) / (n1 + n2 + 2))));
  out[mode - lo] = 1;
  let sum = 1;
  for (let x = mode; x < hi; x++) {
    const v = out[x - lo]! * (((n2 - x) * (t - x)) / ((x + 1) * (n1 - t + x + 1)));
    out[x + 1 - lo] = v;
    sum += v;
  }
  for (let x = mode; x > lo; x--) {
    const v = out[x - lo]! * ((x * (n1 - t + x)) / ((n2 - x + 1) * (t - x + 1)));
    out[x - 1 - lo] = v;
    sum += v;
  }
  return { lo, m, total: sum };
}

/**
 * Rejection region given t, as offsets into the support: reject offsets ≤ lower
 * or ≥ upper (lower = -1 and upper = m mean no rejection in that tail).
 * `level` is alpha times the total of the unnormalized f.
 */
function regionGivenTotal(f: Float64Array, m: number, level: number, alternative: FisherAlternative): { lower: number; upper: number } {
  if (alternative === "greater") {
    let tail = 0;
    let upper = m;
    for (let i = m - 1; i >= 0; i--) {
      tail += f[i]!;
      if (tail > level) break;
      upper = i;
    }
    return { lower: -1, upper };
  }
  // The distribution is unimodal, so merging from both ends visits tables in
  // increasing probability; the p-value is non-decreasing along that order and
  // the rejection region is its longest prefix with p-value ≤ alpha.
  let left = 0, right = m - 1;
  let sumLeft = 0, sumRight = m - 1, pValue = 0;
  let lower = -1, upper = m;
  while (left <= right) {
    const takeLeft = f[left]! <= f[right]!;
    const threshold = (takeLeft ? f[left]! : f[right]!) * RELATIVE_TIE;
    while (sumLeft <= sumRight) {
      const a = f[sumLeft]!, b = f[sumRight]!;
      if (a <= b) {
        if (a > threshold) break;
        pValue += a; sumLeft++;
      } else {
        if (b > threshold) break;
        pValue += b; sumRight--;
      }
    }
    if (pValue > level) break;
    if (takeLeft) { lower = left; left++; } else { upper = right; right--; }
  }
  return { lower, upper };
}

/**
 * Exact power of Fisher's exact test at level alpha.
 * @param n1 control-arm size, p1 its true success probability
 * @param n2 experimental-arm size, p2 its true success probability
 */
export function fisherExactPower(n1: number, n2: number, p1: number, p2: number, alpha: number, alternative: FisherAlternative): number {
  const b1 = binomialPmfArray(n1, p1);
  const b2 = binomialPmfArray(n2, p2);
  const f = new Float64Array(Math.min(n1, n2) + 1);
  let power = 0;
  for (let t = 0; t <= n1 + n2; t++) {
    const { lo, m, total } = conditionalNull(n1, n2, t, f);
    const { lower, upper } = regionGivenTotal(f, m, alpha * total, alternative);
    for (let i = 0; i <= lower; i++) power += b1[t - lo - i]! * b2[lo + i]!;
    for (let i = upper; i < m; i++) power += b1[t - lo - i]! * b2[lo + i]!;
  }
  return Math.min(1, power);
}

/**
 * Fisher's exact p-value for x1 successes of n1 (control) and x2 of n2
 * (experimental), computed directly from log binomial coefficients.
 */
export function fisherExactPValue(x1: number, n1: number, x2: number, n2: number, alternative: FisherAlternative): number {
  const t = x1 + x2;
  const lo = Math.max(0, t - n1);
  const hi = Math.min(t, n2);
  const logs: number[] = [];
  for (let x = lo; x <= hi; x++) logs.push(logChoose(n2, x) + logChoose(n1, t - x));
  const top = Math.max(...logs);
  const d = logs.map((l) => Math.exp(l - top));
  const total = d.reduce((s, v) => s + v, 0);
  const observed = d[x2 - lo]!;
  let p = 0;
  for (let i = 0; i < d.length; i++) {
    if (alternative === "greater" ? lo + i >= x2 : d[i]! <= observed * RELATIVE_TIE) p += d[i]!;
  }
  return Math.min(1, p / total);
}
