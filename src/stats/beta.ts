/**
 * The regularized incomplete beta function I_x(a, b) and the beta distribution.
 *
 * Continued fraction evaluated by the modified Lentz method, using the symmetry
 * I_x(a, b) = 1 - I_{1-x}(b, a) to stay where it converges fast
 * (Press et al., Numerical Recipes, 3rd ed., section 6.4; DiDonato & Morris 1992,
 * ACM TOMS 18:360-373 for the choice of side).
 */
import { logGamma, stirlingRemainder } from "./gamma.js";

const EPS = 1e-16;
const TINY = 1e-300;

/**
 * log B(a, b). When the larger shape is big, log Γ(a) - log Γ(a + b) is formed
 * from the Stirling series with log1p, since subtracting two large log-gammas
 * would lose up to six digits (the t distribution at 10⁵ degrees of freedom).
 */
export function logBeta(a: number, b: number): number {
  const big = Math.max(a, b);
  const small = Math.min(a, b);
  if (big < 15) return logGamma(a) + logGamma(b) - logGamma(a + b);
  const sum = big + small;
  const difference = -(big - 0.5) * Math.log1p(small / big) - small * Math.log(sum) + small +
    stirlingRemainder(big) - stirlingRemainder(sum);
  return logGamma(small) + difference;
}

function continuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 100000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) break;
  }
  return h;
}

/**
 * I_x(a, b) with its complement, each kept at full relative precision.
 * @param x point in [0, 1]
 * @param a first shape, > 0
 * @param b second shape, > 0
 */
export function incompleteBeta(x: number, a: number, b: number): { lower: number; upper: number } {
  if (x <= 0) return { lower: 0, upper: 1 };
  if (x >= 1) return { lower: 1, upper: 0 };
  const logFront = a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b);
  if (x < (a + 1) / (a + b + 2)) {
    const lower = (Math.exp(logFront) * continuedFraction(x, a, b)) / a;
    return { lower, upper: 1 - lower };
  }
  const upper = (Math.exp(logFront) * continuedFraction(1 - x, b, a)) / b;
  return { lower: 1 - upper, upper };
}

/** Beta(a, b) CDF. */
export function betaCdf(x: number, a: number, b: number): number {
  return incompleteBeta(x, a, b).lower;
}

/** Beta(a, b) upper tail P(X > x). */
export function betaSurvival(x: number, a: number, b: number): number {
  return incompleteBeta(x, a, b).upper;
}

/** Beta(a, b) density. */
export function betaDensity(x: number, a: number, b: number): number {
  if (x < 0 || x > 1) return 0;
  if (x === 0) return a < 1 ? Infinity : a === 1 ? 1 / Math.exp(logBeta(a, b)) : 0;
  if (x === 1) return b < 1 ? Infinity : b === 1 ? 1 / Math.exp(logBeta(a, b)) : 0;
  return Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - logBeta(a, b));
}

/** Beta(a, b) quantile by bisection refined with Newton steps; monotone and safe at the edges. */
export function betaQuantile(p: number, a: number, b: number): number {
  if (p <= 0) return 0;
  if (p >= 1) return 1;
  let lo = 0;
  let hi = 1;
  let x = a / (a + b);
  for (let i = 0; i < 200; i++) {
    const f = betaCdf(x, a, b) - p;
    if (Math.abs(f) < 1e-15) break;
    if (f > 0) hi = x; else lo = x;
    const dens = betaDensity(x, a, b);
    let next = dens > 0 && Number.isFinite(dens) ? x - f / dens : NaN;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - x) < 1e-16) { x = next; break; }
    x = next;
  }
  return x;
}
