/**
 * What the dose-finding calculations cost, estimated from their inputs before
 * computing (Design.cost): the count of work the algorithm does times a CPU
 * cost per unit measured on the reference machine, times a safety factor. The
 * service refuses an estimate above the compute budget (budget.ts) with the
 * fields to reduce.
 *
 * - A simulated trial makes one dose decision per cohort, ⌈maxSampleSize /
 *   cohortSize⌉ in all when it runs to its end (stopping early only saves
 *   work), so a plan costs scenarios × trials × decisions × the cost of one
 *   decision.
 * - A CRM decision updates the posterior by the tabulated Gauss-Legendre rule
 *   (crmPosterior.ts): its cost is the number of quadrature nodes times the
 *   doses summed at each node. The window of a holds the nodes; it widens with
 *   the prior's standard deviation (on both sides for the logistic model,
 *   whose likelihood flattens as a falls, on one for the power model) and
 *   the panels narrow with the model's widest panel.
 * - A BOIN decision is a table look-up; its trials cost a fixed part, a part
 *   per dose (the isotonic regression at the end), per decision and per
 *   patient (one random draw each).
 * - The 3+3 enumeration follows every sequence of cohort outcomes: 2^k
 *   sequences reach the top of k doses.
 *
 * The constants were measured with process.cpuUsage, several repeats, on the
 * heaviest inputs of each kind (the budget cases in
 * test/support/budgetCases/doseFinding.ts, timed by `npm run bench designs`,
 * and the simulation figures of bench/crm.bench.ts and bench/boin.bench.ts),
 * the CRM's as ratios to the bench plan timed in the same process: the shared
 * machine's load moved the absolute CPU time of one plan by up to 1.4×.
 */
import type { CrmModelKind } from "./crmModel.js";
import { gridPanelWidth } from "./crmPosterior.js";
import { MIN_TRIALS } from "./doseFinding.js";
import { SAFETY_FACTOR, formatCount } from "./workEstimate.js";

/** The size of a simulated plan. */
export interface SimulationSize {
  doseCount: number;
  maxSampleSize: number;
  cohortSize: number;
  trials: number;
  scenarioCount: number;
}

/** An estimate in CPU milliseconds and the words that say how the work was counted. */
export interface CountedWork {
  milliseconds: number;
  breakdown: string;
}

/**
 * The fields of a simulated plan whose reduction lowers its work, the most
 * effective first, leaving out those already at their least: fewer trials,
 * fewer scenarios, fewer patients.
 */
export function simulationReduce(v: { trials: number; scenarios?: unknown[] | undefined }): string[] {
  return [
    ...(v.trials > MIN_TRIALS ? ["trials"] : []),
    ...(v.scenarios && v.scenarios.length > 1 ? ["scenarios"] : []),
    "maxSampleSize",
  ];
}

/** The size of a plan's simulation from its inputs. */
export function simulationSize(v: { doses: string[]; maxSampleSize: number; cohortSize: number; trials: number; scenarios?: unknown[] | undefined }): SimulationSize {
  return { doseCount: v.doses.length, maxSampleSize: v.maxSampleSize, cohortSize: v.cohortSize, trials: v.trials, scenarioCount: v.scenarios?.length ?? 0 };
}

/**
 * The first calls of a simulation in an isolate run unoptimized code: the
 * second to fourth runs of the catalog examples took up to 30 ms (BOIN) more
 * than once optimized. The very first call in a fresh process also compiles
 * the functions it meets (100 to 300 ms of CPU, the same for every design),
 * which the budget, defined on `npm run bench` timings, leaves to the Worker's
 * own limit.
 */
const FIRST_CALLS_MS = 30;

const plural = (n: number, one: string, many: string): string => `${formatCount(n)} ${n === 1 ? one : many}`;

/** Dose decisions of a trial that runs to its maximum sample size. */
export function cohortDecisions(size: Pick<SimulationSize, "maxSampleSize" | "cohortSize">): number {
  return Math.ceil(size.maxSampleSize / size.cohortSize);
}

