/**
 * Logic shared by the dose-finding designs (CRM, BOIN and their comparison):
 * the input fields with one meaning across them, the checks a scenario or a
 * data set must pass, the seeded simulation loop that turns single trials into operating characteristics,
 * and the report blocks that show them.
 *
 * Conventions (stated in every dose-finding report):
 * - Doses are numbered from 1 (lowest) in inputs and reports; arrays in
 *   results are indexed from 0 in dose order.
 * - The true MTD of a scenario is the dose whose true DLT probability is
 *   closest to the target (the lower dose on a tie), as in O'Quigley, Pepe &
 *   Fisher (1990); "correct selection" means selecting it.
 * - "Treated above the true MTD" is the share of all simulated patients, pooled
 *   over trials, who received a dose higher than the true MTD.
 * - Scenario i is simulated from its own stream, seeded by seed + i × 2654435769
 *   (mod 2³²), so adding a scenario does not change the others.
 */
import { z } from "zod";
import type { Block, Cell, Column, Fact, Section } from "../../report/document.js";
import { type RandomSource, createRandom } from "../../stats/random.js";

export const MAX_DOSES = 10;
export const MAX_SCENARIOS = 6;
export const MIN_TRIALS = 100;
export const MAX_TRIALS = 20000;
export const MAX_SAMPLE_SIZE = 150;
export const MAX_COHORT = 6;

type Issue = (path: PropertyKey[], message: string) => void;

const doseLabel = z.string().trim().min(1).max(40).describe("A dose label, e.g. \"40 mg\".");

export const doseFindingFields = {
  doses: z.array(doseLabel).min(2, "Give at least two doses.").max(MAX_DOSES, `At most ${MAX_DOSES} doses; drop or merge dose levels.`)
    .describe(`Dose labels from lowest to highest (2 to ${MAX_DOSES} doses).`),
  target: z.number().gt(0, "The target DLT rate must be above 0.").lt(1, "The target DLT rate must be below 1.").default(0.25)
    .describe("Target DLT rate: the probability of a dose-limiting toxicity that the MTD should have (0.25 is 25%)."),
  cohortSize: z.number().int().min(1).max(MAX_COHORT).default(3)
    .describe(`Patients treated together at one dose before the next decision (1 to ${MAX_COHORT}).`),
  startDose: z.number().int().min(1).max(MAX_DOSES).default(1)
    .describe("Dose given to the first cohort, numbered from 1 (the lowest dose)."),
  maxSampleSize: z.number().int().min(1).max(MAX_SAMPLE_SIZE).default(30)
    .describe(`Maximum number of patients; the trial ends when it is reached (1 to ${MAX_SAMPLE_SIZE}).`),
};

/** What a design that simulates or decides from data is asked to do; `nextDose` says what the next-dose use gives. */
export function useField(nextDose: string) {
  return z.enum(["plan", "next-dose"]).default("plan")
    .describe(`plan: simulate trials under scenarios to get operating characteristics. next-dose: ${nextDose}`);
}

export const scenarioSchema = z.strictObject({
  name: z.string().trim().min(1).max(60).describe("A short name for the scenario, e.g. \"MTD at dose 3\"."),
  dltProbabilities: z.array(z.number().gt(0, "Must be above 0.").lt(1, "Must be below 1.")).min(1).max(MAX_DOSES)
    .describe("True probability of a DLT at each dose, lowest dose first, not decreasing with dose."),
});
export type Scenario = z.output<typeof scenarioSchema>;

