/**
 * Time to event: two arms compared by the log-rank test.
 *
 * Methods:
 * - Required events, Schoenfeld (1983): D = (z_{1-α/s} + z_{1-β})² / (p1 p2 (ln θ)²),
 *   p1 = 1/(1+k), p2 = k/(1+k) the allocation fractions.
 * - Required events, Freedman (1982): D = (z_{1-α/s} + z_{1-β})² (1 + kθ)² / (k (1 − θ)²),
 *   Freedman's (1 + θ)²/(1 − θ)² with the events split k : 1 in proportion to n × hazard.
 * - Enrolment, Lachin & Foulkes (1986): exponential survival in each arm
 *   (λ = ln 2 / median), uniform accrual over R years, a further F years of
 *   follow-up after accrual ends, and exponential loss to follow-up with hazard η
 *   in both arms. Each arm's probability of an observed event P_i is the kernel in
 *   src/stats/eventProbability.ts; the control arm needs n1 = ⌈D / (P1 + k P2)⌉
 *   and the experimental arm n2 = ⌈k n1⌉, so the expected events reach D at R + F.
 *
 * Conventions:
 * - θ is the hazard ratio experimental / control; θ < 1 favours the experimental
 *   arm. With medians, θ = median_control / median_experimental (exponential).
 * - k = allocationRatio = n2/n1. sides = 2 splits α between the tails.
 * - Power is the normal approximation of each method, counting the rejection in
 *   the direction of the assumed effect only (the opposite tail of a two-sided
 *   test adds less than α/2 and is the one the formulas leave out), so that the
 *   event count is the formula rounded up and its power is at least the target.
 * - Loss to follow-up is given as the fraction lost per year, η = −ln(1 − fraction);
 *   it replaces the dropout inflation of other designs (lost participants
 *   contribute follow-up until lost, which a flat dropout would not credit).
 * - Calendar time starts when the first participant enters.
 * - The event count is planned as ⌈fixed-design events × inflation⌉ with inflation 1
 *   here, so a group-sequential plan can reuse planEnrolment and expectedEventsAt
 *   for each look.
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { normalCdf, normalQuantile } from "../stats/normal.js";
import { findRoot } from "../stats/rootFinding.js";
import { type AccrualModel, enrolledFraction, eventProbability, expectedEventFraction } from "../stats/eventProbability.js";
import { type ArmSizes, armsFromControl, curveSizes, detectableEffect } from "./shared/sizing.js";
import { designSection } from "./shared/reportSections.js";
import { closingSections } from "./shared/comparativeSections.js";
import { checkComparativeCommon, comparativeCommonFields } from "./shared/fields.js";
import { withInterimLooks } from "./shared/groupSequentialCost.js";
import {
  type InterimLooksResult, interimLooksField, planInterimLooks, refineInterimTest,
} from "./shared/interimLooks.js";

const MAX_EVENTS = 200000;
const MAX_ENROLLED = 1000000;
/** Hazard ratios searched when solving for the detectable effect. */
const SMALLEST_HAZARD_RATIO = 0.01;
const FIXED_DESIGN_INFLATION = 1;

const { alpha, power, sides, allocationRatio } = comparativeCommonFields;

