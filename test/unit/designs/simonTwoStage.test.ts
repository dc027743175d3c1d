// Simon's two-stage design: the search against Simon (1989) tables 1-2 (from
// memory), exact characteristics and a brute-force search from
// test/fixtures/activity/generate.R (R 4.2 stats::dbinom, pbinom), and a seeded
// Monte Carlo of the same rule.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { InfeasibleDesignError } from "../../../src/designs/design.js";
import { simonTwoStage } from "../../../src/designs/simonTwoStage.js";
import { searchCanSucceed, searchSimon, surelyFindsDesign } from "../../../src/designs/shared/simonSearch.js";
import { evaluateTwoStage, summarizeTwoStage, type TwoStageRule } from "../../../src/designs/shared/twoStage.js";
import { createRandom } from "../../../src/stats/random.js";
import { budgetCases } from "../../support/budgetCases/index.js";

const parse = (inputs: Record<string, unknown>) => simonTwoStage.input.parse(inputs);

/** The details of the InfeasibleDesignError that computing these inputs must throw. */
function infeasibleDetails(inputs: Record<string, unknown>): Record<string, unknown> {
  try {
    simonTwoStage.compute(parse(inputs));
  } catch (e) {
    expect(e).toBeInstanceOf(InfeasibleDesignError);
    return (e as InfeasibleDesignError).details;
  }
  return expect.fail("expected InfeasibleDesignError");
}
const rule = (d: TwoStageRule): [number, number, number, number] => [d.r1, d.n1, d.r, d.n];

describe("Simon (1989) tables 1 and 2, alpha 0.05 (from memory of the tables)", () => {
  // [p0, p1, power, optimal r1/n1 r/n, minimax r1/n1 r/n]
  const recalled: Array<[number, number, number, number[], number[]]> = [
    [0.1, 0.3, 0.8, [1, 10, 5, 29], [1, 15, 5, 25]],
    [0.2, 0.4, 0.8, [3, 13, 12, 43], [4, 18, 10, 33]],
    [0.05, 0.25, 0.8, [0, 9, 2, 17], [0, 12, 2, 16]],
    [0.1, 0.3, 0.9, [2, 18, 6, 35], [2, 22, 6, 33]],
    [0.2, 0.4, 0.9, [4, 19, 15, 54], [5, 24, 13, 45]],
    [0.3, 0.5, 0.8, [5, 15, 18, 46], [6, 19, 16, 39]],
  ];
  for (const [p0, p1, power, optimal, minimax] of recalled) {
    it(`p0 ${p0}, p1 ${p1}, power ${power}: optimal ${optimal.join("/")}, minimax ${minimax.join("/")}`, () => {
      const result = simonTwoStage.compute(parse({ p0, p1, alpha: 0.05, power, maxN: 100 }));
      expect(rule(result.optimal!)).toEqual(optimal);
      expect(rule(result.minimax!)).toEqual(minimax);
    });
  }

  it("p0 0.05, p1 0.25, power 0.9: optimal 0/9, then 3/30 with E(N | p0) 16.8 (from memory of table 1)", () => {
    const result = simonTwoStage.compute(parse({ p0: 0.05, p1: 0.25, alpha: 0.05, power: 0.9, maxN: 60 }));
    expect(rule(result.optimal!)).toEqual([0, 9, 3, 30]);
    expect(result.optimal!.expectedSampleSize0.toFixed(1)).toBe("16.8");
  });

  it("p0 0.1, p1 0.3, power 0.8: the optimal design has E(N | p0) 15.0 and PET 0.74 (from memory of table 1)", () => {
    const result = simonTwoStage.compute(parse({ p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8, maxN: 60 }));
    expect(result.optimal!.expectedSampleSize0.toFixed(1)).toBe("15.0");
    expect(result.optimal!.probabilityOfEarlyTermination0.toFixed(2)).toBe("0.74");
  });
});

