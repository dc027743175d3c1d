/**
 * BOIN: the Bayesian optimal interval design for finding the MTD.
 *
 * Method: Liu S, Yuan Y (2015), JRSS Series C 64:507-523. With target φ and
 * interval limits φ1 < φ < φ2 (the highest rate deemed underdosing and the
 * lowest deemed overdosing), the escalation and de-escalation boundaries are
 *   λe = log((1 - φ1)/(1 - φ)) / log(φ(1 - φ1) / (φ1(1 - φ)))
 *   λd = log((1 - φ)/(1 - φ2)) / log(φ2(1 - φ) / (φ(1 - φ2)))
 * and after each cohort, with p̂ = DLTs / patients at the current dose:
 * escalate if p̂ ≤ λe, de-escalate if p̂ ≥ λd, otherwise stay.
 * Dose elimination: under a beta(1, 1) prior, if P(p > φ | data) exceeds the
 * cutoff (0.95) with at least 3 patients at a dose, that dose and all higher
 * doses are eliminated; eliminating the lowest dose stops the trial with no MTD.
 * MTD selection: isotonic regression (pool adjacent violators, weights =
 * patients) of the observed rates at the tried, non-eliminated doses; the MTD
 * is the dose whose estimate is closest to φ.
 *
 * Conventions:
 * - φ1 = 0.6 φ and φ2 = 1.4 φ unless given (Liu & Yuan 2015's recommendation).
 * - A decision to escalate at the highest dose, or into an eliminated dose, is
 *   a decision to stay; to de-escalate at the lowest dose, to stay. When the
 *   current dose is eliminated the next cohort goes one dose lower.
 * - Boundaries are compared with the observed rate as a fraction: DLTs/n ≤ λe
 *   escalates and DLTs/n ≥ λd de-escalates (both inclusive).
 * - The observed rates enter the isotonic regression unadjusted (DLTs/patients).
 *   Ties in the isotonic estimate: the highest tied dose when the estimate is
 *   below φ, the lowest when it is at or above φ; two doses equally far from φ
 *   on opposite sides: the one below φ.
 * - The trial ends at the maximum sample size; a last cohort that does not
 *   fit is shortened.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { betaSurvival } from "../stats/beta.js";
import { isotonicRegression } from "../stats/isotonic.js";
import { type RandomSource } from "../stats/random.js";
import {
  MAX_DOSES, type OperatingCharacteristics, SIMULATION_CAUTION, checkDoseFindingInput, checkUseInputs, doseFindingFields, issueReporter,
  observedCounts, observedDataField, operatingCharacteristicsSection, scheduleFacts, simulatePlan, simulationFields, simulationProtocolText,
  treatCohort, type TrialEnd, useField,
} from "./shared/doseFinding.js";
import { BOIN_NEXT_DOSE_MS, boinSimulationWork, simulationReduce, simulationSize } from "./shared/doseFindingCost.js";
import { LIU_YUAN_2015 } from "./shared/doseFindingReferences.js";
import { designSection, protocolSection } from "./shared/reportSections.js";

const schema = z
  .strictObject({
    use: useField("the decision for the next cohort from the data so far."),
    ...doseFindingFields,
    underdosingLimit: z.number().gt(0).lt(1).optional()
      .describe("φ1: the highest DLT rate considered underdosing, so that escalation should follow (default 0.6 × target)."),
    overdosingLimit: z.number().gt(0).lt(1).optional()
      .describe("φ2: the lowest DLT rate considered overdosing, so that de-escalation should follow (default 1.4 × target)."),
    eliminationCutoff: z.number().min(0.5).max(0.999).default(0.95)
      .describe("A dose and all higher doses are eliminated when the posterior probability (beta(1,1) prior) that its DLT rate exceeds the target is above this cutoff."),
    eliminationMinPatients: z.number().int().min(1).max(20).default(3)
      .describe("The elimination rule applies only to doses with at least this many patients."),
    ...simulationFields,
    data: observedDataField,
    currentDose: z.number().int().min(1).max(MAX_DOSES).optional()
      .describe("Dose the last cohort received, numbered from 1; needed for the next-dose decision."),
  })
  .superRefine((v, ctx) => {
    const issue = issueReporter(ctx);
    checkDoseFindingInput(v, issue);
    const lower = v.underdosingLimit ?? 0.6 * v.target;
    const upper = v.overdosingLimit ?? 1.4 * v.target;
    if (!(lower < v.target)) issue(["underdosingLimit"], `The underdosing limit (${lower}) must be below the target (${v.target}).`);
    if (!(upper > v.target)) issue(["overdosingLimit"], `The overdosing limit (${upper}) must be above the target (${v.target}).`);
    if (!(upper < 1)) issue([v.overdosingLimit === undefined ? "target" : "overdosingLimit"], `The overdosing limit (${upper.toFixed(3)}) must be below 1; with a target this high, give overdosingLimit explicitly.`);
    checkUseInputs(v, v.doses.length, issue, "decision");
    if (v.use === "next-dose") {
      if (v.currentDose === undefined) issue(["currentDose"], "Give the dose the last cohort received (numbered from 1).");
      else if (v.currentDose > v.doses.length) issue(["currentDose"], `The current dose must be one of the ${v.doses.length} doses.`);
      else if (v.data && v.data[v.currentDose - 1] && v.data[v.currentDose - 1]!.patients === 0) issue(["currentDose"], `Dose ${v.currentDose} has no patients yet; give the dose the last cohort received.`);
    }
  })
  .transform((v) => ({ ...v, underdosingLimit: v.underdosingLimit ?? 0.6 * v.target, overdosingLimit: v.overdosingLimit ?? 1.4 * v.target }));

export type BoinInput = z.output<typeof schema>;

export interface BoinBoundaries {
  escalation: number;
  deescalation: number;
}

/** λe and λd of Liu & Yuan (2015), equations for the local optimal interval. */
export function boinBoundaries(target: number, underdosingLimit: number, overdosingLimit: number): BoinBoundaries {
  const phi = target;
  const escalation = Math.log((1 - underdosingLimit) / (1 - phi)) / Math.log((phi * (1 - underdosingLimit)) / (underdosingLimit * (1 - phi)));
  const deescalation = Math.log((1 - phi) / (1 - overdosingLimit)) / Math.log((overdosingLimit * (1 - phi)) / (phi * (1 - overdosingLimit)));
  return { escalation, deescalation };
}

