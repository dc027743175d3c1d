/**
 * Two means: a parallel-group comparison of a continuous outcome.
 *
 * Method: the two-sample t test with a common standard deviation σ. Exact power
 * from the noncentral t distribution (AS 243, Lenth 1989):
 *   superiority, two-sided:  P(T' > t_{1-α/2}) + P(T' < -t_{1-α/2})  (both tails counted)
 *   superiority, one-sided:  P(T' > t_{1-α})
 *   non-inferiority:         P(T' > t_{1-α}) with noncentrality (δ + margin)/SE
 * with T' noncentral t on n1 + n2 - 2 degrees of freedom and noncentrality δ/SE,
 * SE = σ √(1/n1 + 1/n2). Equivalence by two one-sided tests (Schuirmann 1987):
 * exact power by integrating the normal probability of the rejection region over
 * the distribution of the sample standard deviation (Owen 1965). The normal
 * method replaces t and T' by the standard normal.
 *
 * Conventions: δ is experimental minus control, oriented so that positive favours
 * the experimental arm; non-inferiority and equivalence tests are one-sided at
 * level α each; sample sizes are the smallest integers meeting the target power.
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { normalCdf, normalQuantile } from "../stats/normal.js";
import { studentTQuantile } from "../stats/studentT.js";
import { noncentralTCdf, noncentralTSurvival } from "../stats/noncentralT.js";
import { integrate } from "../stats/quadrature.js";
import { LOG_SQRT_2PI, stirlingRemainder } from "../stats/gamma.js";
import {
  type ArmSizes, armsFromControl, detectableEffect, powerCurve, rememberPower, smallestSampleSize,
} from "./shared/sizing.js";
import { comparativeCommonFields } from "./shared/fields.js";
import { NORMAL_POWER_MS, T_POWER_MS, sizingEvaluations, sizingWords } from "./shared/sizingCost.js";
import { withInterimLooks } from "./shared/groupSequentialCost.js";
import { type InterimLooksResult, interimLooksField, planInterimLooks, refineInterimTest } from "./shared/interimLooks.js";
import { designSection } from "./shared/reportSections.js";
import { type TwoArmCounts, closingSections, twoArmCounts, powerCurveChart, powerCurveTable, twoArmFacts, twoArmTable } from "./shared/comparativeSections.js";

const MAX_PER_ARM = 100000;

const schema = z
  .strictObject({
    solveFor: z.enum(["sample-size", "power", "difference"]).default("sample-size")
      .meta({ title: "What to work out" })
      .describe("What to compute: the sample size for a target power, the power at given arm sizes, or the smallest difference detectable at given arm sizes."),
    hypothesis: z.enum(["superiority", "non-inferiority", "equivalence"]).default("superiority")
      .describe("Superiority: the arms differ. Non-inferiority: the experimental arm is not worse than control by more than the margin. Equivalence: the arms differ by less than the margin (two one-sided tests)."),
    delta: z.number().min(-1e9).max(1e9).optional()
      .describe("Expected true difference in means, experimental minus control, in outcome units; positive favours the experimental arm. Not needed when solving for the difference."),
    sd: z.number().min(1e-9).max(1e9).describe("Common standard deviation of the outcome in each arm, in outcome units (at least 1e-9: rescale the units for smaller values)."),
    margin: z.number().gt(0).max(1e9).optional()
      .describe("Non-inferiority or equivalence margin, in outcome units, entered as a positive number."),
    method: z.enum(["exact-t", "normal"]).default("exact-t")
      .describe("exact-t: power from the noncentral t distribution (the t test that will be run). normal: the large-sample normal approximation."),
    ...comparativeCommonFields,
    n1: z.number().int().min(2).max(MAX_PER_ARM).optional().describe("Control-arm size, when solving for power or for the difference."),
    n2: z.number().int().min(2).max(MAX_PER_ARM).optional().describe("Experimental-arm size, when solving for power or for the difference."),
    interimLooks: interimLooksField,
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    if (v.solveFor !== "difference" && v.delta === undefined) issue("delta", "Give the difference in means you expect (experimental minus control).");
    if (v.solveFor !== "sample-size") {
      if (v.n1 === undefined) issue("n1", "Give the control-arm size when solving for power or for the difference.");
      if (v.n2 === undefined) issue("n2", "Give the experimental-arm size when solving for power or for the difference.");
    }
    if (v.hypothesis !== "superiority") {
      if (v.margin === undefined) issue("margin", `A ${v.hypothesis} design needs a margin (a positive number in outcome units).`);
      if (v.sides === 2) issue("sides", `A ${v.hypothesis} test is one-sided at level alpha: set sides to 1 (a one-sided 0.025 matches a two-sided 0.05).`);
    }
    if (v.solveFor !== "difference" && v.delta !== undefined) {
      if (v.hypothesis === "superiority" && v.delta === 0) issue("delta", "A superiority design needs a non-zero difference to detect.");
      if (v.hypothesis === "superiority" && v.sides === 1 && v.delta < 0) issue("delta", "A one-sided test looks for benefit: enter the difference so that positive favours the experimental arm.");
      if (v.hypothesis === "non-inferiority" && v.margin !== undefined && v.delta <= -v.margin) issue("delta", "The expected difference is already beyond the non-inferiority margin; no sample size can show non-inferiority.");
      if (v.hypothesis === "equivalence" && v.margin !== undefined && Math.abs(v.delta) >= v.margin) issue("delta", "The expected difference must lie inside the equivalence margin.");
    }
    const scale = (x: number | undefined): number => (x === undefined ? 0 : Math.abs(x) / v.sd);
    if (scale(v.delta) > 100) issue("delta", "The difference is more than 100 standard deviations; check that the difference and the standard deviation are in the same units.");
    if (scale(v.margin) > 100) issue("margin", "The margin is more than 100 standard deviations; check that the margin and the standard deviation are in the same units.");
    if (v.power <= v.alpha) issue("power", "Power must exceed alpha: a test that rejects no more often than chance is not a test.");
    if (v.interimLooks !== undefined) {
      if (v.solveFor !== "sample-size") issue("interimLooks", "Interim looks are planned with the sample size: set solveFor to sample-size, or leave interimLooks out.");
      if (v.hypothesis === "equivalence") issue("interimLooks", "Interim looks are offered for superiority and non-inferiority tests, not for equivalence (two one-sided tests).");
      refineInterimTest(v.alpha, v.power, issue);
    }
  })
  .transform((v) => ({ ...v, sides: v.sides ?? (v.hypothesis === "superiority" ? 2 : 1) }));

export type TwoMeansInput = z.output<typeof schema>;

/** TwoArmCounts (arm sizes, enrolment after dropout, achieved power) and the design's own figures. */
export interface TwoMeansResult extends TwoArmCounts {
  /** The difference used for the power (the solved one when solving for the difference). */
  delta: number;
  standardizedEffect: number;
  criticalValue: number;
  degreesOfFreedom: number | null;
  powerCurve: Array<[number, number]>;
  /** Only when interimLooks is given: the group-sequential maximum, looks and boundaries. */
  interimLooks?: InterimLooksResult;
}