describe("Simon (1989) tables 1 and 2, alpha 0.10, power 0.9 (from memory of the tables)", () => {
  const recalled: Array<[number, number, number[], number[], string, string]> = [
    [0.4, 0.6, [7, 18, 22, 46], [11, 28, 20, 41], "30.2", "33.8"],
    [0.1, 0.3, [1, 12, 5, 35], [1, 16, 4, 25], "19.8", "20.4"],
  ];
  for (const [p0, p1, optimal, minimax, en0Optimal, en0Minimax] of recalled) {
    it(`p0 ${p0}, p1 ${p1}: optimal ${optimal.join("/")} (E(N | p0) ${en0Optimal}), minimax ${minimax.join("/")} (${en0Minimax})`, () => {
      const result = simonTwoStage.compute(parse({ p0, p1, alpha: 0.1, power: 0.9, maxN: 100 }));
      expect(result.optimal!.expectedSampleSize0.toFixed(1)).toBe(en0Optimal);
      expect(result.minimax!.expectedSampleSize0.toFixed(1)).toBe(en0Minimax);
      expect(rule(result.optimal!)).toEqual(optimal);
      expect(rule(result.minimax!)).toEqual(minimax);
    });
  }
});

describe("exact characteristics of the recalled designs (R 4.2 dbinom/pbinom fixture)", () => {
  const f = loadFixture<{ p0: number; p1: number; r1: number; n1: number; r: number; n: number; exactAlpha: number; exactPower: number; pet0: number; pet1: number; en0: number; en1: number; alpha: number; power: number }>("activity/simon-designs.json");
  it("alpha, power, PET and expected size at p0 and p1 match, and each design meets its targets", () => {
    for (const c of f.cases) {
      const s = summarizeTwoStage(c, c.p0, c.p1);
      expectClose(s.alpha, c.exactAlpha, f.tolerance, c);
      expectClose(s.power, c.exactPower, f.tolerance, c);
      expectClose(s.probabilityOfEarlyTermination0, c.pet0, f.tolerance, c);
      expectClose(s.probabilityOfEarlyTermination1, c.pet1, f.tolerance, c);
      expectClose(s.expectedSampleSize0, c.en0, f.tolerance * c.n, c);
      expectClose(s.expectedSampleSize1, c.en1, f.tolerance * c.n, c);
      expect(c.exactAlpha).toBeLessThanOrEqual(c.alpha);
      expect(c.exactPower).toBeGreaterThanOrEqual(c.power);
    }
  });
});

describe("the pruned search against a brute-force search over every (r1, n1, r, n) (R 4.2 fixture)", () => {
  const f = loadFixture<{
    p0: number; p1: number; alpha: number; power: number; maxN: number;
    optimal: number[]; optimalEn0: number; minimax: number[]; minimaxEn0: number;
    admissible: Array<{ design: number[]; en0: number; lowestWeightSeen: number; highestWeightSeen: number }>;
  }>("activity/simon-search.json");
  const gridStep = 0.0005; // the fixture's grid of weights
  for (const c of f.cases) {
    it(`p0 ${c.p0}, p1 ${c.p1}, alpha ${c.alpha}, power ${c.power}, maxN ${c.maxN}`, () => {
      const found = searchSimon(c)!;
      expect(rule(found.optimal)).toEqual(c.optimal);
      expect(rule(found.minimax)).toEqual(c.minimax);
      expectClose(found.optimal.expectedSampleSize0, c.optimalEn0, f.tolerance, c);
      expectClose(found.minimax.expectedSampleSize0, c.minimaxEn0, f.tolerance, c);
      const fromR = [...c.admissible].sort((a, b) => a.design[3]! - b.design[3]!);
      expect(found.admissible.map(rule)).toEqual(fromR.map((a) => a.design));
      found.admissible.forEach((a, i) => {
        const seen = fromR[i]!;
        // Every weight at which R found the design best lies in our range, and the range ends within one grid step of it.
        expect(a.lowestWeight).toBeLessThanOrEqual(seen.lowestWeightSeen + 1e-9);
        expect(a.highestWeight).toBeGreaterThanOrEqual(seen.highestWeightSeen - 1e-9);
        expect(seen.lowestWeightSeen - a.lowestWeight).toBeLessThan(gridStep + 1e-9);
        expect(a.highestWeight - seen.highestWeightSeen).toBeLessThan(gridStep + 1e-9);
      });
    });
  }
});