export interface DecisionRow {
  patients: number;
  /** Escalate when DLTs ≤ this. */
  escalateAtMost: number;
  /** De-escalate when DLTs ≥ this; null when no count up to the patients does. */
  deescalateAtLeast: number | null;
  /** Eliminate the dose (and higher) when DLTs ≥ this; null when no count does. */
  eliminateAtLeast: number | null;
}

/** The integer form of the rules for 1..maxPatients treated at the current dose. */
export function boinDecisionTable(input: Pick<BoinInput, "target" | "underdosingLimit" | "overdosingLimit" | "eliminationCutoff" | "eliminationMinPatients">, maxPatients: number): DecisionRow[] {
  const b = boinBoundaries(input.target, input.underdosingLimit, input.overdosingLimit);
  const rows: DecisionRow[] = [];
  for (let n = 1; n <= maxPatients; n++) {
    let escalateAtMost = -1;
    while (escalateAtMost + 1 <= n && (escalateAtMost + 1) / n <= b.escalation) escalateAtMost++;
    let deescalateAtLeast: number | null = null;
    for (let y = 0; y <= n; y++) if (y / n >= b.deescalation) { deescalateAtLeast = y; break; }
    let eliminateAtLeast: number | null = null;
    if (n >= input.eliminationMinPatients) {
      for (let y = 0; y <= n; y++) if (eliminationProbability(y, n, input.target) > input.eliminationCutoff) { eliminateAtLeast = y; break; }
    }
    rows.push({ patients: n, escalateAtMost, deescalateAtLeast, eliminateAtLeast });
  }
  return rows;
}

