/**
 * The contract every design in the catalog fulfils. One design, one file;
 * catalog.ts lists them.
 */
import type { ZodType } from "zod";
import type { Section } from "../report/document.js";

export type Stage = "dose-finding" | "activity" | "comparative" | "monitoring";

export interface Citation {
  /** Short key, as used in the report: "Lenth 1989". */
  key: string;
  /** Full reference: authors, year, title, journal, volume, pages. */
  text: string;
  doi?: string;
}

export interface Design<I = unknown, R = unknown> {
  /** url-safe, the method's usual name: "simon-two-stage" */
  id: string;
  /** Bump when the same inputs could give a different result. */
  version: number;
  stage: Stage;
  title: string;
  /** One sentence for the catalog page. */
  summary: string;
  /** Bounds, defaults and a description on every field; strict (unknown fields rejected). */
  input: ZodType<I>;
  /** A scenario of our own. */
  example: I;
  /** Pure and deterministic; simulations take a seed. Throws InfeasibleDesignError. */
  compute(input: I): R;
  /**
   * What compute(input) would cost, estimated from the inputs alone and cheaply,
   * before computing: the service refuses (422) an input whose estimate is above
   * COMPUTE_BUDGET_MS (budget.ts) instead of running into the Worker's CPU limit.
   */
  cost(input: I): WorkEstimate;
  /** The clinical question in plain words, filled in from the inputs. */
  question(input: I): string;
  /** What the report shows, after the question and inputs. */
  document(input: I, result: R): Section[];
  references: Citation[];
  cautions: string[];
}

/** The work of one calculation, estimated before it is done. */
export interface WorkEstimate {
  /**
   * CPU milliseconds on the reference machine (the one `npm run bench` reports),
   * an upper estimate: the design's count of work times a cost per unit measured
   * on its heaviest cases.
   */
  milliseconds: number;
  /** How the work was counted, in words a user can act on: "2 scenarios × 500 trials × 10 cohorts × 5 doses". */
  breakdown: string;
  /** Input fields whose reduction reduces the work, the most effective first (names within inputs). */
  reduce: string[];
}

/**
 * Valid inputs for which no design meets the constraints within the bounds
 * (HTTP 422). `field` names the input to change, which the 422 points to.
 */
export class InfeasibleDesignError extends Error {
  constructor(
    message: string,
    readonly details: { field: string } & Record<string, unknown>,
  ) {
    super(message);
    this.name = "InfeasibleDesignError";
  }
}

/** Erases the type parameters for the catalog. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type AnyDesign = Design<any, any>;

export function defineDesign<I, R>(design: Design<I, R>): Design<I, R> {
  return design;
}
