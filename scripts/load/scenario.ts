/**
 * Load scenarios: autocannon drives a route over fixed connections until it
 * has sent `amount` requests or `durationSeconds` have passed, whichever comes
 * first, after an unmeasured warm-up. Scenarios that are compared with one
 * another run interleaved in rounds (each round a slice of every scenario), so
 * that a change in what else the machine is doing weighs on all of them alike.
 *
 * The figures are taken from each response rather than from autocannon's
 * summary: its latency histogram counts whole milliseconds (the cached routes
 * answer in a few), and its duration runs to the next sampling tick after the
 * last answer.
 */
import autocannon, { type Instance, type Request, type Result } from "autocannon";
import { performance } from "node:perf_hooks";
import { COMPUTE_BUDGET_MS } from "../../src/designs/budget.js";
import { groupCpuMs, ownCpuMs } from "./processCpu.js";

export interface Scenario {
  name: string;
  connections: number;
  amount: number;
  durationSeconds: number;
  warmup: number;
  request: Request;
  /** Why an answer is not the one this scenario means to measure, or undefined when it is. */
  unexpected(status: number, headers: Record<string, string | string[]>): string | undefined;
}

/** The Worker's process group, and the CPU it uses when idle, taken off each slice's measure. */
export interface WorkerProcesses {
  group: number;
  idleCpuMsPerSecond: number;
}

export interface ScenarioResult {
  name: string;
  requests: number;
  seconds: number;
  requestsPerSecond: number;
  latencyMs: { p50: number; p90: number; p99: number; max: number };
  non2xx: number;
  serverErrors: number;
  errors: number;
  timeouts: number;
  statusCounts: Record<string, number>;
  unexpected: number;
  /** The first few unexpected answers: status, reason and the start of the body. */
  unexpectedSamples: string[];
  bytesPerResponse: number;
  /** CPU milliseconds per answer in the Worker's processes beyond their idle use (undefined without /proc), and in this process. */
  workerCpuMsPerRequest: number | undefined;
  generatorCpuMsPerRequest: number;
}

/** A request slower than this counts as a timeout: four times the compute budget, far beyond any sound answer. */
const TIMEOUT_SECONDS = (4 * COMPUTE_BUDGET_MS) / 1000;
const SAMPLES_KEPT = 3;

/** What the measured slices of one scenario add up to. */
interface Tally {
  latencies: number[];
  bytes: number;
  seconds: number;
  statusCounts: Record<string, number>;
  non2xx: number;
  errors: number;
  timeouts: number;
  unexpected: number;
  unexpectedSamples: string[];
  workerCpuMs: number | undefined;
  generatorCpuMs: number;
}

function emptyTally(): Tally {
  return { latencies: [], bytes: 0, seconds: 0, statusCounts: {}, non2xx: 0, errors: 0, timeouts: 0, unexpected: 0, unexpectedSamples: [], workerCpuMs: 0, generatorCpuMs: 0 };
}

/** Nearest-rank percentile of ascending values (Hyndman & Fan 1996, definition 1): the smallest value with at least p% at or below it. */
export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return Number.NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

/** Runs in progress, stopped on Ctrl-C so the Worker can be stopped cleanly. */
const activeRuns = new Set<Instance>();
let stopped = false;

class LoadInterrupted extends Error {
  constructor() {
    super("interrupted: the load was stopped before its end");
    this.name = "LoadInterrupted";
  }
}

/** One autocannon run, its answers added to the tally; returns the time of the last answer. */
function drive(url: string, scenario: Scenario, amount: number, durationSeconds: number, tally: Tally): Promise<number> {
  let lastAnswerAt = performance.now();
  const request: Request = {
    ...scenario.request,
    onResponse: (status, body, _context, headers) => {
      const reason = scenario.unexpected(status, headers);
      if (reason === undefined) return;
      tally.unexpected += 1;
      if (tally.unexpectedSamples.length < SAMPLES_KEPT) tally.unexpectedSamples.push(`${status} ${reason}: ${body.slice(0, 300)}`);
    },
  };
  return new Promise((resolve, reject) => {
    let timer: NodeJS.Timeout | undefined;
    let instance: Instance | undefined;
    let settled = false;
    const finish = (error: Error | null, result: Result): void => {
      settled = true;
      clearTimeout(timer);
      if (instance) activeRuns.delete(instance);
      if (error) return reject(error);
      for (const [code, { count }] of Object.entries(result.statusCodeStats)) tally.statusCounts[code] = (tally.statusCounts[code] ?? 0) + Number(count);
      tally.non2xx += result.non2xx;
      tally.errors += result.errors;
      tally.timeouts += result.timeouts;
      resolve(lastAnswerAt);
    };
    instance = autocannon({
      url,
      connections: Math.min(scenario.connections, amount),
      amount,
      timeout: TIMEOUT_SECONDS,
      // The result is handed over at the sampling tick after the last answer; a short tick wastes less time.
      sampleInt: 100,
      requests: [request],
    }, finish);
    // Options autocannon refuses are reported at once, before any request.
    if (settled) return;
    activeRuns.add(instance);
    // autocannon ignores `duration` when `amount` is set; the time bound is kept here.
    timer = setTimeout(() => instance?.stop(), durationSeconds * 1000);
    instance.on("response", (_client: unknown, _status: number, bytes: number, responseTime: number) => {
      tally.latencies.push(responseTime);
      tally.bytes += bytes;
      lastAnswerAt = performance.now();
    });
  });
}

