/**
 * Two-period, two-treatment (AB/BA) crossover for a difference in means.
 *
 * Model (Jones & Kenward 2014, §2.3; Senn 2002, ch. 3): y = μ + subject + period
 * + treatment + e, the subject effect random and e ~ N(0, σw²) independent.
 *
 * Variance convention: σw, the within-subject standard deviation, is the SD of
 * one measurement about its subject's own level after period and treatment
 * effects are removed (the residual SD of the mixed model; √(residual mean
 * square) of the crossover analysis of variance). Each subject's period
 * difference (period 1 − period 2) then has variance 2σw², and the
 * period-adjusted treatment difference (mean difference in sequence AB minus
 * that in sequence BA, halved) has
 *   SE = σw √((1/n1 + 1/n2) / 2)   (= σw √(2/n) for n subjects split evenly),
 * with n1 subjects in AB and n2 in BA. Teams who know the SD of the period
 * differences σd enter σd/√2.
 *
 * Methods: exact t, power from the noncentral t on n1 + n2 − 2 degrees of
 * freedom with noncentrality (δ − δ0)/SE (two-sided power counts both tails);
 * normal, the same with t replaced by the standard normal, whose sample size is
 * n = 2σw²(z_{1−α/2} + z_{1−β})²/δ² in total (Julious 2004, §4.1).
 *
 * Conventions: A is the experimental treatment, B control; δ = A − B, positive
 * favours A. Non-inferiority is one-sided at level α with a positive margin.
 * Sequences are balanced when solving for the size (n1 = n2 = the smallest
 * integer meeting the target); the analysis assumes no carryover, so the
 * washout must rule it out.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { normalCdf, normalQuantile } from "../stats/normal.js";
import { studentTQuantile } from "../stats/studentT.js";
import { noncentralTCdf, noncentralTSurvival } from "../stats/noncentralT.js";
import { type ArmSizes, detectableEffect, effectCurve, powerCurve, rememberPower, smallestSampleSize } from "./shared/sizing.js";
import { checkComparativeCommon, comparativeCommonFields, groupSizeField, solveForField } from "./shared/fields.js";
import { designSection, protocolSection } from "./shared/reportSections.js";
import { EFFECT_CURVE_EVALUATIONS, NORMAL_POWER_MS, T_POWER_MS, sizingEvaluations, sizingWords } from "./shared/sizingCost.js";
import { workEstimate } from "./shared/workEstimate.js";
import { type TwoArmCounts, effectCurveChart, twoArmCounts, powerCurveChart, powerCurveTable } from "./shared/comparativeSections.js";

const MAX_PER_SEQUENCE = 100000;

const { alpha, power, sides, dropout } = comparativeCommonFields;

const schema = z
  .strictObject({
    solveFor: solveForField,
    hypothesis: z.enum(["superiority", "non-inferiority"]).default("superiority")
      .describe("Superiority: the treatments differ. Non-inferiority: treatment A is not worse than B by more than the margin."),
    delta: z.number().min(-1e9).max(1e9).optional()
      .describe("Expected true difference in means, A (experimental) minus B (control), in outcome units; positive favours A. Not needed when solving for the difference."),
    withinSubjectSd: z.number().min(1e-9, "The within-subject standard deviation must be at least 1e-9 in outcome units: rescale the units for smaller values.").max(1e9)
      .describe("Within-subject standard deviation: the SD of repeated measurements on the same subject (the residual SD of the crossover analysis). If you know the SD of each subject's period-1 minus period-2 difference, enter it divided by √2 (at least 1e-9: rescale the units for smaller values)."),
    margin: z.number().min(-1e9).max(1e9).optional()
      .describe("Non-inferiority margin, in outcome units, entered as a positive number."),
    method: z.enum(["exact-t", "normal"]).default("exact-t")
      .describe("exact-t: power from the noncentral t distribution on n − 2 degrees of freedom (the analysis that will be run). normal: the large-sample normal approximation."),
    alpha, power, sides, dropout,
    n1: groupSizeField("Subjects in sequence AB (A in period 1, B in period 2), when solving for power or for the difference.", MAX_PER_SEQUENCE),
    n2: groupSizeField("Subjects in sequence BA (B in period 1, A in period 2), when solving for power or for the difference.", MAX_PER_SEQUENCE),
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    checkComparativeCommon(v, ctx);
    if (typeof v.withinSubjectSd === "number" && !(v.withinSubjectSd > 0)) {
      issue("withinSubjectSd", "The within-subject standard deviation must be a positive number in outcome units: the spread of repeated measurements on the same subject.");
    }
    if (v.solveFor !== "difference" && v.delta === undefined) issue("delta", "Give the difference in means you expect (A minus B).");
    if (v.solveFor !== "sample-size") {
      if (v.n1 === undefined) issue("n1", "Give the number of subjects in sequence AB when solving for power or for the difference.");
      if (v.n2 === undefined) issue("n2", "Give the number of subjects in sequence BA when solving for power or for the difference.");
    }
    if (v.hypothesis === "non-inferiority") {
      if (v.margin === undefined) issue("margin", "A non-inferiority design needs a margin: the largest loss in the mean you would accept, as a positive number in outcome units.");
      else if (v.margin <= 0) issue("margin", "Enter the non-inferiority margin as a positive number in outcome units: the largest amount by which A may be worse than B.");
    }
    const scale = (x: number | undefined): number => (x === undefined ? 0 : Math.abs(x) / v.withinSubjectSd);
    if (scale(v.delta) > 100) issue("delta", "The difference is more than 100 within-subject standard deviations; check that the difference and the standard deviation are in the same units.");
    if (scale(v.margin) > 100) issue("margin", "The margin is more than 100 within-subject standard deviations; check that the margin and the standard deviation are in the same units.");
    if (v.solveFor === "difference" || v.delta === undefined) return;
    if (v.hypothesis === "superiority" && v.delta === 0) issue("delta", "A superiority design needs a non-zero difference to detect.");
    if (v.hypothesis === "superiority" && v.sides === 1 && v.delta < 0) issue("delta", "A one-sided test looks for benefit: enter the difference so that positive favours treatment A.");
    if (v.hypothesis === "non-inferiority" && v.margin !== undefined && v.margin > 0 && v.delta <= -v.margin) {
      issue("delta", "The expected difference is already beyond the non-inferiority margin; no sample size can show non-inferiority.");
    }
  })
  .transform((v) => ({ ...v, sides: v.sides ?? (v.hypothesis === "superiority" ? 2 : 1) }));

export type Crossover2x2Input = z.output<typeof schema>;

/** TwoArmCounts, with n1 and n2 the subjects per sequence (AB, BA) completing both periods. */
export interface Crossover2x2Result extends TwoArmCounts {
  delta: number;
  /** SE of the period-adjusted treatment difference. */
  standardError: number;
  criticalValue: number;
  degreesOfFreedom: number | null;
  powerCurve: Array<[number, number]>;
  effectCurve: Array<[number, number]>;
}

