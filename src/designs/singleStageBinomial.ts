/**
 * Single-stage exact binomial design for a single-arm trial of response rate.
 *
 * Method: A'Hern RP. Sample size tables for exact single-stage phase II
 * designs. Statistics in Medicine 2001;20:859-866. Enrol n patients and declare
 * the drug promising if at least r respond; n is the smallest size for which
 * some r gives P(X ≥ r | p0) ≤ alpha and P(X ≥ r | p1) ≥ power, X binomial,
 * both probabilities summed exactly from the binomial distribution.
 *
 * The scan over n starts where the most powerful randomized test first reaches
 * the power (shared/powerCeiling.ts), since no exact rule can start earlier.
 *
 * Conventions: alpha is one-sided; r is the smallest count keeping alpha (so the
 * most powerful at that n); constraints are met within an absolute 1e-12.
 * Because exact power is saw-toothed in n, a size just above n can fail; the
 * report lists the next sizes so that a protocol does not add patients blindly.
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { TARGET_SLACK, checkResponseRates, responseRateFields } from "./shared/responseRates.js";
import { binomialUpperTails as upperTails, rateGrid } from "./shared/twoStage.js";
import { smallestSizeForPower } from "./shared/powerCeiling.js";
import { type SingleStageRule, singleStageRuleAt } from "./shared/singleStageRule.js";
import { designSection, protocolSection, responseRateCurveSection } from "./shared/reportSections.js";
import { formatCount, workEstimate } from "./shared/workEstimate.js";

/** Sizes beyond this are not searched (p0 and p1 a few points apart need thousands). */
export const SINGLE_STAGE_MAX_N = 5000;
/** Sizes listed after the chosen one, since exact power is saw-toothed in n. */
const NEARBY_SIZES = 10;

const schema = z.strictObject({ ...responseRateFields }).superRefine(checkResponseRates);

export type SingleStageBinomialInput = z.output<typeof schema>;

export interface SingleStageBinomialResult extends SingleStageRule {
  nearbySizes: Array<SingleStageRule & { meetsTargets: boolean }>;
  curve: Array<[number, number]>;
}

/**
 * The compute budget (budget.ts). Where the scan stops cannot be known without
 * running it (exact power is saw-toothed), and finding where it starts costs
 * as much as a good part of it, so the estimate is the most any input can
 * take: every size up to SINGLE_STAGE_MAX_N scanned with two binomial
 * distributions each, then the start's bisection (⌈log2 5,000⌉ = 13 sizes),
 * the nearby sizes (11) and the curve (53 rates: the grid with p0 and p1) at
 * the largest size, also two distributions each. About 26 million binomial
 * terms in all: far inside the budget, so no input is refused.
 *
 * Constant from `npm run bench designs` (the single-stage-binomial heaviest
 * cases, median CPU over 3 runs while other work shared the machine): the
 * scan from n = 2,232 to 4,123 sums 12.8 million terms in 156 ms and the one
 * from 3,979 to 4,990 9.9 million in 112 ms, 11 to 12 ns a term; 12.5 ns is
 * taken. The heaviest inputs found reach half the counted maximum.
 */
const MS_PER_TERM = 12.5e-6;
const LARGEST_SIZE_EVALUATIONS = Math.ceil(Math.log2(SINGLE_STAGE_MAX_N)) + (NEARBY_SIZES + 1) + (rateGrid().length + 2);
// Σ 2(n + 1) for n = 1..N is N(N + 3).
const WORST_CASE_TERMS = SINGLE_STAGE_MAX_N * (SINGLE_STAGE_MAX_N + 3) + 2 * LARGEST_SIZE_EVALUATIONS * (SINGLE_STAGE_MAX_N + 1);

export function costSingleStageBinomial(): WorkEstimate {
  return workEstimate([
    { count: WORST_CASE_TERMS, msEach: MS_PER_TERM, what: `binomial terms at most, every size up to ${formatCount(SINGLE_STAGE_MAX_N)} scanned` },
  ], []);
}

