/**
 * Dose-finding comparison: one scenario of true DLT probabilities run through
 * the 3+3 design, the CRM and BOIN, side by side, so that a team can justify
 * its choice of design.
 *
 * Methods: the 3+3 rules (Storer 1989), computed exactly by enumeration
 * (threePlusThree.ts); the CRM (O'Quigley, Pepe & Fisher 1990; crm.ts) and
 * BOIN (Liu & Yuan 2015; boin.ts), each simulated with the given number of
 * trials.
 *
 * Conventions:
 * - The CRM and BOIN share the target, cohort size, start dose and maximum
 *   sample size; the 3+3 design uses its own cohorts of 3 from the lowest dose
 *   and has no maximum sample size.
 * - The CRM uses the posterior-mean estimate and, for the logistic model, the
 *   intercept 3; BOIN uses the interval limits 0.6 and 1.4 times the target
 *   and eliminates doses after at least 3 patients.
 * - Both simulations start from the same seed.
 * - The true MTD is the dose whose true DLT probability is closest to the
 *   target (shared/doseFinding.ts), for all three designs.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import type { Block, Cell, Section } from "../report/document.js";
import { threePlusThreeOperatingCharacteristics } from "./threePlusThree.js";
import { type CrmInput, crmModelOf, crmTrialRunner } from "./crm.js";
import { type BoinInput, boinBoundaries, boinTrialRunner } from "./boin.js";
import { checkCrmSkeleton } from "./shared/crmSkeletonChecks.js";
import { boinSimulationWork, crmSimulationWork, simulationReduce, simulationSize, threePlusThreeWork } from "./shared/doseFindingCost.js";
import {
  MAX_DOSES, type OperatingCharacteristics, checkDoseFindingInput, checkScenarios, doseFindingFields,
  issueReporter, overdosingShares, scenarioSchema, scenarioSeed, selectionChart, simulateScenario, simulationFields, summaryCells, summaryColumns, trueMtd,
} from "./shared/doseFinding.js";
import { LEE_CHEUNG_2009, LIU_YUAN_2015, OQUIGLEY_PEPE_FISHER_1990, STORER_1989 } from "./shared/doseFindingReferences.js";
import { protocolSection } from "./shared/reportSections.js";

const { scenarios: _unused, ...simulationControls } = simulationFields;

/** The logistic CRM's fixed intercept here (the usual convention). */
const COMPARISON_LOGISTIC_INTERCEPT = 3;

const schema = z
  .strictObject({
    ...doseFindingFields,
    scenario: scenarioSchema.describe("The scenario of true DLT probabilities, one per dose, to run through all three designs."),
    threePlusThreeRule: z.enum(["next-lower-dose", "next-lower-dose-with-six"]).default("next-lower-dose")
      .describe("3+3: after 2 or more DLTs at a dose, the MTD is the next lower dose (next-lower-dose), or the next lower dose once it has 6 patients with at most 1 DLT (next-lower-dose-with-six)."),
    crmModel: z.enum(["power", "logistic"]).default("power").describe("CRM dose-toxicity model: power (empiric) or one-parameter logistic with intercept 3."),
    crmSkeleton: z.array(z.number().gt(0).lt(1)).min(2).max(MAX_DOSES).optional()
      .describe("CRM skeleton (prior guesses of the DLT probability per dose, increasing, each at most 0.999, or 0.999 of 0.9526 with the logistic model); leave out to calibrate it (Lee & Cheung 2009)."),
    crmSkeletonHalfWidth: z.number().min(0.01).max(0.25).default(0.05).describe("Half-width of the indifference interval for calibrating the CRM skeleton."),
    crmPriorMtd: z.number().int().min(1).max(MAX_DOSES).optional().describe("Prior MTD for calibrating the CRM skeleton, numbered from 1 (default: the middle dose)."),
    crmPriorVariance: z.number().gt(0.01).max(10).default(1.34).describe("Variance of the CRM's normal prior on its parameter."),
    crmSafetyThreshold: z.number().min(0.5).max(0.999).default(0.9).describe("CRM: stop when P(DLT rate at the lowest dose > target) exceeds this."),
    boinEliminationCutoff: z.number().min(0.5).max(0.999).default(0.95).describe("BOIN: eliminate a dose (and higher) when P(DLT rate > target) exceeds this, with at least 3 patients."),
    ...simulationControls,
  })
  .superRefine((v, ctx) => {
    const issue = issueReporter(ctx);
    checkDoseFindingInput(v, issue);
    const k = v.doses.length;
    checkScenarios([v.scenario], k, (path, message) => issue(["scenario", ...path.slice(2)], message));
    if (1.4 * v.target >= 1) issue(["target"], "BOIN's overdosing limit 1.4 × target must be below 1: use a target below 0.714.");
    checkCrmSkeleton(
      { model: v.crmModel, intercept: COMPARISON_LOGISTIC_INTERCEPT, target: v.target, skeleton: v.crmSkeleton, halfWidth: v.crmSkeletonHalfWidth, priorMtd: v.crmPriorMtd },
      k, issue, { target: "target", skeleton: "crmSkeleton", halfWidth: "crmSkeletonHalfWidth", priorMtd: "crmPriorMtd" },
    );
  })
  .transform((v) => ({ ...v, crmPriorMtd: v.crmPriorMtd ?? Math.ceil(v.doses.length / 2) }));