/** SE of the period-adjusted treatment difference under the stated convention. */
export function crossoverStandardError(withinSubjectSd: number, sequences: ArmSizes): number {
  return withinSubjectSd * Math.sqrt((1 / sequences.n1 + 1 / sequences.n2) / 2);
}

interface CrossoverTest {
  hypothesis: "superiority" | "non-inferiority";
  sides: 1 | 2;
  alpha: number;
  margin?: number | undefined;
  method: "exact-t" | "normal";
}

/** Power of the crossover test at given sequence sizes and true difference. */
export function crossoverPower(test: CrossoverTest, withinSubjectSd: number, sequences: ArmSizes, delta: number): number {
  const se = crossoverStandardError(withinSubjectSd, sequences);
  const df = sequences.n1 + sequences.n2 - 2;
  const exact = test.method === "exact-t";
  const crit = (p: number): number => (exact ? studentTQuantile(p, df) : normalQuantile(p));
  const upper = (c: number, ncp: number): number => (exact ? noncentralTSurvival(c, df, ncp) : normalCdf(ncp - c));
  const lower = (c: number, ncp: number): number => (exact ? noncentralTCdf(c, df, ncp) : normalCdf(c - ncp));
  if (test.hypothesis === "superiority" && test.sides === 2) {
    const c = crit(1 - test.alpha / 2);
    // The two tails are computed separately and can sum past 1 by rounding when power is near 1.
    return Math.min(1, upper(c, delta / se) + lower(-c, delta / se));
  }
  const shift = test.hypothesis === "non-inferiority" ? test.margin! : 0;
  return upper(crit(1 - test.alpha), (delta + shift) / se);
}