function simulatedTrials(size: SimulationSize): string {
  const decisions = cohortDecisions(size);
  return `${size.scenarioCount > 1 ? `${plural(size.scenarioCount, "scenario", "scenarios")} × ` : ""}${plural(size.trials, "trial", "trials")} × ` +
    `${plural(decisions, "dose decision", "dose decisions")} (${size.maxSampleSize} patients in cohorts of ${size.cohortSize}) over ${plural(size.doseCount, "dose", "doses")}`;
}

/**
 * CRM quadrature panels of one posterior update, an upper envelope over data
 * sets: a fixed part for the window around the mode, and the prior's tails
 * (spread × σ wide) in panels of the model's widest grid width.
 */
export function crmPanelsPerUpdate(model: CrmCostModel): number {
  const spread = model.kind === "logistic" ? CRM_LOGISTIC_SPREAD : CRM_POWER_SPREAD;
  const tails = Math.min(CRM_WINDOW_LIMIT, spread * Math.sqrt(model.priorVariance));
  return CRM_INNER_PANELS + tails / gridPanelWidth(model);
}

export interface CrmCostModel {
  kind: CrmModelKind;
  intercept: number;
  priorVariance: number;
}

/** Panels around the mode, whatever the prior. */
const CRM_INNER_PANELS = 32;
/** Width of the prior's tails in prior standard deviations, per model (fitted to the node counts of random data sets). */
const CRM_LOGISTIC_SPREAD = 7;
const CRM_POWER_SPREAD = 4;
/** The grid of a ends at ±24. */
const CRM_WINDOW_LIMIT = 48;
/**
 * CPU microseconds of one decision of the bench plan (bench/crm.bench.ts, power
 * model: 10,000 trials × 10 decisions over 5 doses in 1,131 ms), the unit the
 * other figures are multiples of.
 */
const CRM_BENCH_DECISION_US = 11.3;
/** The default model (power, prior variance 1.34), whose panels the unit was measured with. */
const CRM_UNIT_PANELS = crmPanelsPerUpdate({ kind: "power", intercept: 3, priorVariance: 1.34 });
/**
 * The costliest decision of plans of up to 30 patients, in bench units, by
 * number of doses (max over schedules of 1 to 6 per cohort and scenarios from
 * all safe to rising, each timed beside the bench plan: 0.95, 1.33 and 1.78 at
 * 2, 5 and 10 doses, with more room at 10 doses, whose timings varied most
 * with the machine's load; at 5 doses the room is what keeps the bench plan
 * with the logistic model within the budget): the posterior sums every dose at
 * each node and the likelihood every dose tried.
 */
const CRM_DOSE_FACTORS: ReadonlyArray<readonly [number, number]> = [[2, 1.15], [5, 1.35], [10, 2.3]];
/** Longer trials: 150 patients cost up to 22% more a decision (sharper posteriors, finer panels; 2.17 bench units at 10 doses), 25% counted. */
const CRM_LONG_TRIAL_EXTRA = 0.25;
/**
 * Tabulating the grid's panel widths, once per simulated design: all seven
 * widths took 30 to 85 ms at 5 and 10 doses (a plan tabulates only those its
 * posteriors need).
 */
const CRM_SETUP_MS = 20;
const CRM_SETUP_MS_PER_DOSE = 8;
/**
 * 1.3: in an isolate that has run other designs first (as a Worker does, and as
 * bench/designs.bench.ts does) the 10,000-trial logistic plan took 1,966 ms of CPU
 * against 1,600 ms alone, which a factor of 1.1 only just covered (1,970 ms).
 */
const CRM_SAFETY = 1.3;

function interpolate(table: ReadonlyArray<readonly [number, number]>, x: number): number {
  for (let i = 1; i < table.length; i++) {
    const [x0, y0] = table[i - 1]!;
    const [x1, y1] = table[i]!;
    if (x <= x1) return y0 + ((Math.max(x, x0) - x0) / (x1 - x0)) * (y1 - y0);
  }
  return table[table.length - 1]![1];
}

