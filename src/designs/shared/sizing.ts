/**
 * Sizing shared by the comparative designs: per-arm sizes under an allocation
 * ratio, dropout inflation, the smallest n reaching a target power, the
 * detectable effect at a given n, and power-curve points.
 *
 * Conventions (stated in every comparative report):
 * - allocationRatio k = n2 / n1 (experimental over control); n2 = ceil(k × n1).
 * - dropout d inflates each arm to ceil(n / (1 - d)) enrolled.
 */
import { InfeasibleDesignError } from "../design.js";
import { findRoot } from "../../stats/rootFinding.js";

export interface ArmSizes {
  n1: number;
  n2: number;
}

/** Arm sizes from the control-arm size and the allocation ratio. */
export function armsFromControl(n1: number, allocationRatio: number): ArmSizes {
  // Rounding guard: 1.1 × 10 is 11.000000000000002 in floating point.
  return { n1, n2: Math.max(1, Math.ceil(n1 * allocationRatio - 1e-9)) };
}

/** Enrolment per arm so that n remain after a fraction `dropout` is lost. */
export function inflateForDropout(n: number, dropout: number): number {
  return dropout > 0 ? Math.ceil(n / (1 - dropout) - 1e-9) : n;
}

export interface SizeSearch {
  /** Power at given arm sizes. */
  powerAt(arms: ArmSizes): number;
  target: number;
  allocationRatio: number;
  /** Smallest control-arm size worth trying (at least 2 for a t test). */
  minimum: number;
  /** Upper bound on the control-arm size; beyond it the design is infeasible. */
  maximum: number;
}

/**
 * Smallest control-arm size n1 whose power reaches the target, assuming power
 * increases with n (true for the normal and t methods used with it). Exact
 * discrete methods, whose power is not monotone, have their own scan.
 */
export function smallestSampleSize(search: SizeSearch): ArmSizes & { power: number } {
  const reaches = (n1: number): boolean => search.powerAt(armsFromControl(n1, search.allocationRatio)) >= search.target;
  let hi = search.minimum;
  while (!reaches(hi)) {
    if (hi >= search.maximum) {
      throw new InfeasibleDesignError(
        `No sample size up to ${search.maximum} per control arm reaches the target power ${search.target}.`,
        { bound: search.maximum, field: "n1" },
      );
    }
    hi = Math.min(search.maximum, hi * 2);
  }
  let lo = Math.max(search.minimum, Math.floor(hi / 2));
  if (reaches(lo)) lo = search.minimum;
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (reaches(mid)) hi = mid; else lo = mid + 1;
  }
  const arms = armsFromControl(hi, search.allocationRatio);
  return { ...arms, power: search.powerAt(arms) };
}

/**
 * The effect at which power equals the target, for power increasing in the
 * effect on [lo, hi]. Throws when even the largest effect is not detectable.
 */
export function detectableEffect(powerAtEffect: (effect: number) => number, target: number, lo: number, hi: number): number {
  if (powerAtEffect(hi) < target) {
    throw new InfeasibleDesignError(`Even an effect of ${hi} is not detected with power ${target} at this size.`, { bound: hi });
  }
  if (powerAtEffect(lo) >= target) return lo;
  return findRoot((e) => powerAtEffect(e) - target, lo, hi, { tolerance: 1e-10 });
}

/** Control-arm sizes for a power curve around n: from about a quarter to twice it. */
export function curveSizes(n1: number, minimum: number, points = 25): number[] {
  const lo = Math.max(minimum, Math.floor(n1 / 4));
  const hi = Math.max(lo + points, Math.ceil(n1 * 2));
  const sizes = new Set<number>();
  for (let i = 0; i < points; i++) sizes.add(Math.round(lo + ((hi - lo) * i) / (points - 1)));
  sizes.add(n1);
  return [...sizes].sort((a, b) => a - b);
}

/** Power-curve points [total size, power] from a power function of the control-arm size. */
export function powerCurve(n1: number, allocationRatio: number, minimum: number, powerAt: (arms: ArmSizes) => number): Array<[number, number]> {
  return curveSizes(n1, minimum).map((size) => {
    const arms = armsFromControl(size, allocationRatio);
    return [arms.n1 + arms.n2, powerAt(arms)];
  });
}
