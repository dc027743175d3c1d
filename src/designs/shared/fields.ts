/** Input fields with the same meaning across comparative designs: one definition each. */
import { z } from "zod";

export const probabilityField = (description: string) => z.number().gt(0).lt(1).describe(description);

export const comparativeCommonFields = {
  alpha: z.number().min(1e-6, "Alpha must be at least 0.000001 (1e-6): smaller levels are beyond what the normal and t quantiles resolve.").max(0.5).default(0.05)
    .describe("Type I error rate: the probability of declaring a difference when there is none (for a two-sided test, split between the two tails); from 1e-6 to 0.5."),
  power: z.number().gt(0).lt(1).default(0.8)
    .describe("Target probability of a positive result when the assumed effect is true (1 - beta)."),
  sides: z.union([z.literal(1), z.literal(2)]).optional()
    .describe("1 for a one-sided test, 2 for two-sided. Superiority defaults to 2; non-inferiority and equivalence are one-sided."),
  allocationRatio: z.number().min(0.1).max(10).default(1)
    .describe("Allocation ratio n2/n1: experimental-arm participants per control-arm participant."),
  dropout: z.number().min(0).max(0.9).default(0)
    .describe("Fraction of enrolled participants expected to be lost (0.1 is 10%); enrolment is inflated to n/(1 - dropout) per arm."),
};

export const solveForField = z.enum(["sample-size", "power", "difference"]).default("sample-size")
      .meta({ title: "What to work out" })
  .describe("What to compute: the sample size for a target power, the power at given arm sizes, or the smallest difference detectable at given arm sizes.");

/** A group size given when solving for power or for the difference. */
export const groupSizeField = (description: string, maximum: number, minimum = 2) =>
  z.number().int().min(minimum).max(maximum).optional().describe(description);

interface CommonTargets { alpha: number; power: number; sides?: 1 | 2 | undefined; hypothesis: string }

/** Cross-field rules shared by the comparative designs, reported on the field to change. */
export function checkComparativeCommon(v: CommonTargets, ctx: z.RefinementCtx): void {
  if (v.power <= v.alpha) {
    ctx.addIssue({ code: "custom", path: ["power"], message: "Power must exceed alpha: a test that rejects no more often than chance is not a test." });
  }
  if (v.hypothesis !== "superiority" && v.sides === 2) {
    ctx.addIssue({ code: "custom", path: ["sides"], message: `A ${v.hypothesis} test is one-sided at level alpha: set sides to 1 (a one-sided 0.025 matches a two-sided 0.05).` });
  }
}
