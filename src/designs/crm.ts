/**
 * CRM: the continual reassessment method for finding the MTD.
 *
 * Method: O'Quigley J, Pepe M, Fisher L (1990), Biometrics 46:33-48, in its
 * Bayesian form with a one-parameter model and a normal prior a ~ N(0, σ²):
 * - power ("empiric") model p_i(a) = s_i^exp(a);
 * - one-parameter logistic model p_i(a) = 1/(1 + exp(-(a0 + exp(a) x_i))) with
 *   the intercept a0 fixed (3 by default, the usual convention) and dose
 *   labels x_i = logit(s_i) - a0 backed out from the skeleton s, so that the
 *   prior median curve is the skeleton.
 * The posterior of a is computed by numerical integration (adaptive
 * Gauss-Kronrod for a next-dose decision, a tabulated composite Gauss-Legendre
 * rule in simulations; both agree to 1e-9, see shared/crmPosterior.ts).
 * The skeleton is given, or calibrated by the indifference-interval method of
 * Lee & Cheung (2009) from the target, the half-width δ and the prior MTD.
 *
 * Conventions:
 * - Estimate of each dose's DLT probability: its posterior mean (default), or
 *   the plug-in p_i(E[a | data]) of O'Quigley, Pepe & Fisher (1990).
 * - Recommended dose: the one whose estimate is closest to the target (the
 *   lower dose on a tie), among doses up to one above the highest dose tried
 *   (no skipping of untried doses when escalating). With no data yet, the
 *   start dose.
 * - Safety stop: after each cohort, if P(p_1 > target | data) exceeds the
 *   threshold (0.90 by default), the trial stops and no dose is selected.
 * - The trial ends at the maximum sample size (a last cohort that does not fit
 *   is shortened); the MTD is the dose that would be recommended next.
 * - Prior variance 1.34 by default (common practice for the power model).
 * - 90% credible intervals are equal-tailed: since every p_i decreases in a,
 *   they are p_i at the 95% and 5% posterior quantiles of a.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import type { RandomSource } from "../stats/random.js";
import {
  MAX_DOSES, type OperatingCharacteristics, SIMULATION_CAUTION, type TrialEnd, checkDoseFindingInput, checkUseInputs, doseFindingFields, issueReporter,
  observedCounts, observedDataField, operatingCharacteristicsSection, scheduleFacts, simulatePlan, simulationFields, simulationProtocolText, treatCohort, useField,
} from "./shared/doseFinding.js";
import { LEE_CHEUNG_2009, OQUIGLEY_PEPE_FISHER_1990 } from "./shared/doseFindingReferences.js";
import { type CrmModel, calibrateSkeleton, doseConstants, doseProbability } from "./shared/crmModel.js";
import { checkCrmSkeleton } from "./shared/crmSkeletonChecks.js";
import { CRM_NEXT_DOSE_MS, crmSimulationWork, simulationReduce, simulationSize } from "./shared/doseFindingCost.js";
import { CrmFastPosterior, type CrmPosteriorSummary, crmPosterior } from "./shared/crmPosterior.js";
import { designSection, protocolSection } from "./shared/reportSections.js";

const schema = z
  .strictObject({
    use: useField("the recommended dose for the next cohort from the data so far."),
    ...doseFindingFields,
    model: z.enum(["power", "logistic"]).default("power")
      .describe("Dose-toxicity model: power (\"empiric\") p = skeleton^exp(a), or one-parameter logistic p = 1/(1 + exp(-(a0 + exp(a) x))) with the intercept a0 fixed."),
    logisticIntercept: z.number().min(0.5).max(10).default(3)
      .describe("The fixed intercept a0 of the logistic model (3 by convention); unused by the power model."),
    priorVariance: z.number().gt(0.01).max(10).default(1.34)
      .describe("Variance of the normal prior on the model parameter a (mean 0); 1.34 is the usual choice."),
    skeleton: z.array(z.number().gt(0, "Must be above 0.").lt(1, "Must be below 1.")).min(2).max(MAX_DOSES).optional()
      .describe("Prior guesses of the DLT probability at each dose, increasing, each at most 0.999 (with the logistic model, 0.999 of its highest rate 1/(1 + e^-a0)). Leave out to calibrate it from the target, the half-width and the prior MTD (Lee & Cheung 2009)."),
    skeletonHalfWidth: z.number().min(0.01).max(0.25).default(0.05)
      .describe("Half-width δ of the indifference interval target ± δ used to calibrate the skeleton (Lee & Cheung 2009)."),
    priorMtd: z.number().int().min(1).max(MAX_DOSES).optional()
      .describe("Dose believed before the trial to be the MTD, numbered from 1; the calibrated skeleton equals the target there (default: the middle dose)."),
    doseEstimate: z.enum(["posterior-mean", "plug-in"]).default("posterior-mean")
      .describe("Estimate compared with the target: the posterior mean of each dose's DLT probability, or the model at the posterior mean of a (plug-in)."),
    safetyThreshold: z.number().min(0.5).max(0.999).default(0.9)
      .describe("Stop the trial for safety when the posterior probability that the lowest dose's DLT rate exceeds the target is above this."),
    ...simulationFields,
    data: observedDataField,
  })
  .superRefine((v, ctx) => {
    const issue = issueReporter(ctx);
    checkDoseFindingInput(v, issue);
    const k = v.doses.length;
    checkCrmSkeleton(
      { model: v.model, intercept: v.logisticIntercept, target: v.target, skeleton: v.skeleton, halfWidth: v.skeletonHalfWidth, priorMtd: v.priorMtd },
      k, issue, { target: "target", skeleton: "skeleton", halfWidth: "skeletonHalfWidth", priorMtd: "priorMtd" },
    );
    checkUseInputs(v, k, issue, "recommendation");
  })
  .transform((v) => ({ ...v, priorMtd: v.priorMtd ?? Math.ceil(v.doses.length / 2) }));

export type CrmInput = z.output<typeof schema>;

export interface CrmNextDose extends CrmPosteriorSummary {
  /** Index of the recommended dose; -1 when the trial stops for safety. */
  recommendedDose: number;
  stoppedForSafety: boolean;
  /** Highest dose tried so far (index), -1 with no data. */
  highestTried: number;
  totalPatients: number;
  maximumReached: boolean;
}