/**
 * The work before computing: power evaluations for the sizes, the power curve
 * and the effect curve (sizingCost.ts). At most a few milliseconds for any
 * admitted input, so no input is refused.
 */
export function costCrossover2x2(input: Crossover2x2Input): WorkEstimate {
  const exact = input.method === "exact-t";
  return workEstimate([{
    count: sizingEvaluations(input.solveFor, MAX_PER_SEQUENCE) + EFFECT_CURVE_EVALUATIONS,
    msEach: exact ? T_POWER_MS : NORMAL_POWER_MS,
    what: `evaluations of the ${exact ? "noncentral t" : "normal"} power: ${sizingWords(input.solveFor, MAX_PER_SEQUENCE, "per sequence")}, and the effect curve`,
  }], []);
}

/** The smallest difference detected with the target power at the given sequence sizes, to 1e-10 standard errors. */
function detectableDifference(input: Crossover2x2Input, sequences: ArmSizes, nullDelta: number): number {
  const se = crossoverStandardError(input.withinSubjectSd, sequences);
  return detectableEffect((d) => crossoverPower(input, input.withinSubjectSd, sequences, d), input.power, nullDelta, nullDelta + 50 * se, "n1", se);
}

export function computeCrossover2x2(input: Crossover2x2Input): Crossover2x2Result {
  const sd = input.withinSubjectSd;
  const powerAt = (s: ArmSizes, d: number): number => crossoverPower(input, sd, s, d);
  const given: ArmSizes = { n1: input.n1!, n2: input.n2! };
  const nullDelta = input.hypothesis === "non-inferiority" ? -input.margin! : 0;
  const delta = input.solveFor === "difference" ? detectableDifference(input, given, nullDelta) : input.delta!;
  const powerAtSizes = rememberPower((s) => powerAt(s, delta));
  let sequences = given;
  if (input.solveFor === "sample-size") {
    const found = smallestSampleSize({
      powerAt: powerAtSizes, target: input.power, allocationRatio: 1, minimum: 2, maximum: MAX_PER_SEQUENCE,
      unit: "per sequence",
    });
    sequences = { n1: found.n1, n2: found.n2 };
  }
  const df = sequences.n1 + sequences.n2 - 2;
  const p = input.hypothesis === "superiority" && input.sides === 2 ? 1 - input.alpha / 2 : 1 - input.alpha;
  // The effect curve runs from the null difference to twice the design's distance from it, on the design's side.
  const direction = input.hypothesis === "superiority" && delta < 0 ? -1 : 1;
  const span = direction * delta - nullDelta;
  return {
    ...twoArmCounts(sequences, input.dropout, powerAtSizes(sequences)),
    delta,
    standardError: crossoverStandardError(sd, sequences),
    criticalValue: input.method === "exact-t" ? studentTQuantile(p, df) : normalQuantile(p),
    degreesOfFreedom: input.method === "exact-t" ? df : null,
    powerCurve: powerCurve(sequences.n1, sequences.n2 / sequences.n1, 2, powerAtSizes),
    effectCurve: effectCurve(nullDelta, nullDelta + 2 * span, (e) => powerAt(sequences, direction * e)).map(([e, pw]) => [direction * e, pw]),
  };
}

const fmt = (x: number, d = 3): string => x.toFixed(d);
const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;

