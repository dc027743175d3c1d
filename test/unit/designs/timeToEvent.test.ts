// time-to-event against published values and R base stats fixtures
// (test/fixtures/time-to-event/generate.R).
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { documentChart, documentTable, tableCell } from "../../support/documentBlocks.js";
import { timeToEvent, timeToEventPower } from "../../../src/designs/timeToEvent.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { eventProbability, expectedEventFraction } from "../../../src/stats/eventProbability.js";

const parse = (inputs: Record<string, unknown>) => timeToEvent.input.parse(inputs);
const solve = (inputs: Record<string, unknown>) => timeToEvent.compute(parse(inputs));
const setting = { controlMedianYears: 2, accrualYears: 3, followUpYears: 2 };

describe("time-to-event: published values", () => {
  it("Schoenfeld: hazard ratio 0.75, two-sided 0.05, power 0.80, 1:1 needs 380 events (4(z0.975 + z0.80)²/(ln 0.75)² = 379.4, Schoenfeld 1983 formula)", () => {
    const r = solve({ ...setting, hazardRatio: 0.75 });
    expect(r.events).toBe(380);
    expectClose(r.fixedDesignEvents, 379.35, 0.01, { hazardRatio: 0.75 });
  });
  it("Freedman: the same inputs need 385 events ((z0.975 + z0.80)² (1.75/0.25)² = 384.6, Freedman 1982 formula)", () => {
    expect(solve({ ...setting, hazardRatio: 0.75, method: "freedman" }).events).toBe(385);
  });
  it("medians 2 and 8/3 years give the same hazard ratio 0.75 and 380 events (exponential: θ = m_control/m_experimental)", () => {
    const r = solve({ ...setting, experimentalMedianYears: 8 / 3 });
    expectClose(r.hazardRatio, 0.75, 1e-12, {});
    expect(r.events).toBe(380);
  });
  it("event probability matches Schoenfeld's Simpson-rule approximation 1 − (S(f) + 4S(f + a/2) + S(f + a))/6 (Schoenfeld 1983; from memory of Collett, Modelling Survival Data in Medical Research, sample-size chapter)", () => {
    for (const [median, a, f] of [[2, 3, 2], [1, 1, 1], [5, 2, 3]] as const) {
      const lambda = Math.LN2 / median;
      const S = (t: number): number => Math.exp(-lambda * t);
      const simpson = 1 - (S(f) + 4 * S(f + a / 2) + S(f + a)) / 6;
      // Simpson's rule error on e^{-λt} over the accrual window is below 1e-3 here.
      expectClose(eventProbability({ eventHazard: lambda, lossHazard: 0, accrualYears: a }, f), simpson, 1e-3, { median, a, f });
    }
  });
  it("all participants with an event when follow-up is long: probability tends to 1 (common practice, no source)", () => {
    expectClose(eventProbability({ eventHazard: 2, lossHazard: 0, accrualYears: 1 }, 40), 1, 1e-12, {});
  });
  it("a very short accrual tends to everyone entering at once: probability λ/φ (1 − e^{−φF}) (common practice, no source)", () => {
    const lambda = 0.4;
    const eta = 0.1;
    expectClose(eventProbability({ eventHazard: lambda, lossHazard: eta, accrualYears: 1e-9 }, 2), (lambda / (lambda + eta)) * (1 - Math.exp(-(lambda + eta) * 2)), 1e-9, {});
  });
  it("with loss to follow-up, the event probability tends to λ/(λ + η), the share of competing exits that are events (common practice, no source)", () => {
    expectClose(eventProbability({ eventHazard: 0.3, lossHazard: 0.1, accrualYears: 2 }, 200), 0.75, 1e-12, {});
  });
});

