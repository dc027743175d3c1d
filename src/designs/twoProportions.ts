/**
 * Two proportions: a parallel-group comparison of a binary outcome (response,
 * cure, or an event such as infection or relapse).
 *
 * Methods (power functions in shared/twoProportionsPower.ts):
 * - normal: the normal approximation with the variance of the test statistic
 *   under H0 (pooled rate for superiority; for non-inferiority the restricted
 *   maximum-likelihood rates on the null boundary, Farrington & Manning 1990)
 *   and of the estimate under H1 (Fleiss, Levin & Paik 2003, §4.2, eq. 4.19);
 * - normal-corrected: the same with the continuity correction (1/n1 + 1/n2)/2,
 *   the power form of Fleiss, Tytun & Ury (1980);
 * - fisher-exact: exact power of Fisher's exact test (two-sided p-value by
 *   probability ordering, as R's stats::fisher.test) by full enumeration of both
 *   binomials. Chosen over the exact unconditional test of Suissa & Shuster
 *   (1985) because its conditional critical regions need no maximum over a
 *   nuisance rate: one pass over each conditional distribution gives the
 *   region, so every size up to 500 per arm can be scanned in a fraction of a
 *   second (bench/twoProportions.bench.ts); the unconditional test would need
 *   that maximum, over the whole table space, at every size.
 *   Fisher's test compares equal proportions only, so it serves superiority.
 *
 * Conventions: p1 control, p2 experimental; the risk difference is p2 - p1;
 * `betterWhen` says whether a higher proportion is good (response) or bad
 * (events); internally both rates are replaced by 1 - p for events so that
 * higher is better. The non-inferiority margin is a positive number of
 * proportion points; the test is one-sided at level alpha. Two-sided power
 * counts both tails. Sample sizes are the smallest integers meeting the target;
 * exact power is not monotone in n (Chernick & Liu 2002), so every size is
 * scanned: the report gives the smallest size reaching the target and the
 * smallest from which every larger size up to twice it (at most 500 per arm)
 * also does, and uses the latter. The fixed-design arm sizes are computed
 * first (fixedDesign) and only then inflated for dropout, so a design-level
 * inflation factor can be applied in between.
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { ChartSeries, Section } from "../report/document.js";
import { normalQuantile } from "../stats/normal.js";
import {
  type ArmSizes, CURVE_POINTS, type SizeScanResult, armsFromControl, curveSizes, effectCurve,
  scanSampleSizes, smallestSampleSize,
} from "./shared/sizing.js";
import { checkComparativeCommon, comparativeCommonFields, groupSizeField, probabilityField, solveForField } from "./shared/fields.js";
import { type ProportionsTest, nullDifference, twoProportionsPower } from "./shared/twoProportionsPower.js";
import { type InterimLooksResult, interimLooksField, planInterimLooks, refineInterimTest } from "./shared/interimLooks.js";
import { designSection } from "./shared/reportSections.js";
import { EFFECT_CURVE_EVALUATIONS, NORMAL_POWER_MS, POWER_CURVE_EVALUATIONS, sizingEvaluations, sizingWords } from "./shared/sizingCost.js";
import { withInterimLooks } from "./shared/groupSequentialCost.js";
import { workEstimate } from "./shared/workEstimate.js";
import { type TwoArmCounts, closingSections, twoArmCounts, effectCurveChart, powerCurveChart, powerCurveTable, twoArmFacts, twoArmTable } from "./shared/comparativeSections.js";

const MAX_PER_ARM = 100000;
/** Largest arm the exact sample-size scan visits. */
export const EXACT_SEARCH_MAX_PER_ARM = 500;
/** Largest arm for which exact power is computed at given sizes. */
export const EXACT_MAX_PER_ARM = 1000;
const STABILITY_MULTIPLE = 2;
/** Points of the exact method's effect curve (each a full enumeration). */
const EXACT_EFFECT_CURVE_POINTS = 15;
/** Width at which the detectable proportion's bisection stops, on the proportion scale. */
const PROPORTION_RESOLUTION = 1e-12;