/** P(p > target | y of n) under a beta(1, 1) prior. */
export function eliminationProbability(dlts: number, patients: number, target: number): number {
  return betaSurvival(target, dlts + 1, patients - dlts + 1);
}

/**
 * The MTD from the data: isotonic estimates at tried doses below the
 * eliminated ones, closest to the target. Returns the estimates (null where
 * not estimated) and the selected index, -1 when no dose qualifies.
 */
export function boinSelectMtd(patients: ArrayLike<number>, dlts: ArrayLike<number>, eliminatedFrom: number, target: number): { selected: number; estimates: Array<number | null> } {
  const tried: number[] = [];
  for (let i = 0; i < Math.min(eliminatedFrom, patients.length); i++) if (patients[i]! > 0) tried.push(i);
  const estimates: Array<number | null> = Array.from({ length: patients.length }, () => null);
  if (tried.length === 0) return { selected: -1, estimates };
  const fitted = isotonicRegression(tried.map((i) => dlts[i]! / patients[i]!), tried.map((i) => patients[i]!));
  tried.forEach((dose, j) => { estimates[dose] = fitted[j]!; });
  let best = Infinity;
  for (const f of fitted) best = Math.min(best, Math.abs(f - target));
  const closest = tried.filter((_, j) => Math.abs(Math.abs(fitted[j]! - target) - best) <= 1e-12);
  const below = closest.filter((dose) => estimates[dose]! < target);
  return { selected: below.length > 0 ? below[below.length - 1]! : closest[0]!, estimates };
}

export type BoinAction = "escalate" | "stay" | "de-escalate" | "stop-for-safety";

/** The rule applied at dose c with the data so far; eliminatedFrom = number of doses when none is eliminated. */
function nextAction(c: number, n: number, y: number, doseCount: number, eliminatedFrom: number, table: DecisionRow[]): { action: BoinAction; next: number } {
  if (eliminatedFrom === 0) return { action: "stop-for-safety", next: -1 };
  if (c >= eliminatedFrom) return { action: "de-escalate", next: eliminatedFrom - 1 };
  const row = table[n - 1]!;
  if (y <= row.escalateAtMost) {
    return c + 1 < doseCount && c + 1 < eliminatedFrom ? { action: "escalate", next: c + 1 } : { action: "stay", next: c };
  }
  if (row.deescalateAtLeast !== null && y >= row.deescalateAtLeast) {
    return c > 0 ? { action: "de-escalate", next: c - 1 } : { action: "stay", next: c };
  }
  return { action: "stay", next: c };
}

function eliminatedFromData(patients: ArrayLike<number>, dlts: ArrayLike<number>, table: DecisionRow[]): number {
  for (let i = 0; i < patients.length; i++) {
    const n = patients[i]!;
    if (n === 0) continue;
    const limit = table[n - 1]?.eliminateAtLeast;
    if (limit !== undefined && limit !== null && dlts[i]! >= limit) return i;
  }
  return patients.length;
}

/** One BOIN trial, as the shared simulation loop runs it. */
export function boinTrialRunner(input: BoinInput) {
  const table = boinDecisionTable(input, input.maxSampleSize);
  const doseCount = input.doses.length;
  return (truth: readonly number[], random: RandomSource, patients: Int32Array, dlts: Int32Array): TrialEnd => {
    let dose = input.startDose - 1;
    let total = 0;
    let eliminatedFrom = doseCount;
    while (total < input.maxSampleSize) {
      const size = Math.min(input.cohortSize, input.maxSampleSize - total);
      treatCohort(dose, size, truth, random, patients, dlts);
      total += size;
      const limit = table[patients[dose]! - 1]!.eliminateAtLeast;
      if (limit !== null && dlts[dose]! >= limit) eliminatedFrom = Math.min(eliminatedFrom, dose);
      const step = nextAction(dose, patients[dose]!, dlts[dose]!, doseCount, eliminatedFrom, table);
      if (step.action === "stop-for-safety") return { selected: -1, stoppedForSafety: true };
      dose = step.next;
    }
    return { selected: boinSelectMtd(patients, dlts, eliminatedFrom, input.target).selected, stoppedForSafety: false };
  };
}