function standardError(input: TwoMeansInput, arms: ArmSizes): number {
  return input.sd * Math.sqrt(1 / arms.n1 + 1 / arms.n2);
}

/**
 * Exact TOST power: integrate over W = df·S²/σ² ~ χ²_df (Owen 1965), in the
 * variable x = W/df − 1, whose log density with k = df/2,
 *   (k − 1) log(1 + x) − k x + ½ log k − log √(2π) − R(k)   (R the Stirling remainder),
 * has no large terms. Written in W it carries rounding noise near 1e-10 at 10⁵
 * degrees of freedom, which kept the adaptive quadrature from its tolerance
 * until it had spent its whole panel allowance (twenty times the work).
 */
function equivalencePowerExact(delta: number, margin: number, se: number, tCrit: number, df: number): number {
  const a = (margin - delta) / se;
  const b = (-margin - delta) / se;
  const inner = (u: number): number => Math.max(0, normalCdf(a - tCrit * u) - normalCdf(b + tCrit * u));
  const k = df / 2;
  const logFront = 0.5 * Math.log(k) - LOG_SQRT_2PI - stirlingRemainder(k);
  const density = (x: number): number => (x <= -1 ? 0 : Math.exp((k - 1) * Math.log1p(x) - k * x + logFront));
  // x has standard deviation √(2/df); beyond 60 of them its density is nil.
  const spread = Math.sqrt(2 / df);
  const upper = Math.min((margin / (tCrit * se)) ** 2 - 1, 60 * spread + 60 / df);
  const lower = Math.max(-1, -60 * spread);
  if (upper <= lower) return 0;
  // The quadrature's error can carry the integral past 1 by rounding when power is near 1.
  return Math.min(1, integrate((x) => inner(Math.sqrt(1 + x)) * density(x), lower, upper, { absoluteTolerance: 1e-13, relativeTolerance: 1e-11 }));
}

