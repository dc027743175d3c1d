// The group-sequential design (src/designs/groupSequential.ts): validation of its
// inputs, the plan against the R fixture and published constants, and the
// observed-looks mode.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { groupSequential } from "../../../src/designs/groupSequential.js";
import { createRandom } from "../../../src/stats/random.js";

const parse = (inputs: Record<string, unknown>) => groupSequential.input.safeParse(inputs);
const pathsOf = (inputs: Record<string, unknown>): string[] => {
  const r = parse(inputs);
  return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
};

describe("group-sequential inputs", () => {
  it("the example parses and defaults give equally spaced fractions", () => {
    expect(parse(groupSequential.example as Record<string, unknown>).success).toBe(true);
    const v = groupSequential.input.parse({ looks: 4 });
    expect(v.informationFractions).toEqual([0.25, 0.5, 0.75, 1]);
  });
  it("refuses fractions that do not increase, do not end at 1, or do not match K", () => {
    expect(pathsOf({ looks: 3, informationFractions: [0.5, 0.4, 1] })).toContain("informationFractions.1");
    expect(pathsOf({ looks: 3, informationFractions: [0.3, 0.6, 0.9] })).toContain("informationFractions.2");
    expect(pathsOf({ looks: 2, informationFractions: [0.3, 0.6, 1] })).toContain("informationFractions");
  });
  it("refuses K above 10 and gamma outside [-10, 10]", () => {
    expect(pathsOf({ looks: 11 })).toContain("looks");
    expect(pathsOf({ efficacyBoundary: "hwang-shih-decani", efficacyGamma: 12 })).toContain("efficacyGamma");
    expect(pathsOf({ futilityBoundary: "hwang-shih-decani", futilityGamma: -11 })).toContain("futilityGamma");
  });
  it("observed-looks mode needs observed fractions and a spending function", () => {
    expect(pathsOf({ mode: "observed-looks" })).toContain("observedFractions");
    expect(pathsOf({ mode: "observed-looks", efficacyBoundary: "pocock", observedFractions: [0.5] })).toContain("efficacyBoundary");
    expect(pathsOf({ mode: "observed-looks", observedFractions: [0.5, 1.1, 1.2] })).toContain("observedFractions.1");
  });
});

