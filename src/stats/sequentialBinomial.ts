/**
 * The number of events in a sequentially monitored single-arm trial, patient by
 * patient, with absorbing stopping regions: the exact distribution of the event
 * count among patients still on study is propagated one patient at a time,
 * f_{n+1}(x) = f_n(x)(1 - p) + f_n(x - 1) p, and at each check the mass in the
 * stopping region is removed and recorded (the recursion behind exact
 * operating characteristics of multi-stage binomial rules; Schultz et al. 1973,
 * Biometrics 29:293-300).
 */

/** Stopping region at one check after `patients` patients: stop when events ≤ atMost or ≥ atLeast. */
export interface CheckRegion {
  patients: number;
  /** Stop when the event count is at most this (omit, or -1, for no lower region). */
  atMost?: number;
  /** Stop when the event count is at least this (omit, or > patients, for no upper region). */
  atLeast?: number;
}

export interface SequentialBinomialOutcome {
  /** Probability of stopping at each check through the lower region, in the order of the checks. */
  stopLow: number[];
  /** Probability of stopping at each check through the upper region. */
  stopHigh: number[];
  /** P(x events among maxN patients and no stop at any check), x = 0..maxN. */
  completed: Float64Array;
  /** Expected number of patients treated: a stop at a check ends the trial there. */
  expectedSampleSize: number;
}

/**
 * @param rate true event probability per patient, in [0, 1]
 * @param maxN maximum number of patients
 * @param checks stopping regions, with strictly increasing `patients` in 1..maxN
 */
const NEGLIGIBLE = 1e-280;

export function sequentialBinomial(rate: number, maxN: number, checks: readonly CheckRegion[]): SequentialBinomialOutcome {
  let f = new Float64Array(maxN + 1);
  let g = new Float64Array(maxN + 1);
  f[0] = 1;
  // Support [lo, hi] of the counts still on study: absorption trims it, so each
  // step only touches counts that can still be reached.
  let lo = 0;
  let hi = 0;
  const step = (): void => {
    g[lo] = f[lo]! * (1 - rate);
    for (let x = lo + 1; x <= hi; x++) g[x] = f[x]! * (1 - rate) + f[x - 1]! * rate;
    g[hi + 1] = f[hi]! * rate;
    [f, g] = [g, f];
    g.fill(0, lo, hi + 2);
    hi++;
    // Drop tails below 1e-280: they cannot move any reported probability, and
    // subnormal numbers would slow the loop a hundredfold.
    while (lo < hi && f[lo]! < NEGLIGIBLE) f[lo++] = 0;
    while (hi > lo && f[hi]! < NEGLIGIBLE) f[hi--] = 0;
  };
  const stopLow: number[] = [];
  const stopHigh: number[] = [];
  let expected = 0;
  let n = 0;
  for (const check of checks) {
    if (!(check.patients > n && check.patients <= maxN)) throw new RangeError("checks must be at increasing patient counts within 1..maxN");
    for (; n < check.patients; n++) if (lo <= hi) step();
    let low = 0;
    let high = 0;
    const atMost = Math.min(check.atMost ?? -1, n);
    const atLeast = Math.max(check.atLeast ?? n + 1, atMost + 1);
    for (let x = lo; x <= Math.min(atMost, hi); x++) { low += f[x]!; f[x] = 0; }
    for (let x = Math.max(atLeast, lo); x <= hi; x++) { high += f[x]!; f[x] = 0; }
    lo = Math.max(lo, atMost + 1);
    hi = Math.min(hi, atLeast - 1);
    stopLow.push(low);
    stopHigh.push(high);
    expected += n * (low + high);
  }
  for (; n < maxN; n++) if (lo <= hi) step();
  let remaining = 0;
  for (let x = 0; x <= maxN; x++) remaining += f[x]!;
  expected += maxN * remaining;
  return { stopLow, stopHigh, completed: f, expectedSampleSize: expected };
}
