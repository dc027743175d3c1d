/**
 * Bayesian monitoring of a single-arm trial with a binary outcome, by one of
 * two rules, each with exact operating characteristics.
 *
 * rule "posterior": continuous monitoring (Thall, Simon & Estey 1995; Thall &
 * Simon 1994). The event probability θ has a Beta(a, b) prior; after x events
 * among n patients its posterior is Beta(a + x, b + n - x).
 *   monitor "toxicity": stop when P(θ > limit | x, n) > threshold;
 *   monitor "response": stop for futility when P(θ < limit | x, n) > threshold.
 * The limit is a fixed rate: the simplification of Thall, Simon & Estey's rule
 * that compares θ with a known standard rate rather than with a standard rate
 * that has its own prior.
 *
 * rule "predictive": futility monitoring by predictive probability (Lee & Liu
 * 2008). At the end (maxN patients) the regimen is declared promising when
 * P(p > p0 | x, maxN) > efficacyThreshold, that is when x ≥ s. At an interim
 * check with x responses among n, the predictive probability of reaching s is
 * PP = P(Y ≥ s - x) with Y ~ BetaBinomial(maxN - n, a + x, b + n - x); the
 * trial stops for futility when PP < futilityThreshold. Alpha and power are the
 * probabilities of declaring promise when the true rate is p0 and p1. With
 * thresholds "search", θT and θL are chosen on a grid for the given maxN
 * (src/designs/shared/predictiveSearch.ts): alpha ≤ target, power ≥ target,
 * smallest expected size at p0.
 *
 * Operating characteristics are exact: the distribution of the event count is
 * propagated patient by patient and absorbed at the boundary (src/stats/sequentialBinomial.ts).
 *
 * Conventions:
 * - Checks at n = firstCheck, firstCheck + cohortSize, ... (firstCheck
 *   defaults to cohortSize). The posterior rule also checks at maxN, so
 *   "stopping" there is the final conclusion that the rate is unacceptable;
 *   the probability of stopping before maxN is reported apart. The
 *   predictive rule's interim checks are those before maxN; at maxN the final
 *   rule decides.
 * - "Exceeds" and "below" are strict (> threshold, < futilityThreshold).
 * - No early stopping for efficacy in the predictive rule.
 * - A stop at a check ends the trial with the patients treated so far; the
 *   outcomes of all patients up to a check are known when it is made.
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Cell, Section } from "../report/document.js";
import { betaSurvival } from "../stats/beta.js";
import { type CheckRegion, sequentialBinomial } from "../stats/sequentialBinomial.js";
import {
  type BoundaryCheck, type BoundaryRun, type PosteriorRule, type PredictiveRule, checkSchedule, finalSuccessCount,
  futilityBoundary, posteriorBeyond, posteriorBoundary, predictiveTable, runsOf,
} from "./shared/bayesianRules.js";
import { type ThresholdSearch, searchThresholds, thresholdSearchWork } from "./shared/predictiveSearch.js";
import { designSection, protocolSection } from "./shared/reportSections.js";
import { workEstimate } from "./shared/workEstimate.js";

export const MAX_PATIENTS = 300;
const MAX_RATES = 30;
/** How far to look for the smallest maxN that would make a rule able to act. */
const SEARCH_LIMIT = 100000;

const rateMessage = "A rate must be strictly between 0 and 1.";
const rate = (description: string) => z.number().gt(0, rateMessage).lt(1, rateMessage).describe(description);
const probability = (description: string) =>
  z.number().gt(0, "A probability threshold must be strictly between 0 and 1.").lt(1, "A probability threshold must be strictly between 0 and 1.").describe(description);

const PRIOR_SHAPE_MESSAGE = "A prior shape must be at least 0.001 (a prior weight of 0.001 patients is already negligible).";

const POSTERIOR_ONLY = ["monitor", "limit", "threshold"] as const;
const PREDICTIVE_ONLY = ["p0", "p1", "thresholds", "efficacyThreshold", "futilityThreshold", "alpha", "power"] as const;