/** CPU microseconds of one CRM decision of a trial of `maxSampleSize` patients over `doseCount` doses. */
export function crmDecisionMicroseconds(doseCount: number, maxSampleSize: number, model: CrmCostModel): number {
  const length = 1 + CRM_LONG_TRIAL_EXTRA * Math.min(1, Math.max(0, maxSampleSize - 30) / 120);
  return CRM_BENCH_DECISION_US * interpolate(CRM_DOSE_FACTORS, doseCount) * length * (crmPanelsPerUpdate(model) / CRM_UNIT_PANELS);
}

/** CPU milliseconds of a CRM simulation, and how they were counted. */
export function crmSimulationWork(size: SimulationSize, model: CrmCostModel): CountedWork {
  const decisions = size.scenarioCount * size.trials * cohortDecisions(size);
  const nodes = 8 * crmPanelsPerUpdate(model);
  return {
    milliseconds: CRM_SAFETY * (FIRST_CALLS_MS + CRM_SETUP_MS + CRM_SETUP_MS_PER_DOSE * size.doseCount + (decisions * crmDecisionMicroseconds(size.doseCount, size.maxSampleSize, model)) / 1000),
    breakdown: `${simulatedTrials(size)}, each decision a posterior by up to ${formatCount(nodes)} quadrature nodes`,
  };
}

/**
 * CPU microseconds of one BOIN trial: fixed, per dose, per decision and per
 * patient, fitted above the costliest scenario of each schedule (10.9 µs for
 * 150 patients one by one over 10 doses, 2.7 µs for 30 in cohorts of 3 over 5,
 * up to 6 µs for short trials of large cohorts on a busy machine).
 */
const BOIN_TRIAL_US = 3;
const BOIN_DOSE_US = 0.05;
const BOIN_DECISION_US = 0.03;
const BOIN_PATIENT_US = 0.04;
/** The decision table, up to 150 patients at a dose (2.4 ms at most). */
const BOIN_SETUP_MS = 3;

/** CPU milliseconds of a BOIN simulation, and how they were counted. */
export function boinSimulationWork(size: SimulationSize): CountedWork {
  const trialUs = BOIN_TRIAL_US + BOIN_DOSE_US * size.doseCount + BOIN_DECISION_US * cohortDecisions(size) + BOIN_PATIENT_US * size.maxSampleSize;
  return {
    milliseconds: SAFETY_FACTOR * (FIRST_CALLS_MS + BOIN_SETUP_MS + (size.scenarioCount * size.trials * trialUs) / 1000),
    breakdown: simulatedTrials(size),
  };
}

/**
 * CPU microseconds per cohort-outcome sequence of the 3+3 enumeration, and its
 * fixed part, as a fresh isolate runs it: before the engine optimizes the
 * recursion, 12 doses under the six-patient rule took 90 ms (1.6 ms once
 * optimized), the first call of any size about 10 ms.
 */
const THREE_PLUS_THREE_SEQUENCE_US = 25;
const THREE_PLUS_THREE_FIXED_MS = 10;

/** CPU milliseconds of the exact 3+3 enumeration over `doseCount` doses. */
export function threePlusThreeWork(doseCount: number): CountedWork {
  const sequences = 2 ** doseCount;
  return {
    milliseconds: SAFETY_FACTOR * (THREE_PLUS_THREE_FIXED_MS + (sequences * THREE_PLUS_THREE_SEQUENCE_US) / 1000),
    breakdown: `an exact enumeration of the 3+3 over ${plural(doseCount, "dose", "doses")}: at most ${formatCount(sequences)} sequences of cohort outcomes`,
  };
}

/**
 * A next-dose decision from data: one posterior by adaptive quadrature (CRM,
 * 12.7 ms at most over 600 random data sets of up to 150 patients a dose) or
 * one table (BOIN, 3.2 ms at most).
 */
export const CRM_NEXT_DOSE_MS = 30;
export const BOIN_NEXT_DOSE_MS = 8;
