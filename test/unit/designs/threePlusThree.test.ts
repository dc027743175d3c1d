// The 3+3 design: exact enumeration against an R enumeration written from the
// rules, against the closed-form probability of clearing a dose, and against a
// seeded simulation of the same rules.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { type MtdRule, threePlusThree, threePlusThreeOperatingCharacteristics } from "../../../src/designs/threePlusThree.js";
import { createRandom, type RandomSource } from "../../../src/stats/random.js";

interface EnumerationCase {
  probabilities: number[];
  mtdRule: MtdRule;
  selection: number[];
  none: number;
  expectedPatients: number[];
  expectedDlts: number[];
  expectedTotalPatients: number;
  expectedTotalDlts: number;
}

describe("3+3 exact operating characteristics", () => {
  it("match the R enumeration of the rules (test/fixtures/three-plus-three/generate.R, R 4.2 dbinom)", () => {
    const f = loadFixture<EnumerationCase>("three-plus-three/enumeration.json");
    expect(f.cases.length).toBe(16);
    for (const c of f.cases) {
      const oc = threePlusThreeOperatingCharacteristics(c.probabilities, c.mtdRule);
      const inputs = { probabilities: c.probabilities, mtdRule: c.mtdRule };
      c.selection.forEach((p, i) => expectClose(oc.selectionProbability[i]!, p, f.tolerance, { ...inputs, selection: i }));
      expectClose(oc.noDoseProbability, c.none, f.tolerance, { ...inputs, none: true });
      c.expectedPatients.forEach((n, i) => expectClose(oc.expectedPatients[i]!, n, f.tolerance * 10, { ...inputs, patients: i }));
      c.expectedDlts.forEach((n, i) => expectClose(oc.expectedDlts[i]!, n, f.tolerance * 10, { ...inputs, dlts: i }));
      expectClose(oc.expectedTotalPatients, c.expectedTotalPatients, f.tolerance * 10, inputs);
      expectClose(oc.expectedTotalDlts, c.expectedTotalDlts, f.tolerance * 10, inputs);
    }
  });

  it("clear a dose with probability (1-p)^3 + 3p(1-p)^2 (1-p)^3 (common practice, no source)", () => {
    const probabilities = [0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.7];
    const formula = (p: number): number => (1 - p) ** 3 + 3 * p * (1 - p) ** 2 * (1 - p) ** 3;
    for (const rule of ["next-lower-dose", "next-lower-dose-with-six"] as const) {
      const oc = threePlusThreeOperatingCharacteristics(probabilities, rule);
      let reach = 1;
      probabilities.forEach((p, i) => {
        expectClose(oc.escalationProbability[i]!, formula(p), 1e-14, { p });
        // Reaching dose i+1 needs every dose below it cleared, whatever the MTD rule.
        expectClose(oc.treatedProbability[i]!, reach, 1e-14, { dose: i, rule });
        reach *= formula(p);
      });
    }
  });

  it("under the next-lower-dose rule, select dose i with probability (cleared 1..i) × (not cleared i+1) (common practice, no source)", () => {
    const probabilities = [0.1, 0.15, 0.3, 0.45];
    const e = probabilities.map((p) => (1 - p) ** 3 + 3 * p * (1 - p) ** 5);
    const oc = threePlusThreeOperatingCharacteristics(probabilities, "next-lower-dose");
    expectClose(oc.noDoseProbability, 1 - e[0]!, 1e-14, { none: true });
    let reach = 1;
    for (let i = 0; i < probabilities.length; i++) {
      reach *= e[i]!;
      const expected = i + 1 < probabilities.length ? reach * (1 - e[i + 1]!) : reach;
      expectClose(oc.selectionProbability[i]!, expected, 1e-14, { dose: i });
    }
  });

  it("give the escalation probabilities 0.91, 0.71, 0.49, 0.31, 0.17 at p = 0.1 to 0.5 (from memory of the usual 3+3 escalation table, e.g. Storer 1989)", () => {
    const oc = threePlusThreeOperatingCharacteristics([0.1, 0.2, 0.3, 0.4, 0.5]);
    [0.91, 0.71, 0.49, 0.31, 0.17].forEach((v, i) => expectClose(oc.escalationProbability[i]!, v, 0.005, { p: (i + 1) / 10 }));
  });

  it("are a probability distribution with consistent totals (common practice, no source)", () => {
    const oc = threePlusThreeOperatingCharacteristics([0.02, 0.05, 0.1, 0.2, 0.3, 0.45, 0.6], "next-lower-dose-with-six");
    const total = oc.selectionProbability.reduce((a, b) => a + b, 0) + oc.noDoseProbability;
    expectClose(total, 1, 1e-13, { sum: "selection" });
    expectClose(oc.sampleSizeDistribution.reduce((a, [, p]) => a + p, 0), 1, 1e-13, { sum: "sizes" });
    expectClose(oc.sampleSizeDistribution.reduce((a, [n, p]) => a + n * p, 0), oc.expectedTotalPatients, 1e-12, { mean: "sizes" });
    for (const [n] of oc.sampleSizeDistribution) expect(n % 3).toBe(0);
  });
});