function describeTest(input: Crossover2x2Input): string {
  return input.hypothesis === "non-inferiority"
    ? `a one-sided test of non-inferiority with margin ${input.margin} at level α = ${input.alpha}`
    : `a ${input.sides === 2 ? "two" : "one"}-sided test at level α = ${input.alpha}`;
}

const WASHOUT = "The washout between the two periods must be long enough that no effect of the first-period treatment remains in the second period (no carryover): the analysis assumes there is none, and a test for carryover has too little power to detect it, so the washout must be justified from the pharmacology of the treatments.";

function documentCrossover(input: Crossover2x2Input, r: Crossover2x2Result): Section[] {
  const method = input.method === "exact-t"
    ? `the t test of the period-adjusted treatment difference (the two-sample t test of the period differences between sequences) on ${r.degreesOfFreedom} degrees of freedom, with exact power from the noncentral t distribution`
    : "the normal approximation to the test of the period-adjusted treatment difference";
  const dropoutText = input.dropout > 0
    ? ` Allowing for ${pct(input.dropout)} of subjects not completing both periods, ${r.enrolledTotal} subjects will be randomized (${r.enrolled1} to AB, ${r.enrolled2} to BA).`
    : "";
  const head = input.solveFor === "sample-size"
    ? `A two-period crossover of ${r.total} subjects completing both periods, ${r.n1} randomized to sequence AB and ${r.n2} to sequence BA, gives ${pct(r.power)} power (target ${pct(input.power, 0)}) to detect a difference in means of ${r.delta} between treatment A and treatment B`
    : input.solveFor === "power"
      ? `A two-period crossover with ${r.n1} subjects in sequence AB and ${r.n2} in sequence BA has ${pct(r.power)} power when the true difference in means between treatment A and treatment B is ${r.delta}`
      : `A two-period crossover with ${r.n1} subjects in sequence AB and ${r.n2} in sequence BA has ${pct(input.power, 0)} power to detect a difference in means of ${fmt(r.delta, 4)} between treatment A and treatment B`;
  const protocol = `${head}, assuming a within-subject standard deviation of ${input.withinSubjectSd} (standard error of the period-adjusted difference ${fmt(r.standardError, 4)}), using ${describeTest(input)} based on ${method}. The treatment effect will be estimated from the within-subject differences adjusted for period. ${WASHOUT}${dropoutText}`;
  return [
    designSection([
      { label: "Sequence AB (n1)", value: r.n1, key: true },
      { label: "Sequence BA (n2)", value: r.n2, key: true },
      { label: "Total subjects completing both periods", value: r.total, key: true },
      { label: "Total to randomize after dropout", value: r.enrolledTotal, key: true },
      { label: "Achieved power", value: r.power, digits: 4, key: true },
      { label: "Difference in means (A − B)", value: r.delta, digits: 4 },
      { label: "Standard error of the difference", value: r.standardError, digits: 4, note: "σw √((1/n1 + 1/n2)/2)" },
      { label: "Critical value", value: r.criticalValue, digits: 4, note: input.method === "exact-t" ? `t on ${r.degreesOfFreedom} degrees of freedom` : "standard normal" },
    ], [
      {
        kind: "table",
        table: {
          id: "sequences",
          caption: "Sequences: what each subject receives",
          columns: [
            { key: "sequence", label: "Sequence" }, { key: "period1", label: "Period 1" }, { key: "period2", label: "Period 2" },
            { key: "completing", label: "Completing" }, { key: "randomized", label: "To randomize" },
          ],
          rows: [
            ["AB", "A (experimental)", "B (control)", r.n1, r.enrolled1],
            ["BA", "B (control)", "A (experimental)", r.n2, r.enrolled2],
            ["Total", "", "", r.total, r.enrolledTotal],
          ],
          note: "A washout separates the periods; see the caution on carryover.",
        },
      },
      {
        kind: "paragraph",
        text: `Variance convention: the within-subject standard deviation σw = ${input.withinSubjectSd} is the SD of repeated measurements on one subject (the residual SD of the crossover analysis). Each subject's period-1 minus period-2 difference then has SD σw√2, and the period-adjusted treatment difference has standard error σw √((1/n1 + 1/n2)/2) = ${fmt(r.standardError, 4)}.`,
      },
      { kind: "paragraph", text: WASHOUT },
    ]),
    {
      id: "operating-characteristics",
      title: "Power against sample size and effect",
      blocks: [
        powerCurveChart({
          title: `Power against total subjects (difference ${fmt(r.delta, 3)}, within-subject SD ${input.withinSubjectSd})`,
          xLabel: "Total subjects completing both periods",
          series: [{ name: "Power", points: r.powerCurve, style: "line" }],
          target: input.power,
          total: r.total,
        }),
        powerCurveTable(r.powerCurve, "Total subjects"),
        effectCurveChart({
          title: `Power against the true difference (${r.n1} AB, ${r.n2} BA)`,
          xLabel: "True difference in means (A − B)",
          points: r.effectCurve,
          effect: { axis: "x", value: r.delta, label: `δ = ${fmt(r.delta, 3)}` },
          target: input.power,
        }),
      ],
    },
    protocolSection(protocol),
  ];
}