describe("time-to-event: R base stats fixtures", () => {
  it("unrounded Schoenfeld and Freedman events match the formulas in R (qnorm)", () => {
    const f = loadFixture<{ hazardRatio: number; alpha: number; power: number; sides: 1 | 2; allocationRatio: number; schoenfeld: number; freedman: number }>("time-to-event/events.json");
    expect(f.cases.length).toBeGreaterThan(100);
    for (const c of f.cases) {
      const base = { ...setting, hazardRatio: c.hazardRatio, alpha: c.alpha, power: c.power, sides: c.sides, allocationRatio: c.allocationRatio };
      const s = solve(base);
      expectClose(s.fixedDesignEvents, c.schoenfeld, f.tolerance, c, "relative");
      expect(s.events, JSON.stringify(c)).toBe(Math.ceil(c.schoenfeld));
      expect(s.freedmanEvents, JSON.stringify(c)).toBe(Math.ceil(c.freedman));
      expectClose(solve({ ...base, method: "freedman" }).fixedDesignEvents, c.freedman, f.tolerance, c, "relative");
    }
  });
  it("power with a given number of events matches pnorm in R", () => {
    const f = loadFixture<{ events: number; hazardRatio: number; alpha: number; sides: 1 | 2; allocationRatio: number; schoenfeld: number; freedman: number }>("time-to-event/power.json");
    for (const c of f.cases) {
      const base = { ...setting, solveFor: "power", events: c.events, hazardRatio: c.hazardRatio, alpha: c.alpha, sides: c.sides, allocationRatio: c.allocationRatio };
      expectClose(solve(base).power, c.schoenfeld, f.tolerance, c);
      expectClose(solve({ ...base, method: "freedman" }).power, c.freedman, f.tolerance, c);
    }
  });
  it("probability of an event matches the Lachin & Foulkes double integral by R integrate()", () => {
    const f = loadFixture<{ eventHazard: number; lossHazard: number; accrualYears: number; followUpYears: number; probability: number }>("time-to-event/event-probability.json");
    for (const c of f.cases) expectClose(eventProbability(c, c.followUpYears), c.probability, f.tolerance, c);
  });
  it("expected events by calendar time, during and after accrual, match R integrate()", () => {
    const f = loadFixture<{ years: number; eventHazard: number; lossHazard: number; accrualYears: number; fraction: number }>("time-to-event/events-by-time.json");
    for (const c of f.cases) expectClose(expectedEventFraction(c.years, c), c.fraction, f.tolerance, c);
  });
  it("whole designs: events, enrolment per arm and the time of the analysis match R (integrate, uniroot)", () => {
    const f = loadFixture<{ method: string; controlMedianYears: number; hazardRatio: number; accrualYears: number; followUpYears: number; annualLossToFollowUp: number; alpha: number; power: number; sides: 1 | 2; allocationRatio: number; events: number; n1: number; n2: number; eventProbabilityControl: number; eventProbabilityExperimental: number; analysisYears: number }>("time-to-event/designs.json");
    for (const c of f.cases) {
      const { events, n1, n2, eventProbabilityControl, eventProbabilityExperimental, analysisYears, ...inputs } = c;
      const r = solve(inputs);
      expect([r.events, r.n1, r.n2], JSON.stringify(c)).toEqual([events, n1, n2]);
      expectClose(r.eventProbabilityControl, eventProbabilityControl, f.tolerance, c);
      expectClose(r.eventProbabilityExperimental, eventProbabilityExperimental, f.tolerance, c);
      expectClose(r.analysisYears, analysisYears, f.tolerance, c);
    }
  });
});

