/**
 * The checks a CRM skeleton must pass, given or calibrated (Lee & Cheung
 * 2009), shared by the crm design and the dose-finding comparison, whose
 * fields differ only by name.
 *
 * A skeleton value must lie above 0 and at most 0.999 of the highest DLT rate
 * the model can give (1 for the power model, 1/(1 + e^-a0) for the logistic
 * one), increasing with dose. Closer to that ceiling the dose's model
 * probability barely moves with the parameter a, data push the posterior of a
 * beyond the range the simulation's quadrature covers (|a| ≤ 24) and the
 * estimates lose their meaning; a calibrated skeleton with a wide half-width
 * reaches that range (or underflows to 0) a few doses from the prior MTD.
 */
import { type CrmModelKind, calibrateSkeleton, logisticCeiling } from "./crmModel.js";

/** Share of the model's ceiling a skeleton value may reach. */
export const SKELETON_CEILING_SHARE = 0.999;

type Issue = (path: PropertyKey[], message: string) => void;

/** The names of the skeleton fields in a design's inputs. */
export interface SkeletonFieldNames {
  target: string;
  skeleton: string;
  halfWidth: string;
  priorMtd: string;
}

export interface SkeletonSettings {
  model: CrmModelKind;
  intercept: number;
  target: number;
  skeleton?: number[] | undefined;
  halfWidth: number;
  /** Numbered from 1; the middle dose when absent. */
  priorMtd?: number | undefined;
}

/** The highest skeleton value the model admits. */
export function highestSkeletonValue(model: CrmModelKind, intercept: number): number {
  return SKELETON_CEILING_SHARE * (model === "logistic" ? logisticCeiling(intercept) : 1);
}

const fmt = (x: number): string => (x >= 1e-4 ? String(Number(x.toPrecision(6))) : x.toExponential(2));

/** Reports every problem of the skeleton (given, or calibrated from the target, half-width and prior MTD). */
export function checkCrmSkeleton(v: SkeletonSettings, doseCount: number, issue: Issue, names: SkeletonFieldNames): void {
  const ceiling = v.model === "logistic" ? logisticCeiling(v.intercept) : 1;
  const highest = highestSkeletonValue(v.model, v.intercept);
  const limitText = v.model === "logistic"
    ? `${fmt(highest)} (${SKELETON_CEILING_SHARE} of ${fmt(ceiling)}, the highest DLT rate the logistic model with intercept ${v.intercept} can give)`
    : `${highest}`;
  if (v.model === "logistic" && v.target >= ceiling) issue([names.target], `With intercept ${v.intercept} the logistic model cannot reach a DLT rate of ${ceiling.toFixed(4)} or more; lower the target or raise the intercept.`);
  if (v.skeleton) {
    const s = v.skeleton;
    if (s.length !== doseCount) issue([names.skeleton], `Give one skeleton value per dose: ${doseCount} doses but ${s.length} values.`);
    s.forEach((value, i) => {
      if (i > 0 && value <= s[i - 1]!) issue([names.skeleton, i], `The skeleton must increase with dose: ${value} at dose ${i + 1} is not above ${s[i - 1]} at dose ${i}.`);
      if (value > highest) issue([names.skeleton, i], `Every skeleton value must be at most ${limitText}: a prior guess this close to the ceiling leaves the model nothing to learn at that dose.`);
    });
    return;
  }
  const priorMtd = v.priorMtd ?? Math.ceil(doseCount / 2);
  let usable = true;
  if (priorMtd > doseCount) { issue([names.priorMtd], `The prior MTD must be one of the ${doseCount} doses.`); usable = false; }
  if (v.halfWidth >= v.target) { issue([names.halfWidth], `The half-width (${v.halfWidth}) must be below the target (${v.target}).`); usable = false; }
  if (v.target + v.halfWidth >= ceiling) { issue([names.halfWidth], `Target plus half-width (${v.target + v.halfWidth}) must be below ${v.model === "logistic" ? ceiling.toFixed(4) : 1}.`); usable = false; }
  if (!usable || v.target >= ceiling) return;
  const s = calibrateSkeleton(v.model, v.target, v.halfWidth, priorMtd - 1, doseCount, v.intercept);
  for (let i = 0; i < s.length; i++) {
    if (s[i]! > highest) {
      issue([names.halfWidth], `The calibrated skeleton reaches ${fmt(s[i]!)} at dose ${i + 1}, above ${limitText}: narrow the half-width, or choose a higher prior MTD.`);
      return;
    }
    // Far below the prior MTD the values underflow: to 0, or to equal subnormal numbers.
    if (!(s[i]! > 0) || (i > 0 && !(s[i]! > s[i - 1]!))) {
      issue([names.halfWidth], `The calibrated skeleton falls to 0 at dose ${i + 1}, too far below the prior MTD: narrow the half-width, or choose a lower prior MTD.`);
      return;
    }
  }
}