const isProportion = (x: unknown): x is number => typeof x === "number" && x > 0 && x < 1;

const schema = z
  .strictObject({
    solveFor: solveForField,
    hypothesis: z.enum(["superiority", "non-inferiority"]).default("superiority")
      .describe("Superiority: the proportions differ. Non-inferiority: the experimental arm is not worse than control by more than the margin."),
    p1: probabilityField("Expected proportion with the outcome in the control arm, between 0 and 1 (0.4 is 40%)."),
    p2: probabilityField("Expected proportion with the outcome in the experimental arm, between 0 and 1. Not needed when solving for the difference.").optional(),
    betterWhen: z.enum(["higher", "lower"]).default("higher")
      .describe("higher: the outcome is good (response, cure), so benefit means a higher proportion. lower: the outcome is an event to prevent (infection, relapse), so benefit means a lower proportion."),
    margin: z.number().min(-1).max(1).optional()
      .describe("Non-inferiority margin on the difference in proportions, as a positive number of proportion points (0.1 is 10 percentage points)."),
    method: z.enum(["normal", "normal-corrected", "fisher-exact"]).default("normal")
      .describe("normal: the normal approximation (variance under the null for the test, under the alternative for the estimate). normal-corrected: the same with the continuity correction. fisher-exact: exact power of Fisher's exact test, by enumerating every possible outcome (superiority only, arms up to 500 when solving for the sample size)."),
    ...comparativeCommonFields,
    n1: groupSizeField("Control-arm size, when solving for power or for the difference.", MAX_PER_ARM),
    n2: groupSizeField("Experimental-arm size, when solving for power or for the difference.", MAX_PER_ARM),
    interimLooks: interimLooksField,
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    checkComparativeCommon(v, ctx);
    const higher = v.betterWhen === "higher";
    // The bounds already give a terse message; this one says why.
    for (const [field, arm] of [["p1", "control"], ["p2", "experimental"]] as const) {
      const p = v[field];
      if (typeof p === "number" && !(p > 0 && p < 1)) {
        issue(field, `The ${arm} proportion must lie strictly between 0 and 1 (0.35 means 35%): with a proportion of exactly 0 or 1 every participant has the same outcome and there is nothing to compare.`);
      }
    }
    if (v.solveFor !== "difference" && v.p2 === undefined) issue("p2", "Give the proportion you expect in the experimental arm.");
    if (v.solveFor !== "sample-size") {
      if (v.n1 === undefined) issue("n1", "Give the control-arm size when solving for power or for the difference.");
      if (v.n2 === undefined) issue("n2", "Give the experimental-arm size when solving for power or for the difference.");
    }
    if (v.method === "fisher-exact") {
      if (v.hypothesis !== "superiority") issue("method", "Fisher's exact test compares equal proportions and has no non-inferiority form: use the normal or normal-corrected method for a non-inferiority margin.");
      if (v.solveFor === "difference") issue("solveFor", "Exact power is not monotone, so there is no single detectable difference: solve for the difference with a normal method, then check its power with the exact method.");
      for (const field of ["n1", "n2"] as const) {
        const n = v[field];
        if (v.solveFor === "power" && n !== undefined && n > EXACT_MAX_PER_ARM) issue(field, `The exact method enumerates every possible outcome and accepts arms up to ${EXACT_MAX_PER_ARM}; for larger arms the normal methods are accurate.`);
      }
    }
    if (v.interimLooks !== undefined) {
      if (v.solveFor !== "sample-size") issue("interimLooks", "Interim looks are planned with the sample size: set solveFor to sample-size, or leave interimLooks out.");
      if (v.method === "fisher-exact") issue("interimLooks", "Group-sequential boundaries are on the Z scale of the normal approximation: use the normal or normal-corrected method with interim looks.");
      refineInterimTest(v.alpha, v.power, issue);
    }
    if (!isProportion(v.p1)) return;
    const o1 = higher ? v.p1 : 1 - v.p1;
    if (v.hypothesis === "non-inferiority") {
      if (v.margin === undefined) {
        issue("margin", "A non-inferiority design needs a margin: the largest loss in the proportion you would accept, as a positive number (0.1 is 10 percentage points).");
      } else if (v.margin <= 0) {
        issue("margin", `Enter the margin as a positive number of proportion points (for example 0.1); the direction comes from betterWhen = ${v.betterWhen}, so the margin is the largest ${higher ? "drop" : "rise"} in the proportion you would still accept.`);
      } else if (v.margin >= o1) {
        issue("margin", higher
          ? `The margin (${v.margin}) must be smaller than the control proportion (${v.p1}): the experimental arm cannot fall below zero.`
          : `The control proportion plus the margin (${v.p1} + ${v.margin}) must stay below 1.`);
      }
    }
    if (v.solveFor === "difference" || !isProportion(v.p2)) return;
    const delta = (higher ? v.p2 : 1 - v.p2) - o1;
    if (v.hypothesis === "superiority") {
      if (delta === 0) issue("p2", "A superiority design needs different proportions in the two arms.");
      else if ((v.sides ?? 2) === 1 && delta < 0) issue("p2", `A one-sided test looks for benefit: with betterWhen = ${v.betterWhen} the experimental proportion must be ${higher ? "higher" : "lower"} than control (${v.p1}).`);
    } else if (v.margin !== undefined && v.margin > 0 && delta <= -v.margin) {
      issue("p2", "The expected experimental proportion is already worse than control by the margin or more; no sample size can show non-inferiority.");
    }
  })
  .transform((v) => ({ ...v, sides: v.sides ?? (v.hypothesis === "superiority" ? 2 : 1) }));