export interface CrmResult {
  skeleton: number[];
  skeletonCalibrated: boolean;
  /** Logistic model dose labels x_i = logit(s_i) - a0; null for the power model. */
  logisticDoseLabels: number[] | null;
  nextDose: CrmNextDose | null;
  operatingCharacteristics: OperatingCharacteristics[] | null;
}

export function crmSkeleton(input: CrmInput): number[] {
  return input.skeleton ?? calibrateSkeleton(input.model, input.target, input.skeletonHalfWidth, input.priorMtd - 1, input.doses.length, input.logisticIntercept);
}

export function crmModelOf(input: CrmInput): CrmModel {
  return { kind: input.model, skeleton: crmSkeleton(input), intercept: input.logisticIntercept, priorVariance: input.priorVariance };
}

/** The dose closest to the target among doses up to one above the highest tried; the lower on a tie. */
export function crmRecommend(estimates: ArrayLike<number>, target: number, highestTried: number): number {
  const limit = Math.min(estimates.length - 1, highestTried + 1);
  let best = 0;
  for (let i = 1; i <= limit; i++) if (Math.abs(estimates[i]! - target) < Math.abs(estimates[best]! - target)) best = i;
  return best;
}

function crmNextDose(input: CrmInput, model: CrmModel): CrmNextDose {
  const data = input.data!;
  const { patients, dlts, total } = observedCounts(data);
  let highestTried = -1;
  patients.forEach((n, i) => { if (n > 0) highestTried = i; });
  const summary = crmPosterior(model, patients, dlts, input.target, 0.9);
  const stoppedForSafety = total > 0 && summary.probabilityLowestAboveTarget > input.safetyThreshold;
  const estimates = input.doseEstimate === "posterior-mean" ? summary.meanProbability : summary.plugInProbability;
  const recommendedDose = stoppedForSafety ? -1 : total === 0 ? input.startDose - 1 : crmRecommend(estimates, input.target, highestTried);
  return { ...summary, recommendedDose, stoppedForSafety, highestTried, totalPatients: total, maximumReached: total >= input.maxSampleSize };
}