const schema = z
  .strictObject({
    rule: z.enum(["posterior", "predictive"]).default("posterior")
      .describe("posterior: stop when the posterior probability that the rate is beyond a limit exceeds a threshold (Thall, Simon & Estey 1995). predictive: stop for futility when the predictive probability of a positive final result falls below a threshold (Lee & Liu 2008)."),
    monitor: z.enum(["toxicity", "response"]).optional()
      .describe("Posterior rule: toxicity (stop when the toxicity rate is probably above the limit) or response (stop for futility when the response rate is probably below the limit). Defaults to toxicity."),
    limit: rate("Posterior rule: the rate limit. For toxicity, the highest acceptable toxicity rate; for response, the lowest response rate worth pursuing.").optional(),
    threshold: probability("Posterior rule: stop when the posterior probability that the rate is beyond the limit exceeds this (0.9 by default).").optional(),
    p0: rate("Predictive rule: the response rate of no interest (the null hypothesis).").optional(),
    p1: rate("Predictive rule: the target response rate, at which power is computed.").optional(),
    thresholds: z.enum(["given", "search"]).optional()
      .describe("Predictive rule: given (use efficacyThreshold and futilityThreshold as entered) or search (choose them on a grid so that alpha and power meet their targets with the smallest expected size at p0). Defaults to given."),
    efficacyThreshold: probability("Predictive rule: at the end the regimen is promising when P(response rate > p0 | data) exceeds this (0.9 by default).").optional(),
    futilityThreshold: probability("Predictive rule: stop for futility when the predictive probability of a promising final result is below this (0.05 by default).").optional(),
    alpha: z.number().gt(0).max(0.5).optional()
      .describe("Predictive rule with thresholds search: the largest acceptable probability of declaring promise when the response rate is p0 (0.1 by default)."),
    power: z.number().gt(0).lt(1).optional()
      .describe("Predictive rule with thresholds search: the smallest acceptable probability of declaring promise when the response rate is p1 (0.8 by default)."),
    // Below 0.001 the incomplete beta function loses its digits (a shape of 5e-324 gave P = 1 where it is 0).
    priorA: z.number().min(0.001, PRIOR_SHAPE_MESSAGE).max(1000).default(1)
      .describe("Beta prior for the event rate: first shape a (prior events). a / (a + b) is the prior mean; a + b its weight in patients."),
    priorB: z.number().min(0.001, PRIOR_SHAPE_MESSAGE).max(1000).default(1)
      .describe("Beta prior for the event rate: second shape b (prior non-events)."),
    maxN: z.number().int().min(2).max(MAX_PATIENTS, `At most ${MAX_PATIENTS} patients can be monitored here.`)
      .describe(`Maximum number of patients (2 to ${MAX_PATIENTS}).`),
    cohortSize: z.number().int().min(1).max(50).default(1)
      .describe("Patients between checks: 1 checks after every patient."),
    firstCheck: z.number().int().min(1).max(MAX_PATIENTS).optional()
      .describe("Number of patients at the first check (defaults to the cohort size)."),
    trueRates: z.array(rate("A true event rate.")).min(1).max(MAX_RATES, `At most ${MAX_RATES} true rates.`).optional()
      .describe("True event rates at which to tabulate the operating characteristics (a grid from 0.05 to 0.95 by default); the limit, or p0 and p1, are always added."),
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    const other = v.rule === "posterior" ? PREDICTIVE_ONLY : POSTERIOR_ONLY;
    for (const field of other) {
      if (v[field] !== undefined) issue(field, `${field} belongs to the ${v.rule === "posterior" ? "predictive" : "posterior"} rule; remove it or set rule to "${v.rule === "posterior" ? "predictive" : "posterior"}".`);
    }
    if (v.rule === "posterior") {
      if (v.limit === undefined) issue("limit", v.monitor === "response" ? "Give the lowest response rate worth pursuing." : "Give the highest acceptable toxicity rate.");
    } else {
      if (v.p0 === undefined) issue("p0", "Give the response rate of no interest.");
      if (v.p1 === undefined) issue("p1", "Give the target response rate.");
      if (v.p0 !== undefined && v.p1 !== undefined && v.p1 <= v.p0) issue("p1", "The target response rate must exceed the rate of no interest (p0).");
      if (v.thresholds === "search") {
        for (const field of ["efficacyThreshold", "futilityThreshold"] as const) {
          if (v[field] !== undefined) issue(field, `${field} is chosen by the search; remove it, or set thresholds to "given".`);
        }
        if (v.alpha !== undefined && v.power !== undefined && v.power <= v.alpha) issue("power", "Power must exceed alpha.");
      } else {
        for (const field of ["alpha", "power"] as const) {
          if (v[field] !== undefined) issue(field, `${field} is a target for the threshold search; set thresholds to "search" or remove it.`);
        }
      }
    }
    if (v.cohortSize > v.maxN) {
      issue("cohortSize", "The cohort size cannot exceed the maximum number of patients.");
      return;
    }
    const first = v.firstCheck ?? v.cohortSize;
    if (v.rule === "predictive" && first >= v.maxN) issue("firstCheck", "The first interim check must come before the last patient.");
    if (v.rule === "posterior" && first > v.maxN) issue("firstCheck", "The first check cannot come after the last patient.");
  })
  .transform((v) => ({
    ...v,
    firstCheck: v.firstCheck ?? v.cohortSize,
    ...(v.rule === "posterior"
      ? { monitor: v.monitor ?? "toxicity", threshold: v.threshold ?? 0.9 }
      : v.thresholds === "search"
        ? { thresholds: "search" as const, alpha: v.alpha ?? 0.1, power: v.power ?? 0.8 }
        : { thresholds: "given" as const, efficacyThreshold: v.efficacyThreshold ?? 0.9, futilityThreshold: v.futilityThreshold ?? 0.05 }),
  }));