export type TwoProportionsInput = z.output<typeof schema>;

export interface ExactSearch {
  firstN1: number;
  firstN2: number;
  firstPower: number;
  stableN1: number | null;
  stableN2: number | null;
  stablePower: number | null;
  /** Largest control-arm size scanned: the bound of the stability statement. */
  boundN1: number;
}

/** TwoArmCounts (arm sizes, enrolment after dropout, achieved power) and the design's own figures. */
export interface TwoProportionsResult extends TwoArmCounts {
  /** Proportions as entered (or solved), on the scale the user gave. */
  p1: number;
  p2: number;
  /** p2 - p1 as entered. */
  difference: number;
  /** Standard normal critical value; null for the exact method. */
  criticalValue: number | null;
  exactSearch: ExactSearch | null;
  powerCurve: Array<[number, number]>;
  /** Normal-approximation power at the same sizes, beside an exact curve. */
  normalPowerCurve: Array<[number, number]> | null;
  /** [experimental proportion, power] at the design's arm sizes. */
  effectCurve: Array<[number, number]>;
  /** Only when interimLooks is given: the group-sequential maximum, looks and boundaries. */
  interimLooks?: InterimLooksResult;
}

const toOriented = (input: TwoProportionsInput, p: number): number => (input.betterWhen === "higher" ? p : 1 - p);
const fromOriented = toOriented;

function testOf(input: TwoProportionsInput): ProportionsTest {
  return { hypothesis: input.hypothesis, sides: input.sides, alpha: input.alpha, margin: input.margin };
}

/** Power on the scale the user entered. */
export function twoProportionsDesignPower(input: TwoProportionsInput, arms: ArmSizes, p2: number, method = input.method): number {
  return twoProportionsPower(toOriented(input, input.p1), toOriented(input, p2), arms, testOf(input), method);
}

/** Largest control arm whose experimental arm also stays within `limit`. */
function controlLimit(limit: number, allocationRatio: number): number {
  let n1 = Math.min(limit, Math.floor(limit / allocationRatio + 1e-9));
  while (n1 > 2 && armsFromControl(n1, allocationRatio).n2 > limit) n1--;
  return n1;
}

interface FixedDesign {
  arms: ArmSizes;
  p2: number;
  scan: SizeScanResult | null;
}

