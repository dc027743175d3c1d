// The interim-looks option (src/designs/shared/interimLooks.ts) as wired into
// two-means: maximum size = fixed size × inflation factor, per-look sizes, and no
// change at all when the option is absent.
import { describe, expect, it } from "vitest";
import { expectClose } from "../../support/fixtures.js";
import { twoMeans } from "../../../src/designs/twoMeans.js";
import { planInterimLooks } from "../../../src/designs/shared/interimLooks.js";
import { interimLooksField } from "../../../src/designs/shared/interimLooks.js";

const base = { delta: 0.5, sd: 1, alpha: 0.05, power: 0.9, method: "normal" };

describe("interim looks in two-means", () => {
  it("classical O'Brien-Fleming, K = 5: 85 per arm fixed becomes ⌈1.026 × 85⌉ = 88 (fixed n: 2(1.960 + 1.282)²/0.5² = 84.06, common practice; R_B = 1.026 from memory of Jennison & Turnbull 2000, Table 2.3)", () => {
    const r = twoMeans.compute(twoMeans.input.parse({ ...base, interimLooks: { looks: 5, efficacyBoundary: "obrien-fleming" } }));
    expect(r.n1).toBe(85);
    expectClose(r.interimLooks!.inflationFactor, 1.026, 0.001, { table: "J&T 2.3" });
    expect(r.interimLooks!.maximumArms).toEqual({ n1: 88, n2: 88 });
    expect(r.interimLooks!.looks.map((l) => l.cumulative)).toEqual([36, 71, 106, 141, 176]);
    expectClose(r.interimLooks!.looks[4]!.efficacyZ, 2.040, 0.0005, { table: "J&T 2.3 C_B(5)" });
  });
  it("leaving the option out changes nothing: no interimLooks key, Cohen's 64 per group (Cohen 1988, Table 2.4.1)", () => {
    const plain = twoMeans.compute(twoMeans.input.parse({ delta: 0.5, sd: 1, alpha: 0.05, power: 0.8 }));
    expect(plain.n1).toBe(64);
    expect("interimLooks" in plain).toBe(false);
    // Version 2 is the two-sided power kept within [0, 1] (degenerate-input audit), 3 the detectable difference
    // resolved in standard errors and 4 the better-conditioned equivalence quadrature; the option itself bumped nothing.
    expect(twoMeans.version).toBe(4);
  });
  it("refuses interim looks when not solving for the sample size, or for equivalence", () => {
    const r1 = twoMeans.input.safeParse({ ...base, solveFor: "power", n1: 50, n2: 50, interimLooks: { looks: 2 } });
    expect(r1.success ? [] : r1.error.issues.map((i) => i.path.join("."))).toContain("interimLooks");
    const r2 = twoMeans.input.safeParse({ delta: 0, sd: 1, hypothesis: "equivalence", margin: 1, sides: 1, interimLooks: { looks: 2 } });
    expect(r2.success ? [] : r2.error.issues.map((i) => i.path.join("."))).toContain("interimLooks");
  });
  it("events: the maximum is ⌈IF × events⌉ and the last look is at the maximum", () => {
    const options = interimLooksField.parse({ looks: 4, efficacyBoundary: "pocock" })!;
    const r = planInterimLooks(options, { alpha: 0.05, power: 0.8, sides: 2 }, { unit: "events", total: 200 });
    // R_P(4, 0.05, 0.2) = 1.202 from memory of Jennison & Turnbull (2000), Table 2.1.
    expectClose(r.inflationFactor, 1.202, 0.001, { table: "J&T 2.1" });
    expect(r.maximumTotal).toBe(Math.ceil(200 * r.inflationFactor));
    expect(r.looks.map((l) => l.cumulative)).toEqual([0.25, 0.5, 0.75, 1].map((t) => Math.ceil(t * r.maximumTotal - 1e-9)));
    expect(r.maximumArms).toBeNull();
  });
  it("the report gains an interim-analyses section and the protocol names each look's size", () => {
    const input = twoMeans.input.parse({ ...base, dropout: 0.1, interimLooks: { looks: 3, futilityBoundary: "obrien-fleming-type" } });
    const r = twoMeans.compute(input);
    const sections = twoMeans.document(input, r);
    expect(sections.map((s) => s.id)).toContain("interim-looks");
    const protocol = sections.find((s) => s.id === "protocol")!.blocks[0] as { text: string };
    expect(protocol.text).toContain(`after ${r.interimLooks!.looks[0]!.cumulative}, ${r.interimLooks!.looks[1]!.cumulative} participants`);
    expect(r.interimLooks!.maximumEnrolled).toBe(2 * Math.ceil(r.interimLooks!.maximumArms!.n1 / 0.9 - 1e-9));
  });
});
