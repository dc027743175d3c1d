/**
 * `npm run load`: the Worker under `wrangler dev`, driven over loopback by
 * autocannon, each scenario bounded in requests and in time.
 *
 * - trivial route (GET /api/v1/health): touches neither storage nor designs, so
 *   its throughput is the ceiling of the runtime, wrangler dev's proxy and the
 *   load generator on this machine; the other routes are read against it.
 * - cached permalink, HTML, JSON and PDF (GET /c/{id}[.json|.pdf]): one frozen
 *   calculation read again and again, what a shared link costs. After its
 *   first read the Worker keeps the verified record and the drawn page in
 *   memory, so HTML and JSON touch no storage; the PDF, drawn once before the
 *   run, comes back from KV.
 * - fresh calculations (POST /api/v1/designs/{id}/calculations), one scenario
 *   per design: its example under a new label each request, so every answer is
 *   validated, computed, sealed and stored (201), never served from the store.
 *
 * With --explain, three more routes run interleaved with those four and take a
 * cached permalink apart (explainScenarios).
 *
 * The Worker is built from a copy of the sources taken at the start, so edits
 * saved meanwhile do not restart it mid-run. Figures are compared as ratios
 * within one run: the load generator and the Worker share this machine's
 * cores, and so does whatever else it is running.
 * The run fails on any connection error, timeout, non-2xx or 5xx answer, on an
 * answer that is not the one measured, and when neither cached HTML nor JSON
 * reaches 0.70 of the trivial route's throughput.
 */
import { availableParallelism, cpus, loadavg } from "node:os";
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import type { describeDesign } from "../src/api/designs.js";
import { RENDERING_HEADER } from "../src/api/renderingHeader.js";
import { type RunningWorker, startWorker } from "../test/browser/server.js";
import { type LoadOptions, USAGE, parseOptions } from "./load/options.js";
import { type Check, type Comparison, checks, cpuRatios, formatBreakdown, formatRatios, formatTable, formatUnexpected, ratios } from "./load/report.js";
import { idleCpuMsPerSecond } from "./load/processCpu.js";
import { type Scenario, type WorkerProcesses, runScenarios, stopScenarios } from "./load/scenario.js";
import { snapshotWorkerSources } from "./load/snapshot.js";

const root = resolve(import.meta.dirname, "..");
/** Long enough to average wrangler's periodic background work. */
const IDLE_MEASURE_MS = 3000;

/** The parts of a catalog entry (GET /api/v1/designs) the load test reads. */
type CatalogEntry = Pick<ReturnType<typeof describeDesign>, "id" | "example" | "links">;

function header(headers: Record<string, string | string[]>, name: string): string | undefined {
  const key = Object.keys(headers).find((k) => k.toLowerCase() === name.toLowerCase());
  const value = key === undefined ? undefined : headers[key];
  return Array.isArray(value) ? value[0] : value;
}

function expectStatus(expected: number, why: string): Scenario["unexpected"] {
  return (status) => (status === expected ? undefined : why);
}

function version(pkg: string): string {
  return (JSON.parse(readFileSync(resolve(root, "node_modules", pkg, "package.json"), "utf8")) as { version: string }).version;
}

function loadAverage(): string {
  return loadavg().map((l) => l.toFixed(2)).join(" ");
}

function describeMachine(): string {
  const cores = availableParallelism();
  return [
    `machine: ${cores} cores (${cpus()[0]?.model.trim() ?? "unknown processor"}), Node ${process.version}, wrangler ${version("wrangler")}, autocannon ${version("autocannon")}`,
    `the load generator (this Node process, one thread) and the Worker (wrangler dev and workerd) share these ${cores} cores, with anything else running; load average at start ${loadAverage()}`,
  ].join("\n");
}

async function post(url: string, body: unknown): Promise<{ status: number; json: { id?: string; digest?: string } }> {
  const response = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  return { status: response.status, json: await response.json() as { id?: string; digest?: string } };
}

