/**
 * A group-sequential plan from its specification: efficacy boundaries, optional
 * non-binding futility boundaries, exit probabilities under the null and the
 * alternative, the inflation factor and the expected information. Shared by the
 * group-sequential design and the interim-looks option of comparative designs.
 *
 * Conventions:
 * - Z is oriented so that positive favours the experimental arm; a two-sided
 *   test has symmetric efficacy boundaries ±b_k and spends alpha/2 per tail.
 * - Futility (optional) stops when Z_k < a_k, on the side of no benefit; it is
 *   non-binding: the efficacy boundaries ignore it, so the type I error is at
 *   most alpha whether or not futility stops are made.
 * - Power counts rejection in either tail for a two-sided test (as for the
 *   fixed designs); the fixed-design reference has the same convention, so one
 *   look gives an inflation factor of exactly 1.
 * - Information fractions are of the maximum information of the plan.
 */
import { normalCdf } from "../../stats/normal.js";
import { type LookExit, exitProbabilities } from "../../stats/groupSequential.js";
import {
  type Sides, classicalBoundaries, driftForPower, fixedDesignDrift, futilityAndDrift, futilityAtDrift, spendingBoundaries,
} from "../../stats/groupSequentialBoundaries.js";
import { type SpendingFamily, errorSpent } from "../../stats/spending.js";

export type EfficacyBoundary = SpendingFamily | "pocock" | "obrien-fleming";
export type FutilityBoundary = "none" | SpendingFamily;

export interface GroupSequentialSpec {
  informationFractions: number[];
  efficacyBoundary: EfficacyBoundary;
  efficacyGamma: number;
  futilityBoundary: FutilityBoundary;
  futilityGamma: number;
  alpha: number;
  power: number;
  sides: Sides;
}

export interface ExitProbabilities {
  efficacy: number;
  /** Crossing the lower efficacy boundary (two-sided tests only). */
  lowerEfficacy: number;
  futility: number;
}

export interface LookPlan {
  look: number;
  informationFraction: number;
  efficacyZ: number;
  /** Nominal p-value at the boundary: two-sided for a two-sided test, else one-sided. */
  efficacyNominalP: number;
  futilityZ: number | null;
  /** One-sided nominal p-value at the futility boundary (stop for futility when p is above it). */
  futilityNominalP: number | null;
  alphaSpent: number;
  cumulativeAlphaSpent: number;
  underNull: ExitProbabilities;
  underAlternative: ExitProbabilities;
}

export interface GroupSequentialPlan {
  looks: LookPlan[];
  /** η = θ√I_max: the drift of Z at the alternative. */
  drift: number;
  fixedDesignDrift: number;
  /** Maximum information over the information of the fixed design, (η/η_fixed)². */
  inflationFactor: number;
  /** Expected information, as a multiple of the fixed design's, stopping at every boundary crossed. */
  expectedInformationNull: number;
  expectedInformationAlternative: number;
  /** Probability of rejecting H0 at the alternative, futility stops made. */
  power: number;
  /** Type I error when every futility stop is made (at most alpha). */
  typeIErrorWithFutilityStops: number;
  /** The classical constant c (Pocock: b_k = c; O'Brien-Fleming: b_k = c/√t_k). */
  classicalConstant: number | null;
}

export function equallySpaced(looks: number): number[] {
  return Array.from({ length: looks }, (_, i) => (i + 1) / looks);
}

function cumulativeSpent(family: SpendingFamily, gamma: number, total: number, times: readonly number[]): number[] {
  return times.map((t) => errorSpent({ family, gamma }, total, Math.min(1, t)));
}

function toExit(e: LookExit): ExitProbabilities {
  return { efficacy: e.upper, lowerEfficacy: e.lowerEfficacy, futility: e.futility };
}

interface Boundaries {
  upper: number[];
  futility: number[] | null;
  drift: number;
  classicalConstant: number | null;
}

function efficacyBoundaries(spec: GroupSequentialSpec, times: readonly number[], lastIsFinal: boolean): { upper: number[]; classicalConstant: number | null } {
  if (spec.efficacyBoundary === "pocock" || spec.efficacyBoundary === "obrien-fleming") {
    const c = classicalBoundaries(times, spec.efficacyBoundary, spec.alpha, spec.sides);
    return { upper: c.upper, classicalConstant: c.constant };
  }
  const perTail = cumulativeSpent(spec.efficacyBoundary, spec.efficacyGamma, spec.alpha / spec.sides, times);
  if (lastIsFinal) perTail[perTail.length - 1] = spec.alpha / spec.sides;
  return { upper: spendingBoundaries(times, perTail.map((a) => a * spec.sides), spec.sides), classicalConstant: null };
}