export interface BoinNextDose {
  currentDose: number;
  action: BoinAction;
  /** Index of the next dose; -1 when the trial stops. */
  nextDose: number;
  totalPatients: number;
  maximumReached: boolean;
  /** First eliminated dose index; null when none is eliminated. */
  eliminatedFrom: number | null;
  probabilityAboveTarget: Array<number | null>;
  isotonicEstimates: Array<number | null>;
  /** The dose BOIN would select as MTD if the trial ended now; -1 for none. */
  mtdIfStoppedNow: number;
}

export interface BoinResult {
  boundaries: BoinBoundaries;
  decisionTable: DecisionRow[];
  nextDose: BoinNextDose | null;
  operatingCharacteristics: OperatingCharacteristics[] | null;
}

/** `table` covers at least the most patients treated at any dose. */
function boinNextDose(input: BoinInput, table: DecisionRow[]): BoinNextDose {
  const data = input.data!;
  const { patients, dlts, total } = observedCounts(data);
  const eliminatedFrom = eliminatedFromData(patients, dlts, table);
  const c = input.currentDose! - 1;
  const step = nextAction(c, patients[c]!, dlts[c]!, input.doses.length, eliminatedFrom, table);
  const selection = boinSelectMtd(patients, dlts, eliminatedFrom, input.target);
  return {
    currentDose: c,
    action: step.action,
    nextDose: step.next,
    totalPatients: total,
    maximumReached: total >= input.maxSampleSize,
    eliminatedFrom: eliminatedFrom < input.doses.length ? eliminatedFrom : null,
    probabilityAboveTarget: data.map((d) => (d.patients > 0 ? eliminationProbability(d.dlts, d.patients, input.target) : null)),
    isotonicEstimates: selection.estimates,
    mtdIfStoppedNow: eliminatedFrom === 0 ? -1 : selection.selected,
  };
}

export function computeBoin(input: BoinInput): BoinResult {
  const boundaries = boinBoundaries(input.target, input.underdosingLimit, input.overdosingLimit);
  if (input.use === "next-dose") {
    // The data may hold more patients at a dose than the maximum sample size; the report's table stops there.
    const table = boinDecisionTable(input, Math.max(input.maxSampleSize, ...input.data!.map((d) => d.patients)));
    return { boundaries, decisionTable: table.slice(0, input.maxSampleSize), nextDose: boinNextDose(input, table), operatingCharacteristics: null };
  }
  const decisionTable = boinDecisionTable(input, input.maxSampleSize);
  return { boundaries, decisionTable, nextDose: null, operatingCharacteristics: simulatePlan(input, boinTrialRunner(input)) };
}

/** A next-dose decision costs one decision table; a plan, its simulated trials (shared/doseFindingCost.ts). */
export function costBoin(input: BoinInput): WorkEstimate {
  if (input.use === "next-dose") return { milliseconds: BOIN_NEXT_DOSE_MS, breakdown: "one decision table and one isotonic regression", reduce: [] };
  return { ...boinSimulationWork(simulationSize(input)), reduce: simulationReduce(input) };
}

const f3 = (x: number): string => x.toFixed(3);
const lowerFirst = (text: string): string => text.charAt(0).toLowerCase() + text.slice(1);

function actionText(r: BoinNextDose, doses: string[]): string {
  switch (r.action) {
    case "stop-for-safety": return "Stop the trial: the lowest dose is eliminated as too toxic; no dose is selected";
    case "escalate": return `Escalate to ${doses[r.nextDose]}`;
    case "de-escalate": return `De-escalate to ${doses[r.nextDose]}`;
    case "stay": return `Stay at ${doses[r.nextDose]}`;
  }
}