/** Freezes the permalink design's example once and draws its PDF once, so the permalink scenarios read only stored data. */
async function preparePermalink(url: string, design: CatalogEntry): Promise<{ id: string; digest: string }> {
  const { status, json } = await post(`${url}${design.links.calculations}`, { inputs: design.example, label: "Load test permalink" });
  if (status !== 201 || !json.id || !json.digest) throw new Error(`freezing the ${design.id} example answered ${status}: ${JSON.stringify(json)}`);
  const pdf = await fetch(`${url}/c/${json.id}.pdf`);
  await pdf.arrayBuffer();
  if (pdf.status !== 200) throw new Error(`drawing the PDF answered ${pdf.status}`);
  return { id: json.id, digest: json.digest };
}

const COMPARISON: Comparison = { trivial: "trivial route", html: "cached permalink, HTML", json: "cached permalink, JSON", pdf: "cached permalink, PDF" };

/** Sizes of every scenario compared with the trivial route. */
function readSizes(options: LoadOptions): Pick<Scenario, "connections" | "amount" | "durationSeconds" | "warmup"> {
  return { connections: options.connections, amount: options.amount, durationSeconds: options.durationSeconds, warmup: options.warmup };
}

/** The trivial route and the cached permalinks, compared with one another. */
function readScenarios(options: LoadOptions, id: string): Scenario[] {
  const sizes = readSizes(options);
  const ok = expectStatus(200, "not 200");
  return [
    { name: COMPARISON.trivial, ...sizes, request: { method: "GET", path: "/api/v1/health" }, unexpected: ok },
    { name: COMPARISON.html, ...sizes, request: { method: "GET", path: `/c/${id}` }, unexpected: ok },
    { name: COMPARISON.json, ...sizes, request: { method: "GET", path: `/c/${id}.json` }, unexpected: ok },
    {
      name: COMPARISON.pdf, ...sizes, request: { method: "GET", path: `/c/${id}.pdf` },
      unexpected: (status, headers) => ok(status, headers) ?? (header(headers, RENDERING_HEADER) === "cached" ? undefined : "PDF drawn again instead of read from KV"),
    },
  ];
}

/**
 * What a cached permalink is made of, beside the trivial route: the record
 * found in memory and answered without a body (a revalidation, 304), a
 * storage read that finds nothing (404), and a JSON body built in memory
 * without storage (the design's description).
 */
function explainScenarios(options: LoadOptions, id: string, digest: string, design: CatalogEntry): Scenario[] {
  const sizes = readSizes(options);
  return [
    { name: "permalink JSON revalidated (304: from memory, no body)", ...sizes, request: { method: "GET", path: `/c/${id}.json`, headers: { "if-none-match": `"${digest}"` } }, unexpected: expectStatus(304, "not 304") },
    { name: "unknown permalink (404: KV read, nothing found)", ...sizes, request: { method: "GET", path: `/c/c_${"0".repeat(32)}.json` }, unexpected: expectStatus(404, "not 404") },
    { name: "design description (JSON from memory, no KV)", ...sizes, request: { method: "GET", path: `/api/v1/designs/${design.id}` }, unexpected: expectStatus(200, "not 200") },
  ];
}

/** Each design's example under a new label each request. */
function freshScenarios(options: LoadOptions, designs: CatalogEntry[]): Scenario[] {
  return designs.map((design) => {
    let sent = 0;
    return {
      name: `fresh calculation, ${design.id}`,
      connections: options.freshConnections, amount: options.freshAmount, durationSeconds: options.freshDurationSeconds, warmup: options.freshWarmup,
      request: {
        method: "POST",
        path: design.links.calculations,
        headers: { "content-type": "application/json" },
        // The label is part of the id, so a new label each request makes each one a new calculation.
        setupRequest: (request) => ({ ...request, body: JSON.stringify({ inputs: design.example, label: `Load test ${design.id} ${++sent}` }) }),
      },
      unexpected: expectStatus(201, "not a new calculation (201)"),
    };
  });
}

function progress(what: string): void {
  process.stderr.write(`running: ${what}\n`);
}

function printChecks(list: Check[]): void {
  for (const check of list) console.log(`${check.passed ? "pass" : "FAIL"}  ${check.name}: ${check.detail}`);
}

let interrupted = false;