const schema = z
  .strictObject({
    solveFor: z.enum(["sample-size", "power", "hazard-ratio"]).default("sample-size")
      .meta({ title: "What to work out" })
      .describe("What to compute: the events and enrolment for a target power, the power given a number of events, or the smallest hazard ratio detectable with a number of events."),
    method: z.enum(["schoenfeld", "freedman"]).default("schoenfeld")
      .describe("Formula for the required number of events: Schoenfeld (1983), from the log hazard ratio, or Freedman (1982), from the expected share of events per arm under the alternative."),
    hazardRatio: z.number().gt(0, "The hazard ratio must be a positive number (below 1 when the experimental arm lowers the hazard).").max(100).optional()
      .describe("Expected hazard ratio, experimental over control; below 1 favours the experimental arm. Give this or the experimental-arm median."),
    controlMedianYears: z.number().gt(0, "The control-arm median time to event must be a positive number of years.").max(1000)
      .describe("Median time to event in the control arm, in years (exponential survival); sets the control-arm hazard ln 2 / median."),
    experimentalMedianYears: z.number().gt(0, "The experimental-arm median time to event must be a positive number of years.").max(1000).optional()
      .describe("Median time to event in the experimental arm, in years; with exponential survival the hazard ratio is the control median over this one. Give this or the hazard ratio."),
    accrualYears: z.number().gt(0, "Recruitment must last some time: give the accrual period in years, greater than 0.").max(50)
      .describe("Length of the recruitment period in years; participants are assumed to enter at a uniform rate."),
    followUpYears: z.number().min(0, "Additional follow-up cannot be negative; give 0 if the analysis is at the end of recruitment.").max(50).default(0)
      .describe("Further follow-up after the last participant enters, in years; the analysis is at accrual plus follow-up."),
    annualLossToFollowUp: z.number().min(0, "Loss to follow-up cannot be negative; give 0 for none.").max(0.9, "More than 90% lost per year leaves no trial to analyse.").default(0)
      .describe("Fraction of participants lost to follow-up per year (0.05 is 5% a year), the same in both arms; modelled as an exponential loss hazard."),
    alpha,
    power,
    sides,
    allocationRatio,
    events: z.number().int().min(2).max(MAX_EVENTS).optional()
      .describe("Number of events at the analysis, when solving for power or for the hazard ratio."),
    interimLooks: interimLooksField,
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    if (v.solveFor !== "hazard-ratio") {
      if (v.hazardRatio === undefined && v.experimentalMedianYears === undefined) {
        issue("hazardRatio", "Give the hazard ratio you expect, or the median time to event in the experimental arm.");
      }
      if (v.hazardRatio !== undefined && v.experimentalMedianYears !== undefined) {
        issue("experimentalMedianYears", "Give either the hazard ratio or the experimental-arm median, not both: with exponential survival each determines the other.");
      }
      const theta = v.hazardRatio ?? (v.experimentalMedianYears !== undefined && v.experimentalMedianYears > 0 ? v.controlMedianYears / v.experimentalMedianYears : undefined);
      const field = v.hazardRatio !== undefined ? "hazardRatio" : "experimentalMedianYears";
      if (theta !== undefined && theta > 0 && Number.isFinite(theta)) {
        if (Math.abs(Math.log(theta)) < 1e-9) {
          issue(field, v.hazardRatio !== undefined
            ? "A hazard ratio of 1 means the arms do not differ: there is no effect to detect. Enter the hazard ratio you expect (below 1 if the experimental arm lowers the hazard)."
            : "Equal medians mean the arms do not differ: there is no effect to detect. Enter the median you expect in the experimental arm.");
        } else if (v.sides === 1 && theta > 1) {
          issue(field, "A one-sided test looks for benefit: the experimental arm must lower the hazard (hazard ratio below 1, longer median). For harm, use a two-sided test.");
        }
      }
    } else if (v.hazardRatio !== undefined || v.experimentalMedianYears !== undefined) {
      issue(v.hazardRatio !== undefined ? "hazardRatio" : "experimentalMedianYears", "When solving for the detectable hazard ratio, leave the hazard ratio and the experimental-arm median out.");
    }
    if (v.solveFor !== "sample-size" && v.events === undefined) issue("events", "Give the number of events expected at the analysis when solving for power or for the hazard ratio.");
    checkComparativeCommon({ ...v, hypothesis: "superiority" }, ctx);
    if (v.interimLooks !== undefined) {
      if (v.solveFor !== "sample-size") issue("interimLooks", "Interim looks are planned with the events: set solveFor to sample-size, or leave interimLooks out.");
      refineInterimTest(v.alpha, v.power, issue);
    }
  })
  .transform((v) => ({ ...v, sides: v.sides ?? 2 }));

export type TimeToEventInput = z.output<typeof schema>;

export interface ArmHazards {
  control: number;
  experimental: number;
  loss: number;
}