function documentBoin(input: BoinInput, r: BoinResult): Section[] {
  const doses = input.doses;
  const b = r.boundaries;
  const sections: Section[] = [
    designSection([
      { label: "Escalation boundary λe", value: b.escalation, digits: 3, key: true, note: "escalate when the observed DLT rate at the current dose is at or below it" },
      { label: "De-escalation boundary λd", value: b.deescalation, digits: 3, key: true, note: "de-escalate when the observed DLT rate is at or above it" },
      { label: "Target DLT rate", value: input.target },
      { label: "Underdosing limit φ1", value: input.underdosingLimit, digits: 3 },
      { label: "Overdosing limit φ2", value: input.overdosingLimit, digits: 3 },
      { label: "Elimination rule", value: `P(DLT rate > ${input.target}) > ${input.eliminationCutoff} with at least ${input.eliminationMinPatients} patients` },
      ...scheduleFacts(input),
    ], [
      {
        kind: "table",
        table: {
          id: "decision-table",
          caption: "Decision table: patients with a DLT at the current dose, by the number treated there",
          columns: [
            { key: "patients", label: "Patients treated at the current dose" },
            { key: "escalate", label: "Escalate if DLTs ≤" },
            { key: "deescalate", label: "De-escalate if DLTs ≥" },
            { key: "eliminate", label: "Eliminate this and higher doses if DLTs ≥" },
          ],
          rows: r.decisionTable.map((row) => [row.patients, row.escalateAtMost, row.deescalateAtLeast, row.eliminateAtLeast]),
          note: "Otherwise stay at the current dose. — means no number of DLTs triggers the action. Escalation never enters an eliminated dose, and at the highest dose it means staying.",
        },
      },
    ]),
  ];
  if (r.nextDose) {
    const nd = r.nextDose;
    const data = input.data!;
    sections.push({
      id: "next-dose",
      title: "Next dose",
      blocks: [
        {
          kind: "facts",
          facts: [
            { label: "Decision", value: actionText(nd, doses), key: true },
            { label: "Current dose", value: doses[nd.currentDose]!, note: `${data[nd.currentDose]!.dlts} of ${data[nd.currentDose]!.patients} with a DLT` },
            { label: "Patients so far", value: nd.totalPatients, note: nd.maximumReached ? "the maximum sample size is reached: the trial ends and the MTD is selected" : `of at most ${input.maxSampleSize}` },
            { label: "MTD if the trial ended now", value: nd.mtdIfStoppedNow >= 0 ? doses[nd.mtdIfStoppedNow]! : "none", key: nd.maximumReached },
            { label: "Eliminated doses", value: nd.eliminatedFrom === null ? "none" : `${doses[nd.eliminatedFrom]} and above` },
          ],
        },
        {
          kind: "table",
          table: {
            id: "data",
            caption: "Data so far",
            columns: [
              { key: "dose", label: "Dose" },
              { key: "patients", label: "Patients" },
              { key: "dlts", label: "DLTs" },
              { key: "rate", label: "Observed DLT rate", digits: 3 },
              { key: "isotonic", label: "Isotonic estimate", digits: 3 },
              { key: "above", label: `P(DLT rate > ${input.target})`, digits: 3 },
            ],
            rows: doses.map((d, i) => [d, data[i]!.patients, data[i]!.dlts, data[i]!.patients > 0 ? data[i]!.dlts / data[i]!.patients : null, nd.isotonicEstimates[i] ?? null, nd.probabilityAboveTarget[i] ?? null]),
            note: "Posterior probabilities under a beta(1,1) prior. Isotonic estimates by pool adjacent violators over the tried, non-eliminated doses.",
          },
        },
      ],
    });
  }
  if (r.operatingCharacteristics) sections.push(operatingCharacteristicsSection(doses, r.operatingCharacteristics, "BOIN"));
  sections.push(protocolSection(protocolText(input, r)));
  return sections;
}

