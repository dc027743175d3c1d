/**
 * The compute budget: the most CPU one calculation may take. Every design
 * estimates its cost from the inputs (Design.cost) before computing, and an
 * estimate above the budget is refused with what to reduce.
 *
 * 2.5 seconds of CPU on the reference machine (the one `npm run bench`
 * reports): the heaviest figure a design must meet is 10,000 simulated CRM
 * trials of 30 patients over 5 doses within 2 s, and its estimate carries the
 * CRM's safety factor above that. It leaves the Worker's CPU limit (30 s by
 * default on the Standard usage model) a wide margin for slower hosts and for
 * a fresh isolate's compilation, which no estimate counts.
 */
import type { AnyDesign, WorkEstimate } from "./design.js";

export const COMPUTE_BUDGET_MS = 2500;

/** A calculation whose estimated work is above the budget. */
export class OverBudgetError extends Error {
  constructor(
    design: string,
    readonly estimate: WorkEstimate,
  ) {
    super(`This ${design} calculation would need about ${formatSeconds(estimate.milliseconds)} of computing (${estimate.breakdown}), above the ${formatSeconds(COMPUTE_BUDGET_MS)} one calculation may take.` +
      (estimate.reduce.length > 0 ? ` Reduce ${listInWords(estimate.reduce)}.` : ""));
    this.name = "OverBudgetError";
  }
}

/** Throws OverBudgetError when the design's estimate for these (validated) inputs is above the budget; NaN counts as above. */
export function assertWithinBudget(design: AnyDesign, inputs: unknown): void {
  const estimate = design.cost(inputs);
  if (!(estimate.milliseconds <= COMPUTE_BUDGET_MS)) throw new OverBudgetError(design.id, estimate);
}

function formatSeconds(ms: number): string {
  if (!Number.isFinite(ms)) return "an unbounded time";
  return ms < 1000 ? `${Math.max(1, Math.round(ms))} ms` : `${(ms / 1000).toPrecision(ms < 10_000 ? 2 : 3).replace(/\.0$/, "")} s`;
}

function listInWords(fields: string[]): string {
  const named = fields.map((f) => `"${f}"`);
  return named.length <= 1 ? named.join("") : `${named.slice(0, -1).join(", ")} or ${named.at(-1)}`;
}