/** Enrolment and calendar for a given event count: what a group-sequential look also needs. */
export interface EnrolmentPlan {
  events: number;
  n1: number;
  n2: number;
  eventProbabilityControl: number;
  eventProbabilityExperimental: number;
  /** Expected events at the end of the study (accrual + follow-up), at least `events`. */
  expectedEventsAtEnd: number;
  studyYears: number;
  /** Calendar time at which `events` events are expected. */
  analysisYears: number;
}

export interface TimeToEventResult {
  method: "schoenfeld" | "freedman";
  hazardRatio: number;
  controlHazard: number;
  experimentalHazard: number;
  lossHazard: number;
  controlMedianYears: number;
  experimentalMedianYears: number;
  /** The method's event count before rounding (or the given events). */
  fixedDesignEvents: number;
  /** Events required by each formula, rounded up, for the same inputs. */
  schoenfeldEvents: number;
  freedmanEvents: number;
  events: number;
  power: number;
  n1: number;
  n2: number;
  total: number;
  eventProbabilityControl: number;
  eventProbabilityExperimental: number;
  eventProbabilityOverall: number;
  expectedEventsAtEnd: number;
  studyYears: number;
  analysisYears: number;
  /** [years, expected events] over calendar time, both arms together. */
  eventsOverTime: Array<[number, number]>;
  /** [years, participants enrolled]. */
  enrolmentOverTime: Array<[number, number]>;
  /** [events, power]. */
  powerCurve: Array<[number, number]>;
  /** Only when interimLooks is given: the group-sequential maximum events, looks and boundaries. */
  interimLooks?: InterimLooksResult;
  /** Enrolment and calendar for the group-sequential maximum events. */
  interimEnrolment?: EnrolmentPlan;
}

const zCritical = (input: Pick<TimeToEventInput, "alpha" | "sides">): number => normalQuantile(1 - input.alpha / input.sides);

/** The standardized effect per √event of each method: power = Φ(√D · drift − z_crit). */
function driftPerRootEvent(method: TimeToEventInput["method"], hazardRatio: number, k: number): number {
  if (method === "schoenfeld") return Math.sqrt(k) / (1 + k) * Math.abs(Math.log(hazardRatio));
  return Math.sqrt(k) * Math.abs(1 - hazardRatio) / (1 + k * hazardRatio);
}

/** Events before rounding for the target power (Schoenfeld 1983 or Freedman 1982). */
export function requiredEvents(input: TimeToEventInput, method: TimeToEventInput["method"], hazardRatio: number): number {
  const z = zCritical(input) + normalQuantile(input.power);
  return (z / driftPerRootEvent(method, hazardRatio, input.allocationRatio)) ** 2;
}

/** Power of the log-rank test with `events` events, by the method's normal approximation. */
export function timeToEventPower(input: TimeToEventInput, events: number, hazardRatio: number): number {
  return normalCdf(Math.sqrt(events) * driftPerRootEvent(input.method, hazardRatio, input.allocationRatio) - zCritical(input));
}

/** Events to plan: the fixed-design count times an inflation factor (1 for a fixed design), rounded up. */
export function plannedEvents(fixedDesignEvents: number, inflation: number): number {
  return Math.ceil(fixedDesignEvents * inflation - 1e-9);
}

export function armHazards(input: TimeToEventInput, hazardRatio: number): ArmHazards {
  const control = Math.LN2 / input.controlMedianYears;
  return { control, experimental: control * hazardRatio, loss: -Math.log(1 - input.annualLossToFollowUp) };
}

const accrualModel = (input: TimeToEventInput, eventHazard: number, lossHazard: number): AccrualModel => ({
  eventHazard, lossHazard, accrualYears: input.accrualYears,
});

/** Expected events in both arms together at calendar time `years`. */
export function expectedEventsAt(input: TimeToEventInput, hazards: ArmHazards, arms: ArmSizes, years: number): number {
  return arms.n1 * expectedEventFraction(years, accrualModel(input, hazards.control, hazards.loss)) +
    arms.n2 * expectedEventFraction(years, accrualModel(input, hazards.experimental, hazards.loss));
}

