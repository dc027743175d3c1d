/**
 * Gehan's two-stage design for a single-arm trial of response rate.
 *
 * Method: Gehan EA. The determination of the number of patients required in a
 * preliminary and a follow-up trial of a new chemotherapeutic agent. Journal of
 * Chronic Diseases 1961;13:346-353. Stage 1 enrols the smallest n1 with
 * (1 - p1)^n1 ≤ beta, so that a drug with response rate p1 or more shows no
 * response in all n1 with probability at most beta; with no response the trial
 * stops. After x1 ≥ 1 responses, stage 2 adds n2 patients so that the standard
 * error of the final proportion, √(p(1 - p)/(n1 + n2)), is at most the target.
 *
 * Convention for the rate p in that standard error (Gehan used a conservative
 * value from stage 1): by default, the rate in [x1/n1, U] whose p(1 - p) is
 * largest, U the exact one-sided upper confidence limit from stage 1 at
 * `confidenceLevel` (Clopper-Pearson: the `confidenceLevel` quantile of
 * Beta(x1 + 1, n1 - x1)), 75% by default; this is U itself unless the interval
 * contains 1/2, where p(1 - p) peaks. Alternatively the stage-1 proportion x1/n1.
 * n1 + n2 is the smallest integer meeting the target (within 1e-9 patients).
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { betaQuantile } from "../stats/beta.js";
import { binomialPmfArray } from "../stats/binomial.js";
import { designSection, protocolSection, responseRateCurveSection } from "./shared/reportSections.js";
import { workEstimate } from "./shared/workEstimate.js";

/** Stage-1 sizes beyond this are refused; the input bounds (p1 ≥ 0.01, beta ≥ 0.001) need at most 688. */
export const GEHAN_MAX_N1 = 2000;

const schema = z.strictObject({
  p1: z.number().min(0.01).max(0.99)
    .describe("Smallest response rate that would make the drug worth further study (p1), as a proportion from 0.01 to 0.99."),
  beta: z.number().min(0.001).max(0.5).default(0.05)
    .describe("Largest accepted probability of stopping after stage 1 (no response at all) when the true response rate is p1."),
  targetSE: z.number().min(0.01).max(0.5).default(0.1)
    .describe("Largest accepted standard error of the final estimate of the response rate, as a proportion from 0.01 to 0.5 (0.1 is 10 percentage points)."),
  rateForStandardError: z.enum(["upper-confidence-limit", "stage-one-proportion"]).default("upper-confidence-limit")
    .describe("Rate used in the standard error when sizing stage 2: a conservative upper confidence limit from stage 1 (moved to 1/2 when the interval from the stage-1 proportion contains it), or the stage-1 proportion itself."),
  confidenceLevel: z.number().min(0.5).lt(1).default(0.75)
    .describe("One-sided level of the exact upper confidence limit used for the standard error (Gehan used 75%)."),
});

export type GehanTwoStageInput = z.output<typeof schema>;

export interface GehanStageTwoRow {
  stage1Responses: number;
  /** P(this many responses in stage 1) when the true rate is p1. */
  probabilityAtP1: number;
  rateForStandardError: number;
  stage2Size: number;
  totalSize: number;
  standardError: number;
}

export interface GehanTwoStageResult {
  n1: number;
  probabilityOfEarlyTerminationAtP1: number;
  rows: GehanStageTwoRow[];
  largestTotalSize: number;
  expectedSampleSizeAtP1: number;
  stoppingCurve: Array<[number, number]>;
}

export function gehanStageOneSize(p1: number, beta: number): number | null {
  for (let n = 1; n <= GEHAN_MAX_N1; n++) if ((1 - p1) ** n <= beta) return n;
  return null;
}

/** The rate whose variance sizes stage 2 after x1 responses among n1. */
export function rateForStandardError(input: GehanTwoStageInput, x1: number, n1: number): number {
  const observed = x1 / n1;
  if (input.rateForStandardError === "stage-one-proportion") return observed;
  const upper = x1 >= n1 ? 1 : betaQuantile(input.confidenceLevel, x1 + 1, n1 - x1);
  return Math.min(Math.max(0.5, observed), upper);
}