describe("Monte Carlo of the optimal design 1/10, then 5/29 (seeded, src/stats/random.ts)", () => {
  const design = { r1: 1, n1: 10, r: 5, n: 29 };
  const simulate = (rate: number, trials: number, seed: number) => {
    const random = createRandom(seed);
    let early = 0, promise = 0, patients = 0;
    for (let t = 0; t < trials; t++) {
      let x1 = 0;
      for (let i = 0; i < design.n1; i++) if (random.bernoulli(rate)) x1++;
      if (x1 <= design.r1) { early++; patients += design.n1; continue; }
      let total = x1;
      for (let i = design.n1; i < design.n; i++) if (random.bernoulli(rate)) total++;
      patients += design.n;
      if (total > design.r) promise++;
    }
    return { early: early / trials, promise: promise / trials, meanSize: patients / trials };
  };
  for (const [rate, seed] of [[0.1, 11], [0.3, 12], [0.2, 13]] as const) {
    it(`agrees with the exact enumeration at rate ${rate} within 4 standard errors`, () => {
      const trials = 20000;
      const exact = evaluateTwoStage(design, rate);
      const sim = simulate(rate, trials, seed);
      const se = (p: number) => Math.sqrt((p * (1 - p)) / trials);
      expect(Math.abs(sim.early - exact.probabilityOfEarlyTermination)).toBeLessThan(4 * se(exact.probabilityOfEarlyTermination));
      expect(Math.abs(sim.promise - exact.probabilityOfPromise)).toBeLessThan(4 * se(exact.probabilityOfPromise));
      const sizeSd = (design.n - design.n1) * Math.sqrt(exact.probabilityOfEarlyTermination * (1 - exact.probabilityOfEarlyTermination));
      expect(Math.abs(sim.meanSize - exact.expectedSampleSize)).toBeLessThan(4 * sizeSd / Math.sqrt(trials));
    });
  }
});

describe("evaluate mode", () => {
  it("reports a given design at p0, p1 and requested rates, and whether it meets the targets", () => {
    const f = loadFixture<{ r1: number; n1: number; r: number; n: number; p0: number; p1: number; exactAlpha: number; exactPower: number; pet0: number }>("activity/simon-designs.json");
    const c = f.cases.find((x) => x.n1 === 10 && x.n === 29)!;
    const result = simonTwoStage.compute(parse({ mode: "evaluate", p0: 0.1, p1: 0.3, r1: 1, n1: 10, r: 5, n: 29, trueRates: [0.1, 0.5] }));
    expect(result.meetsTargets).toBe(true);
    expectClose(result.design.alpha, c.exactAlpha, f.tolerance, c);
    expectClose(result.design.power, c.exactPower, f.tolerance, c);
    expectClose(result.atRequestedRates[0]!.probabilityOfPromise, c.exactAlpha, f.tolerance, c);
    expectClose(result.atRequestedRates[0]!.probabilityOfEarlyTermination, c.pet0, f.tolerance, c);
    // A stricter alpha than the design keeps (0.0471, R fixture) is reported as not met.
    expect(simonTwoStage.compute(parse({ mode: "evaluate", p0: 0.1, p1: 0.3, alpha: 0.04, r1: 1, n1: 10, r: 5, n: 29 })).meetsTargets).toBe(false);
  });

  it("draws PET falling and the probability of promise rising with the true rate (both are monotone in p)", () => {
    const result = simonTwoStage.compute(parse({ p0: 0.2, p1: 0.4, maxN: 50 }));
    for (const curve of result.curves) {
      for (let i = 1; i < curve.points.length; i++) {
        expect(curve.points[i]!.probabilityOfEarlyTermination).toBeLessThanOrEqual(curve.points[i - 1]!.probabilityOfEarlyTermination + 1e-12);
        expect(curve.points[i]!.probabilityOfPromise).toBeGreaterThanOrEqual(curve.points[i - 1]!.probabilityOfPromise - 1e-12);
      }
    }
  });
});