/** Calendar time at which `events` events are expected; the arms must reach them by the end of the study. */
export function yearsToReach(input: TimeToEventInput, hazards: ArmHazards, arms: ArmSizes, events: number): number {
  const end = input.accrualYears + input.followUpYears;
  const gap = (s: number): number => expectedEventsAt(input, hazards, arms, s) - events;
  if (gap(end) <= 0) return end;
  return findRoot(gap, 0, end, { tolerance: 1e-9 });
}

/** Enrolment per arm so that `events` events are expected by the end of the study (Lachin & Foulkes 1986). */
export function planEnrolment(input: TimeToEventInput, hazards: ArmHazards, events: number): EnrolmentPlan {
  const studyYears = input.accrualYears + input.followUpYears;
  const p1 = eventProbability(accrualModel(input, hazards.control, hazards.loss), input.followUpYears);
  const p2 = eventProbability(accrualModel(input, hazards.experimental, hazards.loss), input.followUpYears);
  const k = input.allocationRatio;
  const control = events / (p1 + k * p2);
  if (!(control * (1 + k) <= MAX_ENROLLED)) {
    throw new InfeasibleDesignError(
      `Reaching ${events} events needs about ${Math.ceil(control * (1 + k))} participants, more than the bound of ${MAX_ENROLLED}: only ${(100 * (p1 + k * p2) / (1 + k)).toFixed(2)}% of participants are expected to have an event by the analysis. Lengthen accrual or follow-up.`,
      { bound: MAX_ENROLLED, field: "followUpYears", eventProbabilityControl: p1, eventProbabilityExperimental: p2 },
    );
  }
  const arms = armsFromControl(Math.max(1, Math.ceil(control - 1e-9)), k);
  return {
    events,
    n1: arms.n1,
    n2: arms.n2,
    eventProbabilityControl: p1,
    eventProbabilityExperimental: p2,
    expectedEventsAtEnd: arms.n1 * p1 + arms.n2 * p2,
    studyYears,
    analysisYears: yearsToReach(input, hazards, arms, events),
  };
}

function effectiveHazardRatio(input: TimeToEventInput): number {
  if (input.hazardRatio !== undefined) return input.hazardRatio;
  return input.controlMedianYears / input.experimentalMedianYears!;
}

/** The smallest benefit (hazard ratio below 1) detected with the target power from `events` events. */
function detectableHazardRatio(input: TimeToEventInput, events: number): number {
  const powerAtLogEffect = (e: number): number => timeToEventPower(input, events, Math.exp(-e));
  const largest = -Math.log(SMALLEST_HAZARD_RATIO);
  if (powerAtLogEffect(largest) < input.power) {
    throw new InfeasibleDesignError(
      `With ${events} events not even a hazard ratio of ${SMALLEST_HAZARD_RATIO} is detected with power ${input.power}; more events are needed.`,
      { bound: SMALLEST_HAZARD_RATIO, field: "events" },
    );
  }
  return Math.exp(-detectableEffect(powerAtLogEffect, input.power, 1e-12, largest, "events"));
}

/** Calendar times for the chart: a fine grid with accrual end and the analysis included. */
function calendarGrid(studyYears: number, extra: number[], points = 49): number[] {
  const times = new Set<number>(extra.map((t) => Number(t.toPrecision(12))));
  for (let i = 0; i < points; i++) times.add(Number(((studyYears * i) / (points - 1)).toPrecision(12)));
  return [...times].sort((a, b) => a - b);
}

/**
 * CPU of the fixed design: closed forms for the events and enrolment, one root
 * search for the calendar time of the analysis, a 49-point calendar and a
 * 25-point power curve. The time-to-event cases of `npm run bench designs`
 * took under 0.3 ms; 1 ms is taken.
 */
const FIXED_DESIGN_MS = 1;

/**
 * The work before computing: the fixed design, and the interim looks'
 * boundaries when asked for (groupSequentialCost.ts), which are all of it that
 * grows. Well within the budget for any admitted input, so no input is refused.
 */
export function costTimeToEvent(input: TimeToEventInput): WorkEstimate {
  return withInterimLooks([{ count: 1, msEach: FIXED_DESIGN_MS, what: "fixed design (closed forms, a calendar-time root and the curves)" }], input.interimLooks);
}