export type DoseFindingComparisonInput = z.output<typeof schema>;

export interface DesignComparison {
  design: "3+3" | "CRM" | "BOIN";
  /** true for the 3+3 (exact enumeration), false for simulated designs. */
  exact: boolean;
  operatingCharacteristics: OperatingCharacteristics;
}

export interface DoseFindingComparisonResult {
  trueMtd: number;
  crmSkeleton: number[];
  boinBoundaries: { escalation: number; deescalation: number };
  designs: DesignComparison[];
}

function crmInputOf(v: DoseFindingComparisonInput): CrmInput {
  return {
    use: "plan", doses: v.doses, target: v.target, cohortSize: v.cohortSize, startDose: v.startDose, maxSampleSize: v.maxSampleSize,
    model: v.crmModel, logisticIntercept: COMPARISON_LOGISTIC_INTERCEPT, priorVariance: v.crmPriorVariance, skeleton: v.crmSkeleton, skeletonHalfWidth: v.crmSkeletonHalfWidth,
    priorMtd: v.crmPriorMtd, doseEstimate: "posterior-mean", safetyThreshold: v.crmSafetyThreshold,
    scenarios: [v.scenario], trials: v.trials, seed: v.seed, data: undefined,
  };
}

function boinInputOf(v: DoseFindingComparisonInput): BoinInput {
  return {
    use: "plan", doses: v.doses, target: v.target, cohortSize: v.cohortSize, startDose: v.startDose, maxSampleSize: v.maxSampleSize,
    underdosingLimit: 0.6 * v.target, overdosingLimit: 1.4 * v.target, eliminationCutoff: v.boinEliminationCutoff, eliminationMinPatients: 3,
    scenarios: [v.scenario], trials: v.trials, seed: v.seed, data: undefined, currentDose: undefined,
  };
}

/** The exact 3+3 characteristics in the shared operating-characteristics form. */
function threePlusThreeCharacteristics(v: DoseFindingComparisonInput): OperatingCharacteristics {
  const truth = v.scenario.dltProbabilities;
  const oc = threePlusThreeOperatingCharacteristics(truth, v.threePlusThreeRule);
  const mtd = trueMtd(truth, v.target);
  return {
    scenario: v.scenario.name,
    dltProbabilities: [...truth],
    trueMtd: mtd,
    trials: 0,
    selectionProbability: oc.selectionProbability,
    noSelectionProbability: oc.noDoseProbability,
    correctSelectionProbability: oc.selectionProbability[mtd]!,
    meanPatients: oc.expectedPatients,
    meanDlts: oc.expectedDlts,
    meanTotalPatients: oc.expectedTotalPatients,
    meanTotalDlts: oc.expectedTotalDlts,
    ...overdosingShares(oc.expectedPatients, oc.expectedTotalPatients, truth, v.target, mtd),
  };
}

export function computeDoseFindingComparison(v: DoseFindingComparisonInput): DoseFindingComparisonResult {
  const crmInput = crmInputOf(v);
  const model = crmModelOf(crmInput);
  const boinInput = boinInputOf(v);
  const seed = scenarioSeed(v.seed, 0);
  return {
    trueMtd: trueMtd(v.scenario.dltProbabilities, v.target),
    crmSkeleton: [...model.skeleton],
    boinBoundaries: boinBoundaries(boinInput.target, boinInput.underdosingLimit, boinInput.overdosingLimit),
    designs: [
      { design: "3+3", exact: true, operatingCharacteristics: threePlusThreeCharacteristics(v) },
      { design: "CRM", exact: false, operatingCharacteristics: simulateScenario(v.scenario, v.target, v.trials, seed, crmTrialRunner(crmInput, model)) },
      { design: "BOIN", exact: false, operatingCharacteristics: simulateScenario(v.scenario, v.target, v.trials, seed, boinTrialRunner(boinInput)) },
    ],
  };
}