/** The fixed-design (single-analysis) arm sizes, before any inflation. */
export function fixedDesign(input: TwoProportionsInput): FixedDesign {
  if (input.solveFor === "sample-size") {
    const p2 = input.p2!;
    const powerAt = (arms: ArmSizes): number => twoProportionsDesignPower(input, arms, p2);
    if (input.method === "fisher-exact") {
      const maximum = controlLimit(EXACT_SEARCH_MAX_PER_ARM, input.allocationRatio);
      const scan = scanSampleSizes({
        powerAt, target: input.power, allocationRatio: input.allocationRatio, minimum: 2, maximum,
        stabilityMultiple: STABILITY_MULTIPLE, unit: `per control arm (the exact search stops at ${EXACT_SEARCH_MAX_PER_ARM} per arm; use a normal method for larger trials)`, field: "method",
      });
      const chosen = scan.stable ?? scan.first;
      return { arms: { n1: chosen.n1, n2: chosen.n2 }, p2, scan };
    }
    const found = smallestSampleSize({ powerAt, target: input.power, allocationRatio: input.allocationRatio, minimum: 2, maximum: MAX_PER_ARM });
    return { arms: { n1: found.n1, n2: found.n2 }, p2, scan: null };
  }
  const arms = { n1: input.n1!, n2: input.n2! };
  return { arms, p2: input.solveFor === "difference" ? solveDetectableProportion(input, arms) : input.p2!, scan: null };
}

/** The experimental proportion, on the favourable side, detected with the target power. */
function solveDetectableProportion(input: TwoProportionsInput, arms: ArmSizes): number {
  const o1 = toOriented(input, input.p1);
  const test = testOf(input);
  const lo = nullDifference(test);
  const hi = 1 - o1 - 1e-9;
  const powerAtEffect = (e: number): number => twoProportionsPower(o1, o1 + e, arms, test, input.method);
  const best = powerAtEffect(hi);
  if (best < input.power) {
    throw new InfeasibleDesignError(
      `With ${arms.n1} control and ${arms.n2} experimental participants, even an experimental proportion of ${fromOriented(input, 1).toFixed(0)} gives power ${best.toFixed(3)}, below the target ${input.power}. Enlarge the arms.`,
      { bound: fromOriented(input, 1), field: "n1" },
    );
  }
  // Power at the null difference is alpha < target, so the root is bracketed.
  let a = lo, b = hi;
  for (let i = 0; i < 200 && b - a > PROPORTION_RESOLUTION; i++) {
    const mid = (a + b) / 2;
    if (powerAtEffect(mid) >= input.power) b = mid; else a = mid;
  }
  return fromOriented(input, o1 + b);
}

/**
 * Work of one exact power evaluation, in terms: given each total t of
 * responses (n1 + n2 + 1 of them), the conditional distribution is computed
 * only over the few standard deviations that can decide the test, a window
 * growing as √min(n1, n2) (fisherExact.ts).
 */
function fisherTerms(n1: number, n2: number): number {
  return (n1 + n2 + 1) * Math.sqrt(Math.min(n1, n2) + 1);
}

/**
 * CPU a term: 27 to 54 ns in single evaluations timed from 10 to 4,000 per
 * arm, and 34 ns in the heaviest two-proportions cases of `npm run bench
 * designs` (exact scans to 500 per arm, 4.8 million terms in about 165 ms).
 */
const MS_PER_FISHER_TERM = 6e-5;

/** Bisection steps of the detectable proportion: its bracket is at most 2 wide. */
const DETECTABLE_PROPORTION_EVALUATIONS = 2 + Math.ceil(Math.log2(2 / PROPORTION_RESOLUTION));

/**
 * The work before computing. The exact method's sample size scans every
 * control-arm size up to the search bound (counted in full: where the target
 * is first reached is not known before), then draws its effect curve at sizes
 * no larger; at given sizes it evaluates them, the power curve's sizes and the
 * effect curve. The normal methods count power evaluations as the other
 * comparative designs do (sizingCost.ts); interim looks add their boundaries.
 * The exact scan is bounded by 500 per arm and given sizes by 1,000, so no
 * admitted input is estimated above about 0.45 s and none is refused.
 */
