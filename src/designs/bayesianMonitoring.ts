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
 * probabilities of declaring promise when the true rate is p0 and p1.
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
import { type Design, InfeasibleDesignError } from "./design.js";
import type { Cell, Section } from "../report/document.js";
import { betaCdf, betaSurvival } from "../stats/beta.js";
import { betaBinomialPmfArray } from "../stats/betaBinomial.js";
import { type CheckRegion, sequentialBinomial } from "../stats/sequentialBinomial.js";

export const MAX_PATIENTS = 300;
const MAX_RATES = 30;
/** How far to look for the smallest maxN that would make a rule able to act. */
const SEARCH_LIMIT = 100000;

const rateMessage = "A rate must be strictly between 0 and 1.";
const rate = (description: string) => z.number().gt(0, rateMessage).lt(1, rateMessage).describe(description);
const probability = (description: string) =>
  z.number().gt(0, "A probability threshold must be strictly between 0 and 1.").lt(1, "A probability threshold must be strictly between 0 and 1.").describe(description);

const POSTERIOR_ONLY = ["monitor", "limit", "threshold"] as const;
const PREDICTIVE_ONLY = ["p0", "p1", "efficacyThreshold", "futilityThreshold"] as const;

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
    efficacyThreshold: probability("Predictive rule: at the end the regimen is promising when P(response rate > p0 | data) exceeds this (0.9 by default).").optional(),
    futilityThreshold: probability("Predictive rule: stop for futility when the predictive probability of a promising final result is below this (0.05 by default).").optional(),
    priorA: z.number().gt(0).max(1000).default(1)
      .describe("Beta prior for the event rate: first shape a (prior events). a / (a + b) is the prior mean; a + b its weight in patients."),
    priorB: z.number().gt(0).max(1000).default(1)
      .describe("Beta prior for the event rate: second shape b (prior non-events)."),
    maxN: z.number().int().min(2).max(MAX_PATIENTS, `At most ${MAX_PATIENTS} patients can be monitored here.`)
      .describe(`Maximum number of patients (2 to ${MAX_PATIENTS}).`),
    cohortSize: z.number().int().min(1).max(50).default(1)
      .describe("Patients between checks: 1 checks after every patient."),
    firstCheck: z.number().int().min(1).max(MAX_PATIENTS).optional()
      .describe("Number of patients at the first check (defaults to the cohort size)."),
    trueRates: z.array(rate("A true event rate.")).min(1).max(MAX_RATES, `At most ${MAX_RATES} true rates.`).optional()
      .describe("True event rates at which to tabulate the operating characteristics (a grid from 0.05 to 0.95 by default, with the limit, or p0 and p1, added)."),
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
      : { efficacyThreshold: v.efficacyThreshold ?? 0.9, futilityThreshold: v.futilityThreshold ?? 0.05 }),
  }));

export type BayesianMonitoringInput = z.output<typeof schema>;

export interface BoundaryCheck {
  patients: number;
  /** Toxicity: stop if events ≥ this. Response or predictive: stop if events ≤ this. null: no count stops here. */
  stopAt: number | null;
}

/** Consecutive checks sharing one stopping count: "stop if at least (or at most) events among the first fromPatients..toPatients". */
export interface BoundaryRun {
  events: number;
  fromPatients: number;
  toPatients: number;
}

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
  alpha: number | null;
  power: number | null;
  operatingCharacteristics: RateCharacteristics[];
  /** [true rate, probability of stopping] (posterior) or [true rate, probability promising] (predictive). */
  curve: Array<[number, number]>;
  sizeCurve: Array<[number, number]>;
}

/** Check sizes: firstCheck, then every cohortSize, up to maxN. */
export function checkSchedule(firstCheck: number, cohortSize: number, maxN: number, includeMaxN: boolean): number[] {
  const out: number[] = [];
  for (let n = firstCheck; n < maxN; n += cohortSize) out.push(n);
  if (includeMaxN) out.push(maxN);
  return out;
}