/** The rules as a clinic runs them, patient by patient; written apart from the enumeration. */
function simulateTrial(p: readonly number[], rule: MtdRule, random: RandomSource): { selected: number; patients: number } {
  const k = p.length;
  const n = new Array<number>(k).fill(0);
  const x = new Array<number>(k).fill(0);
  const treat = (d: number): void => {
    for (let j = 0; j < 3; j++) { n[d]!++; if (random.bernoulli(p[d]!)) x[d]!++; }
  };
  const total = (): number => n.reduce((a, b) => a + b, 0);
  const settleBelow = (d: number): number => {
    for (let j = d - 1; j >= 0; j--) {
      if (rule === "next-lower-dose" || n[j]! >= 6) return j;
      treat(j);
      if (x[j]! <= 1) return j;
    }
    return -1;
  };
  let d = 0;
  for (;;) {
    treat(d);
    if (x[d] === 1 && n[d] === 3) treat(d);
    if (x[d]! >= 2) return { selected: settleBelow(d), patients: total() };
    if (d === k - 1) {
      if (rule === "next-lower-dose-with-six" && n[d] === 3) {
        treat(d);
        if (x[d]! >= 2) return { selected: settleBelow(d), patients: total() };
      }
      return { selected: d, patients: total() };
    }
    d++;
  }
}

describe("3+3 exact selection against a seeded simulation of the same rules", () => {
  const trials = 20000;
  for (const [probabilities, rule, seed] of [
    [[0.05, 0.1, 0.2, 0.33, 0.5], "next-lower-dose", 417],
    [[0.1, 0.25, 0.4], "next-lower-dose-with-six", 2026],
    [[0.08, 0.12, 0.5, 0.2], "next-lower-dose-with-six", 99],
  ] as const) {
    it(`${rule} at ${probabilities.join(", ")} (seed ${seed}, ${trials} trials, within 4.5 standard errors)`, () => {
      const random = createRandom(seed);
      const counts = new Array<number>(probabilities.length + 1).fill(0);
      let patients = 0;
      let patientsSquared = 0;
      for (let t = 0; t < trials; t++) {
        const r = simulateTrial(probabilities, rule, random);
        counts[r.selected + 1]!++;
        patients += r.patients;
        patientsSquared += r.patients ** 2;
      }
      const oc = threePlusThreeOperatingCharacteristics(probabilities, rule);
      const exact = [oc.noDoseProbability, ...oc.selectionProbability];
      exact.forEach((p, i) => {
        const se = Math.sqrt((p * (1 - p)) / trials);
        expectClose(counts[i]! / trials, p, 4.5 * se + 1e-9, { rule, dose: i - 1, seed });
      });
      const mean = patients / trials;
      const sd = Math.sqrt(patientsSquared / trials - mean ** 2);
      expectClose(mean, oc.expectedTotalPatients, 4.5 * sd / Math.sqrt(trials), { rule, expectedPatients: true, seed });
    });
  }
});

describe("3+3 inputs", () => {
  const parse = (v: unknown) => threePlusThree.input.safeParse(v);
  const paths = (v: unknown): string[] => {
    const r = parse(v);
    return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
  };
  it("the example parses and computes to finite JSON", () => {
    const input = threePlusThree.input.parse(threePlusThree.example);
    const result = threePlusThree.compute(input);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
    expect(threePlusThree.document(input, result).length).toBeGreaterThan(0);
  });
  it("names the field of each bad input", () => {
    expect(paths({ doses: ["a", "b"], dltProbabilities: [0.1] })).toEqual(["dltProbabilities"]);
    expect(paths({ doses: ["a", "b"], dltProbabilities: [0.1, 1] })).toEqual(["dltProbabilities.1"]);
    expect(paths({ doses: ["a", "b"], dltProbabilities: [0, 0.2] })).toEqual(["dltProbabilities.0"]);
    expect(paths({ doses: ["a", "a"], dltProbabilities: [0.1, 0.2] })).toEqual(["doses.1"]);
    const thirteen = Array.from({ length: 13 }, (_, i) => `d${i}`);
    expect(paths({ doses: thirteen, dltProbabilities: thirteen.map(() => 0.1) })).toEqual(["doses", "dltProbabilities"]);
    expect(paths({ doses: ["a"], dltProbabilities: [0.1], mtdRule: "other" })).toEqual(["mtdRule"]);
  });
});