describe("group-sequential plan", () => {
  it("two-sided Pocock, K = 5: constant 2.413 and inflation factor 1.207 at power 0.9 (Jennison & Turnbull 2000, Table 2.1, from memory; agreed to ±0.001)", () => {
    const r = groupSequential.compute(groupSequential.input.parse({ looks: 5, efficacyBoundary: "pocock", sides: 2, alpha: 0.05, power: 0.9 }));
    expectClose(r.planned.classicalConstant!, 2.413, 0.0005, { table: "J&T 2.1" });
    expectClose(r.planned.inflationFactor, 1.207, 0.001, { table: "J&T 2.1" });
    // Nominal level 0.0158 at every look (Pocock 1977, Table 1, N = 5; from memory).
    for (const l of r.planned.looks) expectClose(l.efficacyNominalP, 0.0158, 5e-5, { look: l.look });
    const total = r.planned.looks.reduce((s, l) => s + l.alphaSpent, 0);
    expectClose(total, 0.05, 1e-9, { quantity: "alpha spent in all" });
  });
  it("one-sided with futility matches the R fixture's boundaries and drift (R fixture groupSequential/futility-designs.json)", () => {
    const f = loadFixture<{ times: number[]; family: string; gamma: number; futilityFamily: string; futilityGamma: number; alpha: number; beta: number; sides: 1 | 2; upper: number[]; futility: number[]; drift: number }>("groupSequential/futility-designs.json");
    for (const c of f.cases) {
      const r = groupSequential.compute(groupSequential.input.parse({
        looks: c.times.length, informationFractions: c.times, efficacyBoundary: c.family, efficacyGamma: c.gamma,
        futilityBoundary: c.futilityFamily, futilityGamma: c.futilityGamma, alpha: c.alpha, power: 1 - c.beta, sides: c.sides,
      }));
      expectClose(r.planned.drift, c.drift, f.tolerance, { case: c.times, quantity: "drift" });
      r.planned.looks.forEach((l, k) => {
        expectClose(l.efficacyZ, c.upper[k]!, f.tolerance, { case: c.times, look: k + 1 });
        if (l.futilityZ !== null) expectClose(l.futilityZ, c.futility[k]!, f.tolerance, { case: c.times, look: k + 1 });
      });
      expectClose(r.planned.power, 1 - c.beta, 1e-7, { case: c.times, quantity: "power" });
      expect(r.planned.typeIErrorWithFutilityStops).toBeLessThanOrEqual(c.alpha + 1e-9);
      expect(r.planned.expectedInformationAlternative).toBeLessThan(r.planned.inflationFactor);
    }
  });
  it("observed looks at the planned fractions give the planned boundaries (Lan & DeMets 1983: spending depends only on the fractions)", () => {
    const base = { looks: 4, efficacyBoundary: "hwang-shih-decani", efficacyGamma: -3, futilityBoundary: "obrien-fleming-type", sides: 1, alpha: 0.025, power: 0.85 };
    const planned = groupSequential.compute(groupSequential.input.parse(base));
    const same = groupSequential.compute(groupSequential.input.parse({ ...base, mode: "observed-looks", observedFractions: [0.25, 0.5, 0.75, 1] }));
    same.observed!.looks.forEach((l, k) => {
      expectClose(l.efficacyZ, planned.planned.looks[k]!.efficacyZ, 1e-9, { look: k + 1 });
      expectClose(l.futilityZ ?? NaN, planned.planned.looks[k]!.futilityZ ?? NaN, 1e-6, { look: k + 1 });
    });
    expectClose(same.observed!.power, 0.85, 1e-6, { quantity: "power as run" });
  });
  it("a later interim and an early final analysis: the final look spends all the alpha left", () => {
    const base = { looks: 3, efficacyBoundary: "obrien-fleming-type", sides: 2, alpha: 0.05, power: 0.9 };
    const r = groupSequential.compute(groupSequential.input.parse({ ...base, mode: "observed-looks", observedFractions: [0.4, 0.9], lastObservedIsFinal: true }));
    const o = r.observed!;
    expectClose(o.looks[1]!.cumulativeAlphaSpent, 0.05, 1e-9, { quantity: "alpha spent by the final" });
    // Both tails spend 2(1 − Φ(Φ⁻¹(0.9875)/√0.4)) each at t = 0.4 (Lan & DeMets 1983);
    // Φ(Φ⁻¹(0.9875)/√0.4) = 0.9998029241 by R 4.2 stats::pnorm/qnorm.
    expectClose(o.looks[0]!.alphaSpent, 2 * 2 * (1 - 0.9998029241), 1e-9, { look: 1 });
    expect(o.power).toBeLessThan(0.9);
  });
  it("the report has decision rules, exit probabilities, a chart and a protocol paragraph naming non-binding futility", () => {
    const input = groupSequential.input.parse(groupSequential.example);
    const sections = groupSequential.document(input, groupSequential.compute(input));
    const kinds = sections.flatMap((s) => s.blocks.map((b) => b.kind));
    expect(kinds).toEqual(expect.arrayContaining(["facts", "table", "chart", "protocol"]));
    const protocol = sections.find((s) => s.id === "protocol")!.blocks[0] as { text: string };
    expect(protocol.text).toMatch(/non-binding/);
    expect(JSON.stringify(groupSequential.compute(input))).not.toMatch(/null,null|NaN|Infinity/);
  });
  it("expected information and exit probabilities agree with simulated Brownian motion (seeded Monte Carlo, within 4 standard errors)", () => {
    // Z_k = W(t_k)/√t_k, increments N(η Δt, Δt) (Jennison & Turnbull 2000, section 3.1);
    // each path stops at the first boundary crossed, futility included.
    const input = groupSequential.input.parse({ ...groupSequential.example, sides: 2, alpha: 0.05 });
    const p = groupSequential.compute(input).planned;
    for (const [drift, expected, label] of [[0, p.expectedInformationNull, "null"], [p.drift, p.expectedInformationAlternative, "alternative"]] as const) {
      const rng = createRandom(label === "null" ? 11 : 12);
      const paths = 100_000;
      let sum = 0;
      let sumSq = 0;
      let rejected = 0;
      for (let i = 0; i < paths; i++) {
        let w = 0;
        let s = 0;
        let stop = 1;
        for (const look of p.looks) {
          const t = look.informationFraction;
          w += drift * (t - s) + Math.sqrt(t - s) * rng.normal();
          s = t;
          const z = w / Math.sqrt(t);
          if (Math.abs(z) >= look.efficacyZ) { rejected++; stop = t; break; }
          if (look.futilityZ !== null && z < look.futilityZ) { stop = t; break; }
        }
        sum += stop;
        sumSq += stop * stop;
      }
      const mean = sum / paths;
      const se = Math.sqrt((sumSq / paths - mean * mean) / paths);
      expectClose(mean * p.inflationFactor, expected, 4 * se * p.inflationFactor, { hypothesis: label });
      const rejection = label === "null" ? p.typeIErrorWithFutilityStops : p.power;
      expectClose(rejected / paths, rejection, 4 * Math.sqrt((rejection * (1 - rejection)) / paths), { hypothesis: label, quantity: "rejection" });
    }
  });
});

describe("group-sequential: precision at the edges (found by the compute-budget audit)", () => {
  it("keeps the power as run within [0, 1] when the looks' exits, each carrying the recursion's error, sum past 1", () => {
    // A final look at 1.5 times the information planned for power 0.9999 has power above 0.9999 and at most 1
    // (definition); before the fix the two looks' exits summed to 1.00000005.
    const r = groupSequential.compute(groupSequential.input.parse({
      mode: "observed-looks", looks: 2, efficacyBoundary: "hwang-shih-decani", efficacyGamma: -10,
      futilityBoundary: "obrien-fleming-type", futilityGamma: 1, sides: 1, alpha: 0.001, power: 0.9999,
      observedFractions: [0.5, 1.5], lastObservedIsFinal: true,
    }));
    expect(r.observed!.power).toBeLessThanOrEqual(1);
    expect(r.observed!.power).toBeGreaterThan(0.9999);
  });
});
