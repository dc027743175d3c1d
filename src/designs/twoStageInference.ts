/**
 * Inference after a two-stage single-arm trial has ended: p-value, exact
 * confidence interval and bias-adjusted estimate of the response rate.
 *
 * Methods: for a rule "stop if at most r1 of n1 respond, else treat n in all"
 * (Simon 1989), outcomes are ordered stage-wise (Fairbanks & Madsen 1982): a
 * stop after stage 1 ranks below any trial that reached stage 2, then by the
 * number of responses. p-value P_p0(outcome ≥ observed), one-sided; exact
 * two-sided interval by inverting it with equal tails (Koyama & Chen 2008,
 * Statistics in Medicine 27:3145-3154); the uniformly minimum variance
 * unbiased estimate (Jung & Kim 2004, Statistics in Medicine 23:881-896).
 * Everything by exact binomial enumeration (see shared/stagewiseInference.ts).
 *
 * Conventions: the interval puts (1 - level)/2 in each tail, and its lower end
 * is 0 after no response in stage 1 and its upper end 1 after all n respond.
 * The final count r is part of the design but does not enter the inference;
 * it says whether the rule declared the drug promising.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import {
  type TwoStageOutcome, allOutcomes, probabilityAtLeast, stagewiseInterval, umvue,
} from "./shared/stagewiseInference.js";
import { TWO_STAGE_MAX_N, type TwoStageRule, evaluateTwoStage } from "./shared/twoStage.js";
import { probabilityField } from "./shared/fields.js";
import { describeTwoStage, twoStageRuleTable } from "./shared/twoStageReport.js";
import { protocolSection } from "./shared/reportSections.js";
import { workEstimate } from "./shared/workEstimate.js";

const count = (description: string) => z.number().int().min(0).max(TWO_STAGE_MAX_N).describe(description);

const schema = z
  .strictObject({
    r1: count("The design's stage-1 rule: the trial stops if this many or fewer of the first n1 patients respond."),
    n1: count("Number of patients in stage 1."),
    r: count("The design's final rule: the drug is declared promising if more than this many of all n patients respond."),
    n: count("Total number of patients over both stages."),
    p0: probabilityField("Uninteresting response rate (the null rate p0) against which the p-value is computed."),
    confidenceLevel: z.number().min(0.5).max(0.999).default(0.95)
      .describe("Two-sided confidence level of the interval (0.95 for a 95% interval; (1 - level)/2 in each tail)."),
    stage1Responses: count("Responses observed among the n1 stage-1 patients."),
    stage2Responses: count("Responses observed among the n - n1 stage-2 patients; leave out when the trial stopped after stage 1.").optional(),
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    if (v.n1 < 1) issue("n1", "Stage 1 needs at least one patient.");
    if (v.n1 >= v.n) issue("n", `The total size n (${v.n}) must exceed the stage-1 size n1 (${v.n1}).`);
    if (v.r1 >= v.n1) issue("r1", `The stage-1 stopping count r1 (${v.r1}) must be below n1 (${v.n1}).`);
    if (v.r < v.r1) issue("r", `The final count r (${v.r}) cannot be below the stage-1 count r1 (${v.r1}).`);
    if (v.r >= v.n) issue("r", `The final count r (${v.r}) must be below n (${v.n}).`);
    if (v.stage1Responses > v.n1) issue("stage1Responses", `At most ${v.n1} stage-1 patients can respond.`);
    const stopped = v.stage1Responses <= v.r1;
    if (stopped && v.stage2Responses !== undefined) {
      issue("stage2Responses", `With ${v.stage1Responses} stage-1 responses (at most r1 = ${v.r1}) the rule stops the trial after stage 1; leave stage2Responses out.`);
    }
    if (!stopped && v.stage2Responses === undefined) {
      issue("stage2Responses", `With ${v.stage1Responses} stage-1 responses (more than r1 = ${v.r1}) the trial goes on to stage 2: give the stage-2 responses.`);
    }
    if (v.stage2Responses !== undefined && v.n > v.n1 && v.stage2Responses > v.n - v.n1) {
      issue("stage2Responses", `At most ${v.n - v.n1} stage-2 patients can respond.`);
    }
  });

export type TwoStageInferenceInput = z.output<typeof schema>;

export interface InferenceRow {
  stage: 1 | 2;
  responses: number;
  patients: number;
  naiveEstimate: number;
  umvue: number;
  pValue: number;
  lower: number;
  upper: number;
}

export interface TwoStageInferenceResult {
  observed: InferenceRow;
  declaredPromising: boolean;
  designAlpha: number;
  /** The same quantities for every outcome the design can end in, lowest first. */
  allOutcomes: InferenceRow[];
}