/** Power at given arm sizes and true difference. */
export function twoMeansPower(input: TwoMeansInput, arms: ArmSizes, delta: number): number {
  const se = standardError(input, arms);
  const df = arms.n1 + arms.n2 - 2;
  const exact = input.method === "exact-t";
  const crit = (p: number): number => (exact ? studentTQuantile(p, df) : normalQuantile(p));
  const upperTail = (c: number, ncp: number): number => (exact ? noncentralTSurvival(c, df, ncp) : normalCdf(ncp - c));
  const lowerTail = (c: number, ncp: number): number => (exact ? noncentralTCdf(c, df, ncp) : normalCdf(c - ncp));
  switch (input.hypothesis) {
    case "superiority": {
      const ncp = delta / se;
      if (input.sides === 2) {
        const c = crit(1 - input.alpha / 2);
        // The two tails are computed separately and can sum past 1 by rounding when power is near 1.
        return Math.min(1, upperTail(c, ncp) + lowerTail(-c, ncp));
      }
      return upperTail(crit(1 - input.alpha), ncp);
    }
    case "non-inferiority":
      return upperTail(crit(1 - input.alpha), (delta + input.margin!) / se);
    case "equivalence": {
      const c = crit(1 - input.alpha);
      const m = input.margin!;
      if (exact) return equivalencePowerExact(delta, m, se, c, df);
      return Math.max(0, normalCdf((m - delta) / se - c) + normalCdf((m + delta) / se - c) - 1);
    }
  }
}

function criticalValue(input: TwoMeansInput, df: number): number {
  const p = input.hypothesis === "superiority" && input.sides === 2 ? 1 - input.alpha / 2 : 1 - input.alpha;
  return input.method === "exact-t" ? studentTQuantile(p, df) : normalQuantile(p);
}

/**
 * CPU of one exact equivalence power: a quadrature of at most about 800
 * integrand evaluations, timed alone at up to 0.55 ms from 2 to 2 × 10⁶
 * degrees of freedom; in the heaviest equivalence case of `npm run bench
 * designs` (10 experimental per control participant) an evaluation took
 * about 0.2 ms CPU.
 */
const TOST_POWER_MS = 0.6;

/**
 * The work before computing: power evaluations for the sizes and the power
 * curve (sizingCost.ts), each costing what the method's power takes, and the
 * interim looks' boundaries when asked for. No admitted input is estimated
 * above about 0.22 s (an exact equivalence difference at the largest arms),
 * so none is refused.
 */
export function costTwoMeans(input: TwoMeansInput): WorkEstimate {
  const exact = input.method === "exact-t";
  const equivalence = input.hypothesis === "equivalence";
  const kernel = exact && equivalence
    ? { msEach: TOST_POWER_MS, what: "evaluations of the exact equivalence power (each a numerical integral)" }
    : exact ? { msEach: T_POWER_MS, what: "evaluations of the noncentral t power" } : { msEach: NORMAL_POWER_MS, what: "evaluations of the normal power" };
  // Solving an equivalence difference first checks the power at no difference.
  const count = sizingEvaluations(input.solveFor, MAX_PER_ARM) + (equivalence && input.solveFor === "difference" ? 1 : 0);
  return withInterimLooks([{ count, msEach: kernel.msEach, what: `${kernel.what}: ${sizingWords(input.solveFor, MAX_PER_ARM, "per control arm")}` }], input.interimLooks);
}