const posteriorBeyond = (input: BayesianMonitoringInput, x: number, n: number): number =>
  input.monitor === "response"
    ? betaCdf(input.limit!, input.priorA + x, input.priorB + n - x)
    : betaSurvival(input.limit!, input.priorA + x, input.priorB + n - x);

/** The posterior rule's boundary: the count at which P(beyond limit) first exceeds the threshold, per check. */
export function posteriorBoundary(input: BayesianMonitoringInput): BoundaryCheck[] {
  const t = input.threshold!;
  const stops = (x: number, n: number): boolean => posteriorBeyond(input, x, n) > t;
  const schedule = checkSchedule(input.firstCheck, input.cohortSize, input.maxN, true);
  const out: BoundaryCheck[] = [];
  // Both boundaries are non-decreasing in n (more patients need more events to
  // alarm, and allow more responses to be too few), so each scan resumes.
  let k = 0;
  for (const n of schedule) {
    if (input.monitor === "response") {
      if (!stops(0, n)) { out.push({ patients: n, stopAt: null }); continue; }
      while (k + 1 <= n && stops(k + 1, n)) k++;
      out.push({ patients: n, stopAt: k });
    } else {
      while (k <= n && !stops(k, n)) k++;
      out.push({ patients: n, stopAt: k <= n ? k : null });
    }
  }
  return out;
}

/** The smallest n in 1..SEARCH_LIMIT at which `acts(n)` holds, or null. */
function smallestSize(acts: (n: number) => boolean): number | null {
  for (let n = 1; n <= SEARCH_LIMIT; n++) if (acts(n)) return n;
  return null;
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
    const needed = smallestSize((n) => posteriorBeyond(input, input.monitor === "response" ? 0 : n, n) > input.threshold!);
    const where = needed === null ? `no number of patients up to ${SEARCH_LIMIT}` : `at least ${needed} patients`;
    throw new InfeasibleDesignError(
      `The rule can never stop within ${input.maxN} patients: even the most unfavourable outcomes keep the posterior probability beyond the limit at or below ${input.threshold}. It needs ${where}${needed !== null && needed > MAX_PATIENTS ? ` (above the limit of ${MAX_PATIENTS})` : ""}, a lower threshold, or a weaker prior.`,
      { field: "maxN", ...(needed !== null ? { bound: needed } : {}), maxN: input.maxN },
    );
  }
}

/** Smallest response count among maxN with P(p > p0 | x, maxN) > efficacyThreshold, or null. */
export function finalSuccessCount(input: BayesianMonitoringInput, maxN = input.maxN): number | null {
  for (let x = 0; x <= maxN; x++) {
    if (betaSurvival(input.p0!, input.priorA + x, input.priorB + maxN - x) > input.efficacyThreshold!) return x;
  }
  return null;
}

/** PP(x, n) = P(at least s - x responses among the maxN - n still to come | x of n). */
export function predictiveProbability(input: BayesianMonitoringInput, s: number, x: number, n: number): number {
  const m = input.maxN - n;
  const need = s - x;
  if (need <= 0) return 1;
  if (need > m) return 0;
  const pmf = betaBinomialPmfArray(m, input.priorA + x, input.priorB + n - x);
  let sum = 0;
  for (let y = need; y <= m; y++) sum += pmf[y]!;
  return Math.min(1, sum);
}

/** The predictive rule's futility boundary: the largest count with PP below the threshold, per interim check. */
export function predictiveBoundary(input: BayesianMonitoringInput, s: number): BoundaryCheck[] {
  return checkSchedule(input.firstCheck, input.cohortSize, input.maxN, false).map((n) => {
    // PP increases with x (the beta-binomial is stochastically increasing in its first shape).
    let x = 0;
    while (x <= n && predictiveProbability(input, s, x, n) < input.futilityThreshold!) x++;
    return { patients: n, stopAt: x > 0 ? x - 1 : null };
  });
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
      `The rule stops for futility at the first check (${first.patients} patients) whatever the outcomes: even ${first.patients} responses give a predictive probability below ${input.futilityThreshold}. Lower the futility threshold, check later, or raise maxN.`,
      { field: "futilityThreshold", firstCheck: first.patients },
    );
  }
}