export type BayesianMonitoringInput = z.output<typeof schema>;

export interface RateCharacteristics {
  rate: number;
  /** Posterior rule: P(the rule stops at any check, maxN included). Predictive: P(futility stop). */
  probabilityOfStopping: number;
  probabilityOfEarlyTermination: number;
  expectedSampleSize: number;
  /** Predictive rule: P(declared promising at the end). */
  probabilityPromising: number | null;
}

export interface BayesianMonitoringResult {
  rule: "posterior" | "predictive";
  /** "at-least" for toxicity monitoring, "at-most" for futility. */
  direction: "at-least" | "at-most";
  boundary: BoundaryCheck[];
  runs: BoundaryRun[];
  /** Predictive rule: promising when at least this many responses among maxN. */
  finalSuccessCount: number | null;
  /** Predictive rule: the thresholds used, as given or as chosen by the search. */
  efficacyThreshold: number | null;
  futilityThreshold: number | null;
  search: ThresholdSearch | null;
  alpha: number | null;
  power: number | null;
  operatingCharacteristics: RateCharacteristics[];
  /** [true rate, probability of stopping] (posterior) or [true rate, probability promising] (predictive). */
  curve: Array<[number, number]>;
  sizeCurve: Array<[number, number]>;
}

const posteriorRule = (input: BayesianMonitoringInput): PosteriorRule =>
  ({ monitor: input.monitor!, limit: input.limit!, threshold: input.threshold!, priorA: input.priorA, priorB: input.priorB });
const predictiveRule = (input: BayesianMonitoringInput): PredictiveRule =>
  ({ p0: input.p0!, priorA: input.priorA, priorB: input.priorB, maxN: input.maxN });

/** The smallest n in 1..SEARCH_LIMIT at which `acts(n)` holds, for `acts` monotone in n (false, then true); or null. */
function smallestSize(acts: (n: number) => boolean): number | null {
  let hi = 1;
  while (!acts(hi)) {
    if (hi >= SEARCH_LIMIT) return null;
    hi = Math.min(SEARCH_LIMIT, hi * 2);
  }
  let lo = Math.floor(hi / 2) + 1;
  if (hi === 1) return 1;
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (acts(mid)) hi = mid; else lo = mid + 1;
  }
  return hi;
}

function checkPosteriorFeasible(input: BayesianMonitoringInput, boundary: BoundaryCheck[]): void {
  const first = boundary[0]!;
  const event = input.monitor === "response" ? "response" : "toxicity";
  if (input.monitor === "response" ? first.stopAt === first.patients : first.stopAt === 0) {
    throw new InfeasibleDesignError(
      `With this prior the rule stops at the first check (${first.patients} patient${first.patients === 1 ? "" : "s"}) whatever the outcomes: even ${input.monitor === "response" ? `a ${event} in every patient` : `no ${event}`} leaves the posterior probability beyond the limit above ${input.threshold}. Use a prior closer to the limit, a smaller prior weight (priorA + priorB), or a higher threshold.`,
      { field: "threshold", firstCheck: first.patients },
    );
  }
  if (boundary.every((c) => c.stopAt === null)) {
    // The most alarming data at n (every patient an event, or none a response) alarm more as n grows.
    const needed = smallestSize((n) => posteriorBeyond(posteriorRule(input), input.monitor === "response" ? 0 : n, n) > input.threshold!);
    const where = needed === null ? `no number of patients up to ${SEARCH_LIMIT}` : `at least ${needed} patients`;
    throw new InfeasibleDesignError(
      `The rule can never stop within ${input.maxN} patients: even the most unfavourable outcomes keep the posterior probability beyond the limit at or below ${input.threshold}. It needs ${where}${needed !== null && needed > MAX_PATIENTS ? ` (above the limit of ${MAX_PATIENTS})` : ""}, a lower threshold, or a weaker prior.`,
      { field: "maxN", ...(needed !== null ? { bound: needed } : {}), maxN: input.maxN },
    );
  }
}