function ruleOf(input: TwoStageInferenceInput): TwoStageRule {
  return { r1: input.r1, n1: input.n1, r: input.r, n: input.n };
}

function inferenceRow(rule: TwoStageRule, outcome: TwoStageOutcome, p0: number, level: number): InferenceRow {
  const patients = outcome.stage === 1 ? rule.n1 : rule.n;
  const [lower, upper] = stagewiseInterval(rule, outcome, level);
  return {
    stage: outcome.stage,
    responses: outcome.responses,
    patients,
    naiveEstimate: outcome.responses / patients,
    umvue: umvue(rule, outcome),
    pValue: probabilityAtLeast(rule, outcome, p0),
    lower,
    upper,
  };
}

/**
 * The compute budget (budget.ts): every outcome of the design (n + 1 of them)
 * gets an exact interval, two root searches whose every step sums the
 * stage-wise tail over the n patients, a p-value, and an unbiased estimate
 * summing at most min(n1, n - n1) + 1 weights. n ≤ 300 keeps it far inside
 * the budget, so no input is refused.
 *
 * Constants from `npm run bench designs` (the two-stage-inference heaviest
 * cases, 301 outcomes of 300 patients, and the example, 30 outcomes of 29;
 * median CPU over 3 runs while other work shared the machine): over 150
 * random designs with levels up to 0.999, Brent's method took at most 18.5
 * evaluations an interval end on average over a design's outcomes (27 for a
 * single end), so 25 are counted. An evaluation took about 2.8 µs plus 9 ns
 * a patient (its two binomial distributions start from log-gamma values),
 * a weight about 25 ns; 3.5 µs, 12 ns and 30 ns are taken.
 */
const EVALUATIONS_PER_INTERVAL_END = 25;
const MS_PER_EVALUATION = 3.5e-3;
const MS_PER_PATIENT_EVALUATION = 1.2e-5;
const MS_PER_WEIGHT = 3e-5;

export function costTwoStageInference(input: TwoStageInferenceInput): WorkEstimate {
  const outcomes = input.n + 1;
  return workEstimate([
    {
      count: outcomes * (2 * EVALUATIONS_PER_INTERVAL_END + 1),
      msEach: MS_PER_EVALUATION + (input.n + 1) * MS_PER_PATIENT_EVALUATION,
      what: `evaluations of the stage-wise tail over ${input.n} patients (${outcomes} possible outcomes × (2 interval ends × up to ${EVALUATIONS_PER_INTERVAL_END} + 1 p-value))`,
    },
    { count: outcomes * (Math.min(input.n1, input.n - input.n1) + 1), msEach: MS_PER_WEIGHT, what: "weights of the unbiased estimates" },
  ], ["n"]);
}

export function computeTwoStageInference(input: TwoStageInferenceInput): TwoStageInferenceResult {
  const rule = ruleOf(input);
  const stopped = input.stage1Responses <= input.r1;
  const outcome: TwoStageOutcome = stopped
    ? { stage: 1, responses: input.stage1Responses }
    : { stage: 2, responses: input.stage1Responses + input.stage2Responses! };
  return {
    observed: inferenceRow(rule, outcome, input.p0, input.confidenceLevel),
    declaredPromising: !stopped && outcome.responses > input.r,
    designAlpha: evaluateTwoStage(rule, input.p0).probabilityOfPromise,
    allOutcomes: allOutcomes(rule).map((o) => inferenceRow(rule, o, input.p0, input.confidenceLevel)),
  };
}

