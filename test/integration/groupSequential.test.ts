// group-sequential through the real Worker (SELF.fetch): bad inputs answer 400
// problem+json naming the field, and the interim-looks option of two-means.
import { describe, expect, it } from "vitest";
import { type ProblemBody, type RecordBody, createCalculation } from "./helpers.js";

async function problemPaths(design: string, inputs: unknown): Promise<string[]> {
  const res = await createCalculation(design, inputs);
  expect(res.status).toBe(400);
  expect(res.headers.get("content-type")).toMatch(/application\/problem\+json/);
  const body = await res.json<ProblemBody>();
  for (const e of body.errors ?? []) expect(e.message.length).toBeGreaterThan(10);
  return (body.errors ?? []).map((e) => e.path);
}

describe("group-sequential: bad input is a 400 with the field path", () => {
  it("fractions not increasing", async () => {
    expect(await problemPaths("group-sequential", { looks: 3, informationFractions: [0.6, 0.4, 1] })).toContain("inputs.informationFractions.1");
  });
  it("fractions not ending at 1", async () => {
    expect(await problemPaths("group-sequential", { looks: 3, informationFractions: [0.3, 0.6, 0.9] })).toContain("inputs.informationFractions.2");
  });
  it("more than 10 looks", async () => {
    expect(await problemPaths("group-sequential", { looks: 11 })).toContain("inputs.looks");
  });
  it("gamma out of range", async () => {
    expect(await problemPaths("group-sequential", { efficacyBoundary: "hwang-shih-decani", efficacyGamma: 25 })).toContain("inputs.efficacyGamma");
  });
  it("the same checks inside two-means' interimLooks", async () => {
    const paths = await problemPaths("two-means", { delta: 4, sd: 9, interimLooks: { looks: 12, informationFractions: [0.5, 0.4], efficacyGamma: -30 } });
    expect(paths).toEqual(expect.arrayContaining(["inputs.interimLooks.looks", "inputs.interimLooks.efficacyGamma"]));
    expect(await problemPaths("two-means", { delta: 4, sd: 9, interimLooks: { looks: 2, informationFractions: [0.7, 0.5] } })).toContain("inputs.interimLooks.informationFractions.1");
  });
});

describe("group-sequential: a valid design is frozen", () => {
  it("K = 10 with futility answers 201 with ten looks", async () => {
    const res = await createCalculation("group-sequential", { looks: 10, sides: 1, alpha: 0.025, power: 0.9, futilityBoundary: "hwang-shih-decani" });
    expect(res.status, await res.clone().text()).toBe(201);
    const record = await res.json<RecordBody>();
    const planned = (record.result as { planned: { looks: unknown[]; inflationFactor: number } }).planned;
    expect(planned.looks).toHaveLength(10);
    expect(planned.inflationFactor).toBeGreaterThan(1);
  });
});