describe("time-to-event: the printed hazards, event probability, expected events and enrolment (R base stats and the uniform-accrual formula)", () => {
  type Details = {
    method: string; controlMedianYears: number; hazardRatio?: number; experimentalMedianYears?: number; accrualYears: number; followUpYears: number;
    annualLossToFollowUp: number; alpha: number; power: number; sides: 1 | 2; allocationRatio: number; events: number; n1: number; n2: number;
    controlHazard: number; experimentalHazard: number; lossHazard: number; eventProbabilityOverall: number; expectedEventsAtEnd: number;
  };
  const f = loadFixture<Details>("time-to-event/design-details.json");
  const designs = f.cases.map((c) => {
    const { events, n1, n2, controlHazard, experimentalHazard, lossHazard, eventProbabilityOverall, expectedEventsAtEnd, ...inputs } = c;
    return { c, inputs, result: solve(inputs) };
  });

  it("the fixture covers both ways of giving the effect and an experimental arm rounded up past k × n1", () => {
    expect(f.cases.some((c) => c.experimentalMedianYears !== undefined)).toBe(true);
    expect(f.cases.some((c) => c.hazardRatio !== undefined)).toBe(true);
    expect(f.cases.some((c) => c.n2 > c.allocationRatio * c.n1)).toBe(true);
  });
  it("each arm's hazard and the loss hazard match log(2)/median and log(1/(1 − annual loss)) from R", () => {
    for (const { c, result } of designs) {
      expect([result.events, result.n1, result.n2], JSON.stringify(c)).toEqual([c.events, c.n1, c.n2]);
      expectClose(result.controlHazard, c.controlHazard, f.tolerance, c);
      expectClose(result.experimentalHazard, c.experimentalHazard, f.tolerance, c);
      expectClose(result.lossHazard, c.lossHazard, f.tolerance, c);
    }
  });
  it("the overall event probability (P1 + k P2)/(1 + k) and the expected events at the end, n1 P1 + n2 P2, match R integrate()", () => {
    for (const { c, result } of designs) {
      expectClose(result.eventProbabilityOverall, c.eventProbabilityOverall, f.tolerance, c);
      expectClose(result.expectedEventsAtEnd, c.expectedEventsAtEnd, f.tolerance, c, "relative");
    }
  });
  it("the arms table prints those numbers in its total row", () => {
    for (const { c, inputs, result } of designs) {
      const table = documentTable(timeToEvent.document(parse(inputs), result), "arms");
      expect(tableCell(table, "Total", "enrolled"), JSON.stringify(c)).toBe(c.n1 + c.n2);
      expectClose(tableCell(table, "Total", "probability") as number, c.eventProbabilityOverall, f.tolerance, c);
      expectClose(tableCell(table, "Total", "events") as number, c.expectedEventsAtEnd, f.tolerance, c, "relative");
    }
  });
  it("the enrolment chart follows uniform accrual, N × min(1, t/R) (Lachin & Foulkes 1986: entry uniform over the accrual period), with N from R", () => {
    for (const { c, inputs, result } of designs) {
      const points = result.enrolmentOverTime;
      const times = points.map(([t]) => t);
      expect(times[0]).toBe(0);
      expect(times[times.length - 1]).toBe(c.accrualYears + c.followUpYears);
      expect(times).toContain(c.accrualYears);
      for (const [t, enrolled] of points) {
        expectClose(enrolled, (c.n1 + c.n2) * Math.min(1, t / c.accrualYears), 1e-12, { ...c, t }, "relative");
      }
      const chart = documentChart(timeToEvent.document(parse(inputs), result), "events-over-time");
      expect(chart.series.find((s) => s.name === "Enrolled")!.points).toEqual(points);
    }
  });
});

