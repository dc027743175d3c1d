/**
 * Gauss-Legendre quadrature rules of any order: nodes are the roots of the
 * Legendre polynomial P_n, found by Newton's method from Tricomi's initial
 * approximation, with weights 2 / ((1 - x²) P_n'(x)²) (Abramowitz & Stegun
 * 1964, 25.4.29; Davis & Rabinowitz 1984, Methods of Numerical Integration,
 * section 2.7). A fixed rule is exact for polynomials of degree 2n - 1 and
 * converges geometrically for analytic integrands, which is what a fast inner
 * loop needs; the adaptive integrator in quadrature.ts is the reference.
 */

export interface QuadratureRule {
  /** Nodes on [-1, 1], ascending. */
  nodes: Float64Array;
  weights: Float64Array;
}

const cache = new Map<number, QuadratureRule>();

/** The n-point rule on [-1, 1] (1 ≤ n ≤ 1000), computed once and cached. */
export function gaussLegendreRule(n: number): QuadratureRule {
  if (!Number.isInteger(n) || n < 1 || n > 1000) throw new RangeError("gaussLegendreRule: n must be an integer from 1 to 1000");
  const hit = cache.get(n);
  if (hit) return hit;
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  const half = Math.floor((n + 1) / 2);
  for (let i = 0; i < half; i++) {
    // Tricomi's approximation to the i-th largest root.
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      derivative = (n * (x * p1 - p0)) / (x * x - 1);
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    const w = 2 / ((1 - x * x) * derivative * derivative);
    nodes[n - 1 - i] = x;
    nodes[i] = x === 0 ? 0 : -x;
    weights[n - 1 - i] = w;
    weights[i] = w;
  }
  const rule = { nodes, weights };
  cache.set(n, rule);
  return rule;
}

/** ∫_a^b f(x) dx by the fixed n-point rule. */
export function integrateFixed(f: (x: number) => number, a: number, b: number, n: number): number {
  const { nodes, weights } = gaussLegendreRule(n);
  const centre = (a + b) / 2;
  const half = (b - a) / 2;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += weights[i]! * f(centre + half * nodes[i]!);
  return sum * half;
}
