/**
 * Input fields shared by the single-arm response-rate designs (single-stage
 * binomial, Simon's two-stage): the uninteresting rate p0, the target rate p1,
 * and the error rates of the one-sided test of p ≤ p0 against p ≥ p1.
 */
import { z } from "zod";
import { probabilityField } from "./fields.js";

/**
 * Every response-rate design meets its alpha and power targets within this
 * absolute slack, so that rounding in the last digits of an exact tail does not
 * flip a design on its boundary; the searches and the rules they compare with
 * must share it.
 */
export const TARGET_SLACK = 1e-12;

export const responseRateFields = {
  p0: probabilityField("Response rate too low to be of interest (the null rate p0), as a proportion between 0 and 1: a drug this active should be stopped."),
  p1: probabilityField("Response rate worth pursuing (the target rate p1), as a proportion between 0 and 1; it must exceed p0."),
  // Exact tails are summed to about 1e-12 and constraints are met within TARGET_SLACK,
  // so an alpha or a 1 - power below 1e-6 would be decided by rounding.
  alpha: z.number().min(1e-6, "Alpha must be at least 0.000001: smaller error rates are below the precision of the exact search.").max(0.5).default(0.05)
    .describe("Largest accepted probability of declaring the drug promising when its true response rate is p0 (one-sided type I error)."),
  power: z.number().gt(0).max(0.999999, "Power must be at most 0.999999: closer to 1 is below the precision of the exact search.").default(0.8)
    .describe("Smallest accepted probability of declaring the drug promising when its true response rate is p1 (1 - beta)."),
};

interface RateTargets { p0: number; p1: number; alpha: number; power: number }

/** The cross-field rules every response-rate design shares, reported on the field to change. */
export function checkResponseRates(v: RateTargets, ctx: z.RefinementCtx): void {
  if (v.p1 <= v.p0) {
    ctx.addIssue({ code: "custom", path: ["p1"], message: `The target response rate p1 (${v.p1}) must be higher than the uninteresting rate p0 (${v.p0}).` });
  }
  if (v.power <= v.alpha) {
    ctx.addIssue({ code: "custom", path: ["power"], message: "Power must exceed alpha: a rule that declares promise no more often at p1 than at p0 cannot tell them apart." });
  }
}