/**
 * The compute budget (budget.ts): one row per possible number of stage-1
 * responses, each with an exact upper confidence limit (a beta quantile, found
 * iteratively) when that convention is chosen. The bounds of p1 and beta allow
 * at most 688 rows, far inside the budget, so no input is refused.
 *
 * Constants from `npm run bench designs` (the gehan-two-stage heaviest case,
 * 688 rows with a 0.9999 confidence level, median CPU over 3 runs while other
 * work shared the machine): 9 to 16 ms, up to 23 µs a row (a beta quantile
 * alone took 2 to 11 µs); 30 µs is taken.
 */
const MS_PER_QUANTILE_ROW = 0.03;
const MS_PER_PLAIN_ROW = 0.001;

export function costGehanTwoStage(input: GehanTwoStageInput): WorkEstimate {
  const rows = gehanStageOneSize(input.p1, input.beta) ?? 0;
  const quantiles = input.rateForStandardError === "upper-confidence-limit";
  return workEstimate([{
    count: rows,
    msEach: quantiles ? MS_PER_QUANTILE_ROW : MS_PER_PLAIN_ROW,
    what: `stage-2 sizes, one per possible number of stage-1 responses${quantiles ? ", each from an exact upper confidence limit" : ""}`,
  }], []); // Fewer rows need a higher p1 or a higher beta: no field falls to lower the work.
}

export function computeGehanTwoStage(input: GehanTwoStageInput): GehanTwoStageResult {
  const n1 = gehanStageOneSize(input.p1, input.beta);
  if (n1 === null) {
    throw new InfeasibleDesignError(`A stage 1 of more than ${GEHAN_MAX_N1} patients would be needed to see a response with probability ${1 - input.beta} at a response rate of ${input.p1}.`, { field: "p1", bound: GEHAN_MAX_N1 });
  }
  const pmf = binomialPmfArray(n1, input.p1);
  const rows: GehanStageTwoRow[] = [];
  let expected = n1;
  for (let x1 = 1; x1 <= n1; x1++) {
    const p = rateForStandardError(input, x1, n1);
    const variance = p * (1 - p);
    const total = Math.max(n1, Math.ceil(variance / input.targetSE ** 2 - 1e-9));
    rows.push({
      stage1Responses: x1,
      probabilityAtP1: pmf[x1]!,
      rateForStandardError: p,
      stage2Size: total - n1,
      totalSize: total,
      standardError: Math.sqrt(variance / total),
    });
    expected += pmf[x1]! * (total - n1);
  }
  const stoppingCurve: Array<[number, number]> = [];
  for (let i = 0; i <= 50; i++) stoppingCurve.push([i / 50, (1 - i / 50) ** n1]);
  return {
    n1,
    probabilityOfEarlyTerminationAtP1: (1 - input.p1) ** n1,
    rows,
    largestTotalSize: Math.max(...rows.map((r) => r.totalSize)),
    expectedSampleSizeAtP1: expected,
    stoppingCurve,
  };
}

