/**
 * Brent's method for a root of a continuous function on a bracketing interval
 * (Brent 1973, Algorithms for Minimization without Derivatives, chapter 4).
 */

/** Iterations of Brent's method unless a caller asks for others; each evaluates f once. */
export const ROOT_MAX_ITERATIONS = 200;

interface RootOptions {
  tolerance?: number;
  maxIterations?: number;
}

/**
 * @param f continuous function with f(lo) and f(hi) of opposite signs (or one zero)
 * @returns x in [lo, hi] with |f(x)| = 0 to within the tolerance on x
 * @example findRoot((x) => x * x - 2, 0, 2) // 1.41421356...
 */
export function findRoot(f: (x: number) => number, lo: number, hi: number, options: RootOptions = {}): number {
  const tol = options.tolerance ?? 1e-12;
  const maxIter = options.maxIterations ?? ROOT_MAX_ITERATIONS;
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa * fb > 0) throw new RangeError(`findRoot: f(${lo}) and f(${hi}) have the same sign`);
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let i = 0; i < maxIter; i++) {
    if (fb * fc > 0) {
      c = a; fc = fa; d = b - a; e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b; b = c; c = a;
      fa = fb; fb = fc; fc = fa;
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + tol / 2;
    const m = (c - b) / 2;
    if (Math.abs(m) <= tol1 || fb === 0) return b;
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q; else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m; e = m;
      }
    } else {
      d = m; e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : m > 0 ? tol1 : -tol1;
    fb = f(b);
  }
  return b;
}