export function costTwoProportions(input: TwoProportionsInput): WorkEstimate {
  if (input.method === "fisher-exact") {
    const ratio = input.allocationRatio;
    let terms = 0;
    let words: string;
    let normalEvaluations: number;
    if (input.solveFor === "sample-size") {
      const maximum = controlLimit(EXACT_SEARCH_MAX_PER_ARM, ratio);
      for (let n1 = 2; n1 <= maximum; n1++) terms += fisherTerms(n1, armsFromControl(n1, ratio).n2);
      const largest = armsFromControl(maximum, ratio);
      terms += EXACT_EFFECT_CURVE_POINTS * fisherTerms(largest.n1, largest.n2);
      words = `every control-arm size from 2 to ${maximum} and the effect curve`;
      normalEvaluations = maximum;
    } else {
      const n1 = input.n1!, n2 = input.n2!;
      terms += (1 + EXACT_EFFECT_CURVE_POINTS) * fisherTerms(n1, n2);
      for (const size of curveSizes(n1, 2)) {
        const arms = armsFromControl(size, ratio);
        if (arms.n2 <= EXACT_MAX_PER_ARM) terms += fisherTerms(arms.n1, arms.n2);
      }
      words = `the given sizes, the power curve's and the effect curve`;
      normalEvaluations = POWER_CURVE_EVALUATIONS;
    }
    return workEstimate([
      { count: terms, msEach: MS_PER_FISHER_TERM, what: `terms of Fisher's exact power (${words})` },
      { count: normalEvaluations, msEach: NORMAL_POWER_MS, what: "evaluations of the normal power beside it" },
    ], input.solveFor === "sample-size" ? [] : ["n1", "n2"]);
  }
  const count = input.solveFor === "difference"
    ? DETECTABLE_PROPORTION_EVALUATIONS + 1 + POWER_CURVE_EVALUATIONS
    : sizingEvaluations(input.solveFor, MAX_PER_ARM);
  const why = input.solveFor === "difference" ? "a bisection for the proportion and the power curve" : sizingWords(input.solveFor, MAX_PER_ARM, "per control arm");
  return withInterimLooks([{ count: count + EFFECT_CURVE_EVALUATIONS, msEach: NORMAL_POWER_MS, what: `evaluations of the normal power: ${why}, and the effect curve` }], input.interimLooks);
}

export function computeTwoProportions(input: TwoProportionsInput): TwoProportionsResult {
  const fixed = fixedDesign(input);
  const arms = fixed.arms;
  const power = fixed.scan ? (fixed.scan.stable ?? fixed.scan.first).power : twoProportionsDesignPower(input, arms, fixed.p2);
  const exact = input.method === "fisher-exact";
  const scan = fixed.scan;
  const exactSearch: ExactSearch | null = scan
    ? {
      firstN1: scan.first.n1, firstN2: scan.first.n2, firstPower: scan.first.power,
      stableN1: scan.stable?.n1 ?? null, stableN2: scan.stable?.n2 ?? null, stablePower: scan.stable?.power ?? null,
      boundN1: scan.bound,
    }
    : null;
  const toTotal = (n1: number): number => { const a = armsFromControl(n1, input.allocationRatio); return a.n1 + a.n2; };
  const powerOfControl = (n1: number, method = input.method): number => twoProportionsDesignPower(input, armsFromControl(n1, input.allocationRatio), fixed.p2, method);
  // An exact scan already holds every size, so the saw-tooth shows.
  const scanned = scan ? scan.powers.filter(([n1]) => n1 >= Math.max(2, Math.floor(arms.n1 / 4))) : null;
  const controlSizes = scanned
    ? scanned.map(([n1]) => n1)
    : curveSizes(arms.n1, 2).filter((n1) => !exact || armsFromControl(n1, input.allocationRatio).n2 <= EXACT_MAX_PER_ARM);
  const powerCurve: Array<[number, number]> = scanned
    ? scanned.map(([n1, p]) => [toTotal(n1), p])
    : controlSizes.map((n1) => [toTotal(n1), powerOfControl(n1)]);
  const normalPowerCurve: Array<[number, number]> | null = exact
    ? controlSizes.map((n1) => [toTotal(n1), powerOfControl(n1, "normal")])
    : null;
  return {
    ...twoArmCounts(arms, input.dropout, power),
    p1: input.p1,
    p2: fixed.p2,
    difference: fixed.p2 - input.p1,
    criticalValue: exact ? null : normalQuantile(1 - (input.hypothesis === "superiority" && input.sides === 2 ? input.alpha / 2 : input.alpha)),
    exactSearch,
    powerCurve,
    normalPowerCurve,
    effectCurve: proportionCurve(input, arms, fixed.p2),
    ...(input.interimLooks ? {
      interimLooks: planInterimLooks(input.interimLooks, { alpha: input.alpha, power: input.power, sides: input.sides }, { unit: "participants", n1: arms.n1, n2: arms.n2, dropout: input.dropout }),
    } : {}),
  };
}

