// The interim-looks option in two-proportions and time-to-event: the maximum is
// the fixed-design size (or events) times the inflation factor, and leaving the
// option out changes nothing.
import { describe, expect, it } from "vitest";
import { expectClose } from "../../support/fixtures.js";
import { twoProportions } from "../../../src/designs/twoProportions.js";
import { timeToEvent } from "../../../src/designs/timeToEvent.js";

describe("interim looks in two-proportions", () => {
  const base = { p1: 0.35, p2: 0.55, method: "normal", alpha: 0.05, power: 0.8, sides: 2 };
  it("O'Brien-Fleming, K = 3: each arm is ⌈1.017 × n⌉ (R_B(3, 0.05, 0.2) = 1.017 from memory of Jennison & Turnbull 2000, Table 2.3)", () => {
    const fixed = twoProportions.compute(twoProportions.input.parse(base));
    const r = twoProportions.compute(twoProportions.input.parse({ ...base, interimLooks: { looks: 3, efficacyBoundary: "obrien-fleming" } }));
    expect("interimLooks" in fixed).toBe(false);
    expect({ n1: r.n1, n2: r.n2 }).toEqual({ n1: fixed.n1, n2: fixed.n2 });
    expectClose(r.interimLooks!.inflationFactor, 1.017, 0.001, { table: "J&T 2.3" });
    expect(r.interimLooks!.maximumArms).toEqual({ n1: Math.ceil(fixed.n1 * r.interimLooks!.inflationFactor - 1e-9), n2: Math.ceil(fixed.n2 * r.interimLooks!.inflationFactor - 1e-9) });
    const ids = twoProportions.document(twoProportions.input.parse({ ...base, interimLooks: { looks: 3 } }), r).map((s) => s.id);
    expect(ids).toContain("interim-looks");
  });
  it("refuses interim looks with Fisher's exact test, whose boundaries would not be on the Z scale", () => {
    const r = twoProportions.input.safeParse({ ...base, method: "fisher-exact", interimLooks: { looks: 2 } });
    expect(r.success ? [] : r.error.issues.map((i) => i.path.join("."))).toContain("interimLooks");
  });
});

describe("interim looks in time-to-event", () => {
  const base = { hazardRatio: 0.7, controlMedianYears: 1.5, accrualYears: 2.5, followUpYears: 1.5, alpha: 0.05, power: 0.8, sides: 2, method: "schoenfeld" };
  it("Pocock, K = 4: 247 fixed-design events (4(1.960 + 0.842)²/(ln 0.7)², Schoenfeld 1983) become ⌈1.202 × 247⌉ (R_P(4, 0.05, 0.2) = 1.202 from memory of Jennison & Turnbull 2000, Table 2.1)", () => {
    const fixed = timeToEvent.compute(timeToEvent.input.parse(base));
    expect(fixed.events).toBe(247);
    expect("interimLooks" in fixed).toBe(false);
    const input = timeToEvent.input.parse({ ...base, interimLooks: { looks: 4, efficacyBoundary: "pocock" } });
    const r = timeToEvent.compute(input);
    expect(r.events).toBe(247);
    expectClose(r.interimLooks!.inflationFactor, 1.202, 0.001, { table: "J&T 2.1" });
    expect(r.interimLooks!.maximumTotal).toBe(Math.ceil(247 * r.interimLooks!.inflationFactor - 1e-9));
    expect(r.interimLooks!.looks.map((l) => l.cumulative).at(-1)).toBe(r.interimLooks!.maximumTotal);
    expect(r.interimEnrolment!.n1).toBeGreaterThan(r.n1);
    const protocol = timeToEvent.document(input, r).find((s) => s.id === "protocol")!.blocks[0] as { text: string };
    expect(protocol.text).toContain(`final analysis after ${r.interimLooks!.maximumTotal}`);
  });
  it("refuses interim looks when solving for power", () => {
    const r = timeToEvent.input.safeParse({ ...base, solveFor: "power", events: 200, interimLooks: { looks: 2 } });
    expect(r.success ? [] : r.error.issues.map((i) => i.path.join("."))).toContain("interimLooks");
  });
});
