// The time-to-event design over HTTP: a frozen calculation, 400s naming the bad
// field with a sentence, and 422s naming the bound.
import { SELF } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import { type Problem, expectFieldError, postCalculation } from "../support/http.js";

const post = (inputs: unknown): Promise<Response> => postCalculation("time-to-event", inputs);

const setting = { controlMedianYears: 2, accrualYears: 3, followUpYears: 2 };

describe("time-to-event over HTTP", () => {
  it("freezes a calculation with 380 events for hazard ratio 0.75 (Schoenfeld 1983 formula, 379.4 rounded up)", async () => {
    const res = await post({ ...setting, hazardRatio: 0.75 });
    expect(res.status).toBe(201);
    const body = await res.json<{ id: string; result: { events: number; eventsOverTime: Array<[number, number]> } }>();
    expect(body.result.events).toBe(380);
    expect(body.result.eventsOverTime.length).toBeGreaterThan(10);
    const page = await SELF.fetch(`https://example.com/c/${body.id}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("380");
  });

  const cases: Array<[string, unknown, string, RegExp]> = [
    ["a hazard ratio of 1", { ...setting, hazardRatio: 1 }, "inputs.hazardRatio", /no effect to detect/],
    ["equal medians", { ...setting, experimentalMedianYears: 2 }, "inputs.experimentalMedianYears", /do not differ/],
    ["a zero control median", { ...setting, controlMedianYears: 0, hazardRatio: 0.8 }, "inputs.controlMedianYears", /positive number of years/],
    ["a negative experimental median", { ...setting, experimentalMedianYears: -3 }, "inputs.experimentalMedianYears", /positive number of years/],
    ["zero accrual", { ...setting, hazardRatio: 0.8, accrualYears: 0 }, "inputs.accrualYears", /Recruitment must last/],
    ["negative follow-up", { ...setting, hazardRatio: 0.8, followUpYears: -1 }, "inputs.followUpYears", /cannot be negative/],
    ["both effect forms", { ...setting, hazardRatio: 0.8, experimentalMedianYears: 3 }, "inputs.experimentalMedianYears", /not both/],
    ["harm with a one-sided test", { ...setting, hazardRatio: 1.3, sides: 1 }, "inputs.hazardRatio", /one-sided test looks for benefit/],
    ["power below alpha", { ...setting, hazardRatio: 0.8, power: 0.03 }, "inputs.power", /Power must exceed alpha/],
    ["power without events", { ...setting, solveFor: "power", hazardRatio: 0.8 }, "inputs.events", /number of events/],
  ];
  for (const [what, inputs, path, message] of cases) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      await expectFieldError(await post(inputs), path, message);
    });
  }

  it("answers 422 with the event bound when the hazard ratio is too close to 1", async () => {
    const res = await post({ ...setting, hazardRatio: 0.995 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.bound).toBe(200000);
    expect(problem.detail).toMatch(/200000/);
  });

  it("answers 422 with the enrolment bound when events are too rare to reach", async () => {
    const res = await post({ hazardRatio: 0.7, controlMedianYears: 1000, accrualYears: 0.01, followUpYears: 0 });
    expect(res.status).toBe(422);
    const problem = await res.json<Problem>();
    expect(problem.bound).toBe(1000000);
    expect(problem.field).toBe("followUpYears");
  });
});