/** Power against the experimental proportion, from the null difference to past the design's. */
function proportionCurve(input: TwoProportionsInput, arms: ArmSizes, p2: number): Array<[number, number]> {
  const o1 = toOriented(input, input.p1);
  const lo = nullDifference(testOf(input));
  const design = toOriented(input, p2) - o1;
  const hi = Math.min(1 - o1 - 1e-6, lo + 2 * (Math.abs(design) - lo));
  const points = input.method === "fisher-exact" ? EXACT_EFFECT_CURVE_POINTS : CURVE_POINTS;
  return effectCurve(lo, hi, (e) => twoProportionsPower(o1, o1 + e, arms, testOf(input), input.method), points)
    .map(([e, power]) => [fromOriented(input, o1 + e), power]);
}

const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;
const fmt = (x: number, d = 3): string => x.toFixed(d);

function methodName(input: TwoProportionsInput): string {
  switch (input.method) {
    case "normal": return "the normal approximation (variance under the null hypothesis for the test statistic, under the alternative for the estimate; Fleiss, Levin & Paik 2003)";
    case "normal-corrected": return "the normal approximation with continuity correction (Fleiss, Tytun & Ury 1980)";
    case "fisher-exact": return input.sides === 2
      ? "Fisher's exact test (two-sided p-value by probability ordering), with power computed exactly by enumerating every possible outcome in both arms"
      : "Fisher's exact test (one-sided), with power computed exactly by enumerating every possible outcome in both arms";
  }
}

function describeTest(input: TwoProportionsInput): string {
  if (input.hypothesis === "non-inferiority") {
    return `a one-sided test of non-inferiority at level α = ${input.alpha} with a margin of ${input.margin} (${pct(input.margin!)} points) on the difference in proportions`;
  }
  return `a ${input.sides === 2 ? "two" : "one"}-sided test at level α = ${input.alpha}`;
}