describe("bad and infeasible input", () => {
  const pathsOf = (inputs: Record<string, unknown>): string[] => {
    const r = simonTwoStage.input.safeParse(inputs);
    return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
  };
  it("names the field", () => {
    expect(pathsOf({ p0: 0.3, p1: 0.3 })).toContain("p1");
    expect(pathsOf({ p0: 0, p1: 0.3 })).toContain("p0");
    expect(pathsOf({ p0: 0.1, p1: 1 })).toContain("p1");
    expect(pathsOf({ p0: 0.1, p1: 0.3, alpha: 0.7 })).toContain("alpha");
    expect(pathsOf({ p0: 0.1, p1: 0.3, power: 1 })).toContain("power");
    expect(pathsOf({ p0: 0.1, p1: 0.3, maxN: 1 })).toContain("maxN");
    expect(pathsOf({ mode: "evaluate", p0: 0.1, p1: 0.3, r1: 1, n1: 10, r: 5 })).toContain("n");
    expect(pathsOf({ mode: "evaluate", p0: 0.1, p1: 0.3, r1: 10, n1: 10, r: 12, n: 29 })).toContain("r1");
    expect(pathsOf({ mode: "evaluate", p0: 0.1, p1: 0.3, r1: 1, n1: 10, r: 29, n: 29 })).toContain("r");
  });

  it("a maxN below the minimax size is infeasible and names the smallest maxN that works (25: minimax n, from memory of Simon 1989 table 1)", () => {
    expect(infeasibleDetails({ p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8, maxN: 20 })).toMatchObject({ field: "maxN", bound: 20, smallestMaxN: 25 });
  });

  it("a maxN where a randomized test could reach the power but no two-stage rule does (24: the most powerful test needs 23) still names 25, searching only the larger totals again", () => {
    expect(infeasibleDetails({ p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8, maxN: 24 })).toMatchObject({ field: "maxN", bound: 24, smallestMaxN: 25 });
  });

  it("a search that skips totals known to have no design finds exactly the designs of the full search", () => {
    // No design below the minimax n = 25 (Simon 1989 table 1, from memory), so starting at 21 or 25 loses nothing.
    const targets = { p0: 0.1, p1: 0.3, alpha: 0.05, power: 0.8, maxN: 60 };
    const full = searchSimon(targets);
    expect(full?.minimax.n).toBe(25);
    expect(searchSimon(targets, 21)).toEqual(full);
    expect(searchSimon(targets, 25)).toEqual(full);
    expect(searchSimon(targets, 61)).toBeNull();
  });

  it("when no maxN allowed works, says so without a smallest maxN", () => {
    const details = infeasibleDetails({ p0: 0.5, p1: 0.55, alpha: 0.01, power: 0.99, maxN: 100 });
    expect(details).toMatchObject({ field: "maxN", bound: 100 });
    expect(details).not.toHaveProperty("smallestMaxN");
  });
});

describe("report", () => {
  it("the example computes, is plain JSON and its protocol paragraph carries the design's numbers", () => {
    const input = parse(simonTwoStage.example);
    const result = simonTwoStage.compute(input);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
    const sections = simonTwoStage.document(input, result);
    const protocol = sections.flatMap((s) => s.blocks).find((b) => b.kind === "protocol");
    expect(protocol && protocol.kind === "protocol" ? protocol.text : "").toContain(`${result.design.n1} evaluable patients`);
    expect(protocol && protocol.kind === "protocol" ? protocol.text : "").toContain(result.design.alpha.toFixed(4));
  });
});