/** One CRM trial, as the shared simulation loop runs it. */
export function crmTrialRunner(input: CrmInput, model: CrmModel = crmModelOf(input)) {
  const posterior = new CrmFastPosterior(model, input.target);
  const constants = doseConstants(model);
  const k = input.doses.length;
  const plugIn = new Float64Array(k);
  return (truth: readonly number[], random: RandomSource, patients: Int32Array, dlts: Int32Array): TrialEnd => {
    posterior.reset();
    let dose = input.startDose - 1;
    let highest = -1;
    let total = 0;
    while (total < input.maxSampleSize) {
      const size = Math.min(input.cohortSize, input.maxSampleSize - total);
      treatCohort(dose, size, truth, random, patients, dlts);
      total += size;
      if (dose > highest) highest = dose;
      posterior.update(patients, dlts);
      if (posterior.probabilityLowestAboveTarget > input.safetyThreshold) return { selected: -1, stoppedForSafety: true };
      let estimates: ArrayLike<number> = posterior.meanProbability;
      if (input.doseEstimate === "plug-in") {
        for (let i = 0; i < k; i++) plugIn[i] = doseProbability(model.kind, constants[i]!, model.intercept, posterior.meanParameter);
        estimates = plugIn;
      }
      dose = crmRecommend(estimates, input.target, highest);
    }
    return { selected: dose, stoppedForSafety: false };
  };
}

export function computeCrm(input: CrmInput): CrmResult {
  const model = crmModelOf(input);
  const base = {
    skeleton: [...model.skeleton],
    skeletonCalibrated: input.skeleton === undefined,
    logisticDoseLabels: input.model === "logistic" ? Array.from(doseConstants(model)) : null,
  };
  if (input.use === "next-dose") return { ...base, nextDose: crmNextDose(input, model), operatingCharacteristics: null };
  return { ...base, nextDose: null, operatingCharacteristics: simulatePlan(input, crmTrialRunner(input, model)) };
}

/** A next-dose decision costs one posterior; a plan, its simulated decisions (shared/doseFindingCost.ts). */
export function costCrm(input: CrmInput): WorkEstimate {
  if (input.use === "next-dose") return { milliseconds: CRM_NEXT_DOSE_MS, breakdown: "one posterior by adaptive quadrature, with credible limits", reduce: [] };
  const work = crmSimulationWork(simulationSize(input), { kind: input.model, intercept: input.logisticIntercept, priorVariance: input.priorVariance });
  return { ...work, reduce: simulationReduce(input) };
}

const f3 = (x: number): string => x.toFixed(3);

function modelText(input: CrmInput): string {
  return input.model === "power"
    ? `the power model p = s^exp(a)`
    : `the one-parameter logistic model p = 1/(1 + exp(-(${input.logisticIntercept} + exp(a) x))) with dose labels x backed out from the skeleton`;
}

function skeletonText(input: CrmInput, r: CrmResult): string {
  const values = r.skeleton.map(f3).join(", ");
  return r.skeletonCalibrated
    ? `a skeleton of ${values}, calibrated by the indifference-interval method (Lee & Cheung 2009) with half-width ${input.skeletonHalfWidth} and prior MTD ${input.doses[input.priorMtd - 1]}`
    : `a skeleton of ${values}`;
}

function documentCrm(input: CrmInput, r: CrmResult): Section[] {
  const doses = input.doses;
  const sections: Section[] = [
    designSection([
      { label: "Model", value: input.model === "power" ? "power (empiric)" : `one-parameter logistic, intercept ${input.logisticIntercept}`, key: true },
      { label: "Target DLT rate", value: input.target, key: true },
      { label: "Prior on a", value: `normal, mean 0, variance ${input.priorVariance}` },
      { label: "Skeleton", value: r.skeleton.map(f3).join(", "), key: true, note: r.skeletonCalibrated ? `calibrated: indifference interval ${f3(input.target - input.skeletonHalfWidth)} to ${f3(input.target + input.skeletonHalfWidth)}, prior MTD ${doses[input.priorMtd - 1]}` : "given" },
      { label: "Dose estimate", value: input.doseEstimate === "posterior-mean" ? "posterior mean of the DLT probability" : "model at the posterior mean of a (plug-in)" },
      ...scheduleFacts(input),
      { label: "Safety stop", value: `P(DLT rate at ${doses[0]} > ${input.target}) > ${input.safetyThreshold}` },
    ], [
      {
        kind: "table",
        table: {
          id: "skeleton",
          caption: "Skeleton: prior guess of the DLT probability at each dose",
          columns: [
            { key: "dose", label: "Dose" },
            { key: "skeleton", label: "Skeleton", digits: 4 },
            ...(r.logisticDoseLabels ? [{ key: "label", label: "Logistic dose label x", digits: 4 }] : []),
          ],
          rows: doses.map((d, i) => [d, r.skeleton[i]!, ...(r.logisticDoseLabels ? [r.logisticDoseLabels[i]!] : [])]),
        },
      },
      {
        kind: "table",
        table: {
          id: "decision-rules",
          caption: "Decision rules after each cohort",
          columns: [{ key: "when", label: "When" }, { key: "action", label: "Action" }],
          rows: [
            [`P(DLT rate at ${doses[0]} > ${input.target} | data) > ${input.safetyThreshold}`, "Stop the trial; no dose is selected"],
            ["Otherwise", `Treat the next cohort at the dose whose estimated DLT probability is closest to ${input.target}, never more than one dose above the highest dose tried`],
            [`${input.maxSampleSize} patients treated`, "Stop; the MTD is the dose that would be recommended next"],
          ],
        },
      },
    ]),
  ];
  if (r.nextDose) sections.push(nextDoseSection(input, r.nextDose));
  if (r.operatingCharacteristics) sections.push(operatingCharacteristicsSection(doses, r.operatingCharacteristics, "the CRM"));
  sections.push(protocolSection(protocolText(input, r)));
  return sections;
}