/** The three designs' work added up: the 3+3 enumeration and one scenario simulated by the CRM and by BOIN. */
export function costDoseFindingComparison(v: DoseFindingComparisonInput): WorkEstimate {
  const size = { ...simulationSize(v), scenarioCount: 1 };
  const parts = [
    threePlusThreeWork(v.doses.length),
    crmSimulationWork(size, { kind: v.crmModel, intercept: COMPARISON_LOGISTIC_INTERCEPT, priorVariance: v.crmPriorVariance }),
    boinSimulationWork(size),
  ];
  const [tpt, crm, boin] = parts;
  return {
    milliseconds: parts.reduce((sum, p) => sum + p.milliseconds, 0),
    breakdown: `CRM: ${crm!.breakdown}; BOIN: the same trials; 3+3: ${tpt!.breakdown}`,
    reduce: simulationReduce(v),
  };
}

const pct = (x: number): number => x * 100;

function documentComparison(v: DoseFindingComparisonInput, r: DoseFindingComparisonResult): Section[] {
  const doses = v.doses;
  const [tpt, crmOc, boinOc] = r.designs.map((d) => d.operatingCharacteristics) as [OperatingCharacteristics, OperatingCharacteristics, OperatingCharacteristics];
  const summaryRows: Cell[][] = r.designs.map((d) => {
    const oc = d.operatingCharacteristics;
    return [d.design, d.exact ? "exact" : `${v.trials} simulated trials`, ...summaryCells(oc)];
  });
  // One row per dose (and a "No dose" row when `none` is given), one column per design.
  const perDoseTable = (id: string, caption: string, digits: number, pick: (oc: OperatingCharacteristics, i: number) => number, none: ((oc: OperatingCharacteristics) => number) | null): Block => {
    const rows: Cell[][] = doses.map((d, i) => [d, v.scenario.dltProbabilities[i]!, pick(tpt, i), pick(crmOc, i), pick(boinOc, i)]);
    if (none) rows.push(["No dose", null, none(tpt), none(crmOc), none(boinOc)]);
    return {
      kind: "table",
      table: {
        id,
        caption,
        columns: [{ key: "dose", label: "Dose" }, { key: "truth", label: "True DLT probability", digits: 3 }, { key: "tpt", label: "3+3", digits }, { key: "crm", label: "CRM", digits }, { key: "boin", label: "BOIN", digits }],
        rows,
      },
    };
  };
  const best = r.designs.reduce((a, b) => (b.operatingCharacteristics.correctSelectionProbability > a.operatingCharacteristics.correctSelectionProbability ? b : a));
  const protocol =
    `Under the scenario "${v.scenario.name}" (true DLT probabilities ${v.scenario.dltProbabilities.join(", ")} at ${doses.join(", ")}; target ${v.target}, so the true MTD is ${doses[r.trueMtd]}), ` +
    `the 3+3 design (exact enumeration) selects the true MTD with probability ${pct(tpt.correctSelectionProbability).toFixed(1)}% using on average ${tpt.meanTotalPatients.toFixed(1)} patients; ` +
    `the CRM (${v.crmModel} model, skeleton ${r.crmSkeleton.map((s) => s.toFixed(3)).join(", ")}, prior variance ${v.crmPriorVariance}) selects it in ${pct(crmOc.correctSelectionProbability).toFixed(1)}% of ${v.trials} simulated trials; ` +
    `and BOIN (boundaries ${r.boinBoundaries.escalation.toFixed(3)} and ${r.boinBoundaries.deescalation.toFixed(3)}) in ${pct(boinOc.correctSelectionProbability).toFixed(1)}%, ` +
    `the CRM and BOIN each with cohorts of ${v.cohortSize} up to ${v.maxSampleSize} patients from ${doses[v.startDose - 1]} (seed ${v.seed}). ` +
    `The share of patients treated above the true MTD is ${pct(tpt.treatedAboveMtd).toFixed(1)}% (3+3), ${pct(crmOc.treatedAboveMtd).toFixed(1)}% (CRM) and ${pct(boinOc.treatedAboveMtd).toFixed(1)}% (BOIN).`;
  return [
    {
      id: "comparison",
      title: "Comparison",
      blocks: [
        {
          kind: "facts",
          facts: [
            { label: "True MTD (closest to the target)", value: doses[r.trueMtd]!, key: true },
            { label: "Highest correct selection", value: best.design, key: true, note: `${pct(best.operatingCharacteristics.correctSelectionProbability).toFixed(1)}%` },
            { label: "Correct selection, 3+3", value: pct(tpt.correctSelectionProbability), digits: 1, unit: "%", key: true },
            { label: "Correct selection, CRM", value: pct(crmOc.correctSelectionProbability), digits: 1, unit: "%", key: true },
            { label: "Correct selection, BOIN", value: pct(boinOc.correctSelectionProbability), digits: 1, unit: "%", key: true },
            { label: "CRM skeleton", value: r.crmSkeleton.map((s) => s.toFixed(3)).join(", ") },
            { label: "BOIN boundaries", value: `escalate ≤ ${r.boinBoundaries.escalation.toFixed(3)}, de-escalate ≥ ${r.boinBoundaries.deescalation.toFixed(3)}` },
          ],
        },
        {
          kind: "table",
          table: {
            id: "summary",
            caption: "Operating characteristics side by side",
            columns: [{ key: "design", label: "Design" }, { key: "how", label: "Computed by" }, ...summaryColumns],
            rows: summaryRows,
            note: "The 3+3 figures are exact probabilities and expectations; the CRM and BOIN figures are estimated from simulated trials and carry Monte Carlo error.",
          },
        },
        {
          kind: "chart",
          chart: selectionChart("selection", `How often each dose is selected as the MTD (scenario "${v.scenario.name}")`, doses,
            r.designs.map((d) => ({ name: d.design, oc: d.operatingCharacteristics }))),
        },
        perDoseTable("selection", "Selected as MTD (% of trials)", 1, (oc, i) => pct(oc.selectionProbability[i]!), (oc) => pct(oc.noSelectionProbability)),
        perDoseTable("patients", "Mean patients treated per dose", 2, (oc, i) => oc.meanPatients[i]!, null),
        perDoseTable("dlts", "Mean patients with a DLT per dose", 2, (oc, i) => oc.meanDlts[i]!, null),
      ],
    },
    protocolSection(protocol),
  ];
}