export function computeSingleStageBinomial(input: SingleStageBinomialInput): SingleStageBinomialResult {
  const { p0, p1, alpha, power } = input;
  let found: SingleStageRule | undefined;
  // No non-randomized test beats the randomized most powerful one at the same n.
  const start = smallestSizeForPower(SINGLE_STAGE_MAX_N, p0, p1, alpha + TARGET_SLACK, power - TARGET_SLACK) ?? SINGLE_STAGE_MAX_N + 1;
  for (let n = start; n <= SINGLE_STAGE_MAX_N && !found; n++) {
    const rule = singleStageRuleAt(n, p0, p1, alpha);
    if (rule.power >= power - TARGET_SLACK) found = rule;
  }
  if (!found) {
    throw new InfeasibleDesignError(
      `No single-stage design with at most ${SINGLE_STAGE_MAX_N} patients keeps alpha at ${alpha} and reaches power ${power} for p0 = ${p0} and p1 = ${p1}. Widen the gap between p0 and p1, or relax alpha or power.`,
      { field: "p1", bound: SINGLE_STAGE_MAX_N },
    );
  }
  const nearbySizes = [];
  for (let n = found.n; n <= Math.min(SINGLE_STAGE_MAX_N, found.n + NEARBY_SIZES); n++) {
    const rule = singleStageRuleAt(n, p0, p1, alpha);
    nearbySizes.push({ ...rule, meetsTargets: rule.power >= power - TARGET_SLACK });
  }
  const r = found.r;
  const curve = rateGrid(p0, p1).map((p): [number, number] => [p, upperTails(found.n, p)[r]!]);
  return { ...found, nearbySizes, curve };
}

function documentSingleStage(input: SingleStageBinomialInput, res: SingleStageBinomialResult): Section[] {
  const protocol = `${res.n} evaluable patients will be enrolled, and the drug will be declared promising if ${res.r} or more respond (A'Hern 2001). ` +
    `This tests the null hypothesis that the true response rate is at most ${input.p0} against the alternative that it is at least ${input.p1}; ` +
    `computed exactly from the binomial distribution, the probability of declaring the drug promising is ${res.alpha.toFixed(4)} when the true rate is ${input.p0} (one-sided alpha; target at most ${input.alpha}) ` +
    `and ${res.power.toFixed(4)} when it is ${input.p1} (power; target at least ${input.power}).`;
  return [
    designSection([
      { label: "Patients (n)", value: res.n, key: true },
      { label: "Promising if responses ≥ (r)", value: res.r, key: true },
      { label: "Exact alpha (at p0)", value: res.alpha, digits: 4, key: true },
      { label: "Exact power (at p1)", value: res.power, digits: 4, key: true },
    ], [
      {
        kind: "table",
        table: {
          id: "decision-rule",
          caption: "Decision rule",
          columns: [{ key: "responses", label: `Responses among ${res.n}` }, { key: "decision", label: "Decision" }],
          rows: [[`${res.r} or more`, "Promising: consider further study"], [`${res.r - 1} or fewer`, "Not promising"]],
        },
      },
      {
        kind: "table",
        table: {
          id: "nearby-sizes",
          caption: "Larger sizes: exact power is not monotone in n",
          columns: [
            { key: "n", label: "n" }, { key: "r", label: "r" },
            { key: "alpha", label: "Alpha", digits: 4 }, { key: "power", label: "Power", digits: 4 },
            { key: "meets", label: "Meets targets" },
          ],
          rows: res.nearbySizes.map((s) => [s.n, s.r, s.alpha, s.power, s.meetsTargets ? "yes" : "no"]),
        },
      },
    ]),
    responseRateCurveSection({
      id: "probability-of-promise",
      title: `Probability of declaring promise (${res.r} or more of ${res.n}) against the true response rate`,
      yLabel: "P(declare promising)",
      points: res.curve,
      markers: [{ axis: "x", value: input.p0, label: `p0 = ${input.p0}` }, { axis: "x", value: input.p1, label: `p1 = ${input.p1}` }],
    }),
    protocolSection(protocol),
  ];
}

export const singleStageBinomial: Design<SingleStageBinomialInput, SingleStageBinomialResult> = {
  id: "single-stage-binomial",
  version: 2,
  stage: "activity",
  title: "Single-stage exact binomial design",
  summary: "Smallest single-arm trial, and its critical number of responses, that tells an uninteresting response rate from a target one with exact alpha and power.",
  input: schema,
  example: { p0: 0.15, p1: 0.35, alpha: 0.05, power: 0.8 },
  compute: computeSingleStageBinomial,
  cost: costSingleStageBinomial,
  question: (input) => `How many patients, and how many responses among them, are needed to declare the drug promising with probability at most ${input.alpha} if its response rate is ${input.p0} and at least ${input.power} if it is ${input.p1}?`,
  document: documentSingleStage,
  references: [
    { key: "A'Hern 2001", text: "A'Hern RP. Sample size tables for exact single-stage phase II designs. Statistics in Medicine. 2001;20(6):859-866." },
  ],
  cautions: [
    "Exact power rises and falls with n: a few more patients than the design's n can give less power. Change n only by re-running the design.",
    "The response rates p0 and p1 are assumptions; justify p0 from the outcomes of current treatment in the same population.",
  ],
};