export function computeTimeToEvent(input: TimeToEventInput): TimeToEventResult {
  let hazardRatio: number;
  let fixedDesignEvents: number;
  if (input.solveFor === "hazard-ratio") {
    fixedDesignEvents = input.events!;
    hazardRatio = detectableHazardRatio(input, fixedDesignEvents);
  } else {
    hazardRatio = effectiveHazardRatio(input);
    fixedDesignEvents = input.solveFor === "power" ? input.events! : requiredEvents(input, input.method, hazardRatio);
  }
  const events = plannedEvents(fixedDesignEvents, FIXED_DESIGN_INFLATION);
  if (events > MAX_EVENTS) {
    throw new InfeasibleDesignError(
      `A hazard ratio of ${hazardRatio} needs ${events} events, more than the bound of ${MAX_EVENTS}; the effect is too close to no difference to detect in one trial.`,
      { bound: MAX_EVENTS, field: input.hazardRatio !== undefined ? "hazardRatio" : "experimentalMedianYears", events },
    );
  }
  const hazards = armHazards(input, hazardRatio);
  const plan = planEnrolment(input, hazards, events);
  const arms = { n1: plan.n1, n2: plan.n2 };
  const k = input.allocationRatio;
  const times = calendarGrid(plan.studyYears, [input.accrualYears, plan.analysisYears]);
  const eventsAt = (required: number): number => Math.ceil(required - 1e-9);
  return {
    method: input.method,
    hazardRatio,
    controlHazard: hazards.control,
    experimentalHazard: hazards.experimental,
    lossHazard: hazards.loss,
    controlMedianYears: input.controlMedianYears,
    experimentalMedianYears: input.controlMedianYears / hazardRatio,
    fixedDesignEvents,
    schoenfeldEvents: eventsAt(requiredEvents(input, "schoenfeld", hazardRatio)),
    freedmanEvents: eventsAt(requiredEvents(input, "freedman", hazardRatio)),
    events,
    power: timeToEventPower(input, events, hazardRatio),
    n1: plan.n1,
    n2: plan.n2,
    total: plan.n1 + plan.n2,
    eventProbabilityControl: plan.eventProbabilityControl,
    eventProbabilityExperimental: plan.eventProbabilityExperimental,
    eventProbabilityOverall: (plan.eventProbabilityControl + k * plan.eventProbabilityExperimental) / (1 + k),
    expectedEventsAtEnd: plan.expectedEventsAtEnd,
    studyYears: plan.studyYears,
    analysisYears: plan.analysisYears,
    eventsOverTime: times.map((t) => [t, expectedEventsAt(input, hazards, arms, t)]),
    enrolmentOverTime: times.map((t) => [t, (plan.n1 + plan.n2) * enrolledFraction(t, input.accrualYears)]),
    powerCurve: curveSizes(events, 2).map((d) => [d, timeToEventPower(input, d, hazardRatio)]),
    ...(input.interimLooks ? interimPlan(input, input.interimLooks, hazards, events) : {}),
  };
}

/** The group-sequential maximum from the fixed-design events, and the enrolment that reaches it. */
function interimPlan(input: TimeToEventInput, options: NonNullable<TimeToEventInput["interimLooks"]>, hazards: ArmHazards, events: number): Pick<TimeToEventResult, "interimLooks" | "interimEnrolment"> {
  const interimLooks = planInterimLooks(options, { alpha: input.alpha, power: input.power, sides: input.sides }, { unit: "events", total: events });
  if (interimLooks.maximumTotal > MAX_EVENTS) {
    throw new InfeasibleDesignError(`With interim looks the trial needs ${interimLooks.maximumTotal} events, more than the bound of ${MAX_EVENTS}.`, { bound: MAX_EVENTS, field: "interimLooks", events: interimLooks.maximumTotal });
  }
  return { interimLooks, interimEnrolment: planEnrolment(input, hazards, interimLooks.maximumTotal) };
}

