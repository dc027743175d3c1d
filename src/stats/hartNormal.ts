/**
 * A fast standard normal CDF for inner loops (the group-sequential recursion
 * evaluates it hundreds of thousands of times per design).
 *
 * Hart's double-precision rational approximation, algorithm 5666 (Hart et al.
 * 1968, Computer Approximations, Wiley), for |x| < 5√2, and a continued fraction
 * for the tail beyond, as arranged by West (2005, "Better approximations to
 * cumulative normal functions", Wilmott Magazine, 70-76). Absolute error below
 * 1e-15 everywhere; relative error about 1e-8 in the far tail (|x| > 6), which
 * `normalCdf` in normal.ts keeps to full precision when that matters.
 */

/** Standard normal CDF Φ(x), absolute error below 1e-15. */
export function hartNormalCdf(x: number): number {
  const a = Math.abs(x);
  let tail: number;
  if (a > 37) {
    tail = 0;
  } else {
    const e = Math.exp(-0.5 * a * a);
    if (a < 7.07106781186547) {
      let n = 3.52624965998911e-2 * a + 0.700383064443688;
      n = n * a + 6.37396220353165;
      n = n * a + 33.912866078383;
      n = n * a + 112.079291497871;
      n = n * a + 221.213596169931;
      n = n * a + 220.206867912376;
      let d = 8.83883476483184e-2 * a + 1.75566716318264;
      d = d * a + 16.064177579207;
      d = d * a + 86.7807322029461;
      d = d * a + 296.564248779674;
      d = d * a + 637.333633378831;
      d = d * a + 793.826512519948;
      d = d * a + 440.413735824752;
      tail = (e * n) / d;
    } else {
      let b = a + 0.65;
      b = a + 4 / b;
      b = a + 3 / b;
      b = a + 2 / b;
      b = a + 1 / b;
      tail = e / b / 2.506628274631;
    }
  }
  return x > 0 ? 1 - tail : tail;
}
