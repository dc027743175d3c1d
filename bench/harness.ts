/**
 * The timing harness of `npm run bench`, on tinybench: warm up, time repeated
 * calls in this process and report the median. Figures compare within one run.
 */
import { Bench } from "tinybench";

export interface BenchResult {
  name: string;
  medianMs: number;
  runs: number;
  budgetMs?: number;
}

interface BenchOptions {
  runs?: number;
  warmup?: number;
  budgetMs?: number;
}

function timer(name: string, options: BenchOptions): Bench {
  // Exactly `runs` timed calls: the time budget is zero, so the iteration count decides.
  return new Bench({ name, iterations: options.runs ?? 15, time: 0, warmupIterations: options.warmup ?? 3, warmupTime: 0, throws: true });
}

/** Median of the timed runs, printed with its share of the budget when there is one. */
function report(name: string, b: Bench, options: BenchOptions): BenchResult {
  const task = b.tasks[0]!;
  const result = task.result;
  if (!("latency" in result)) throw new Error(`${name}: no timings (${result.state})`);
  const out: BenchResult = { name, medianMs: result.latency.p50, runs: result.latency.samplesCount, budgetMs: options.budgetMs };
  const budget = options.budgetMs !== undefined ? `  budget ${options.budgetMs} ms: ${out.medianMs <= options.budgetMs ? "within" : "OVER"} (${(out.medianMs / options.budgetMs).toFixed(2)} of budget)` : "";
  console.log(`${name.padEnd(60)} median ${out.medianMs.toFixed(2).padStart(9)} ms over ${out.runs} runs${budget}`);
  return out;
}

export function bench(name: string, fn: () => unknown, options: BenchOptions = {}): BenchResult {
  const b = timer(name, options);
  b.add(name, () => { fn(); });
  b.runSync();
  return report(name, b, options);
}

export async function benchAsync(name: string, fn: () => Promise<unknown>, options: BenchOptions = {}): Promise<BenchResult> {
  const b = timer(name, options);
  b.add(name, async () => { await fn(); });
  await b.run();
  return report(name, b, options);
}
