/**
 * The timing harness of `npm run bench`, on tinybench: warm up, time repeated
 * calls in this process and report the median. Figures compare within one run.
 */
import { Bench } from "tinybench";

export interface BenchResult {
  name: string;
  /** Median wall time of the timed runs. */
  medianMs: number;
  /** Median CPU time (user + system) of this process over the same runs: less swayed by other work on the machine. */
  medianCpuMs: number;
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

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)] ?? Number.NaN;
}

/** Medians of the timed runs (wall and CPU), printed with the share of the budget when there is one; the budget is judged on CPU time. */
function report(name: string, b: Bench, cpu: number[], options: BenchOptions): BenchResult {
  const task = b.tasks[0]!;
  const result = task.result;
  if (!("latency" in result)) throw new Error(`${name}: no timings (${result.state})`);
  // The warm-up runs come first in the CPU samples; the timed ones are the last.
  const timed = cpu.slice(-result.latency.samplesCount);
  const out: BenchResult = { name, medianMs: result.latency.p50, medianCpuMs: median(timed), runs: result.latency.samplesCount, budgetMs: options.budgetMs };
  const budget = options.budgetMs !== undefined ? `  budget ${options.budgetMs} ms: ${out.medianCpuMs <= options.budgetMs ? "within" : "OVER"} (${(out.medianCpuMs / options.budgetMs).toFixed(2)} of budget)` : "";
  console.log(`${name.padEnd(60)} median ${out.medianMs.toFixed(2).padStart(9)} ms wall, ${out.medianCpuMs.toFixed(2).padStart(9)} ms CPU over ${out.runs} runs${budget}`);
  return out;
}

/** The CPU time of each call, in milliseconds. */
function cpuTimed<T>(fn: () => T, samples: number[]): () => T {
  return () => {
    const before = process.cpuUsage();
    try {
      return fn();
    } finally {
      const used = process.cpuUsage(before);
      samples.push((used.user + used.system) / 1000);
    }
  };
}

export function bench(name: string, fn: () => unknown, options: BenchOptions = {}): BenchResult {
  const b = timer(name, options);
  const cpu: number[] = [];
  const timed = cpuTimed(fn, cpu);
  b.add(name, () => { timed(); });
  b.runSync();
  return report(name, b, cpu, options);
}

export async function benchAsync(name: string, fn: () => Promise<unknown>, options: BenchOptions = {}): Promise<BenchResult> {
  const b = timer(name, options);
  const cpu: number[] = [];
  b.add(name, async () => {
    // CPU time over an await includes whatever else the process ran meanwhile; these benches await nothing slow.
    const before = process.cpuUsage();
    await fn();
    const used = process.cpuUsage(before);
    cpu.push((used.user + used.system) / 1000);
  });
  await b.run();
  return report(name, b, cpu, options);
}
