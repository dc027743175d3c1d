/**
 * The one-parameter dose-toxicity models of the continual reassessment method
 * (O'Quigley, Pepe & Fisher 1990) and the skeleton calibration of Lee & Cheung
 * (2009).
 *
 * Models, with skeleton s_i (the prior guess of the DLT probability at dose i)
 * and parameter a with a normal prior N(0, σ²):
 * - power ("empiric"): p_i(a) = s_i^exp(a);
 * - one-parameter logistic: p_i(a) = 1 / (1 + exp(-(a0 + exp(a) x_i))) with a
 *   fixed intercept a0 (3 by default, the usual convention) and dose labels
 *   x_i = logit(s_i) - a0 backed out from the skeleton, so that p_i(0) = s_i.
 * Both are decreasing in a at every dose (for the logistic model because every
 * s_i < 1/(1 + e^-a0), so that x_i < 0), which is what makes a credible
 * interval for a map to one for p_i, and P(p_1 > target) = P(a < a*).
 *
 * Calibration (Lee & Cheung 2009, Clinical Trials 6:227-238): the skeleton is
 * chosen so that, for every a at which the CRM switches its recommendation
 * from dose i to dose i + 1, p_i(a) = target - δ and p_{i+1}(a) = target + δ:
 * each dose is then recommended exactly while its model probability lies in
 * the indifference interval target ± δ. Starting from s_ν = target at the
 * prior MTD ν, this gives for the power model
 *   log s_{i+1} = log s_i · log(target + δ) / log(target - δ),
 * and for the logistic model x_{i+1} = x_i (logit(target + δ) - a0) / (logit(target - δ) - a0).
 */

export type CrmModelKind = "power" | "logistic";

export interface CrmModel {
  kind: CrmModelKind;
  skeleton: readonly number[];
  /** a0 of the logistic model (unused by the power model). */
  intercept: number;
  /** Variance σ² of the normal prior on a. */
  priorVariance: number;
}

const logit = (p: number): number => Math.log(p / (1 - p));

/** Per-dose constants: log s_i (power) or x_i = logit(s_i) - a0 (logistic); all negative. */
export function doseConstants(model: CrmModel): Float64Array {
  return Float64Array.from(model.skeleton, (s) => (model.kind === "power" ? Math.log(s) : logit(s) - model.intercept));
}

/** p_i(a) for one dose constant. */
export function doseProbability(kind: CrmModelKind, constant: number, intercept: number, a: number): number {
  const t = Math.exp(a);
  return kind === "power" ? Math.exp(t * constant) : 1 / (1 + Math.exp(-(intercept + t * constant)));
}

/** The a at which p_i(a) = p (p_i decreases in a). */
export function parameterForProbability(kind: CrmModelKind, constant: number, intercept: number, p: number): number {
  return kind === "power" ? Math.log(Math.log(p) / constant) : Math.log((logit(p) - intercept) / constant);
}

/** The highest probability the logistic model can give at any dose: 1/(1 + e^-a0). */
export function logisticCeiling(intercept: number): number {
  return 1 / (1 + Math.exp(-intercept));
}

/**
 * Skeleton of Lee & Cheung (2009) from the target, the half-width δ of the
 * indifference interval and the prior MTD (index from 0).
 */
export function calibrateSkeleton(kind: CrmModelKind, target: number, halfWidth: number, priorMtd: number, doseCount: number, intercept = 3): number[] {
  const low = target - halfWidth;
  const high = target + halfWidth;
  const ratio = kind === "power" ? Math.log(high) / Math.log(low) : (logit(high) - intercept) / (logit(low) - intercept);
  const constants = new Array<number>(doseCount);
  constants[priorMtd] = kind === "power" ? Math.log(target) : logit(target) - intercept;
  for (let i = priorMtd + 1; i < doseCount; i++) constants[i] = constants[i - 1]! * ratio;
  for (let i = priorMtd - 1; i >= 0; i--) constants[i] = constants[i + 1]! / ratio;
  return constants.map((c) => (kind === "power" ? Math.exp(c) : 1 / (1 + Math.exp(-(intercept + c)))));
}