function checkPredictiveFeasible(input: BayesianMonitoringInput, s: number | null, boundary: BoundaryCheck[]): asserts s is number {
  if (s === null) {
    const needed = smallestSize((n) => betaSurvival(input.p0!, input.priorA + n, input.priorB) > input.efficacyThreshold!);
    throw new InfeasibleDesignError(
      `No result among ${input.maxN} patients can be declared promising: even ${input.maxN} responses leave P(response rate > ${input.p0}) at or below ${input.efficacyThreshold}. ${needed === null ? `No number of patients up to ${SEARCH_LIMIT} suffices` : `It needs at least ${needed} patients${needed > MAX_PATIENTS ? ` (above the limit of ${MAX_PATIENTS})` : ""}`}, or a lower efficacy threshold.`,
      { field: "maxN", ...(needed !== null ? { bound: needed } : {}), maxN: input.maxN },
    );
  }
  if (s === 0) {
    throw new InfeasibleDesignError(
      `The prior alone declares the regimen promising: with no responses among ${input.maxN} patients P(response rate > ${input.p0}) still exceeds ${input.efficacyThreshold}. Use a prior with less weight or a lower prior mean.`,
      { field: "priorA" },
    );
  }
  const first = boundary[0]!;
  if (first.stopAt === first.patients) {
    throw new InfeasibleDesignError(
      `The rule stops for futility at the first check (${first.patients} ${first.patients === 1 ? "patient" : "patients"}) whatever the outcomes: even ${first.patients === 1 ? "a response in that patient gives" : `${first.patients} responses give`} a predictive probability below ${input.futilityThreshold}. Lower the futility threshold, check later, or raise maxN.`,
      { field: "futilityThreshold", firstCheck: first.patients },
    );
  }
}

/** The tabulated rates: the entered grid (or 0.05 to 0.95 by 0.05), always with the limit, or p0 and p1, which the report quotes. */
function rateGrid(input: BayesianMonitoringInput): number[] {
  const base = [
    ...(input.trueRates ?? Array.from({ length: 19 }, (_, i) => (i + 1) / 20)),
    ...(input.rule === "posterior" ? [input.limit!] : [input.p0!, input.p1!]),
  ];
  return [...new Set(base)].sort((a, b) => a - b);
}

const CURVE_RATES = Array.from({ length: 99 }, (_, i) => (i + 1) / 100);

/** Thresholds of the predictive rule: as given, or chosen by the search. */
function predictiveThresholds(input: BayesianMonitoringInput, checks: number[]): { efficacyThreshold: number; futilityThreshold: number; search: ThresholdSearch | null } {
  if (input.thresholds !== "search") return { efficacyThreshold: input.efficacyThreshold!, futilityThreshold: input.futilityThreshold!, search: null };
  const search = searchThresholds(predictiveRule(input), input.p1!, checks, input.alpha!, input.power!);
  if (!search.chosen) {
    const closest = search.mostPowerfulWithinAlpha;
    throw new InfeasibleDesignError(
      `No pair of thresholds on the grid (efficacy 0.80 to 0.99, futility 0.001 to 0.20) gives alpha at most ${input.alpha} and power at least ${input.power} with at most ${input.maxN} patients` +
        (closest ? `; the most powerful pair within alpha reaches power ${closest.power.toFixed(4)} (efficacy ${closest.efficacyThreshold}, futility ${closest.futilityThreshold}).` : "; no pair keeps alpha within the target.") +
        " Raise maxN, or relax the targets.",
      { field: "maxN", maxN: input.maxN, evaluated: search.evaluated, ...(closest ? { bestPower: closest.power } : {}) },
    );
  }
  return { efficacyThreshold: search.chosen.efficacyThreshold, futilityThreshold: search.chosen.futilityThreshold, search };
}

/**
 * The compute budget (budget.ts). The work is in exact recursions over the
 * patients (sequentialBinomial: one per tabulated or charted rate, two per
 * threshold pair of a search), each at most maxN(maxN + 3)/2 steps; tables of
 * predictive probabilities (the same number of steps); and posterior tail
 * probabilities for the boundaries and final counts. With maxN ≤ 300 and at
 * most 30 rates the heaviest input stays far inside the budget, so no input
 * is refused.
 *
 * Constants from `npm run bench designs` (the bayesian-monitoring heaviest
 * cases, median CPU over 3 runs while other work shared the machine): the
 * threshold search over 300 patients checked one by one counts 46.9 million
 * steps and took 79 ms, the posterior rule 5.9 million in 16 ms, 1.7 to
 * 2.6 ns a step; a posterior tail probability alone took 0.3 to 1.4 µs.
 * 2.7 ns and 2 µs are taken.
 */
const MS_PER_STEP = 2.7e-6;
const MS_PER_POSTERIOR_PROBABILITY = 0.002;