function documentGehan(input: GehanTwoStageInput, res: GehanTwoStageResult): Section[] {
  const rateText = input.rateForStandardError === "upper-confidence-limit"
    ? `the exact one-sided ${(input.confidenceLevel * 100).toFixed(0)}% upper confidence limit for the response rate from stage 1 (or 1/2 where that interval includes it)`
    : "the proportion of responders in stage 1";
  const protocol = `The trial follows Gehan's two-stage design (Gehan 1961). In stage 1, ${res.n1} evaluable patients are enrolled: if none responds, the trial stops, since a drug with a response rate of ${input.p1} or more would show no response among ${res.n1} patients with probability ${res.probabilityOfEarlyTerminationAtP1.toFixed(3)} (at most ${input.beta}). ` +
    `If at least one responds, further patients are enrolled, the number depending on the stage-1 responses as tabulated, so that the standard error of the final estimate of the response rate is at most ${input.targetSE}, computed from ${rateText}. ` +
    `At most ${res.largestTotalSize} patients are enrolled in all; if the true rate is ${input.p1}, the expected number is ${res.expectedSampleSizeAtP1.toFixed(1)}.`;
  return [
    designSection([
      { label: "Stage 1 patients (n1)", value: res.n1, key: true },
      { label: "P(no response in stage 1) at p1", value: res.probabilityOfEarlyTerminationAtP1, digits: 4, key: true },
      { label: "Largest total size", value: res.largestTotalSize, key: true },
      { label: "Expected total size at p1", value: res.expectedSampleSizeAtP1, digits: 1 },
    ], [
      {
        kind: "table",
        table: {
          id: "stage-two-sizes",
          caption: `After stage 1 (${res.n1} patients): stop if no response; otherwise enrol the stage-2 patients shown`,
          columns: [
            { key: "x1", label: "Stage-1 responses" },
            { key: "n2", label: "Stage-2 patients" },
            { key: "total", label: "Total patients" },
            { key: "rate", label: "Rate used for the standard error", digits: 3 },
            { key: "se", label: "Standard error at that rate", digits: 4 },
            { key: "prob", label: "P(this many) at p1", digits: 4 },
          ],
          rows: [
            [0, 0, res.n1, null, null, res.probabilityOfEarlyTerminationAtP1],
            ...res.rows.map((r) => [r.stage1Responses, r.stage2Size, r.totalSize, r.rateForStandardError, r.standardError, r.probabilityAtP1]),
          ],
          note: "With no stage-1 response the trial stops and no standard error target applies.",
        },
      },
    ]),
    responseRateCurveSection({
      id: "early-stop",
      title: `Probability of stopping after stage 1 (no response among ${res.n1}) against the true response rate`,
      yLabel: "P(stop after stage 1)",
      points: res.stoppingCurve,
      markers: [{ axis: "x", value: input.p1, label: `p1 = ${input.p1}` }, { axis: "y", value: input.beta, label: `beta = ${input.beta}` }],
    }),
    protocolSection(protocol),
  ];
}

export const gehanTwoStage: Design<GehanTwoStageInput, GehanTwoStageResult> = {
  id: "gehan-two-stage",
  version: 1,
  stage: "activity",
  title: "Gehan two-stage design",
  summary: "Single-arm two-stage design that stops when stage 1 shows no response at all, then sizes stage 2 to estimate the response rate to a given standard error.",
  input: schema,
  example: { p1: 0.2, beta: 0.05, targetSE: 0.1, rateForStandardError: "upper-confidence-limit", confidenceLevel: 0.75 },
  compute: computeGehanTwoStage,
  cost: costGehanTwoStage,
  question: (input) => `How many patients are needed in stage 1 so that a drug with a response rate of ${input.p1} or more shows at least one response with probability ${1 - input.beta}, and how many more, by the number of stage-1 responses, to estimate the response rate with a standard error of at most ${input.targetSE}?`,
  document: documentGehan,
  references: [
    { key: "Gehan 1961", text: "Gehan EA. The determination of the number of patients required in a preliminary and a follow-up trial of a new chemotherapeutic agent. Journal of Chronic Diseases. 1961;13(4):346-353." },
    { key: "Clopper & Pearson 1934", text: "Clopper CJ, Pearson ES. The use of confidence or fiducial limits illustrated in the case of the binomial. Biometrika. 1934;26(4):404-413." },
  ],
  cautions: [
    "Stage 1 only screens out drugs with no activity at all; it is not a test of a null response rate, and the design sets no type I error. Use Simon's two-stage design to test an uninteresting rate against a target one.",
    "The standard error target holds at the rate used to size stage 2; if the true rate is nearer 1/2, the achieved standard error is larger.",
  ],
};