function documentInference(input: TwoStageInferenceInput, res: TwoStageInferenceResult): Section[] {
  const o = res.observed;
  const level = `${(input.confidenceLevel * 100).toFixed(1).replace(/\.0$/, "")}%`;
  const stageText = o.stage === 1
    ? `The trial stopped after stage 1 with ${o.responses} responses among ${o.patients} patients`
    : `The trial completed both stages with ${o.responses} responses among ${o.patients} patients (${input.stage1Responses} of ${input.n1} in stage 1)`;
  const protocol = `${stageText}, under the two-stage rule ${describeTwoStage(ruleOf(input))} (Simon 1989); by that rule the drug was ${res.declaredPromising ? "" : "not "}declared promising. ` +
    `Accounting for the two-stage design, the estimated response rate is ${o.umvue.toFixed(3)} (uniformly minimum variance unbiased estimate; Jung & Kim 2004) and the exact ${level} confidence interval is ${o.lower.toFixed(3)} to ${o.upper.toFixed(3)}, ` +
    `obtained by inverting the stage-wise ordering of outcomes (Koyama & Chen 2008). The one-sided p-value for the null hypothesis that the response rate is at most ${input.p0} is ${o.pValue.toPrecision(3)}. The crude proportion of responders, ${o.naiveEstimate.toFixed(3)}, ignores the stopping rule and is biased.`;
  return [
    {
      id: "inference",
      title: "Inference",
      blocks: [
        {
          kind: "facts",
          facts: [
            { label: "Stage reached", value: o.stage, key: true },
            { label: "Responses / patients", value: `${o.responses} / ${o.patients}`, key: true },
            { label: "Estimate (UMVUE)", value: o.umvue, digits: 4, key: true },
            { label: `Exact ${level} interval, lower`, value: o.lower, digits: 4, key: true },
            { label: `Exact ${level} interval, upper`, value: o.upper, digits: 4, key: true },
            { label: `One-sided p-value (p0 = ${input.p0})`, value: o.pValue, digits: 4, key: true },
            { label: "Crude proportion (biased)", value: o.naiveEstimate, digits: 4 },
            { label: "Declared promising by the rule", value: res.declaredPromising ? "yes" : "no" },
            { label: "Design's exact alpha at p0", value: res.designAlpha, digits: 4 },
          ],
        },
        { kind: "table", table: twoStageRuleTable(ruleOf(input), "design-rules") },
      ],
    },
    {
      id: "all-outcomes",
      title: "Every possible outcome",
      blocks: [{
        kind: "table",
        table: {
          id: "all-outcomes",
          caption: "Inference for each outcome of the design, in the stage-wise ordering (lowest first)",
          columns: [
            { key: "stage", label: "Stage ended" },
            { key: "responses", label: "Responses" },
            { key: "patients", label: "Patients" },
            { key: "umvue", label: "UMVUE", digits: 4 },
            { key: "lower", label: `${level} lower`, digits: 4 },
            { key: "upper", label: `${level} upper`, digits: 4 },
            { key: "p", label: "p-value", digits: 4 },
            { key: "naive", label: "Crude proportion", digits: 4 },
          ],
          rows: res.allOutcomes.map((r) => [r.stage, r.responses, r.patients, r.umvue, r.lower, r.upper, r.pValue, r.naiveEstimate]),
        },
      }],
    },
    protocolSection(protocol, "report"),
  ];
}

export const twoStageInference: Design<TwoStageInferenceInput, TwoStageInferenceResult> = {
  id: "two-stage-inference",
  version: 2,
  stage: "activity",
  title: "Inference after a two-stage trial",
  summary: "P-value, exact confidence interval and unbiased estimate of the response rate at the end of a Simon-type two-stage trial, accounting for the early stop.",
  input: schema,
  example: { r1: 1, n1: 10, r: 5, n: 29, p0: 0.1, confidenceLevel: 0.95, stage1Responses: 3, stage2Responses: 4 },
  compute: computeTwoStageInference,
  cost: costTwoStageInference,
  question: (input) => `The two-stage trial (${input.r1}/${input.n1}, then ${input.r}/${input.n}) ended with ${input.stage1Responses} stage-1 responses${input.stage2Responses === undefined ? "" : ` and ${input.stage2Responses} in stage 2`}: what is the response rate, with an exact ${input.confidenceLevel * 100}% confidence interval, and how strong is the evidence that it exceeds ${input.p0}?`,
  document: documentInference,
  references: [
    { key: "Koyama & Chen 2008", text: "Koyama T, Chen H. Proper inference from Simon's two-stage designs. Statistics in Medicine. 2008;27(16):3145-3154." },
    { key: "Jung & Kim 2004", text: "Jung SH, Kim KM. On the estimation of the binomial probability in multistage clinical trials. Statistics in Medicine. 2004;23(6):881-896." },
    { key: "Fairbanks & Madsen 1982", text: "Fairbanks K, Madsen R. P values for tests using a repeated significance test design. Biometrika. 1982;69(1):69-74." },
    { key: "Simon 1989", text: "Simon R. Optimal two-stage designs for phase II clinical trials. Controlled Clinical Trials. 1989;10(1):1-10." },
  ],
  cautions: [
    "The inference is valid only if the trial followed its rule: enter the design as planned and the responses as observed. If the trial was stopped or extended off the rule, these numbers do not apply.",
    "The p-value and interval depend on the stage-wise ordering of outcomes; other orderings give other values. State the ordering in the report.",
  ],
};