function nextDoseSection(input: CrmInput, nd: CrmNextDose): Section {
  const doses = input.doses;
  const data = input.data!;
  const decision = nd.stoppedForSafety
    ? `Stop for safety: P(DLT rate at ${doses[0]} > ${input.target}) = ${f3(nd.probabilityLowestAboveTarget)}`
    : nd.maximumReached ? `Maximum sample size reached: the MTD is ${doses[nd.recommendedDose]}` : `Treat the next cohort at ${doses[nd.recommendedDose]}`;
  return {
    id: "next-dose",
    title: "Next dose",
    blocks: [
      {
        kind: "facts",
        facts: [
          { label: "Recommendation", value: decision, key: true },
          { label: `P(DLT rate at ${doses[0]} > ${input.target})`, value: nd.probabilityLowestAboveTarget, digits: 4, key: true, note: `stop above ${input.safetyThreshold}` },
          { label: "Patients so far", value: nd.totalPatients, note: `of at most ${input.maxSampleSize}` },
          { label: "Posterior mean of a", value: nd.meanParameter, digits: 4 },
        ],
      },
      {
        kind: "table",
        table: {
          id: "posterior",
          caption: "Data so far and posterior DLT probabilities",
          columns: [
            { key: "dose", label: "Dose" },
            { key: "patients", label: "Patients" },
            { key: "dlts", label: "DLTs" },
            { key: "mean", label: "Posterior mean", digits: 3 },
            { key: "lower", label: "90% credible interval, lower", digits: 3 },
            { key: "upper", label: "90% credible interval, upper", digits: 3 },
            { key: "plugin", label: "Plug-in estimate", digits: 3 },
          ],
          rows: doses.map((d, i) => [d, data[i]!.patients, data[i]!.dlts, nd.meanProbability[i]!, nd.credibleLower[i]!, nd.credibleUpper[i]!, nd.plugInProbability[i]!]),
          note: "Equal-tailed 90% credible intervals. Posterior by adaptive Gauss-Kronrod quadrature.",
        },
      },
      {
        kind: "chart",
        chart: {
          id: "posterior",
          title: "Posterior DLT probability by dose (mean and 90% credible limits)",
          xLabel: "Dose",
          yLabel: "DLT probability",
          yDomain: [0, 1],
          categories: doses,
          series: [
            { name: "Posterior mean", style: "bars", points: nd.meanProbability.map((p, i): [number, number] => [i, p]) },
            { name: "90% lower limit", style: "points", points: nd.credibleLower.map((p, i): [number, number] => [i, p]) },
            { name: "90% upper limit", style: "points", points: nd.credibleUpper.map((p, i): [number, number] => [i, p]) },
          ],
          markers: [{ axis: "y", value: input.target, label: `target ${input.target}` }],
        },
      },
    ],
  };
}