export const simulationFields = {
  scenarios: z.array(scenarioSchema).min(1, "Give at least one scenario.").max(MAX_SCENARIOS, `At most ${MAX_SCENARIOS} scenarios per calculation.`).optional()
    .describe(`Scenarios of true DLT probabilities to simulate trials under (1 to ${MAX_SCENARIOS}); needed to plan.`),
  trials: z.number().int().min(MIN_TRIALS).max(MAX_TRIALS).default(1000)
    .describe(`Number of simulated trials per scenario (${MIN_TRIALS} to ${MAX_TRIALS}); the Monte Carlo standard error of a percentage p is about √(p(100 - p)/trials).`),
  seed: z.number().int().min(0).max(4294967295).default(20261201)
    .describe("Seed of the random number generator: the same seed gives the same simulated trials, byte for byte."),
};

export const doseDataSchema = z.strictObject({
  patients: z.number().int().min(0).max(MAX_SAMPLE_SIZE).describe("Patients treated at this dose so far."),
  dlts: z.number().int().min(0).max(MAX_SAMPLE_SIZE).describe("Of them, patients with a dose-limiting toxicity."),
});
export type DoseData = z.output<typeof doseDataSchema>;

export const observedDataField = z.array(doseDataSchema).min(2).max(MAX_DOSES).optional()
  .describe("Data so far, one entry per dose in dose order (patients treated and patients with a DLT); needed for the next-dose decision.");

/** Issue reporter for a zod superRefine context. */
export function issueReporter(ctx: z.RefinementCtx): Issue {
  return (path, message) => ctx.addIssue({ code: "custom", path, message });
}

/** Checks shared by every dose-finding input: labels, start dose, cohort against sample size. */
export function checkDoseFindingInput(
  v: { doses: string[]; startDose: number; cohortSize: number; maxSampleSize: number },
  issue: Issue,
): void {
  const seen = new Map<string, number>();
  v.doses.forEach((label, i) => {
    const first = seen.get(label);
    if (first !== undefined) issue(["doses", i], `The label "${label}" is used twice (doses ${first + 1} and ${i + 1}); give each dose its own label.`);
    else seen.set(label, i);
  });
  if (v.startDose > v.doses.length) issue(["startDose"], `The start dose must be one of the ${v.doses.length} doses (1 to ${v.doses.length}).`);
  if (v.cohortSize > v.maxSampleSize) issue(["cohortSize"], `A cohort of ${v.cohortSize} does not fit in a maximum sample size of ${v.maxSampleSize}.`);
}

/** Each scenario has one probability per dose, not decreasing with dose. */
export function checkScenarios(scenarios: Scenario[] | undefined, doseCount: number, issue: Issue, field = "scenarios"): void {
  scenarios?.forEach((s, i) => {
    if (s.dltProbabilities.length !== doseCount) {
      issue([field, i, "dltProbabilities"], `Scenario "${s.name}" has ${s.dltProbabilities.length} DLT probabilities; give one per dose (${doseCount}).`);
      return;
    }
    for (let j = 1; j < doseCount; j++) {
      if (s.dltProbabilities[j]! < s.dltProbabilities[j - 1]!) {
        issue([field, i, "dltProbabilities", j], `In scenario "${s.name}" the DLT probability at dose ${j + 1} (${s.dltProbabilities[j]}) is below that at dose ${j} (${s.dltProbabilities[j - 1]}); these designs assume toxicity does not decrease with dose.`);
      }
    }
  });
}

/** One entry per dose, and no more DLTs than patients. */
export function checkObservedData(data: DoseData[] | undefined, doseCount: number, issue: Issue, field = "data"): void {
  if (!data) return;
  if (data.length !== doseCount) issue([field], `Give the data of every dose: ${doseCount} doses but ${data.length} entries (use 0 patients for untried doses).`);
  data.forEach((d, i) => {
    if (d.dlts > d.patients) issue([field, i, "dlts"], `Dose ${i + 1} has ${d.dlts} patients with a DLT but only ${d.patients} treated.`);
  });
}

/**
 * Checks the scenarios and data given, and that the chosen use has what it
 * needs; `nextDoseAnswer` names what the next-dose use gives ("decision").
 */
