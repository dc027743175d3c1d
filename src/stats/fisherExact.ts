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
 * Power = Σ_t Σ_{x2 rejected given t} b(t − x2; n1, p1) b(x2; n2, p2), a full
 * enumeration of both binomials. Given t, only the part of the conditional
 * distribution that can decide a test at level alpha is computed (a few of its
 * standard deviations; the rest is rejected), and two-sided power is one minus
 * the probability of the short acceptance region, so the cost grows with
 * (n1 + n2) times that width rather than with n1 n2.
 */
import { binomialPmfArray, logChoose } from "./binomial.js";

export type FisherAlternative = "greater" | "two-sided";

const RELATIVE_TIE = 1 + 1e-7;

/**
 * The conditional distribution is log-concave, so beyond a point where the
 * ratio of successive probabilities is ρ < 1 the rest of the tail is at most
 * f·ρ/(1 − ρ). Once that is below this fraction of alpha × the running total,
 * the rest is rejected at any level in use and its p-values cannot move a
 * decision by more than rounding would; it is not computed.
 */
const NEGLIGIBLE_TAIL = 1e-13;

/**
 * Conditional null distribution of X2 given t, unnormalized (mode = 1), written
 * into `out` at offsets x2 - lo, computed outward from the mode by the ratio
 * recurrence and only as far as its tails matter at level alpha: offsets
 * first..last. Leaving it unnormalized and truncated keeps the cost near the
 * width of the distribution (a few standard deviations), not the support.
 */
function conditionalNull(n1: number, n2: number, t: number, alpha: number, out: Float64Array): { lo: number; m: number; first: number; last: number; total: number } {
  const lo = Math.max(0, t - n1);
  const hi = Math.min(t, n2);
  const mode = Math.min(hi, Math.max(lo, Math.floor(((t + 1) * (n2 + 1)) / (n1 + n2 + 2))));
  const negligible = NEGLIGIBLE_TAIL * alpha;
  out[mode - lo] = 1;
  let total = 1;
  let x = mode;
  while (x < hi) {
    const ratio = ((n2 - x) * (t - x)) / ((x + 1) * (n1 - t + x + 1));
    const v = out[x - lo]! * ratio;
    out[x + 1 - lo] = v;
    total += v;
    x++;
    if (ratio < 1 && (v * ratio) / (1 - ratio) < negligible * total) break;
  }
  const last = x - lo;
  x = mode;
  while (x > lo) {
    const ratio = (x * (n1 - t + x)) / ((n2 - x + 1) * (t - x + 1));
    const v = out[x - lo]! * ratio;
    out[x - 1 - lo] = v;
    total += v;
    x--;
    if (ratio < 1 && (v * ratio) / (1 - ratio) < negligible * total) break;
  }
  return { lo, m: hi - lo + 1, first: x - lo, last, total };
}

/**
 * Rejection region given t, as offsets into the support: reject offsets ≤ lower
 * or ≥ upper. Only f[first..last] is computed; the negligible offsets outside
 * it are rejected in the tails the test rejects (both for two-sided, the upper
 * for "greater"). `level` is alpha times the total of the unnormalized f.
 */
function regionGivenTotal(f: Float64Array, first: number, last: number, level: number, alternative: FisherAlternative): { lower: number; upper: number } {
  if (alternative === "greater") {
    let tail = 0;
    let upper = last + 1;
    for (let i = last; i >= first; i--) {
      tail += f[i]!;
      if (tail > level) break;
      upper = i;
    }
    return { lower: -1, upper };
  }
  // The distribution is unimodal, so merging from both ends visits tables in
  // increasing probability; the p-value is non-decreasing along that order and
  // the rejection region is its longest prefix with p-value ≤ alpha.
  let left = first, right = last;
  let sumLeft = first, sumRight = last, pValue = 0;
  let lower = first - 1, upper = last + 1;
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
  // Two-sided: the acceptance region lies inside the computed window, so its
  // probability is the short sum, and power is its complement (the tables'
  // probabilities sum to 1). One-sided: the rejected upper tail, summed directly.
  let sum = 0;
  for (let t = 0; t <= n1 + n2; t++) {
    const { lo, m, first, last, total } = conditionalNull(n1, n2, t, alpha, f);
    const { lower, upper } = regionGivenTotal(f, first, last, alpha * total, alternative);
    if (alternative === "two-sided") {
      for (let i = lower + 1; i < upper; i++) sum += b1[t - lo - i]! * b2[lo + i]!;
    } else {
      for (let i = upper; i < m; i++) sum += b1[t - lo - i]! * b2[lo + i]!;
    }
  }
  return Math.max(0, Math.min(1, alternative === "two-sided" ? 1 - sum : sum));
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