describe("degenerate targets", () => {
  it("refuses an alpha below 1e-6, which the 1e-12 precision of the search cannot honour (found by the degenerate-input audit)", () => {
    // Common practice, no source: alpha 5e-324 used to return n = 297 with exact alpha 6.9e-13, far above the target.
    const r = simonTwoStage.input.safeParse({ mode: "search", p0: 0.1, p1: 0.3, alpha: 5e-324, power: 0.8, maxN: 300 });
    expect(r.success).toBe(false);
    expect(r.success ? [] : r.error.issues.map((i) => i.path.join("."))).toEqual(["alpha"]);
    const p = simonTwoStage.input.safeParse({ mode: "search", p0: 0.1, p1: 0.3, alpha: 0.05, power: 1 - 1e-15, maxN: 300 });
    expect(p.success ? [] : p.error.issues.map((i) => i.path.join("."))).toEqual(["power"]);
    const result = simonTwoStage.compute(parse({ mode: "search", p0: 0.1, p1: 0.3, alpha: 1e-6, power: 0.8, maxN: 300 }));
    expect(result.optimal?.alpha).toBeLessThanOrEqual(1e-6);
  });
});

describe("compute budget estimate", () => {
  const cost = (inputs: Record<string, unknown>) => simonTwoStage.cost(parse(inputs));

  it("a design promised by the single-stage witness is always found by the search (the estimate leaves out the second search on its word)", () => {
    const rate = fc.double({ min: 0.001, max: 0.999, noNaN: true });
    const targets = fc.record({
      p0: rate, gap: fc.double({ min: 0.01, max: 0.6, noNaN: true }),
      alpha: fc.constantFrom(1e-6, 0.001, 0.01, 0.05, 0.1, 0.2, 0.5),
      power: fc.constantFrom(0.1, 0.5, 0.8, 0.9, 0.99, 0.999999),
      maxN: fc.integer({ min: 2, max: 80 }),
    }).filter((t) => t.p0 + t.gap < 1 && t.power > t.alpha);
    fc.assert(fc.property(targets, ({ gap, ...t }) => {
      const target = { ...t, p1: t.p0 + gap };
      return !surelyFindsDesign(target) || searchSimon(target) !== null;
    }), { seed: 1989, numRuns: 400 });
  });

  it("the empty-search budget case runs the search it is named for: the power ceiling on 299 patients does not stop it, and no design is certain", () => {
    const empty = budgetCases["simon-two-stage"]!.heaviest.find((c) => c.name.startsWith("empty search"))!;
    const targets = parse(empty.inputs);
    expect(searchCanSucceed(targets)).toBe(true);
    expect(surelyFindsDesign(targets)).toBe(false);
  });

  it("counts a search up to maxN when a design within it is certain, up to 300 when not, and none when no rule on 300 patients reaches the power", () => {
    expect(cost({ p0: 0.1, p1: 0.3, maxN: 60 }).breakdown).toContain("up to 60 patients");
    // The smallest design has 25 patients (Simon 1989 table 1, from memory): an empty search up to 24 goes on to 300.
    expect(cost({ p0: 0.1, p1: 0.3, maxN: 24 }).breakdown).toContain("up to 300 patients");
    expect(cost({ p0: 0.5, p1: 0.55, alpha: 0.01, power: 0.99, maxN: 100 }).breakdown).toContain("no search");
    expect(cost({ p0: 0.5, p1: 0.55, alpha: 0.01, power: 0.99, maxN: 100 }).milliseconds).toBeLessThan(cost({ p0: 0.1, p1: 0.3, maxN: 60 }).milliseconds);
    expect(cost({ p0: 0.1, p1: 0.3, maxN: 24 }).milliseconds).toBeGreaterThan(cost({ p0: 0.1, p1: 0.3, maxN: 60 }).milliseconds);
  });
});