function protocolText(input: BoinInput, r: BoinResult): string {
  const b = r.boundaries;
  let text = `Dose finding will use the Bayesian optimal interval (BOIN) design (Liu & Yuan 2015) with a target DLT rate of ${input.target}, over ${input.doses.length} dose levels (${input.doses.join(", ")}), starting at ${input.doses[input.startDose - 1]}, in cohorts of ${input.cohortSize} up to a maximum of ${input.maxSampleSize} patients. ` +
    `With underdosing and overdosing limits of ${f3(input.underdosingLimit)} and ${f3(input.overdosingLimit)}, the escalation and de-escalation boundaries are ${f3(b.escalation)} and ${f3(b.deescalation)}: after each cohort, the next cohort receives the next higher dose if the observed DLT rate at the current dose is at or below ${f3(b.escalation)}, the next lower dose if it is at or above ${f3(b.deescalation)}, and the same dose otherwise. ` +
    `A dose and all higher doses are eliminated when, with at least ${input.eliminationMinPatients} patients treated, the posterior probability (beta(1,1) prior) that its DLT rate exceeds ${input.target} is above ${input.eliminationCutoff}; the trial stops with no dose selected if the lowest dose is eliminated. ` +
    `At the end, the MTD is the dose whose isotonic (pool-adjacent-violators) estimate of the DLT rate is closest to ${input.target}.`;
  const ocs = r.operatingCharacteristics;
  if (ocs) text += simulationProtocolText(input.doses, input.trials, input.seed, ocs);
  const nd = r.nextDose;
  if (nd) text += ` With the data so far (${nd.totalPatients} patients; ${input.data![nd.currentDose]!.dlts} of ${input.data![nd.currentDose]!.patients} with a DLT at ${input.doses[nd.currentDose]}), the decision is: ${lowerFirst(actionText(nd, input.doses))}.`;
  return text;
}

export const boin: Design<BoinInput, BoinResult> = {
  id: "boin",
  version: 1,
  stage: "dose-finding",
  title: "BOIN (Bayesian optimal interval) dose finding",
  summary: "Escalation and de-escalation boundaries, the decision table and dose elimination of the Bayesian optimal interval design; the next dose from the data so far, or simulated operating characteristics under scenarios.",
  input: schema,
  example: {
    use: "plan",
    doses: ["TW-417 10 mg", "TW-417 20 mg", "TW-417 40 mg", "TW-417 70 mg", "TW-417 100 mg"],
    target: 0.3,
    cohortSize: 3,
    startDose: 1,
    maxSampleSize: 30,
    underdosingLimit: 0.18,
    overdosingLimit: 0.42,
    eliminationCutoff: 0.95,
    eliminationMinPatients: 3,
    scenarios: [
      { name: "MTD at 40 mg", dltProbabilities: [0.05, 0.12, 0.3, 0.45, 0.6] },
      { name: "All doses safe", dltProbabilities: [0.02, 0.04, 0.06, 0.08, 0.12] },
    ],
    trials: 1000,
    seed: 20261201,
  },
  compute: computeBoin,
  cost: costBoin,
  question: (input) => input.use === "next-dose"
    ? `With the data so far at ${input.doses.join(", ")}, which dose should the next cohort of ${input.cohortSize} receive under the BOIN design targeting a DLT rate of ${input.target}?`
    : `Under the BOIN design targeting a DLT rate of ${input.target} with at most ${input.maxSampleSize} patients, how often is each dose selected as the MTD, and how many patients are treated at each dose, under each scenario?`,
  document: documentBoin,
  references: [
    LIU_YUAN_2015,
    { key: "Yuan, Hess, Hilsenbeck & Gilbert 2016", text: "Yuan Y, Hess KR, Hilsenbeck SG, Gilbert MR. Bayesian optimal interval design: a simple and well-performing design for phase I oncology trials. Clinical Cancer Research. 2016;22(17):4291-4301.", doi: "10.1158/1078-0432.CCR-16-0592" },
    { key: "Barlow et al. 1972", text: "Barlow RE, Bartholomew DJ, Bremner JM, Brunk HD. Statistical Inference under Order Restrictions. London: Wiley; 1972." },
  ],
  cautions: [
    SIMULATION_CAUTION,
    "The boundaries assume toxicity does not decrease with dose and that each DLT is observed before the next cohort is dosed; late-onset toxicities need a design that allows for them.",
    "The decision table guides, it does not replace, the clinical judgement of the safety review committee.",
  ],
};
