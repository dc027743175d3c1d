// The load test's own arithmetic: percentiles, the ratios and checks that set
// its exit code, and how its sizes are read from flags and the environment.
import { describe, expect, it } from "vitest";
import { USAGE, parseOptions } from "../../../scripts/load/options.js";
import { checks, cpuRatios, formatTable, ratios } from "../../../scripts/load/report.js";
import { type ScenarioResult, percentile } from "../../../scripts/load/scenario.js";

describe("percentile", () => {
  it("is the nearest rank (values from R 4.2.2 base stats, quantile(x, type = 1))", () => {
    const sorted = [3.2, 0.4, 7.7, 1.1, 2.5, 9.0, 4.4].sort((a, b) => a - b);
    expect([50, 90, 99, 100].map((p) => percentile(sorted, p))).toEqual([3.2, 9.0, 9.0, 9.0]);
    const tenths = Array.from({ length: 1000 }, (_, i) => (i + 1) / 10);
    expect([50, 90, 99].map((p) => percentile(tenths, p))).toEqual([50, 90, 99]);
  });

  it("has no value without data", () => {
    expect(percentile([], 50)).toBeNaN();
  });
});

const NAMES = { trivial: "trivial", html: "html", json: "json", pdf: "pdf" };

function result(name: string, over: Partial<ScenarioResult> = {}): ScenarioResult {
  return {
    name, requests: 1000, seconds: 10, requestsPerSecond: 100,
    latencyMs: { p50: 1, p90: 2, p99: 3, max: 4 },
    non2xx: 0, serverErrors: 0, errors: 0, timeouts: 0, statusCounts: { 200: 1000 },
    unexpected: 0, unexpectedSamples: [], bytesPerResponse: 1024,
    workerCpuMsPerRequest: 2, generatorCpuMsPerRequest: 0.5,
    ...over,
  };
}

const failing = (list: ReturnType<typeof checks>): string[] => list.filter((c) => !c.passed).map((c) => c.name);

describe("ratios and checks", () => {
  it("divides each cached permalink's throughput by the trivial route's", () => {
    const results = [result("trivial", { requestsPerSecond: 200 }), result("html", { requestsPerSecond: 120 }), result("json", { requestsPerSecond: 150 }), result("pdf", { requestsPerSecond: 50 })];
    expect(ratios(results, NAMES)).toEqual({ html: 0.6, json: 0.75, pdf: 0.25 });
  });

  it("divides the trivial route's CPU per answer by each permalink's, Worker and load generator together", () => {
    const results = [result("trivial"), result("html", { workerCpuMsPerRequest: 4.5 }), result("json", { workerCpuMsPerRequest: 2, generatorCpuMsPerRequest: 3 }), result("pdf", { workerCpuMsPerRequest: 9.5 })];
    expect(cpuRatios(results, NAMES)).toEqual({ html: 0.5, json: 0.5, pdf: 0.25 });
    expect(cpuRatios([...results.slice(1), result("trivial", { workerCpuMsPerRequest: undefined })], NAMES)).toBeUndefined();
  });

  it("passes a clean run whose cached JSON alone reaches 0.70", () => {
    const results = [result("trivial", { requestsPerSecond: 100 }), result("html", { requestsPerSecond: 40 }), result("json", { requestsPerSecond: 70 }), result("pdf", { requestsPerSecond: 10 })];
    expect(failing(checks(results, NAMES))).toEqual([]);
  });

  it("fails when neither cached HTML nor JSON reaches 0.70", () => {
    const results = [result("trivial", { requestsPerSecond: 100 }), result("html", { requestsPerSecond: 69 }), result("json", { requestsPerSecond: 69.9 }), result("pdf")];
    expect(failing(checks(results, NAMES))).toEqual(["a cached permalink (HTML or JSON) reaches 0.70 of the trivial route's throughput"]);
  });

  it("fails on a 5xx, a connection error, an unexpected answer or a scenario with no answer, naming the scenario", () => {
    const results = [
      result("trivial"), result("html"), result("json"), result("pdf"),
      result("fresh, a", { non2xx: 2, serverErrors: 1, unexpected: 2, statusCounts: { 201: 998, 500: 1, 422: 1 } }),
      result("fresh, b", { errors: 3, timeouts: 3 }),
      result("fresh, c", { requests: 0, requestsPerSecond: 0 }),
    ];
    const list = checks(results, NAMES);
    expect(failing(list)).toEqual([
      "no connection errors or timeouts",
      "no 5xx answers",
      "no non-2xx answers",
      "every answer is the one measured (200; PDF from KV; fresh calculations 201)",
      "every scenario answered",
    ]);
    expect(list.find((c) => c.name === "no 5xx answers")?.detail).toBe("fresh, a: 1");
  });

  it("prints one row a scenario under one heading", () => {
    const lines = formatTable([result("trivial"), result("json")]).split("\n");
    expect(lines).toHaveLength(4);
    expect(lines[0]).toMatch(/^scenario +requests +req\/s +p50 ms +p90 ms +p99 ms +max ms +non-2xx +5xx +errors +timeouts/);
    expect(lines[3]).toMatch(/^json +1000 +100 +1\.00 +2\.00 +3\.00 +4\.00 +0 +0 +0 +0 +1\.0 +2\.00 +0\.50$/);
  });
});

describe("options", () => {
  it("takes a flag over the environment over the mode's default", () => {
    const options = parseOptions(["--quick", "--amount", "300"], { LOAD_AMOUNT: "200", LOAD_DURATION: "7" });
    if (options === "help") throw new Error("not help");
    expect(options.quick).toBe(true);
    expect(options.amount).toBe(300);
    expect(options.durationSeconds).toBe(7);
    const full = parseOptions([], {});
    if (full === "help") throw new Error("not help");
    expect(options.connections).toBe(full.connections);
    expect(options.freshAmount).toBeLessThan(full.freshAmount);
  });

  it("reads the designs and the permalink design", () => {
    const options = parseOptions(["--designs", "crm, boin"], { LOAD_PERMALINK_DESIGN: "simon-two-stage" });
    expect(options).toMatchObject({ designs: ["crm", "boin"], permalinkDesign: "simon-two-stage" });
  });

  it("refuses sizes that are not whole numbers, and zero except for a warm-up", () => {
    expect(() => parseOptions(["--amount", "0"], {})).toThrow(/--amount \(LOAD_AMOUNT\) must be a positive whole number/);
    expect(() => parseOptions([], { LOAD_DURATION: "1.5" })).toThrow(/--duration \(LOAD_DURATION\) must be a positive whole number/);
    expect(parseOptions(["--warmup", "0"], {})).toMatchObject({ warmup: 0 });
    expect(() => parseOptions(["--bogus"], {})).toThrow(/Unknown option '--bogus'/);
  });

  it("answers --help, and the help names every flag", () => {
    expect(parseOptions(["--help"], {})).toBe("help");
    for (const flag of ["--quick", "--connections", "--amount", "--duration", "--warmup", "--rounds", "--fresh-connections", "--fresh-amount", "--fresh-duration", "--fresh-warmup", "--designs", "--permalink-design"]) {
      expect(USAGE).toContain(flag);
    }
  });
});