function protocolText(input: CrmInput, r: CrmResult): string {
  const doses = input.doses;
  let text = `Dose finding will use the continual reassessment method (CRM; O'Quigley, Pepe & Fisher 1990) with a target DLT rate of ${input.target}, over ${doses.length} dose levels (${doses.join(", ")}), using ${modelText(input)}, ${skeletonText(input, r)}, and a normal prior on a with mean 0 and variance ${input.priorVariance}. ` +
    `Patients are treated in cohorts of ${input.cohortSize}, starting at ${doses[input.startDose - 1]}. After each cohort, the posterior distribution of a is updated by numerical integration and the next cohort receives the dose whose ${input.doseEstimate === "posterior-mean" ? "posterior mean DLT probability" : "DLT probability at the posterior mean of a"} is closest to ${input.target}, without skipping an untried dose when escalating. ` +
    `The trial stops for safety if the posterior probability that the DLT rate at ${doses[0]} exceeds ${input.target} is above ${input.safetyThreshold}; otherwise it ends after ${input.maxSampleSize} patients, and the MTD is the dose recommended for the next patient.`;
  const ocs = r.operatingCharacteristics;
  if (ocs) text += simulationProtocolText(doses, input.trials, input.seed, ocs);
  const nd = r.nextDose;
  if (nd) {
    text += nd.stoppedForSafety
      ? ` With the data so far (${nd.totalPatients} patients), the posterior probability that the DLT rate at ${doses[0]} exceeds ${input.target} is ${f3(nd.probabilityLowestAboveTarget)}, above ${input.safetyThreshold}: the trial stops for safety.`
      : ` With the data so far (${nd.totalPatients} patients), the ${nd.maximumReached ? "selected MTD" : "recommended dose for the next cohort"} is ${doses[nd.recommendedDose]}, with posterior mean DLT probability ${f3(nd.meanProbability[nd.recommendedDose]!)} (90% credible interval ${f3(nd.credibleLower[nd.recommendedDose]!)} to ${f3(nd.credibleUpper[nd.recommendedDose]!)}).`;
  }
  return text;
}

export const crm: Design<CrmInput, CrmResult> = {
  id: "crm",
  // 2: the simulations' quadrature panels are no wider than the logistic model's poles are far from the real axis, which moves results for a logistic intercept above 3.05.
  version: 2,
  stage: "dose-finding",
  title: "CRM (continual reassessment method) dose finding",
  summary: "The continual reassessment method with a power or one-parameter logistic model: the next dose with posterior DLT estimates and credible intervals from the data so far, or simulated operating characteristics under scenarios; skeleton given or calibrated.",
  input: schema,
  example: {
    use: "plan",
    doses: ["TW-417 10 mg", "TW-417 20 mg", "TW-417 40 mg", "TW-417 70 mg", "TW-417 100 mg"],
    target: 0.25,
    cohortSize: 3,
    startDose: 1,
    maxSampleSize: 24,
    model: "power",
    logisticIntercept: 3,
    priorVariance: 1.34,
    skeletonHalfWidth: 0.05,
    priorMtd: 3,
    doseEstimate: "posterior-mean",
    safetyThreshold: 0.9,
    scenarios: [
      { name: "MTD at 40 mg", dltProbabilities: [0.05, 0.12, 0.25, 0.4, 0.55] },
      { name: "Toxic from the start", dltProbabilities: [0.4, 0.5, 0.6, 0.7, 0.8] },
    ],
    trials: 500,
    seed: 20261201,
  },
  compute: computeCrm,
  cost: costCrm,
  question: (input) => input.use === "next-dose"
    ? `With the data so far at ${input.doses.join(", ")}, which dose should the next cohort of ${input.cohortSize} receive under the CRM targeting a DLT rate of ${input.target}, and what are the posterior DLT probabilities?`
    : `Under the CRM targeting a DLT rate of ${input.target} with at most ${input.maxSampleSize} patients, how often is each dose selected as the MTD, and how many patients are treated at each dose, under each scenario?`,
  document: documentCrm,
  references: [
    OQUIGLEY_PEPE_FISHER_1990,
    LEE_CHEUNG_2009,
    { key: "Cheung & Chappell 2002", text: "Cheung YK, Chappell R. A simple technique to evaluate model sensitivity in the continual reassessment method. Biometrics. 2002;58(3):671-674.", doi: "10.1111/j.0006-341X.2002.00671.x" },
    { key: "Cheung 2011", text: "Cheung YK. Dose Finding by the Continual Reassessment Method. Boca Raton: Chapman & Hall/CRC; 2011." },
  ],
  cautions: [
    SIMULATION_CAUTION,
    "The CRM's behaviour depends on the skeleton and the prior; check the operating characteristics under several scenarios, including one where every dose is too toxic and one where every dose is safe.",
    "The model assumes toxicity increases with dose and that each DLT is observed before the next cohort is dosed.",
    "A model-based recommendation supports, it does not replace, the safety review committee's decision.",
  ],
};
