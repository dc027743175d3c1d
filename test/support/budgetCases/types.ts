// Inputs at the edge of the compute budget, per design: what `npm run bench`
// times against the budget, and what the tests expect the service to refuse.

export interface BudgetCase {
  name: string;
  /** Valid inputs for the design's schema (defaults may be left out). */
  inputs: Record<string, unknown>;
}

export interface OverBudgetCase extends BudgetCase {
  /** A field the 422 must name among those to reduce. */
  reduces: string;
}

export interface DesignBudgetCases {
  /** The costliest inputs the budget admits, each computed within the budget on the reference machine. */
  heaviest: BudgetCase[];
  /** Valid inputs just beyond the budget: refused with 422 before computing. */
  overBudget: OverBudgetCase[];
  /** When no valid input can exceed the budget (overBudget empty): why, in one sentence. */
  boundedBySchema?: string;
}

export type BudgetCaseTable = Record<string, DesignBudgetCases>;