export function costBayesianMonitoring(input: BayesianMonitoringInput): WorkEstimate {
  const maxN = input.maxN;
  const rates = CURVE_RATES.length + rateGrid(input).length;
  const search = input.rule === "predictive" && input.thresholds === "search" ? thresholdSearchWork(maxN) : null;
  const recursions = rates + (search?.recursions ?? 0);
  const tables = (input.rule === "predictive" ? 1 : 0) + (search?.tables ?? 0);
  // The boundary scan or final count, and the feasibility checks (bisections up to SEARCH_LIMIT patients).
  const posteriorProbabilities = 2 * (maxN + 1) + 40 + (search?.posteriorProbabilities ?? 0);
  return workEstimate([
    {
      count: ((recursions + tables) * maxN * (maxN + 3)) / 2,
      msEach: MS_PER_STEP,
      what: `steps of ${recursions + tables} exact recursions over up to ${maxN} patients (${rates} true rates` +
        (search ? `, ${search.recursions / 2} threshold pairs at p0 and p1` : "") + ")",
    },
    { count: posteriorProbabilities, msEach: MS_PER_POSTERIOR_PROBABILITY, what: "posterior tail probabilities" },
  ], ["maxN", "trueRates"]);
}

export function computeBayesianMonitoring(input: BayesianMonitoringInput): BayesianMonitoringResult {
  const maxN = input.maxN;
  let boundary: BoundaryCheck[];
  let s: number | null = null;
  let direction: "at-least" | "at-most";
  let thresholds: ReturnType<typeof predictiveThresholds> | null = null;
  if (input.rule === "posterior") {
    boundary = posteriorBoundary(posteriorRule(input), checkSchedule(input.firstCheck, input.cohortSize, maxN, true));
    checkPosteriorFeasible(input, boundary);
    direction = input.monitor === "response" ? "at-most" : "at-least";
  } else {
    const checks = checkSchedule(input.firstCheck, input.cohortSize, maxN, false);
    thresholds = predictiveThresholds(input, checks);
    const effective = { ...input, ...thresholds };
    s = finalSuccessCount(predictiveRule(input), thresholds.efficacyThreshold);
    boundary = s === null || s === 0
      ? []
      : futilityBoundary(predictiveTable(predictiveRule(input), s, checks, thresholds.futilityThreshold), checks, thresholds.futilityThreshold);
    checkPredictiveFeasible(effective, s, boundary);
    direction = "at-most";
  }
  const regions: CheckRegion[] = boundary
    .filter((c) => c.stopAt !== null)
    .map((c) => (direction === "at-least" ? { patients: c.patients, atLeast: c.stopAt! } : { patients: c.patients, atMost: c.stopAt! }));

  const characteristics = (trueRate: number): RateCharacteristics => {
    const out = sequentialBinomial(trueRate, maxN, regions);
    let stop = 0;
    let early = 0;
    regions.forEach((r, i) => {
      const here = out.stopLow[i]! + out.stopHigh[i]!;
      stop += here;
      if (r.patients < maxN) early += here;
    });
    let promising: number | null = null;
    if (s !== null) {
      promising = 0;
      for (let x = s; x <= maxN; x++) promising += out.completed[x]!;
    }
    return { rate: trueRate, probabilityOfStopping: stop, probabilityOfEarlyTermination: early, expectedSampleSize: out.expectedSampleSize, probabilityPromising: promising };
  };

  const curveRows = CURVE_RATES.map(characteristics);
  const gridRows = rateGrid(input).map(characteristics);
  // The grid holds p0 and p1 of the predictive rule, so alpha and power are read from it.
  const promisingAt = (rate: number): number | null => gridRows.find((row) => row.rate === rate)!.probabilityPromising;
  return {
    rule: input.rule,
    direction,
    boundary,
    runs: runsOf(boundary),
    finalSuccessCount: s,
    efficacyThreshold: thresholds?.efficacyThreshold ?? null,
    futilityThreshold: thresholds?.futilityThreshold ?? null,
    search: thresholds?.search ?? null,
    alpha: s === null ? null : promisingAt(input.p0!),
    power: s === null ? null : promisingAt(input.p1!),
    operatingCharacteristics: gridRows,
    curve: curveRows.map((r) => [r.rate, r.probabilityPromising ?? r.probabilityOfStopping]),
    sizeCurve: curveRows.map((r) => [r.rate, r.expectedSampleSize]),
  };
}

const fmt = (x: number, d = 3): string => x.toFixed(d);
const pct = (x: number): string => `${(x * 100).toFixed(1)}%`;

function scheduleText(input: BayesianMonitoringInput): string {
  const every = input.cohortSize === 1 ? "after every patient" : `after every cohort of ${input.cohortSize} patients`;
  return `${every}, from the ${input.firstCheck === 1 ? "first patient" : `first ${input.firstCheck} patients`} up to ${input.maxN} patients`;
}

function runSentence(run: BoundaryRun, direction: "at-least" | "at-most", event: string): string {
  const span = run.fromPatients === run.toPatients ? `${run.fromPatients}` : `${run.fromPatients} to ${run.toPatients}`;
  const what = direction === "at-least"
    ? `${run.events} or more have had a ${event}`
    : run.events === 0 ? `none has had a ${event}` : `${run.events} or fewer have had a ${event}`;
  return `After ${span} patients: stop if ${what}`;
}