export const crossover2x2: Design<Crossover2x2Input, Crossover2x2Result> = {
  id: "crossover-2x2",
  version: 3,
  stage: "comparative",
  title: "Two-period crossover (AB/BA)",
  summary: "Sample size, power or detectable difference for an AB/BA crossover comparing means with the within-subject standard deviation, by the exact t method or the normal approximation.",
  input: schema,
  example: {
    solveFor: "sample-size",
    hypothesis: "superiority",
    delta: 6,
    withinSubjectSd: 10,
    method: "exact-t",
    alpha: 0.05,
    power: 0.9,
    sides: 2,
    dropout: 0.1,
  },
  compute: computeCrossover2x2,
  cost: costCrossover2x2,
  question: (input) => {
    const who = input.solveFor === "sample-size"
      ? "How many subjects in an AB/BA crossover"
      : input.solveFor === "power" ? `What power do ${input.n1} subjects in sequence AB and ${input.n2} in BA give` : `What difference in means can ${input.n1} subjects in sequence AB and ${input.n2} in BA detect`;
    const aim = input.hypothesis === "superiority"
      ? input.solveFor === "difference" ? "" : ` to detect a difference of ${input.delta} between treatments A and B`
      : ` to show that treatment A is no worse than B by more than ${input.margin}`;
    const sided = input.hypothesis === "superiority" && input.sides === 2 ? "two-sided" : "one-sided";
    return `${who}${aim}, when the within-subject standard deviation is ${input.withinSubjectSd}, with ${input.solveFor === "power" ? "" : `${input.power * 100}% power and `}${sided} α = ${input.alpha}?`;
  },
  document: documentCrossover,
  references: [
    { key: "Jones & Kenward 2014", text: "Jones B, Kenward MG. Design and Analysis of Cross-Over Trials. 3rd ed. Boca Raton: Chapman & Hall/CRC; 2014. Chapter 2: the 2 × 2 cross-over trial." },
    { key: "Senn 2002", text: "Senn S. Cross-over Trials in Clinical Research. 2nd ed. Chichester: Wiley; 2002. Chapter 3.", doi: "10.1002/0470854596" },
    { key: "Julious 2004", text: "Julious SA. Sample sizes for clinical trials with Normal data. Statistics in Medicine. 2004;23(12):1921-1986.", doi: "10.1002/sim.1783" },
    { key: "Lenth 1989", text: "Lenth RV. Algorithm AS 243: cumulative distribution function of the non-central t distribution. Journal of the Royal Statistical Society, Series C (Applied Statistics). 1989;38(1):185-189.", doi: "10.2307/2347693" },
  ],
  cautions: [
    WASHOUT,
    "The within-subject standard deviation is an assumption; take it from the residual of an earlier crossover or repeated-measures study of the same outcome, not from a between-subject SD, which also contains the variation between subjects and would overstate the sample size.",
    "Subjects who complete only one period contribute nothing to this analysis; the dropout allowance must cover them.",
  ],
};
