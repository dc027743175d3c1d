// Inference after a two-stage trial: stage-wise p-value, exact interval
// (Koyama & Chen 2008) and UMVUE (Jung & Kim 2004), against a fixture written
// from the definitions with R 4.2 (stats::dbinom, pbinom, uniroot, choose;
// test/fixtures/activity/generate.R), and against exact identities.
import { describe, expect, it } from "vitest";
import { expectClose, loadFixture } from "../../support/fixtures.js";
import { twoStageInference } from "../../../src/designs/twoStageInference.js";
import { allOutcomes, outcomeProbabilities, stagewiseInterval, umvue } from "../../../src/designs/shared/stagewiseInference.js";
import { evaluateTwoStage } from "../../../src/designs/shared/twoStage.js";

const parse = (inputs: Record<string, unknown>) => twoStageInference.input.parse(inputs);

describe("inference after a two-stage trial (R 4.2 fixture)", () => {
  const f = loadFixture<{ r1: number; n1: number; r: number; n: number; p0: number; level: number; stage: 1 | 2; responses: number; pValue: number; lower: number; upper: number; umvue: number }>("activity/two-stage-inference.json");
  it("p-value, interval and UMVUE match for every outcome of three designs", () => {
    const byDesign = new Map<string, ReturnType<typeof twoStageInference.compute>>();
    for (const c of f.cases) {
      const key = `${c.r1}/${c.n1}/${c.r}/${c.n}`;
      if (!byDesign.has(key)) {
        byDesign.set(key, twoStageInference.compute(parse({ r1: c.r1, n1: c.n1, r: c.r, n: c.n, p0: c.p0, confidenceLevel: c.level, stage1Responses: 0 })));
      }
      const row = byDesign.get(key)!.allOutcomes.find((o) => o.stage === c.stage && o.responses === c.responses)!;
      expectClose(row.pValue, c.pValue, f.tolerance, c);
      expectClose(row.lower, c.lower, f.tolerance, c);
      expectClose(row.upper, c.upper, f.tolerance, c);
      expectClose(row.umvue, c.umvue, f.tolerance, c);
    }
  });

  it("an observed outcome is reported with its stage, decision and the same numbers", () => {
    const input = parse(twoStageInference.example);
    const result = twoStageInference.compute(input);
    const c = f.cases.find((x) => x.n1 === 10 && x.n === 29 && x.stage === 2 && x.responses === 7)!;
    expect(result.observed).toMatchObject({ stage: 2, responses: 7, patients: 29 });
    expect(result.declaredPromising).toBe(true); // 7 > r = 5
    expectClose(result.observed.pValue, c.pValue, f.tolerance, c);
    expectClose(result.observed.umvue, c.umvue, f.tolerance, c);
  });
});

describe("exact identities", () => {
  const design = { r1: 3, n1: 13, r: 12, n: 43 };
  it("the UMVUE is unbiased: its expectation over every outcome equals the true rate (Jung & Kim 2004), unlike the crude proportion", () => {
    const outcomes = allOutcomes(design);
    for (const p of [0.05, 0.2, 0.4, 0.7]) {
      const probs = outcomeProbabilities(design, p);
      expectClose(probs.reduce((a, b) => a + b, 0), 1, 1e-12, { p });
      const mean = outcomes.reduce((acc, o, i) => acc + probs[i]! * umvue(design, o), 0);
      expectClose(mean, p, 1e-12, { p });
      const crude = outcomes.reduce((acc, o, i) => acc + probs[i]! * (o.responses / (o.stage === 1 ? design.n1 : design.n)), 0);
      expect(Math.abs(crude - p)).toBeGreaterThan(1e-4);
    }
  });

  it("the p-value at the first outcome declaring promise is the design's exact alpha (stage-wise ordering)", () => {
    const result = twoStageInference.compute(parse({ ...design, p0: 0.2, stage1Responses: 5, stage2Responses: 8 }));
    const boundary = result.allOutcomes.find((o) => o.stage === 2 && o.responses === design.r + 1)!;
    expectClose(boundary.pValue, evaluateTwoStage(design, 0.2).probabilityOfPromise, 1e-13, design);
  });

  it("the intervals cover the true rate with probability at least the level (exact coverage by enumeration)", () => {
    const outcomes = allOutcomes(design);
    const intervals = outcomes.map((o) => stagewiseInterval(design, o, 0.9));
    for (const p of [0.1, 0.25, 0.33, 0.5]) {
      const probs = outcomeProbabilities(design, p);
      const coverage = outcomes.reduce((acc, _o, i) => acc + (intervals[i]![0] <= p && p <= intervals[i]![1] ? probs[i]! : 0), 0);
      expect(coverage).toBeGreaterThanOrEqual(0.9 - 1e-9);
    }
  });
});

describe("bad input names the field", () => {
  const pathsOf = (inputs: Record<string, unknown>): string[] => {
    const r = twoStageInference.input.safeParse(inputs);
    return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
  };
  const base = { r1: 1, n1: 10, r: 5, n: 29, p0: 0.1 };
  it("stage-2 responses after a stop, missing after continuing, or too many", () => {
    expect(pathsOf({ ...base, stage1Responses: 1, stage2Responses: 2 })).toContain("stage2Responses");
    expect(pathsOf({ ...base, stage1Responses: 2 })).toContain("stage2Responses");
    expect(pathsOf({ ...base, stage1Responses: 2, stage2Responses: 20 })).toContain("stage2Responses");
    expect(pathsOf({ ...base, stage1Responses: 11 })).toContain("stage1Responses");
    expect(pathsOf({ ...base, n: 10, stage1Responses: 0 })).toContain("n");
    expect(pathsOf({ ...base, p0: 1, stage1Responses: 0 })).toContain("p0");
  });
});
