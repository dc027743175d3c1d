/**
 * Weighted isotonic (non-decreasing) regression by the pool-adjacent-violators
 * algorithm (Ayer, Brunk, Ewing, Reid & Silverman 1955, Annals of Mathematical
 * Statistics 26:641-647; Barlow, Bartholomew, Bremner & Brunk 1972, Statistical
 * Inference under Order Restrictions, chapter 1).
 */

/**
 * The non-decreasing sequence f minimizing Σ wᵢ (yᵢ - fᵢ)².
 * @param values observations yᵢ in their order (dose order for dose finding)
 * @param weights positive weights wᵢ (patients per dose); all 1 when omitted
 * @returns the fitted values, one per observation
 * @example isotonicRegression([0.1, 0.4, 0.2], [3, 3, 6]) // [0.1, 0.2667, 0.2667]
 */
export function isotonicRegression(values: readonly number[], weights?: readonly number[]): number[] {
  const n = values.length;
  if (weights && weights.length !== n) throw new RangeError("isotonicRegression: one weight per value");
  // Blocks of pooled observations, kept as a stack: mean, total weight, count.
  const mean: number[] = [];
  const weight: number[] = [];
  const count: number[] = [];
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i]! : 1;
    if (!(w > 0)) throw new RangeError("isotonicRegression: weights must be positive");
    let m = values[i]!;
    let wt = w;
    let c = 1;
    // Pool backwards while the newest block violates the order.
    while (mean.length > 0 && mean[mean.length - 1]! >= m) {
      const pm = mean.pop()!;
      const pw = weight.pop()!;
      const pc = count.pop()!;
      m = (pm * pw + m * wt) / (pw + wt);
      wt += pw;
      c += pc;
    }
    mean.push(m);
    weight.push(wt);
    count.push(c);
  }
  const out: number[] = [];
  for (let b = 0; b < mean.length; b++) for (let j = 0; j < count[b]!; j++) out.push(mean[b]!);
  return out;
}