export function checkUseInputs(
  v: { use: "plan" | "next-dose"; scenarios?: Scenario[] | undefined; data?: DoseData[] | undefined },
  doseCount: number,
  issue: Issue,
  nextDoseAnswer: string,
): void {
  checkScenarios(v.scenarios, doseCount, issue);
  checkObservedData(v.data, doseCount, issue);
  if (v.use === "plan" && !v.scenarios) issue(["scenarios"], "Planning needs at least one scenario of true DLT probabilities.");
  if (v.use === "next-dose" && !v.data) issue(["data"], `The next-dose ${nextDoseAnswer} needs the data so far: patients and DLTs at each dose.`);
}

/** Patients and DLTs per dose of the data so far, and the patients in all. */
export function observedCounts(data: DoseData[]): { patients: number[]; dlts: number[]; total: number } {
  const patients = data.map((d) => d.patients);
  return { patients, dlts: data.map((d) => d.dlts), total: patients.reduce((a, b) => a + b, 0) };
}

/** The dose closest to the target, the lower one on a tie. */
export function trueMtd(probabilities: readonly number[], target: number): number {
  let best = 0;
  for (let i = 1; i < probabilities.length; i++) {
    if (Math.abs(probabilities[i]! - target) < Math.abs(probabilities[best]! - target) - 1e-12) best = i;
  }
  return best;
}

/** What one simulated trial reports: the dose selected (-1 for none) and whether it stopped for safety. */
export interface TrialEnd {
  selected: number;
  stoppedForSafety: boolean;
}

/**
 * Runs one trial under the true probabilities, adding patients and DLTs per
 * dose into the (zeroed) arrays given.
 */
export type TrialRunner = (truth: readonly number[], random: RandomSource, patients: Int32Array, dlts: Int32Array) => TrialEnd;

export interface OperatingCharacteristics {
  scenario: string;
  dltProbabilities: number[];
  /** Index of the true MTD (closest to the target). */
  trueMtd: number;
  trials: number;
  /** Fraction of trials selecting each dose. */
  selectionProbability: number[];
  /** Fraction of trials selecting no dose (stopped for safety). */
  noSelectionProbability: number;
  correctSelectionProbability: number;
  meanPatients: number[];
  meanDlts: number[];
  meanTotalPatients: number;
  meanTotalDlts: number;
  /** Share of all patients treated above the true MTD. */
  treatedAboveMtd: number;
  /** Share of all patients treated at doses whose true DLT probability exceeds the target. */
  treatedAboveTarget: number;
}

export function scenarioSeed(seed: number, scenarioIndex: number): number {
  return (seed + Math.imul(scenarioIndex, 0x9e3779b9)) >>> 0;
}

/** Simulates `trials` trials of one scenario and summarizes them. */
export function simulateScenario(scenario: Scenario, target: number, trials: number, seed: number, run: TrialRunner): OperatingCharacteristics {
  const truth = scenario.dltProbabilities;
  const k = truth.length;
  const random = createRandom(seed);
  const patients = new Int32Array(k);
  const dlts = new Int32Array(k);
  const selected = new Float64Array(k);
  const patientSum = new Float64Array(k);
  const dltSum = new Float64Array(k);
  let none = 0;
  for (let t = 0; t < trials; t++) {
    patients.fill(0);
    dlts.fill(0);
    const end = run(truth, random, patients, dlts);
    if (end.selected < 0) none++; else selected[end.selected]!++;
    for (let i = 0; i < k; i++) {
      patientSum[i]! += patients[i]!;
      dltSum[i]! += dlts[i]!;
    }
  }
  const mtd = trueMtd(truth, target);
  const totalPatients = patientSum.reduce((a, b) => a + b, 0);
  return {
    scenario: scenario.name,
    dltProbabilities: [...truth],
    trueMtd: mtd,
    trials,
    selectionProbability: Array.from(selected, (c) => c / trials),
    noSelectionProbability: none / trials,
    correctSelectionProbability: selected[mtd]! / trials,
    meanPatients: Array.from(patientSum, (s) => s / trials),
    meanDlts: Array.from(dltSum, (s) => s / trials),
    meanTotalPatients: totalPatients / trials,
    meanTotalDlts: dltSum.reduce((a, b) => a + b, 0) / trials,
    ...overdosingShares(patientSum, totalPatients, truth, target, mtd),
  };
}

