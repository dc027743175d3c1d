/**
 * The compute budget: the most CPU one calculation may take. Every design
 * estimates its cost from the inputs (Design.cost) before computing, and an
 * estimate above the budget is refused with what to reduce.
 *
 * Two seconds on the reference machine is the figure the heaviest published
 * use asks for (10,000 simulated CRM trials of 30 patients over 5 doses), and
 * leaves a Worker's CPU limit (30 s by default on the Standard usage model,
 * wrangler.toml `[limits]`) a wide margin for slower hosts.
 */
import type { AnyDesign, WorkEstimate } from "./design.js";

export const COMPUTE_BUDGET_MS = 2000;

/** A calculation whose estimated work is above the budget. */
export class OverBudgetError extends Error {
  constructor(
    readonly design: string,
    readonly estimate: WorkEstimate,
  ) {
    super(`This ${design} calculation would need about ${formatSeconds(estimate.milliseconds)} of computing (${estimate.breakdown}), above the ${formatSeconds(COMPUTE_BUDGET_MS)} one calculation may take.` +
      (estimate.reduce.length > 0 ? ` Reduce ${listInWords(estimate.reduce)}.` : ""));
    this.name = "OverBudgetError";
  }
}

/** The design's estimate for these (validated) inputs; a design without an estimator is treated as free. */
export function estimateWork(design: AnyDesign, inputs: unknown): WorkEstimate | undefined {
  return design.cost?.(inputs);
}

/** Throws OverBudgetError when the estimate is above the budget. */
export function assertWithinBudget(design: AnyDesign, inputs: unknown): void {
  const estimate = estimateWork(design, inputs);
  if (estimate && !(estimate.milliseconds <= COMPUTE_BUDGET_MS)) throw new OverBudgetError(design.id, estimate);
}

function formatSeconds(ms: number): string {
  if (!Number.isFinite(ms)) return "an unbounded time";
  return ms < 1000 ? `${Math.max(1, Math.round(ms))} ms` : `${(ms / 1000).toPrecision(ms < 10_000 ? 2 : 3).replace(/\.0$/, "")} s`;
}

function listInWords(fields: string[]): string {
  const named = fields.map((f) => `"${f}"`);
  return named.length <= 1 ? named.join("") : `${named.slice(0, -1).join(", ")} or ${named.at(-1)}`;
}