function countText(events: number, patients: number, direction: "at-least" | "at-most", event: string): string {
  const plural = event === "toxicity" ? "toxicities" : "responses";
  if (direction === "at-least") return `${events} or more ${events === 1 ? event : plural} among the first ${patients} patients`;
  return events === 0 ? `no ${event} among the first ${patients} patients` : `at most ${events} ${events === 1 ? event : plural} among the first ${patients} patients`;
}

function documentBayesianMonitoring(entered: BayesianMonitoringInput, r: BayesianMonitoringResult): Section[] {
  const input: BayesianMonitoringInput = r.rule === "predictive"
    ? { ...entered, efficacyThreshold: r.efficacyThreshold!, futilityThreshold: r.futilityThreshold! }
    : entered;
  const posterior = r.rule === "posterior";
  const event = posterior && input.monitor !== "response" ? "toxicity" : "response";
  const prior = `Beta(${input.priorA}, ${input.priorB})`;
  const ruleText = posterior
    ? input.monitor === "response"
      ? `stop for futility when P(response rate < ${input.limit} | data) > ${input.threshold}`
      : `stop when P(toxicity rate > ${input.limit} | data) > ${input.threshold}`
    : `stop for futility when the predictive probability of a promising final result is below ${input.futilityThreshold}`;
  // A predictive rule whose futility threshold is too low to act has no run; the posterior rule always has one.
  const firstRun: BoundaryRun | undefined = r.runs[0];
  const at = (rate: number): RateCharacteristics => r.operatingCharacteristics.find((c) => c.rate === rate)!;

  const facts = posterior
    ? (() => {
        const l = at(input.limit!);
        return [
          { label: "Rule", value: ruleText, key: true },
          { label: "Earliest possible stop", value: firstRun ? countText(firstRun.events, firstRun.fromPatients, r.direction, event) : "none", key: true },
          { label: `P(rule stops) at a true rate of ${input.limit}`, value: l.probabilityOfStopping, digits: 4, key: true },
          { label: `Expected patients at a true rate of ${input.limit}`, value: l.expectedSampleSize, digits: 2, key: true },
          { label: "Prior", value: prior, note: `mean ${fmt(input.priorA / (input.priorA + input.priorB))}, weight ${input.priorA + input.priorB} patients` },
          { label: "Maximum patients", value: input.maxN },
        ];
      })()
    : (() => {
        const p0 = at(input.p0!);
        const p1 = at(input.p1!);
        return [
          { label: "Final rule", value: `promising if at least ${r.finalSuccessCount} responses among ${input.maxN}`, key: true },
          { label: "Alpha (exact)", value: r.alpha, digits: 4, key: true },
          { label: "Power (exact)", value: r.power, digits: 4, key: true },
          { label: `Probability of early termination at p0 = ${input.p0}`, value: p0.probabilityOfEarlyTermination, digits: 4, key: true },
          { label: `Expected patients at p0 = ${input.p0}`, value: p0.expectedSampleSize, digits: 2, key: true },
          { label: `Expected patients at p1 = ${input.p1}`, value: p1.expectedSampleSize, digits: 2 },
          { label: "Efficacy threshold (θT)", value: r.efficacyThreshold, note: r.search ? "chosen by the search" : undefined },
          { label: "Futility threshold (θL)", value: r.futilityThreshold, note: r.search ? "chosen by the search" : undefined },
          { label: "Prior", value: prior, note: `mean ${fmt(input.priorA / (input.priorA + input.priorB))}, weight ${input.priorA + input.priorB} patients` },
        ];
      })();

  const runRows: Cell[][] = r.runs.map((run) => [runSentence(run, r.direction, event), run.events, run.fromPatients, run.toPatients]);
  if (!posterior) runRows.push([`After ${input.maxN} patients: promising if ${r.finalSuccessCount} or more have had a response`, r.finalSuccessCount, input.maxN, input.maxN]);

  const ocColumns = posterior
    ? [
        { key: "rate", label: `True ${event} rate`, digits: 3 },
        { key: "stop", label: "P(rule stops)", digits: 4 },
        { key: "early", label: `P(stop before ${input.maxN})`, digits: 4 },
        { key: "size", label: "Expected patients", digits: 2 },
      ]
    : [
        { key: "rate", label: "True response rate", digits: 3 },
        { key: "promising", label: "P(declared promising)", digits: 4 },
        { key: "early", label: "P(early futility stop)", digits: 4 },
        { key: "size", label: "Expected patients", digits: 2 },
      ];
  const ocRows: Cell[][] = r.operatingCharacteristics.map((c) => posterior
    ? [c.rate, c.probabilityOfStopping, c.probabilityOfEarlyTermination, c.expectedSampleSize]
    : [c.rate, c.probabilityPromising, c.probabilityOfEarlyTermination, c.expectedSampleSize]);

  const runsText = r.runs.length
    ? r.runs.map((run) => runSentence(run, r.direction, event).replace(/^After/, "after")).join("; ")
    : "no interim result is low enough to stop the trial";
  const protocol = posterior
    ? (() => {
        const l = at(input.limit!);
        return `${event === "toxicity" ? "Toxicity" : "Response"} will be monitored by the Bayesian rule of Thall, Simon & Estey (1995): with a ${prior} prior for the ${event} rate, the trial will ${ruleText}, evaluated ${scheduleText(input)}. ` +
          `Equivalently: ${runsText}. ` +
          `Computed exactly, if the true ${event} rate equals ${input.limit} the rule stops the trial with probability ${fmt(l.probabilityOfStopping)} (${fmt(l.probabilityOfEarlyTermination)} before ${input.maxN} patients) and the expected number of patients is ${fmt(l.expectedSampleSize, 1)}; operating characteristics at other true rates are tabulated.`;
      })()
    : (() => {
        const p0 = at(input.p0!);
        const p1 = at(input.p1!);
        return `The trial will use the predictive probability design of Lee & Liu (2008) with at most ${input.maxN} patients and a ${prior} prior for the response rate. At the end the regimen will be declared promising if P(response rate > ${input.p0} | data) > ${input.efficacyThreshold}, that is if at least ${r.finalSuccessCount} of ${input.maxN} patients respond. ` +
          `The predictive probability of that result will be computed ${scheduleText(input).replace(/ up to .*$/, "")}, and the trial will stop for futility if it is below ${input.futilityThreshold}: ${runsText}. ` +
          `Computed exactly, the type I error rate is ${fmt(r.alpha!, 4)} at a response rate of ${input.p0} and the power is ${fmt(r.power!, 4)} at ${input.p1}; the probability of early termination is ${fmt(p0.probabilityOfEarlyTermination)} at ${input.p0} and ${fmt(p1.probabilityOfEarlyTermination)} at ${input.p1}, with expected sample sizes ${fmt(p0.expectedSampleSize, 1)} and ${fmt(p1.expectedSampleSize, 1)}.`;
      })();

  return [
    designSection(facts, [
      {
        kind: "table",
        table: {
          id: "stopping-rules",
          caption: posterior ? `Stopping rules, checked ${scheduleText(input)}` : `Futility rules, checked ${scheduleText(input).replace(/ up to .*$/, "")} until patient ${input.maxN - 1}, and the final rule`,
          columns: [
            { key: "rule", label: "Rule" },
            { key: "events", label: event === "toxicity" ? "Toxicities" : "Responses" },
            { key: "from", label: "From patient" },
            { key: "to", label: "To patient" },
          ],
          rows: runRows,
          note: !firstRun
            ? `No interim count stops the trial: the futility threshold is too low to act before patient ${input.maxN}.`
            : r.boundary[0]?.stopAt === null ? `No count stops the trial before patient ${firstRun.fromPatients}.` : undefined,
        },
      },
      {
        kind: "table",
        table: {
          id: "boundary",
          caption: "Boundary at each check",
          columns: [
            { key: "patients", label: "Patients" },
            { key: "stop", label: r.direction === "at-least" ? `Stop if ${event === "toxicity" ? "toxicities" : "responses"} at least` : "Stop if responses at most" },
          ],
          rows: r.boundary.map((c) => [c.patients, c.stopAt]),
          note: "— means no count stops the trial at that check.",
        },
      },
    ]),
    ...(r.search ? [searchSection(input, r.search)] : []),
    {
      id: "operating-characteristics",
      title: "Operating characteristics (exact)",
      blocks: [
        { kind: "table", table: { id: "operating-characteristics", caption: "By true rate", columns: ocColumns, rows: ocRows, note: "Computed by propagating the exact distribution of the event count patient by patient, absorbed at the boundary; no simulation." } },
        {
          kind: "chart",
          chart: {
            id: "stopping-curve",
            title: posterior ? "Probability that the rule stops the trial" : "Probability of declaring the regimen promising",
            xLabel: `True ${event} rate`,
            yLabel: "Probability",
            xDomain: [0, 1],
            yDomain: [0, 1],
            series: [{ name: posterior ? "P(rule stops)" : "P(declared promising)", points: r.curve, style: "line" }],
            markers: posterior ? [{ axis: "x", value: input.limit!, label: `limit ${input.limit}` }] : [{ axis: "x", value: input.p0!, label: `p0 ${input.p0}` }, { axis: "x", value: input.p1!, label: `p1 ${input.p1}` }],
          },
        },
        {
          kind: "chart",
          chart: {
            id: "expected-size",
            title: "Expected number of patients",
            xLabel: `True ${event} rate`,
            yLabel: "Patients",
            xDomain: [0, 1],
            yDomain: [0, input.maxN],
            series: [{ name: "Expected patients", points: r.sizeCurve, style: "line" }],
          },
        },
      ],
    },
    protocolSection(protocol),
  ];
}