export const doseFindingComparison: Design<DoseFindingComparisonInput, DoseFindingComparisonResult> = {
  id: "dose-finding-comparison",
  version: 1,
  stage: "dose-finding",
  title: "Dose-finding designs compared: 3+3, CRM and BOIN",
  summary: "One scenario of true DLT probabilities run through the 3+3 design (exactly), the CRM and BOIN (by simulation), side by side: how often each selects each dose, and how many patients and DLTs each uses.",
  input: schema,
  example: {
    doses: ["TW-417 10 mg", "TW-417 20 mg", "TW-417 40 mg", "TW-417 70 mg", "TW-417 100 mg"],
    target: 0.25,
    cohortSize: 3,
    startDose: 1,
    maxSampleSize: 24,
    scenario: { name: "MTD at 40 mg", dltProbabilities: [0.05, 0.12, 0.25, 0.4, 0.55] },
    threePlusThreeRule: "next-lower-dose",
    crmModel: "power",
    crmSkeletonHalfWidth: 0.05,
    crmPriorMtd: 3,
    crmPriorVariance: 1.34,
    crmSafetyThreshold: 0.9,
    boinEliminationCutoff: 0.95,
    trials: 500,
    seed: 20261201,
  },
  compute: computeDoseFindingComparison,
  cost: costDoseFindingComparison,
  question: (v) => `If the true DLT probabilities at ${v.doses.join(", ")} are ${v.scenario.dltProbabilities.join(", ")}, how do the 3+3 design, the CRM and BOIN targeting ${v.target} compare in selecting the MTD and in the patients they treat?`,
  document: documentComparison,
  references: [
    STORER_1989,
    OQUIGLEY_PEPE_FISHER_1990,
    LEE_CHEUNG_2009,
    LIU_YUAN_2015,
  ],
  cautions: [
    "One scenario does not choose a design: compare the designs under several scenarios, including one where every dose is too toxic and one where every dose is safe.",
    "The 3+3 figures are exact; the CRM and BOIN figures are simulated and carry Monte Carlo error (about ±3 percentage points at 1,000 trials).",
    "The 3+3 design has no maximum sample size and always starts at the lowest dose; the CRM and BOIN use the cohort size, start dose and maximum sample size given, so the designs do not use the same number of patients.",
  ],
};