function documentTwoProportions(input: TwoProportionsInput, r: TwoProportionsResult): Section[] {
  const what = input.betterWhen === "higher" ? "proportion with the outcome" : "event proportion";
  const dropoutText = input.dropout > 0
    ? ` Allowing for ${pct(input.dropout)} loss to follow-up, ${r.enrolledTotal} participants will be enrolled (${r.enrolled1} control, ${r.enrolled2} experimental).`
    : "";
  const e = r.exactSearch;
  const exactText = e
    ? ` Because the power of an exact test does not increase steadily with the sample size, the exact power was computed at every control-arm size up to ${e.boundN1}: the smallest size reaching the target is ${e.firstN1} control and ${e.firstN2} experimental (power ${pct(e.firstPower)})` +
      (e.stableN1 !== null
        ? `, and from ${e.stableN1} control and ${e.stableN2} experimental (power ${pct(e.stablePower!)}) every larger size up to ${e.boundN1} control reaches it; the latter is planned.`
        : `, but the power falls below the target again at ${e.boundN1} control participants, so this size should be checked against the final enrolment.`)
    : "";
  const protocol = input.solveFor === "difference"
    ? `With ${r.n1} participants in the control arm and ${r.n2} in the experimental arm and an expected control ${what} of ${input.p1}, ${describeTest(input)} based on ${methodName(input)} has ${pct(input.power, 0)} power to detect an experimental ${what} of ${fmt(r.p2, 4)} (a difference of ${fmt(r.difference, 4)}).${dropoutText}`
    : input.solveFor === "power"
      ? `With ${r.n1} participants in the control arm and ${r.n2} in the experimental arm, ${describeTest(input)} based on ${methodName(input)} has ${pct(r.power)} power when the true ${what} is ${input.p1} in the control arm and ${r.p2} in the experimental arm.${dropoutText}`
      : `A sample size of ${r.n1} in the control arm and ${r.n2} in the experimental arm (${r.total} in total) gives ${pct(r.power)} power (target ${pct(input.power, 0)}) to detect a change in the ${what} from ${input.p1} in the control arm to ${r.p2} in the experimental arm (difference ${fmt(r.difference, 3)}), using ${describeTest(input)} based on ${methodName(input)}.${exactText}${dropoutText}`;
  const series: ChartSeries[] = [{ name: input.method === "fisher-exact" ? "Exact power (Fisher)" : "Power", points: r.powerCurve, style: "line" }];
  if (r.normalPowerCurve) series.push({ name: "Normal approximation", points: r.normalPowerCurve, style: "line" });
  const curveRows = r.exactSearch ? thin(r.powerCurve, 30) : r.powerCurve;
  const sections: Section[] = [
    designSection([
      ...twoArmFacts(r),
      { label: "Control proportion (p1)", value: r.p1, digits: 4 },
      { label: "Experimental proportion (p2)", value: r.p2, digits: 4 },
      { label: "Difference (p2 − p1)", value: r.difference, digits: 4 },
      ...(r.criticalValue !== null ? [{ label: "Critical value", value: r.criticalValue, digits: 4, note: "standard normal" }] : []),
    ], [twoArmTable(r)]),
  ];
  if (e) {
    sections.push({
      id: "exact-search",
      title: "Exact sample-size search",
      blocks: [{
        kind: "table",
        table: {
          id: "exact-search",
          caption: "Exact power is not monotone in the sample size: both sizes, scanned one by one",
          columns: [{ key: "size", label: "Size" }, { key: "n1", label: "Control" }, { key: "n2", label: "Experimental" }, { key: "power", label: "Exact power", digits: 4 }],
          rows: [
            ["Smallest reaching the target", e.firstN1, e.firstN2, e.firstPower],
            [`Smallest from which every size up to ${e.boundN1} control reaches it`, e.stableN1, e.stableN2, e.stablePower],
          ],
          note: `Every control-arm size from 2 to ${e.boundN1} was computed (the bound is twice the first size reaching the target, at most ${EXACT_SEARCH_MAX_PER_ARM} per arm).`,
        },
      }],
    });
  }
  sections.push(
    {
      id: "operating-characteristics",
      title: "Power against sample size and effect",
      blocks: [
        powerCurveChart({ title: `Power against total sample size (p1 ${r.p1}, p2 ${fmt(r.p2, 3)})`, xLabel: "Total evaluable participants", series, target: input.power, total: r.total }),
        powerCurveTable(curveRows, "Total evaluable"),
        effectCurveChart({
          title: `Power against the experimental proportion (${r.n1} control, ${r.n2} experimental)`,
          xLabel: "True experimental proportion",
          points: r.effectCurve,
          effect: { axis: "x", value: r.p2, label: `p2 = ${fmt(r.p2, 3)}` },
          target: input.power,
        }),
      ],
    },
    ...closingSections(input.interimLooks, input.sides, r.interimLooks, protocol),
  );
  return sections;
}

/** At most `count` evenly spaced points, for a readable table. */
function thin(points: Array<[number, number]>, count: number): Array<[number, number]> {
  if (points.length <= count) return points;
  const step = (points.length - 1) / (count - 1);
  return Array.from({ length: count }, (_, i) => points[Math.round(i * step)]!);
}