/** A measured slice: one run with the CPU time of the Worker's processes and of this process around it. */
async function measure(url: string, scenario: Scenario, amount: number, durationSeconds: number, worker: WorkerProcesses, tally: Tally): Promise<void> {
  const workerBefore = groupCpuMs(worker.group);
  const generatorBefore = ownCpuMs();
  const startedAt = performance.now();
  const lastAnswerAt = await drive(url, scenario, amount, durationSeconds, tally);
  const workerAfter = groupCpuMs(worker.group);
  const endedAt = performance.now();
  tally.generatorCpuMs += ownCpuMs() - generatorBefore;
  tally.seconds += (lastAnswerAt - startedAt) / 1000;
  const idle = (worker.idleCpuMsPerSecond * (endedAt - startedAt)) / 1000;
  tally.workerCpuMs = tally.workerCpuMs !== undefined && workerBefore !== undefined && workerAfter !== undefined ? tally.workerCpuMs + workerAfter - workerBefore - idle : undefined;
}

function summarize(name: string, tally: Tally): ScenarioResult {
  const requests = tally.latencies.length;
  const sorted = tally.latencies.sort((a, b) => a - b);
  const perRequest = (ms: number): number => (requests > 0 ? ms / requests : Number.NaN);
  return {
    name,
    requests,
    seconds: tally.seconds,
    requestsPerSecond: requests > 0 ? requests / tally.seconds : 0,
    latencyMs: { p50: percentile(sorted, 50), p90: percentile(sorted, 90), p99: percentile(sorted, 99), max: sorted.at(-1) ?? Number.NaN },
    non2xx: tally.non2xx,
    serverErrors: Object.entries(tally.statusCounts).filter(([code]) => code.startsWith("5")).reduce((sum, [, count]) => sum + count, 0),
    errors: tally.errors,
    timeouts: tally.timeouts,
    statusCounts: tally.statusCounts,
    unexpected: tally.unexpected,
    unexpectedSamples: tally.unexpectedSamples,
    bytesPerResponse: perRequest(tally.bytes),
    workerCpuMsPerRequest: tally.workerCpuMs === undefined ? undefined : perRequest(tally.workerCpuMs),
    generatorCpuMsPerRequest: perRequest(tally.generatorCpuMs),
  };
}

/** Stops the running scenario; runScenarios then throws LoadInterrupted instead of reporting. */
export function stopScenarios(): void {
  stopped = true;
  for (const instance of activeRuns) instance.stop();
}

/**
 * Warms every scenario up, then runs them in `rounds` rounds, each round a
 * 1/rounds slice (in requests and in time) of every scenario in turn. Results
 * come in the order of `scenarios`.
 */
export async function runScenarios(url: string, scenarios: Scenario[], rounds: number, worker: WorkerProcesses, onProgress: (what: string) => void): Promise<ScenarioResult[]> {
  for (const scenario of scenarios) {
    if (stopped) throw new LoadInterrupted();
    if (scenario.warmup > 0) await drive(url, scenario, scenario.warmup, scenario.durationSeconds, emptyTally());
  }
  const tallies = scenarios.map(emptyTally);
  for (let round = 0; round < rounds; round++) {
    // Each round starts one scenario further on, so that none always follows the same one (a collection it left behind, say).
    for (let k = 0; k < scenarios.length; k++) {
      const i = (round + k) % scenarios.length;
      const scenario = scenarios[i]!;
      if (stopped) throw new LoadInterrupted();
      if (rounds === 1) onProgress(scenario.name);
      else if (k === 0) onProgress(`round ${round + 1} of ${rounds} of ${scenarios.map((s) => s.name).join("; ")}`);
      // The first slices take the remainder, so the slices add up to the scenario's amount.
      const amount = Math.floor(scenario.amount / rounds) + (round < scenario.amount % rounds ? 1 : 0);
      if (amount > 0) await measure(url, scenario, amount, scenario.durationSeconds / rounds, worker, tallies[i]!);
    }
  }
  if (stopped) throw new LoadInterrupted();
  return scenarios.map((scenario, i) => summarize(scenario.name, tallies[i]!));
}