function assemble(spec: GroupSequentialSpec, times: readonly number[], b: Boundaries, fixed: number): GroupSequentialPlan {
  const lookBoundaries = (withFutility: boolean) => b.upper.map((u, k) => ({
    upper: u,
    lowerEfficacy: spec.sides === 2 ? -u : -Infinity,
    futility: withFutility && b.futility ? b.futility[k]! : -Infinity,
  }));
  const nullNoFutility = exitProbabilities(times, lookBoundaries(false), 0);
  const nullExits = b.futility ? exitProbabilities(times, lookBoundaries(true), 0) : nullNoFutility;
  const altExits = exitProbabilities(times, lookBoundaries(true), b.drift);
  const inflationFactor = (b.drift / fixed) ** 2;
  const expected = (exits: LookExit[]): number => {
    let stopped = 0;
    let sum = 0;
    for (let k = 0; k < times.length - 1; k++) {
      const p = exits[k]!.upper + exits[k]!.lowerEfficacy + exits[k]!.futility;
      sum += times[k]! * p;
      stopped += p;
    }
    return sum + times[times.length - 1]! * Math.max(0, 1 - stopped);
  };
  let cumulative = 0;
  const looks = times.map((t, k): LookPlan => {
    const spent = nullNoFutility[k]!.upper + nullNoFutility[k]!.lowerEfficacy;
    cumulative += spent;
    const u = b.upper[k]!;
    const a = b.futility ? b.futility[k]! : null;
    const futilityShown = a !== null && a > (spec.sides === 2 ? -u : -Infinity) ? a : null;
    return {
      look: k + 1,
      informationFraction: t,
      efficacyZ: u,
      efficacyNominalP: spec.sides * normalCdf(-u),
      futilityZ: futilityShown,
      futilityNominalP: futilityShown === null ? null : normalCdf(-futilityShown),
      alphaSpent: spent,
      cumulativeAlphaSpent: cumulative,
      underNull: toExit(nullExits[k]!),
      underAlternative: toExit(altExits[k]!),
    };
  });
  // Exits at separate looks carry the recursion's error (about 1e-7), so their sum can pass 1 when power is near 1.
  const sumRejections = (exits: LookExit[]): number => Math.min(1, exits.reduce((s, e) => s + e.upper + e.lowerEfficacy, 0));
  return {
    looks,
    drift: b.drift,
    fixedDesignDrift: fixed,
    inflationFactor,
    expectedInformationNull: expected(nullExits) * inflationFactor,
    expectedInformationAlternative: expected(altExits) * inflationFactor,
    power: sumRejections(altExits),
    typeIErrorWithFutilityStops: sumRejections(nullExits),
    classicalConstant: b.classicalConstant,
  };
}

/** The plan at its planned information fractions. */
export function planGroupSequential(spec: GroupSequentialSpec): GroupSequentialPlan {
  const times = spec.informationFractions;
  const { upper, classicalConstant } = efficacyBoundaries(spec, times, true);
  let drift: number;
  let futility: number[] | null = null;
  if (spec.futilityBoundary === "none") {
    drift = driftForPower(times, upper, spec.sides, spec.power);
  } else {
    const beta = cumulativeSpent(spec.futilityBoundary, spec.futilityGamma, 1 - spec.power, times);
    const f = futilityAndDrift(times, upper, beta, spec.sides, spec.power);
    drift = f.drift;
    futility = f.futility;
  }
  return assemble(spec, times, { upper, futility, drift, classicalConstant }, fixedDesignDrift(spec.alpha, spec.power, spec.sides));
}

/**
 * Boundaries recomputed at the information fractions actually observed (of the
 * planned maximum), keeping the spending functions and the planned drift (Lan &
 * DeMets 1983). The last observed look spends all remaining alpha when it is the
 * final analysis; a fraction above 1 is spent as 1.
 */
export function recomputeAtObservedLooks(spec: GroupSequentialSpec, planned: GroupSequentialPlan, observed: number[], lastIsFinal: boolean): GroupSequentialPlan {
  const { upper } = efficacyBoundaries(spec, observed, lastIsFinal);
  let futility: number[] | null = null;
  if (spec.futilityBoundary !== "none") {
    const beta = cumulativeSpent(spec.futilityBoundary, spec.futilityGamma, 1 - spec.power, observed);
    futility = futilityAtDrift(observed, upper, beta, spec.sides, planned.drift, undefined, lastIsFinal).futility;
  }
  return assemble(spec, observed, { upper, futility, drift: planned.drift, classicalConstant: null }, planned.fixedDesignDrift);
}