export function computeTwoMeans(input: TwoMeansInput): TwoMeansResult {
  const delta = input.solveFor === "difference" ? solveDifference(input, { n1: input.n1!, n2: input.n2! }) : input.delta!;
  const powerAt = rememberPower((a) => twoMeansPower(input, a, delta));
  let arms: ArmSizes = { n1: input.n1!, n2: input.n2! };
  if (input.solveFor === "sample-size") {
    const found = smallestSampleSize({ powerAt, target: input.power, allocationRatio: input.allocationRatio, minimum: 2, maximum: MAX_PER_ARM });
    arms = { n1: found.n1, n2: found.n2 };
  }
  const power = powerAt(arms);
  const df = arms.n1 + arms.n2 - 2;
  const ratio = arms.n2 / arms.n1;
  return {
    ...twoArmCounts(arms, input.dropout, power),
    delta,
    standardizedEffect: delta / input.sd,
    criticalValue: criticalValue(input, df),
    degreesOfFreedom: input.method === "exact-t" ? df : null,
    powerCurve: powerCurve(arms.n1, ratio, 2, powerAt),
    ...(input.interimLooks ? {
      interimLooks: planInterimLooks(input.interimLooks, { alpha: input.alpha, power: input.power, sides: input.sides }, { unit: "participants", n1: arms.n1, n2: arms.n2, dropout: input.dropout }),
    } : {}),
  };
}

/** Smallest favourable difference with power ≥ target at the given sizes. */
function solveDifference(input: TwoMeansInput, arms: ArmSizes): number {
  const target = input.power;
  const se = standardError(input, arms);
  const ceiling = 50 * se + (input.margin ?? 0);
  if (input.hypothesis === "equivalence") {
    // The largest |δ| inside the margin still shown equivalent with the target power.
    const m = input.margin!;
    const powerAtZero = twoMeansPower(input, arms, 0);
    if (powerAtZero < target) {
      throw new InfeasibleDesignError(`Even with no true difference, these arm sizes give power ${powerAtZero.toFixed(3)} to show equivalence, below the target ${target}.`, { field: "n1" });
    }
    return m - detectableEffect((e) => twoMeansPower(input, arms, m - e), target, 0, m, "n1", se);
  }
  const lo = input.hypothesis === "non-inferiority" ? -input.margin! : 0;
  return detectableEffect((e) => twoMeansPower(input, arms, e), target, lo, ceiling, "n1", se);
}

const fmt = (x: number, d = 3): string => x.toFixed(d);

function describeHypothesis(input: TwoMeansInput): string {
  switch (input.hypothesis) {
    case "superiority":
      return input.sides === 2
        ? `a two-sided test at level α = ${input.alpha}`
        : `a one-sided test at level α = ${input.alpha}`;
    case "non-inferiority":
      return `a one-sided test of non-inferiority with margin ${input.margin} at level α = ${input.alpha}`;
    case "equivalence":
      return `two one-sided tests of equivalence with margin ±${input.margin}, each at level α = ${input.alpha}`;
  }
}

function documentTwoMeans(input: TwoMeansInput, r: TwoMeansResult): Section[] {
  const methodName = input.method === "exact-t" ? "the two-sample t test (exact power from the noncentral t distribution)" : "the normal approximation to the two-sample test";
  const dropoutText = input.dropout > 0
    ? ` Allowing for ${(input.dropout * 100).toFixed(1)}% loss to follow-up, ${r.enrolledTotal} participants will be enrolled (${r.enrolled1} control, ${r.enrolled2} experimental).`
    : "";
  const protocol = input.solveFor === "difference"
    ? `With ${r.n1} participants in the control arm and ${r.n2} in the experimental arm, ${describeHypothesis(input)} based on ${methodName} has ${fmt(input.power * 100, 0)}% power to detect a difference in means of ${fmt(r.delta, 3)} (${fmt(r.standardizedEffect, 3)} standard deviations), assuming a common standard deviation of ${input.sd}.${dropoutText}`
    : input.solveFor === "power"
      ? `With ${r.n1} participants in the control arm and ${r.n2} in the experimental arm, ${describeHypothesis(input)} based on ${methodName} has ${fmt(r.power * 100, 1)}% power when the true difference in means is ${r.delta} and the common standard deviation is ${input.sd}.${dropoutText}`
      : `A sample size of ${r.n1} in the control arm and ${r.n2} in the experimental arm (${r.total} in total) gives ${fmt(r.power * 100, 1)}% power (target ${fmt(input.power * 100, 0)}%) to detect a difference in means of ${r.delta} (${fmt(r.standardizedEffect, 3)} standard deviations, common standard deviation ${input.sd}), using ${describeHypothesis(input)} based on ${methodName}.${dropoutText}`;
  return [
    designSection([
      ...twoArmFacts(r),
      { label: "Difference in means", value: r.delta, digits: 4 },
      { label: "Standardized effect (δ/σ)", value: r.standardizedEffect, digits: 4 },
      { label: "Critical value", value: r.criticalValue, digits: 4, note: input.method === "exact-t" ? `t on ${r.degreesOfFreedom} degrees of freedom` : "standard normal" },
    ], [twoArmTable(r)]),
    {
      id: "operating-characteristics",
      title: "Power against sample size",
      blocks: [
        powerCurveChart({
          title: `Power against total sample size (difference ${fmt(r.delta, 3)}, SD ${input.sd})`,
          xLabel: "Total evaluable participants",
          series: [{ name: "Power", points: r.powerCurve, style: "line" }],
          target: input.power,
          total: r.total,
        }),
        powerCurveTable(r.powerCurve, "Total evaluable"),
      ],
    },
    ...closingSections(input.interimLooks, input.sides, r.interimLooks, protocol),
  ];
}