function searchSection(input: BayesianMonitoringInput, search: ThresholdSearch): Section {
  return {
    id: "threshold-search",
    title: "Threshold search",
    blocks: [
      {
        kind: "paragraph",
        text: `Every pair of an efficacy threshold θT (0.80 to 0.99 by 0.01) and a futility threshold θL (0.001, 0.005, then 0.01 to 0.20 by 0.01) was evaluated exactly with at most ${input.maxN} patients; thresholds that give the same final rule count once. ${search.feasible} of ${search.evaluated} distinct designs have alpha at most ${input.alpha} at p0 = ${input.p0} and power at least ${input.power} at p1 = ${input.p1}; the one with the smallest expected number of patients at p0 was chosen.`,
      },
      {
        kind: "table",
        table: {
          id: "threshold-search",
          caption: "Best designs meeting the targets",
          columns: [
            { key: "efficacy", label: "θT" },
            { key: "futility", label: "θL" },
            { key: "final", label: "Promising if responses at least" },
            { key: "alpha", label: "Alpha", digits: 4 },
            { key: "power", label: "Power", digits: 4 },
            { key: "pet", label: "P(early stop) at p0", digits: 4 },
            { key: "size", label: "Expected patients at p0", digits: 2 },
          ],
          rows: search.best.map((c) => [c.efficacyThreshold, c.futilityThreshold, c.finalSuccessCount, c.alpha, c.power, c.probabilityOfEarlyTerminationAtP0, c.expectedSizeAtP0]),
        },
      },
    ],
  };
}

