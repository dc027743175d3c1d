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

/**
 * A power function of the arm sizes that computes each pair of sizes once:
 * solving, reporting the power at the answer and drawing the curve around it
 * ask for the same sizes again.
 */
export function rememberPower(powerAt: (arms: ArmSizes) => number): (arms: ArmSizes) => number {
  const known = new Map<string, number>();
  return (arms) => {
    const key = `${arms.n1}:${arms.n2}`;
    let power = known.get(key);
    if (power === undefined) {
      power = powerAt(arms);
      known.set(key, power);
    }
    return power;
  };
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
  /** What the searched size counts, for the 422 message (default "per control arm"). */
  unit?: string;
  /** Input field the bound refers to, for the 422 details (default "n1"). */
  field?: string;
}

/**
 * Smallest control-arm size n1 whose power reaches the target, assuming power
 * increases with n (true for the normal and t methods used with it). Exact
 * discrete methods, whose power is not monotone, have their own scan.
 */
export function smallestSampleSize(search: SizeSearch): ArmSizes & { power: number } {
  const powerAt = rememberPower(search.powerAt);
  const reaches = (n1: number): boolean => powerAt(armsFromControl(n1, search.allocationRatio)) >= search.target;
  let hi = search.minimum;
  while (!reaches(hi)) {
    if (hi >= search.maximum) {
      throw new InfeasibleDesignError(
        `No sample size up to ${search.maximum} ${search.unit ?? "per control arm"} reaches the target power ${search.target}.`,
        { bound: search.maximum, field: search.field ?? "n1" },
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
  return { ...arms, power: powerAt(arms) };
}

/**
 * The effect at which power equals the target, for power increasing in the
 * effect on [lo, hi], resolved to 1e-10 × `scale`. Designs whose effect is in
 * outcome units pass one standard error as the scale, so the answer is as
 * precise whatever the units (an absolute 1e-10 is coarse when the standard
 * deviation itself is 1e-9). Throws when even the largest effect is not
 * detectable, naming `sizeField`, the input whose increase would detect it.
 */
export function detectableEffect(powerAtEffect: (effect: number) => number, target: number, lo: number, hi: number, sizeField: string, scale = 1): number {
  if (powerAtEffect(hi) < target) {
    throw new InfeasibleDesignError(`Even an effect of ${hi} is not detected with power ${target} at this size.`, { bound: hi, field: sizeField });
  }
  if (powerAtEffect(lo) >= target) return lo;
  return findRoot((e) => powerAtEffect(e) - target, lo, hi, { tolerance: DETECTABLE_EFFECT_RESOLUTION * scale });
}

/** Resolution of a detectable effect, in units of its scale (one standard error for effects in outcome units). */
export const DETECTABLE_EFFECT_RESOLUTION = 1e-10;

/** Points on a power or effect curve unless a design asks for others. */
export const CURVE_POINTS = 25;

/** Control-arm sizes for a power curve around n: from about a quarter to twice it. */
export function curveSizes(n1: number, minimum: number, points = CURVE_POINTS): number[] {
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

/**
 * Arm sizes scaled by an inflation factor applied to the control arm (for
 * example the maximum-information ratio of a group-sequential design, applied
 * to a fixed-design size), the experimental arm following the allocation ratio.
 */
export function inflateArms(arms: ArmSizes, factor: number, allocationRatio: number): ArmSizes {
  if (factor === 1) return arms;
  return armsFromControl(Math.ceil(arms.n1 * factor - 1e-9), allocationRatio);
}

export interface SizeScan extends SizeSearch {
  /**
   * How far past the first size reaching the target the scan continues, as a
   * multiple of that size (capped by `maximum`): the stated bound within which
   * every larger size is checked.
   */
  stabilityMultiple: number;
}

export interface SizeScanResult {
  /** Smallest control-arm size whose power reaches the target. */
  first: ArmSizes & { power: number };
  /**
   * Smallest control-arm size from which every larger size up to `bound` also
   * reaches the target; null when the power at the bound itself falls short.
   */
  stable: (ArmSizes & { power: number }) | null;
  /** Largest control-arm size checked. */
  bound: number;
  /** [control-arm size, power] for every size scanned. */
  powers: Array<[number, number]>;
}

/**
 * Scan of every control-arm size, for exact discrete methods whose power is not
 * monotone in n (the saw-tooth of Chernick & Liu 2002, The American
 * Statistician 56:149-155). The work is bounded by `maximum`.
 */
export function scanSampleSizes(scan: SizeScan): SizeScanResult {
  const powers: Array<[number, number]> = [];
  let first: number | undefined;
  let bound = scan.maximum;
  for (let n1 = scan.minimum; n1 <= bound; n1++) {
    const power = scan.powerAt(armsFromControl(n1, scan.allocationRatio));
    powers.push([n1, power]);
    if (first === undefined && power >= scan.target) {
      first = n1;
      bound = Math.min(scan.maximum, Math.max(n1 + 1, Math.ceil(n1 * scan.stabilityMultiple)));
    }
  }
  if (first === undefined) {
    throw new InfeasibleDesignError(
      `No sample size up to ${scan.maximum} ${scan.unit ?? "per control arm"} reaches the target power ${scan.target}.`,
      { bound: scan.maximum, field: scan.field ?? "n1" },
    );
  }
  let stableN1: number | undefined;
  for (let i = powers.length - 1; i >= 0 && powers[i]![1] >= scan.target; i--) stableN1 = powers[i]![0];
  const at = (n1: number): ArmSizes & { power: number } => ({ ...armsFromControl(n1, scan.allocationRatio), power: powers[n1 - scan.minimum]![1] });
  return { first: at(first), stable: stableN1 === undefined ? null : at(stableN1), bound, powers };
}

/** Points [effect, power] on an even grid of effects from lo to hi. */
export function effectCurve(lo: number, hi: number, powerAtEffect: (effect: number) => number, points = CURVE_POINTS): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i < points; i++) {
    const effect = lo + ((hi - lo) * i) / (points - 1);
    out.push([effect, powerAtEffect(effect)]);
  }
  return out;
}
