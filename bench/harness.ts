/**
 * A minimal timing harness for `npm run bench`: warm up, then time repeated
 * calls and report the median. Figures are for comparison within one run.
 */
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

/** Median of the timed runs, printed with its share of the budget when there is one. */
function report(name: string, times: number[], options: BenchOptions): BenchResult {
  times.sort((a, b) => a - b);
  const runs = times.length;
  const result: BenchResult = { name, medianMs: times[Math.floor(runs / 2)]!, runs, budgetMs: options.budgetMs };
  const budget = options.budgetMs !== undefined ? `  budget ${options.budgetMs} ms: ${result.medianMs <= options.budgetMs ? "within" : "OVER"} (${(result.medianMs / options.budgetMs).toFixed(2)} of budget)` : "";
  console.log(`${name.padEnd(60)} median ${result.medianMs.toFixed(2).padStart(9)} ms over ${runs} runs${budget}`);
  return result;
}

export function bench(name: string, fn: () => unknown, options: BenchOptions = {}): BenchResult {
  for (let i = 0; i < (options.warmup ?? 3); i++) fn();
  const times: number[] = [];
  for (let i = 0; i < (options.runs ?? 15); i++) {
    const start = performance.now();
    fn();
    times.push(performance.now() - start);
  }
  return report(name, times, options);
}

export async function benchAsync(name: string, fn: () => Promise<unknown>, options: BenchOptions = {}): Promise<BenchResult> {
  for (let i = 0; i < (options.warmup ?? 3); i++) await fn();
  const times: number[] = [];
  for (let i = 0; i < (options.runs ?? 15); i++) {
    const start = performance.now();
    await fn();
    times.push(performance.now() - start);
  }
  return report(name, times, options);
}