const fmt = (x: number, d = 3): string => x.toFixed(d);
const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;
const methodCitation = (m: TimeToEventInput["method"]): string => (m === "schoenfeld" ? "Schoenfeld 1983" : "Freedman 1982");
const years = (x: number): string => `${x} year${x === 1 ? "" : "s"}`;

/** A step between table rows that gives at most about 20 rows. */
function tableStep(studyYears: number): number {
  for (const step of [0.1, 0.25, 0.5, 1, 2, 5, 10]) if (studyYears / step <= 20) return step;
  return 10;
}

function calendarRows(input: TimeToEventInput, r: TimeToEventResult): Array<Array<number | string>> {
  const hazards: ArmHazards = { control: r.controlHazard, experimental: r.experimentalHazard, loss: r.lossHazard };
  const arms = { n1: r.n1, n2: r.n2 };
  const control = accrualModel(input, hazards.control, hazards.loss);
  const experimental = accrualModel(input, hazards.experimental, hazards.loss);
  const step = tableStep(r.studyYears);
  const marks = new Map<number, string>();
  for (let i = 0; i * step <= r.studyYears + 1e-9; i++) marks.set(Number((i * step).toPrecision(12)), "");
  const note = (t: number, label: string): void => {
    const key = Number(t.toPrecision(12));
    marks.set(key, marks.get(key) ? `${marks.get(key)}; ${label}` : label);
  };
  note(input.accrualYears, "accrual ends");
  note(r.analysisYears, `${r.events} events expected`);
  note(r.studyYears, "end of follow-up");
  return [...marks.entries()].sort((a, b) => a[0] - b[0]).map(([t, label]) => {
    const e1 = r.n1 * expectedEventFraction(t, control);
    const e2 = r.n2 * expectedEventFraction(t, experimental);
    return [t, (r.n1 + r.n2) * enrolledFraction(t, input.accrualYears), e1, e2, expectedEventsAt(input, hazards, arms, t), label];
  });
}

function describeTest(input: TimeToEventInput): string {
  return input.sides === 2 ? `a two-sided log-rank test at level α = ${input.alpha}` : `a one-sided log-rank test at level α = ${input.alpha}`;
}