describe("time-to-event: solving for power and for the hazard ratio", () => {
  it("the detectable hazard ratio with the required events has the target power, and inverts the event count", () => {
    const r = solve({ ...setting, solveFor: "hazard-ratio", events: 380 });
    expectClose(r.power, 0.8, 1e-8, {});
    expect(r.hazardRatio).toBeGreaterThan(0.75);
    expect(r.hazardRatio).toBeLessThan(0.751);
  });
  it("power at the required events is at least the target and one event fewer falls short", () => {
    const input = parse({ ...setting, hazardRatio: 0.6, power: 0.9 });
    const r = timeToEvent.compute(input);
    expect(r.power).toBeGreaterThanOrEqual(0.9);
    expect(timeToEventPower(input, r.events - 1, 0.6)).toBeLessThan(0.9);
  });
  it("expected events rise to at least the required count by the end of follow-up; the chart ends there", () => {
    const r = solve(timeToEvent.example as Record<string, unknown>);
    const last = r.eventsOverTime[r.eventsOverTime.length - 1]!;
    expect(last[0]).toBe(r.studyYears);
    expect(last[1]).toBeGreaterThanOrEqual(r.events);
    for (let i = 1; i < r.eventsOverTime.length; i++) expect(r.eventsOverTime[i]![1]).toBeGreaterThanOrEqual(r.eventsOverTime[i - 1]![1]);
    expect(r.analysisYears).toBeLessThanOrEqual(r.studyYears);
  });
  it("the report has the calendar chart, its table, the power curve and a protocol paragraph with the numbers", () => {
    const input = parse(timeToEvent.example as Record<string, unknown>);
    const r = timeToEvent.compute(input);
    const blocks = timeToEvent.document(input, r).flatMap((s) => s.blocks);
    const charts = blocks.flatMap((b) => (b.kind === "chart" ? [b.chart.id] : []));
    expect(charts).toEqual(["events-over-time", "power-curve"]);
    const protocol = blocks.find((b) => b.kind === "protocol");
    expect(protocol && protocol.kind === "protocol" && protocol.text).toContain(`${r.events} events`);
    expect(protocol && protocol.kind === "protocol" && protocol.text).toContain(`${r.total} participants`);
  });
});

describe("time-to-event: bad and infeasible input", () => {
  const issues = (inputs: Record<string, unknown>) => timeToEvent.input.safeParse(inputs).error?.issues.map((i) => i.path.join(".")) ?? [];
  it("refuses an alpha below 1e-6, which made the required events infinite, naming alpha (found by the degenerate-input audit)", () => {
    expect(issues({ ...setting, hazardRatio: 0.7, alpha: 1e-300 })).toEqual(["alpha"]);
    expect(issues({ ...setting, solveFor: "power", hazardRatio: 0.7, events: 2, alpha: 1e-300, sides: 1 })).toEqual(["alpha"]);
    const r = solve({ ...setting, solveFor: "power", hazardRatio: 0.7, events: 2, alpha: 1e-6, sides: 1 });
    expect(Number.isFinite(r.schoenfeldEvents)).toBe(true);
  });
  it("hazard ratio 1, equal medians, non-positive medians and zero accrual are refused with their field", () => {
    expect(issues({ ...setting, hazardRatio: 1 })).toEqual(["hazardRatio"]);
    expect(issues({ ...setting, experimentalMedianYears: 2 })).toEqual(["experimentalMedianYears"]);
    expect(issues({ ...setting, controlMedianYears: 0, hazardRatio: 0.8 })).toContain("controlMedianYears");
    expect(issues({ ...setting, experimentalMedianYears: -1 })).toContain("experimentalMedianYears");
    expect(issues({ ...setting, hazardRatio: 0.8, accrualYears: 0 })).toEqual(["accrualYears"]);
    expect(issues({ ...setting, hazardRatio: 0.8, experimentalMedianYears: 3 })).toEqual(["experimentalMedianYears"]);
    expect(issues({ ...setting, hazardRatio: 1.2, sides: 1 })).toEqual(["hazardRatio"]);
    expect(issues({ ...setting, hazardRatio: 0.8, power: 0.04 })).toEqual(["power"]);
    expect(issues({ ...setting, solveFor: "power", hazardRatio: 0.8 })).toEqual(["events"]);
  });
  it("a hazard ratio too close to 1 exceeds the event bound (422 with the bound)", () => {
    try {
      solve({ ...setting, hazardRatio: 0.99 });
      expect.fail("expected an infeasible design");
    } catch (error) {
      expect(error).toBeInstanceOf(InfeasibleDesignError);
      expect((error as InfeasibleDesignError).details.bound).toBe(200000);
    }
  });
  it("events too rare to be reached within the enrolment bound (422 with the bound)", () => {
    expect(() => solve({ hazardRatio: 0.7, controlMedianYears: 1000, accrualYears: 0.01, followUpYears: 0 })).toThrow(InfeasibleDesignError);
  });
});
