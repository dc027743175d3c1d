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

export function bench(name: string, fn: () => unknown, options: { runs?: number; warmup?: number; budgetMs?: number } = {}): BenchResult {
  const runs = options.runs ?? 15;
  for (let i = 0; i < (options.warmup ?? 3); i++) fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    fn();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const result: BenchResult = { name, medianMs: times[Math.floor(runs / 2)]!, runs, budgetMs: options.budgetMs };
  const budget = options.budgetMs !== undefined ? `  budget ${options.budgetMs} ms: ${result.medianMs <= options.budgetMs ? "within" : "OVER"} (${(result.medianMs / options.budgetMs).toFixed(2)} of budget)` : "";
  console.log(`${name.padEnd(60)} median ${result.medianMs.toFixed(2).padStart(9)} ms over ${runs} runs${budget}`);
  return result;
}

export async function benchAsync(name: string, fn: () => Promise<unknown>, options: { runs?: number; warmup?: number; budgetMs?: number } = {}): Promise<BenchResult> {
  const runs = options.runs ?? 15;
  for (let i = 0; i < (options.warmup ?? 3); i++) await fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await fn();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const result: BenchResult = { name, medianMs: times[Math.floor(runs / 2)]!, runs, budgetMs: options.budgetMs };
  const budget = options.budgetMs !== undefined ? `  budget ${options.budgetMs} ms: ${result.medianMs <= options.budgetMs ? "within" : "OVER"} (${(result.medianMs / options.budgetMs).toFixed(2)} of budget)` : "";
  console.log(`${name.padEnd(60)} median ${result.medianMs.toFixed(2).padStart(9)} ms over ${runs} runs${budget}`);
  return result;
}