function documentTimeToEvent(input: TimeToEventInput, r: TimeToEventResult): Section[] {
  const loss = input.annualLossToFollowUp > 0 ? `, ${pct(input.annualLossToFollowUp)} of participants lost to follow-up per year` : ", no loss to follow-up";
  const assumptions = `exponential times to event with a median of ${input.controlMedianYears} years in the control arm and ${fmt(r.experimentalMedianYears, 2)} years in the experimental arm (hazard ratio ${fmt(r.hazardRatio, 3)}), uniform accrual over ${years(input.accrualYears)} with ${years(input.followUpYears)} of further follow-up${loss}`;
  const allocation = input.allocationRatio === 1 ? "1:1 allocation" : `allocation 1:${input.allocationRatio} (control:experimental)`;
  const enrolment = `Under ${assumptions}, the probability of an observed event is ${fmt(r.eventProbabilityControl, 3)} in the control arm and ${fmt(r.eventProbabilityExperimental, 3)} in the experimental arm (Lachin & Foulkes 1986), so ${r.total} participants will be enrolled (${r.n1} control, ${r.n2} experimental) and the ${r.events} events are expected about ${fmt(r.analysisYears, 1)} years after the first participant enters.`;
  const protocol = input.solveFor === "sample-size"
    ? `The primary analysis is ${describeTest(input)} with ${allocation}. To detect a hazard ratio of ${fmt(r.hazardRatio, 3)} with ${pct(input.power, 0)} power, ${r.events} events are required (${methodCitation(input.method)}); the achieved power is ${pct(r.power)}. ${enrolment}`
    : input.solveFor === "power"
      ? `The primary analysis is ${describeTest(input)} with ${allocation}. With ${r.events} events, the power to detect a hazard ratio of ${fmt(r.hazardRatio, 3)} is ${pct(r.power)} (${methodCitation(input.method)}). ${enrolment}`
      : `The primary analysis is ${describeTest(input)} with ${allocation}. With ${r.events} events, the smallest hazard ratio detectable with ${pct(input.power, 0)} power is ${fmt(r.hazardRatio, 3)} (${methodCitation(input.method)}). ${enrolment}`;
  const other = input.method === "schoenfeld" ? { label: "Events by Freedman 1982", value: r.freedmanEvents } : { label: "Events by Schoenfeld 1983", value: r.schoenfeldEvents };
  return [
    designSection([
      { label: "Events required", value: r.events, key: true, note: methodCitation(input.method) },
      { label: "Control arm to enrol (n1)", value: r.n1, key: true },
      { label: "Experimental arm to enrol (n2)", value: r.n2, key: true },
      { label: "Total to enrol", value: r.total, key: true },
      { label: "Power", value: r.power, digits: 4, key: true },
      { label: "Events expected at", value: r.analysisYears, digits: 2, unit: "years", key: true, note: "after the first participant enters" },
      { label: "Hazard ratio", value: r.hazardRatio, digits: 4 },
      { label: other.label, value: other.value, note: "for comparison; not used" },
      { label: "Probability of an event, control", value: r.eventProbabilityControl, digits: 4 },
      { label: "Probability of an event, experimental", value: r.eventProbabilityExperimental, digits: 4 },
      { label: "Study duration", value: r.studyYears, digits: 2, unit: "years", note: "accrual plus follow-up" },
    ], [
      {
        kind: "table",
        table: {
          id: "arms",
          caption: "Participants and expected events per arm at the end of follow-up",
          columns: [
            { key: "arm", label: "Arm" },
            { key: "median", label: "Median time to event", digits: 2, unit: "years" },
            { key: "probability", label: "Probability of an event", digits: 4 },
            { key: "enrolled", label: "To enrol" },
            { key: "events", label: "Expected events", digits: 1 },
          ],
          rows: [
            ["Control", input.controlMedianYears, r.eventProbabilityControl, r.n1, r.n1 * r.eventProbabilityControl],
            ["Experimental", r.experimentalMedianYears, r.eventProbabilityExperimental, r.n2, r.n2 * r.eventProbabilityExperimental],
            ["Total", null, r.eventProbabilityOverall, r.total, r.expectedEventsAtEnd],
          ],
        },
      },
    ]),
    {
      id: "calendar",
      title: "When the analysis will happen",
      blocks: [
        {
          kind: "chart",
          chart: {
            id: "events-over-time",
            title: "Participants enrolled and expected events against calendar time",
            xLabel: "Years since the first participant entered",
            yLabel: "Participants or events",
            series: [
              { name: "Enrolled", points: r.enrolmentOverTime, style: "line" },
              { name: "Expected events", points: r.eventsOverTime, style: "line" },
            ],
            markers: [
              { axis: "y", value: r.events, label: `${r.events} events` },
              { axis: "x", value: input.accrualYears, label: "accrual ends" },
              { axis: "x", value: r.analysisYears, label: `analysis ≈ ${fmt(r.analysisYears, 2)} y` },
            ],
          },
        },
        {
          kind: "table",
          table: {
            id: "events-over-time",
            caption: "Expected enrolment and events by calendar time",
            columns: [
              { key: "years", label: "Years", digits: 2 },
              { key: "enrolled", label: "Enrolled", digits: 0 },
              { key: "controlEvents", label: "Events, control", digits: 1 },
              { key: "experimentalEvents", label: "Events, experimental", digits: 1 },
              { key: "events", label: "Events, total", digits: 1 },
              { key: "milestone", label: "Milestone" },
            ],
            rows: calendarRows(input, r),
            note: "Expected values under the assumed medians, uniform accrual and exponential loss to follow-up; observed event counts will vary around them.",
          },
        },
      ],
    },
    {
      id: "operating-characteristics",
      title: "Power against the number of events",
      blocks: [
        {
          kind: "chart",
          chart: {
            id: "power-curve",
            title: `Power against events (hazard ratio ${fmt(r.hazardRatio, 3)})`,
            xLabel: "Events",
            yLabel: "Power",
            yDomain: [0, 1],
            series: [{ name: "Power", points: r.powerCurve, style: "line" }],
            markers: [
              { axis: "y", value: input.power, label: `target ${input.power}` },
              { axis: "x", value: r.events, label: `${r.events} events` },
            ],
          },
        },
        {
          kind: "table",
          table: {
            id: "power-curve",
            caption: "Power at other numbers of events",
            columns: [
              { key: "events", label: "Events" },
              { key: "power", label: "Power", digits: 4 },
            ],
            rows: r.powerCurve.map(([d, p]) => [d, p]),
          },
        },
      ],
    },
    ...closingSections(input.interimLooks, input.sides, r.interimLooks, protocol, r.interimEnrolment
      ? ` To reach the maximum events, ${r.interimEnrolment.n1 + r.interimEnrolment.n2} participants are enrolled (${r.interimEnrolment.n1} control, ${r.interimEnrolment.n2} experimental), the final analysis expected about ${fmt(r.interimEnrolment.analysisYears, 1)} years after the first participant enters.`
      : ""),
  ];
}

