/**
 * What the load test prints: one table of every scenario, the cached
 * permalinks' throughput as ratios of the trivial route's (measured in the same
 * run, so the machine's speed and its other work mostly cancel), and the checks
 * that decide the exit code.
 */
import type { ScenarioResult } from "./scenario.js";

/** A cached permalink (HTML or JSON) must reach this share of the trivial route's throughput. */
export const CACHED_RATIO_TARGET = 0.7;

export interface Check {
  name: string;
  passed: boolean;
  /** The scenarios or figures behind a failure, or the figure behind a pass. */
  detail: string;
}

/** The scenarios the ratios compare, by the names they were run under. */
export interface Comparison {
  trivial: string;
  html: string;
  json: string;
  pdf: string;
}

const COLUMNS: Array<[heading: string, width: number, cell: (r: ScenarioResult) => string]> = [
  ["scenario", 42, (r) => r.name],
  ["requests", 9, (r) => String(r.requests)],
  ["req/s", 8, (r) => r.requestsPerSecond.toFixed(r.requestsPerSecond < 100 ? 1 : 0)],
  ["p50 ms", 8, (r) => milliseconds(r.latencyMs.p50)],
  ["p90 ms", 8, (r) => milliseconds(r.latencyMs.p90)],
  ["p99 ms", 8, (r) => milliseconds(r.latencyMs.p99)],
  ["max ms", 8, (r) => milliseconds(r.latencyMs.max)],
  ["non-2xx", 8, (r) => String(r.non2xx)],
  ["5xx", 5, (r) => String(r.serverErrors)],
  ["errors", 7, (r) => String(r.errors)],
  ["timeouts", 9, (r) => String(r.timeouts)],
  ["kB/answer", 10, (r) => (r.bytesPerResponse / 1024).toFixed(1)],
  ["Worker CPU ms/req", 18, (r) => (r.workerCpuMsPerRequest === undefined ? "n/a" : r.workerCpuMsPerRequest.toFixed(2))],
  ["load gen. CPU ms/req", 21, (r) => r.generatorCpuMsPerRequest.toFixed(2)],
];

function milliseconds(ms: number): string {
  if (!Number.isFinite(ms)) return "-";
  return ms < 10 ? ms.toFixed(2) : ms < 1000 ? ms.toFixed(1) : ms.toFixed(0);
}

export function formatTable(results: ScenarioResult[]): string {
  const line = (cells: string[]): string => cells.map((cell, i) => (i === 0 ? cell.padEnd(COLUMNS[i]![1]) : cell.padStart(COLUMNS[i]![1]))).join(" ").trimEnd();
  return [
    line(COLUMNS.map(([heading]) => heading)),
    line(COLUMNS.map(([, width]) => "-".repeat(width))),
    ...results.map((r) => line(COLUMNS.map(([, , cell]) => cell(r)))),
  ].join("\n");
}

function find(results: ScenarioResult[], name: string): ScenarioResult {
  const found = results.find((r) => r.name === name);
  if (!found) throw new Error(`no scenario named ${name}`);
  return found;
}

interface Ratios {
  html: number;
  json: number;
  pdf: number;
}

/** Throughput of each cached permalink over the trivial route's. */
export function ratios(results: ScenarioResult[], names: Comparison): Ratios {
  const trivial = find(results, names.trivial).requestsPerSecond;
  const over = (name: string): number => find(results, name).requestsPerSecond / trivial;
  return { html: over(names.html), json: over(names.json), pdf: over(names.pdf) };
}

/** CPU milliseconds an answer costs on this machine, Worker and load generator together; undefined without the Worker's CPU time. */
function cpuPerAnswer(r: ScenarioResult): number | undefined {
  return r.workerCpuMsPerRequest === undefined ? undefined : r.workerCpuMsPerRequest + r.generatorCpuMsPerRequest;
}

/**
 * CPU per answer of the trivial route over each cached permalink's: the
 * throughput ratio when the processor is the limit and nothing else competes
 * for it, so it varies less with the machine's other work. Undefined without
 * the Worker's CPU time.
 */
export function cpuRatios(results: ScenarioResult[], names: Comparison): Ratios | undefined {
  const [trivial, html, json, pdf] = [names.trivial, names.html, names.json, names.pdf].map((name) => cpuPerAnswer(find(results, name)));
  if (trivial === undefined || html === undefined || json === undefined || pdf === undefined) return undefined;
  return { html: trivial / html, json: trivial / json, pdf: trivial / pdf };
}

export function formatRatios(label: string, r: Ratios): string {
  return `${label}: cached HTML ${r.html.toFixed(2)}, cached JSON ${r.json.toFixed(2)}, cached PDF ${r.pdf.toFixed(2)}`;
}

function every(results: ScenarioResult[], name: string, count: (r: ScenarioResult) => number): Check {
  const failing = results.filter((r) => count(r) > 0);
  return {
    name,
    passed: failing.length === 0,
    detail: failing.length === 0 ? `0 in ${results.reduce((sum, r) => sum + r.requests, 0)} answers` : failing.map((r) => `${r.name}: ${count(r)}`).join("; "),
  };
}

export function checks(results: ScenarioResult[], names: Comparison): Check[] {
  const { html, json } = ratios(results, names);
  const best = Math.max(html, json);
  return [
    // autocannon counts every timeout among the errors as well.
    every(results, "no connection errors or timeouts", (r) => r.errors),
    every(results, "no 5xx answers", (r) => r.serverErrors),
    every(results, "no non-2xx answers", (r) => r.non2xx),
    every(results, "every answer is the one measured (200; PDF from KV; fresh calculations 201)", (r) => r.unexpected),
    every(results, "every scenario answered", (r) => (r.requests === 0 ? 1 : 0)),
    {
      name: `a cached permalink (HTML or JSON) reaches ${CACHED_RATIO_TARGET.toFixed(2)} of the trivial route's throughput`,
      passed: best >= CACHED_RATIO_TARGET,
      detail: `HTML ${html.toFixed(2)}, JSON ${json.toFixed(2)}`,
    },
  ];
}

/**
 * Routes beside the trivial one, with their throughput ratio and the CPU each
 * answer costs beyond a trivial answer (Worker and load generator): what the
 * parts of a cached permalink cost.
 */
export function formatBreakdown(results: ScenarioResult[], trivialName: string): string {
  const trivial = find(results, trivialName);
  const cost = (r: ScenarioResult): number => cpuPerAnswer(r) ?? Number.NaN;
  const rows = results.map((r) => [
    r.name.padEnd(58),
    r.requestsPerSecond.toFixed(0).padStart(7),
    (r.requestsPerSecond / trivial.requestsPerSecond).toFixed(2).padStart(9),
    cost(r).toFixed(2).padStart(12),
    (cost(r) - cost(trivial)).toFixed(2).padStart(13),
    String(r.unexpected).padStart(11),
  ].join(" "));
  return [`${"route".padEnd(58)}   req/s  /trivial  CPU ms/req  over trivial  unexpected`, ...rows].join("\n");
}

/** The status counts and first unexpected answers of every scenario that had any, for a failed run. */
export function formatUnexpected(results: ScenarioResult[]): string {
  return results
    .filter((r) => r.unexpected > 0 || r.non2xx > 0 || r.errors > 0)
    .map((r) => [`${r.name}: statuses ${JSON.stringify(r.statusCounts)}, errors ${r.errors}, timeouts ${r.timeouts}`, ...r.unexpectedSamples.map((s) => `  ${s}`)].join("\n"))
    .join("\n");
}