/**
 * Shares of all patients treated above the true MTD and at doses whose true
 * DLT probability exceeds the target, from patients per dose (counts or
 * expectations) and their total.
 */
export function overdosingShares(
  patientsPerDose: ArrayLike<number>, totalPatients: number, truth: readonly number[], target: number, mtd: number,
): { treatedAboveMtd: number; treatedAboveTarget: number } {
  let above = 0;
  let overTarget = 0;
  for (let i = 0; i < truth.length; i++) {
    if (i > mtd) above += patientsPerDose[i]!;
    if (truth[i]! > target) overTarget += patientsPerDose[i]!;
  }
  return {
    treatedAboveMtd: totalPatients > 0 ? above / totalPatients : 0,
    treatedAboveTarget: totalPatients > 0 ? overTarget / totalPatients : 0,
  };
}

/** The fields of a simulated plan that set its streams. */
interface SimulationPlan {
  target: number;
  scenarios?: Scenario[] | undefined;
  trials: number;
  seed: number;
}

/** Every scenario of a plan, each from its own seeded stream (its work is estimated before, by the design's cost). */
export function simulatePlan(v: SimulationPlan, run: TrialRunner): OperatingCharacteristics[] {
  return v.scenarios!.map((s, i) => simulateScenario(s, v.target, v.trials, scenarioSeed(v.seed, i), run));
}

/** Treats a cohort at a dose, drawing each patient's DLT from the true probability. */
export function treatCohort(dose: number, size: number, truth: readonly number[], random: RandomSource, patients: Int32Array, dlts: Int32Array): void {
  const p = truth[dose]!;
  let events = 0;
  for (let j = 0; j < size; j++) if (random.uniform() < p) events++;
  patients[dose]! += size;
  dlts[dose]! += events;
}

const percent = (x: number): number => x * 100;

/** Columns of the whole-trial figures, in the order of `summaryCells`. */
export const summaryColumns: Column[] = [
  { key: "correct", label: "Correct selection (%)", digits: 1 },
  { key: "none", label: "No dose selected (%)", digits: 1 },
  { key: "patients", label: "Mean patients", digits: 1 },
  { key: "dlts", label: "Mean DLTs", digits: 2 },
  { key: "above", label: "Treated above true MTD (%)", digits: 1 },
  { key: "overTarget", label: "Treated at doses above target (%)", digits: 1 },
];

/** Whole-trial figures of one design under one scenario, percentages as 0-100. */
export function summaryCells(oc: OperatingCharacteristics): Cell[] {
  return [percent(oc.correctSelectionProbability), percent(oc.noSelectionProbability), oc.meanTotalPatients, oc.meanTotalDlts, percent(oc.treatedAboveMtd), percent(oc.treatedAboveTarget)];
}

/** Facts of the cohort schedule, as every simulated dose-finding report lists them. */
export function scheduleFacts(v: { doses: string[]; cohortSize: number; startDose: number; maxSampleSize: number }): Fact[] {
  return [
    { label: "Cohort size", value: v.cohortSize },
    { label: "Start dose", value: v.doses[v.startDose - 1]! },
    { label: "Maximum sample size", value: v.maxSampleSize },
  ];
}

