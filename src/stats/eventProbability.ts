/**
 * Expected events under exponential survival, exponential loss to follow-up and
 * uniform accrual (Lachin JM, Foulkes MA 1986, Biometrics 42:507-519, section 3).
 *
 * A participant followed for time u has had the event by then with probability
 *   F(u) = λ/φ · (1 − e^{−φu}),  φ = λ + η,
 * where λ is the event hazard and η the hazard of loss to follow-up (a lost
 * participant contributes no event). Entry times are uniform on [0, R]; at
 * calendar time s a participant who entered at e has been followed for s − e.
 * The expected fraction of all R-year enrolment with an event by s is
 *   (1/R) ∫_{max(0, s−R)}^{s} F(u) du = (H(s) − H(max(0, s − R))) / R,
 *   H(t) = ∫_0^t F(u) du = λ/φ · (t − (1 − e^{−φt})/φ).
 * At the end of the study, s = R + followUp, this is the probability of an event.
 * After accrual (s ≥ R) it is computed in the equivalent closed form
 *   λ/φ · (1 − e^{−φ(s−R)} · (1 − e^{−φR}) / (φR)),
 * which keeps its precision when the accrual period is short.
 */

/** t − (1 − e^{−φt})/φ without cancellation when φt is small. */
function excessOverExponential(t: number, phi: number): number {
  const x = phi * t;
  if (x < 1e-4) return t * x * (0.5 - x / 6 + (x * x) / 24);
  return t + Math.expm1(-x) / phi;
}

/** H(t) = ∫_0^t F(u) du; H(t) = 0 for t ≤ 0. */
function integratedIncidence(t: number, eventHazard: number, lossHazard: number): number {
  if (t <= 0) return 0;
  const phi = eventHazard + lossHazard;
  return (eventHazard / phi) * excessOverExponential(t, phi);
}

export interface AccrualModel {
  /** Event hazard λ per year (ln 2 / median for exponential survival). */
  eventHazard: number;
  /** Hazard of loss to follow-up η per year (0 for none). */
  lossHazard: number;
  /** Length R of uniform accrual, years (> 0). */
  accrualYears: number;
}

/**
 * Expected fraction of the arm's eventual enrolment that has had an event by
 * calendar time `years` after the first participant enters.
 */
export function expectedEventFraction(years: number, model: AccrualModel): number {
  if (years <= 0) return 0;
  const { eventHazard, lossHazard, accrualYears } = model;
  if (years <= accrualYears) return integratedIncidence(years, eventHazard, lossHazard) / accrualYears;
  const phi = eventHazard + lossHazard;
  const x = phi * accrualYears;
  // (1 − e^{−x})/x, by its series where the subtraction would cancel.
  const averageSurvivalFactor = x < 1e-8 ? 1 - x / 2 : -Math.expm1(-x) / x;
  return (eventHazard / phi) * (1 - Math.exp(-phi * (years - accrualYears)) * averageSurvivalFactor);
}

/** Probability that a participant has an observed event by the end of the study (accrual + follow-up). */
export function eventProbability(model: AccrualModel, followUpYears: number): number {
  return expectedEventFraction(model.accrualYears + followUpYears, model);
}

/** Fraction of the eventual enrolment already enrolled at calendar time `years`. */
export function enrolledFraction(years: number, accrualYears: number): number {
  return Math.min(1, Math.max(0, years / accrualYears));
}