export const timeToEvent: Design<TimeToEventInput, TimeToEventResult> = {
  id: "time-to-event",
  version: 2,
  stage: "comparative",
  title: "Time to event (log-rank test)",
  summary: "Events and enrolment for comparing time to event between two arms by the log-rank test, from a hazard ratio or medians, with uniform accrual, follow-up and loss to follow-up, and when the analysis is expected.",
  input: schema,
  example: {
    solveFor: "sample-size",
    method: "schoenfeld",
    controlMedianYears: 1.5,
    experimentalMedianYears: 2.1,
    accrualYears: 2.5,
    followUpYears: 1.5,
    annualLossToFollowUp: 0.05,
    alpha: 0.05,
    power: 0.85,
    sides: 2,
    allocationRatio: 1,
  },
  compute: computeTimeToEvent,
  cost: costTimeToEvent,
  question: (input) => {
    const effect = input.hazardRatio !== undefined
      ? `a hazard ratio of ${input.hazardRatio}`
      : `an increase in median time to event from ${input.controlMedianYears} to ${input.experimentalMedianYears} years`;
    const setting = `with ${years(input.accrualYears)} of accrual and ${years(input.followUpYears)} of further follow-up, ${input.sides === 2 ? "two-sided" : "one-sided"} α = ${input.alpha}`;
    switch (input.solveFor) {
      case "sample-size":
        return `How many events, and how many participants per arm, are needed to detect ${effect} with ${input.power * 100}% power, ${setting}, and when will the events have happened?`;
      case "power":
        return `What power do ${input.events} events give to detect ${effect}, ${setting}?`;
      case "hazard-ratio":
        return `What is the smallest hazard ratio that ${input.events} events detect with ${input.power * 100}% power, when the control-arm median is ${input.controlMedianYears} years, ${setting}?`;
    }
  },
  document: documentTimeToEvent,
  references: [
    { key: "Schoenfeld 1983", text: "Schoenfeld DA. Sample-size formula for the proportional-hazards regression model. Biometrics. 1983;39(2):499-503.", doi: "10.2307/2531021" },
    { key: "Freedman 1982", text: "Freedman LS. Tables of the number of patients required in clinical trials using the logrank test. Statistics in Medicine. 1982;1(2):121-129.", doi: "10.1002/sim.4780010204" },
    { key: "Lachin & Foulkes 1986", text: "Lachin JM, Foulkes MA. Evaluation of sample size and power for analyses of survival with allowance for nonuniform patient entry, losses to follow-up, noncompliance, and stratification. Biometrics. 1986;42(3):507-519.", doi: "10.2307/2531201" },
  ],
  cautions: [
    "The event count comes from the hazard ratio alone, assuming proportional hazards; if the hazards are not proportional (a delayed effect, crossing curves) the log-rank test loses power and the count is too small.",
    "Enrolment and timing assume exponential times to event, a uniform accrual rate and exponential loss to follow-up; a slower start to recruitment or a lower event rate than assumed delays the analysis. Plan the analysis on the number of events, not on the calendar.",
  ],
};