/** Report blocks for simulated operating characteristics: a summary, one table and chart per scenario. */
export function operatingCharacteristicsSection(doses: string[], ocs: OperatingCharacteristics[], design: string): Section {
  const trials = ocs[0]?.trials ?? 0;
  const blocks: Block[] = [
    {
      kind: "table",
      table: {
        id: "scenario-summary",
        caption: `Operating characteristics of ${design}, ${trials} simulated trials per scenario`,
        columns: [{ key: "scenario", label: "Scenario" }, { key: "mtd", label: "True MTD" }, ...summaryColumns],
        rows: ocs.map((oc) => [oc.scenario, doses[oc.trueMtd]!, ...summaryCells(oc)]),
        note: "The true MTD is the dose whose true DLT probability is closest to the target. Percentages of patients are pooled over all simulated trials.",
      },
    },
  ];
  ocs.forEach((oc, s) => {
    const rows: Cell[][] = doses.map((label, i) => [label, oc.dltProbabilities[i]!, percent(oc.selectionProbability[i]!), oc.meanPatients[i]!, oc.meanDlts[i]!]);
    rows.push(["No dose (stopped)", null, percent(oc.noSelectionProbability), null, null]);
    rows.push(["Total", null, null, oc.meanTotalPatients, oc.meanTotalDlts]);
    blocks.push({
      kind: "table",
      table: {
        id: `scenario-${s + 1}`,
        caption: `Scenario ${s + 1}: ${oc.scenario}`,
        columns: [
          { key: "dose", label: "Dose" },
          { key: "truth", label: "True DLT probability", digits: 3 },
          { key: "selected", label: "Selected as MTD (%)", digits: 1 },
          { key: "patients", label: "Mean patients", digits: 2 },
          { key: "dlts", label: "Mean DLTs", digits: 2 },
        ],
        rows,
      },
    });
    blocks.push({ kind: "chart", chart: selectionChart(`scenario-${s + 1}-selection`, `Scenario ${s + 1} (${oc.scenario}): how often each dose is selected`, doses, [{ name: design, oc }]) });
  });
  return { id: "operating-characteristics", title: "Operating characteristics (simulated)", blocks };
}

/** Bar chart of selection percentages, one series per design; category 0 is "no dose". */
export function selectionChart(id: string, title: string, doses: string[], series: Array<{ name: string; oc: { selectionProbability: number[]; noSelectionProbability: number } }>) {
  return {
    id,
    title,
    xLabel: "Dose selected as MTD",
    yLabel: "Trials (%)",
    yDomain: [0, 100] as [number, number],
    categories: ["None", ...doses],
    series: series.map(({ name, oc }) => ({
      name,
      style: "bars" as const,
      points: [[0, percent(oc.noSelectionProbability)] as [number, number], ...oc.selectionProbability.map((p, i): [number, number] => [i + 1, percent(p)])],
    })),
  };
}

/** The protocol's sentence on the simulated operating characteristics, with a leading space. */
export function simulationProtocolText(doses: string[], trials: number, seed: number, ocs: OperatingCharacteristics[]): string {
  return ` In ${trials} simulated trials per scenario (seed ${seed}), ` + ocs.map((oc) =>
    `under the scenario "${oc.scenario}" (true MTD ${doses[oc.trueMtd]}) the design selects ${selectionText(doses, oc)}, treating on average ${oc.meanTotalPatients.toFixed(1)} patients, ${percent(oc.treatedAboveMtd).toFixed(1)}% of them above the true MTD`).join("; ") + ".";
}

/** The caution every simulated dose-finding plan carries. */
export const SIMULATION_CAUTION = "Operating characteristics are estimated from simulated trials: each percentage carries Monte Carlo error (about ±3 percentage points at 1,000 trials). Use more trials for a protocol.";

/** "dose 1 (10 mg) 12.3%, ..." for protocol text. */
export function selectionText(doses: string[], oc: OperatingCharacteristics): string {
  return `${doses.map((d, i) => `${d} ${percent(oc.selectionProbability[i]!).toFixed(1)}%`).join(", ")}, no dose ${percent(oc.noSelectionProbability).toFixed(1)}%`;
}