function runsOf(boundary: BoundaryCheck[]): BoundaryRun[] {
  const runs: BoundaryRun[] = [];
  for (const c of boundary) {
    if (c.stopAt === null) continue;
    const last = runs[runs.length - 1];
    if (last && last.events === c.stopAt) last.toPatients = c.patients;
    else runs.push({ events: c.stopAt, fromPatients: c.patients, toPatients: c.patients });
  }
  return runs;
}

function rateGrid(input: BayesianMonitoringInput): number[] {
  const base = input.trueRates ?? [
    ...Array.from({ length: 19 }, (_, i) => (i + 1) / 20),
    ...(input.rule === "posterior" ? [input.limit!] : [input.p0!, input.p1!]),
  ];
  return [...new Set(base)].sort((a, b) => a - b);
}

const CURVE_RATES = Array.from({ length: 99 }, (_, i) => (i + 1) / 100);

export function computeBayesianMonitoring(input: BayesianMonitoringInput): BayesianMonitoringResult {
  const maxN = input.maxN;
  let boundary: BoundaryCheck[];
  let s: number | null = null;
  let direction: "at-least" | "at-most";
  if (input.rule === "posterior") {
    boundary = posteriorBoundary(input);
    checkPosteriorFeasible(input, boundary);
    direction = input.monitor === "response" ? "at-most" : "at-least";
  } else {
    s = finalSuccessCount(input);
    boundary = s === null || s === 0 ? [] : predictiveBoundary(input, s);
    checkPredictiveFeasible(input, s, boundary);
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
  return {
    rule: input.rule,
    direction,
    boundary,
    runs: runsOf(boundary),
    finalSuccessCount: s,
    alpha: s === null ? null : characteristics(input.p0!).probabilityPromising,
    power: s === null ? null : characteristics(input.p1!).probabilityPromising,
    operatingCharacteristics: rateGrid(input).map(characteristics),
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

function documentBayesianMonitoring(input: BayesianMonitoringInput, r: BayesianMonitoringResult): Section[] {
  const posterior = r.rule === "posterior";
  const event = posterior && input.monitor !== "response" ? "toxicity" : "response";
  const prior = `Beta(${input.priorA}, ${input.priorB})`;
  const ruleText = posterior
    ? input.monitor === "response"
      ? `stop for futility when P(response rate < ${input.limit} | data) > ${input.threshold}`
      : `stop when P(toxicity rate > ${input.limit} | data) > ${input.threshold}`
    : `stop for futility when the predictive probability of a promising final result is below ${input.futilityThreshold}`;
  const firstRun = r.runs[0]!;
  const at = (rate: number): RateCharacteristics => r.operatingCharacteristics.find((c) => c.rate === rate) ?? computeAt(input, rate);

  const facts = posterior
    ? (() => {
        const l = at(input.limit!);
        return [
          { label: "Rule", value: ruleText, key: true },
          { label: "Earliest possible stop", value: countText(firstRun.events, firstRun.fromPatients, r.direction, event), key: true },
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

  const runsText = r.runs.map((run) => runSentence(run, r.direction, event).replace(/^After/, "after")).join("; ");
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
    {
      id: "design",
      title: "Design",
      blocks: [
        { kind: "facts", facts },
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
            note: r.boundary[0]!.stopAt === null ? `No count stops the trial before patient ${firstRun.fromPatients}.` : undefined,
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
      ],
    },
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
    { id: "protocol", title: "Statistical paragraph for the protocol", blocks: [{ kind: "protocol", text: protocol }] },
  ];
}

/** Operating characteristics at one rate not in the stored grid (user-chosen grids may omit the limit). */
function computeAt(input: BayesianMonitoringInput, trueRate: number): RateCharacteristics {
  return computeBayesianMonitoring({ ...input, trueRates: [trueRate] }).operatingCharacteristics[0]!;
}

export const bayesianMonitoring: Design<BayesianMonitoringInput, BayesianMonitoringResult> = {
  id: "bayesian-monitoring",
  version: 1,
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