export const twoProportions: Design<TwoProportionsInput, TwoProportionsResult> = {
  id: "two-proportions",
  version: 1,
  stage: "comparative",
  title: "Two proportions (parallel groups)",
  summary: "Sample size, power or detectable difference for comparing a response or event proportion between two arms: superiority or non-inferiority, by the normal approximation (with or without continuity correction) or exact power of Fisher's exact test.",
  input: schema,
  example: {
    solveFor: "sample-size",
    hypothesis: "superiority",
    p1: 0.35,
    p2: 0.55,
    betterWhen: "higher",
    method: "fisher-exact",
    alpha: 0.05,
    power: 0.8,
    sides: 2,
    allocationRatio: 1,
    dropout: 0.1,
  },
  compute: computeTwoProportions,
  cost: costTwoProportions,
  question: (input) => {
    const what = input.betterWhen === "higher" ? "proportion with the outcome" : "event proportion";
    const who = input.solveFor === "sample-size"
      ? "How many participants per arm"
      : input.solveFor === "power" ? `What power do ${input.n1} control and ${input.n2} experimental participants give` : `What experimental ${what} can ${input.n1} control and ${input.n2} experimental participants detect`;
    const aim = input.hypothesis === "superiority"
      ? input.solveFor === "difference" ? ` against a control ${what} of ${input.p1}` : ` to detect a change in the ${what} from ${input.p1} (control) to ${input.p2} (experimental)`
      : ` to show that the experimental ${what} is no worse than control (${input.p1}) by more than ${input.margin}${input.p2 !== undefined ? `, when it is truly ${input.p2}` : ""}`;
    const sided = input.hypothesis === "superiority" && input.sides === 2 ? "two-sided" : "one-sided";
    return `${who}${aim}, with ${input.solveFor === "power" ? "" : `${input.power * 100}% power and `}${sided} α = ${input.alpha}?`;
  },
  document: documentTwoProportions,
  references: [
    { key: "Fleiss, Levin & Paik 2003", text: "Fleiss JL, Levin B, Paik MC. Statistical Methods for Rates and Proportions. 3rd ed. Hoboken, NJ: Wiley; 2003. Chapter 4: Determining sample sizes needed to detect a difference between two proportions.", doi: "10.1002/0471445428" },
    { key: "Fleiss, Tytun & Ury 1980", text: "Fleiss JL, Tytun A, Ury HK. A simple approximation for calculating sample sizes for comparing independent proportions. Biometrics. 1980;36(2):343-346." },
    { key: "Farrington & Manning 1990", text: "Farrington CP, Manning G. Test statistics and sample size formulae for comparative binomial trials with null hypothesis of non-zero risk difference or non-unity relative risk. Statistics in Medicine. 1990;9(12):1447-1454.", doi: "10.1002/sim.4780091208" },
    { key: "Fisher 1935", text: "Fisher RA. The logic of inductive inference. Journal of the Royal Statistical Society. 1935;98(1):39-82." },
    { key: "Suissa & Shuster 1985", text: "Suissa S, Shuster JJ. Exact unconditional sample sizes for the 2 × 2 binomial trial. Journal of the Royal Statistical Society, Series A. 1985;148(4):317-327." },
    { key: "Chernick & Liu 2002", text: "Chernick MR, Liu CY. The saw-toothed behavior of power versus sample size and software solutions: single binomial proportion using exact methods. The American Statistician. 2002;56(2):149-155." },
  ],
  cautions: [
    "The control proportion is an assumption; when it is nearer 0.5 than assumed the variance is larger and the power lower than stated. Justify it from prior data in the same population.",
    "The normal approximation is poor when an arm expects fewer than about five participants with (or without) the outcome; use the exact method there.",
    "Fisher's exact test is conservative: its actual type I error is below alpha, which is why it needs more participants than the normal approximation.",
    "A non-inferiority margin must be justified clinically and from the effect of the control treatment in earlier trials; the analysis must use the same margin and the same one-sided level.",
  ],
};