export const twoMeans: Design<TwoMeansInput, TwoMeansResult> = {
  id: "two-means",
  version: 4,
  stage: "comparative",
  title: "Two means (parallel groups)",
  summary: "Sample size or power for comparing a continuous outcome between two arms: superiority, non-inferiority or equivalence, by the exact t method or the normal approximation.",
  input: schema,
  example: {
    solveFor: "sample-size",
    hypothesis: "superiority",
    delta: 4,
    sd: 9,
    method: "exact-t",
    alpha: 0.05,
    power: 0.9,
    sides: 2,
    allocationRatio: 1,
    dropout: 0.1,
  },
  compute: computeTwoMeans,
  cost: costTwoMeans,
  question: (input) => {
    const what = input.solveFor === "sample-size"
      ? "How many participants per arm"
      : input.solveFor === "power" ? `What power do ${input.n1} control and ${input.n2} experimental participants give` : `What difference in means can ${input.n1} control and ${input.n2} experimental participants detect`;
    const aim = input.hypothesis === "superiority"
      ? input.solveFor === "difference" ? "" : ` to detect a difference in means of ${input.delta}`
      : input.hypothesis === "non-inferiority" ? ` to show that the experimental arm is no worse than control by more than ${input.margin}` : ` to show that the arms differ by less than ${input.margin}`;
    return `${what}${aim}, when the outcome's standard deviation is ${input.sd}, with ${input.solveFor === "power" ? "" : `${input.power * 100}% power and `}${input.hypothesis === "superiority" && input.sides === 2 ? "two-sided" : "one-sided"} α = ${input.alpha}?`;
  },
  document: documentTwoMeans,
  references: [
    { key: "Lenth 1989", text: "Lenth RV. Algorithm AS 243: cumulative distribution function of the non-central t distribution. Journal of the Royal Statistical Society, Series C (Applied Statistics). 1989;38(1):185-189.", doi: "10.2307/2347693" },
    { key: "Cohen 1988", text: "Cohen J. Statistical Power Analysis for the Behavioral Sciences. 2nd ed. Hillsdale, NJ: Lawrence Erlbaum; 1988. Chapter 2." },
    { key: "Schuirmann 1987", text: "Schuirmann DJ. A comparison of the two one-sided tests procedure and the power approach for assessing the equivalence of average bioavailability. Journal of Pharmacokinetics and Biopharmaceutics. 1987;15(6):657-680.", doi: "10.1007/BF01068419" },
    { key: "Owen 1965", text: "Owen DB. A special case of a bivariate non-central t-distribution. Biometrika. 1965;52(3/4):437-446.", doi: "10.2307/2333696" },
    { key: "Chow, Shao & Wang 2008", text: "Chow SC, Shao J, Wang H. Sample Size Calculations in Clinical Research. 2nd ed. Boca Raton: Chapman & Hall/CRC; 2008. Chapter 3." },
  ],
  cautions: [
    "The standard deviation is an assumption; a sample size computed from an underestimated standard deviation gives less power than stated. Justify it from prior data.",
  ],
};