/** Ctrl-C stops the running scenario so that the Worker is stopped and its store removed; a second one leaves at once. */
function interrupt(): void {
  if (interrupted) process.exit(130);
  interrupted = true;
  console.error("\ninterrupted: stopping the load and the Worker");
  stopScenarios();
}

async function main(): Promise<number> {
  const options = parseOptions(process.argv.slice(2), process.env);
  if (options === "help") {
    console.log(USAGE);
    return 0;
  }
  console.log(describeMachine());
  const snapshot = snapshotWorkerSources(root);
  let worker: RunningWorker | undefined;
  try {
    worker = await startWorker(snapshot.root);
    const catalog = (await (await fetch(`${worker.url}/api/v1/designs`)).json() as { designs: CatalogEntry[] }).designs;
    const permalinkDesign = catalog.find((d) => d.id === options.permalinkDesign);
    if (!permalinkDesign) throw new Error(`no design ${options.permalinkDesign} in the catalog`);
    const unknown = options.designs.filter((d) => !catalog.some((c) => c.id === d));
    if (unknown.length > 0) throw new Error(`no design ${unknown.join(", ")} in the catalog`);
    const { id, digest } = await preparePermalink(worker.url, permalinkDesign);
    console.log(`permalink: /c/${id} (the ${permalinkDesign.id} example); Worker at ${worker.url}`);
    const idle = await idleCpuMsPerSecond(worker.processGroup, IDLE_MEASURE_MS);
    const processes: WorkerProcesses = { group: worker.processGroup, idleCpuMsPerSecond: idle ?? 0 };
    console.log(idle === undefined
      ? "CPU time of the Worker's processes: not available (no /proc)"
      : `the Worker's processes use ${idle.toFixed(1)} ms of CPU a second when idle (file watching, bundler service); the per-request CPU figures leave it out`);
    console.log(`sizes${options.quick ? " (quick)" : ""}: trivial and cached ${options.connections} connections, at most ${options.amount} requests or ${options.durationSeconds} s after ${options.warmup} unmeasured; ` +
      `fresh ${options.freshConnections} connections, at most ${options.freshAmount} requests or ${options.freshDurationSeconds} s after ${options.freshWarmup} unmeasured, per design\n`);

    const fresh = options.designs.length > 0 ? catalog.filter((d) => options.designs.includes(d.id)) : catalog;
    const reads = readScenarios(options, id);
    const explained = options.explain ? explainScenarios(options, id, digest, permalinkDesign) : [];
    const readResults = await runScenarios(worker.url, [...reads, ...explained], options.rounds, processes, progress);
    const results = [
      ...readResults.slice(0, reads.length),
      ...await runScenarios(worker.url, freshScenarios(options, fresh), 1, processes, progress),
    ];

    console.log(formatTable(results));
    console.log(`\n${formatRatios("throughput over the trivial route's", ratios(results, COMPARISON))}`);
    const byCpu = cpuRatios(results, COMPARISON);
    if (byCpu) console.log(formatRatios("trivial route's CPU per answer over (Worker and load generator)", byCpu));
    console.log(`load average at end ${loadAverage()}\n`);
    const outcome = checks(results, COMPARISON);
    printChecks(outcome);
    const failed = outcome.some((c) => !c.passed);
    if (options.explain) console.log(`\nwhat a cached permalink is made of (run interleaved with the routes above; CPU of the Worker and the load generator):\n${formatBreakdown(readResults, COMPARISON.trivial)}`);
    if (failed) {
      const unexpected = formatUnexpected(results);
      if (unexpected) console.log(`\nanswers behind the failures:\n${unexpected}`);
    }
    return failed ? 1 : 0;
  } finally {
    await worker?.stop();
    snapshot.remove();
  }
}

for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.on(signal, interrupt);
try {
  process.exitCode = await main();
} catch (error) {
  console.error(error instanceof Error ? error.message : error);
  if (error instanceof TypeError && "code" in error && String(error.code).startsWith("ERR_PARSE_ARGS")) console.error("npm run load -- --help lists the options");
  process.exitCode = interrupted ? 130 : 1;
}
