/**
 * The exact single-stage binomial rule at a given size (A'Hern 2001,
 * Statistics in Medicine 20:859-866): declare promise when at least r of n
 * respond, r the smallest count whose probability under p0 keeps alpha
 * (within an absolute 1e-12), which makes it the most powerful at that n.
 */
import { binomialUpperTails } from "./twoStage.js";
import { TARGET_SLACK } from "./responseRates.js";

export interface SingleStageRule {
  n: number;
  /** Declare promising if at least r respond. */
  r: number;
  alpha: number;
  power: number;
}

/** The smallest critical count keeping alpha at size n, with its exact alpha and power. */
export function singleStageRuleAt(n: number, p0: number, p1: number, alpha: number): SingleStageRule {
  const t0 = binomialUpperTails(n, p0);
  let r = 0;
  while (t0[r]! > alpha + TARGET_SLACK) r++;
  return { n, r, alpha: t0[r]!, power: binomialUpperTails(n, p1)[r]! };
}