export const bayesianMonitoring: Design<BayesianMonitoringInput, BayesianMonitoringResult> = {
  id: "bayesian-monitoring",
  version: 2,
  stage: "monitoring",
  title: "Bayesian monitoring of a single-arm trial",
  summary: "Stopping boundaries a clinic can follow for continuous Bayesian monitoring of toxicity or futility (posterior probability), or for futility by predictive probability, with exact stopping probabilities, expected sizes, alpha and power.",
  input: schema,
  example: {
    rule: "posterior",
    monitor: "toxicity",
    limit: 0.25,
    threshold: 0.9,
    priorA: 0.5,
    priorB: 1.5,
    maxN: 40,
    cohortSize: 1,
    firstCheck: 1,
  },
  compute: computeBayesianMonitoring,
  cost: costBayesianMonitoring,
  question: (input) => input.rule === "posterior"
    ? input.monitor === "response"
      ? `When should a single-arm trial of up to ${input.maxN} patients stop for futility because the response rate is probably below ${input.limit} (posterior probability above ${input.threshold}), and how often will it stop at each true response rate?`
      : `When should a single-arm trial of up to ${input.maxN} patients stop because the toxicity rate is probably above ${input.limit} (posterior probability above ${input.threshold}), and how often will it stop at each true toxicity rate?`
    : `When should a single-arm trial of up to ${input.maxN} patients stop for futility, using the predictive probability of showing a response rate above ${input.p0}, and what are its exact type I error at ${input.p0} and power at ${input.p1}?`,
  document: documentBayesianMonitoring,
  references: [
    { key: "Thall, Simon & Estey 1995", text: "Thall PF, Simon RM, Estey EH. Bayesian sequential monitoring designs for single-arm clinical trials with multiple outcomes. Statistics in Medicine. 1995;14(4):357-379.", doi: "10.1002/sim.4780140404" },
    { key: "Thall & Simon 1994", text: "Thall PF, Simon R. Practical Bayesian guidelines for phase IIB clinical trials. Biometrics. 1994;50(2):337-349." },
    { key: "Lee & Liu 2008", text: "Lee JJ, Liu DD. A predictive probability design for phase II cancer clinical trials. Clinical Trials. 2008;5(2):93-106.", doi: "10.1177/1740774508089279" },
    { key: "Schultz et al. 1973", text: "Schultz JR, Nichol FR, Elfring GL, Weed SD. Multiple-stage procedures for drug screening. Biometrics. 1973;29(2):293-300." },
  ],
  cautions: [
    "The stopping boundary depends on the prior: a prior with a large weight (priorA + priorB) dominates the early checks. State the prior and show the operating characteristics table with the rule.",
    "The exact operating characteristics assume every check is made, on schedule, with the outcomes of all patients treated so far known; patients treated while earlier outcomes are pending, or skipped checks, change them.",
    "A trial stopped by a monitoring rule gives a biased estimate of the rate; do not report the naive proportion as the rate's estimate without saying so.",
  ],
};
