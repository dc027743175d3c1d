/**
 * Group-sequential boundaries on the Z scale, solved look by look with the
 * recursion of groupSequential.ts.
 *
 * - Error spending (Lan & DeMets 1983): the boundary at look k is the value whose
 *   crossing probability under H0, given no earlier crossing, is the alpha the
 *   spending function allows between t_{k−1} and t_k. Two-sided tests are
 *   symmetric (±b_k) and count both tails in the alpha spent.
 * - Classical constants: Pocock (1977) b_k = c; O'Brien & Fleming (1979)
 *   b_k = c/√t_k; c solved so that the total crossing probability is alpha.
 * - Futility by beta spending (Pampallona, Tsiatis & Kim 2001): the lower
 *   boundary a_k is the value whose crossing probability under the alternative,
 *   given no earlier stop, is the beta allowed between t_{k−1} and t_k; the last
 *   look has a_K = b_K, and the drift (hence the maximum information) is solved
 *   so that the power is 1 − β. Futility is non-binding: the efficacy boundaries
 *   are computed ignoring it, so the type I error stays at most alpha whether or
 *   not the trial stops when the futility boundary is crossed.
 */
import { findRoot } from "./rootFinding.js";
import { normalCdf, normalQuantile } from "./normal.js";
import {
  type ContinuationDensity, DEFAULT_GRID_SIZE, type LookBoundaries, advance, exitProbabilities,
  probabilityAbove, probabilityBelow, startingDensity,
} from "./groupSequential.js";

export type Sides = 1 | 2;

/** Upper boundaries never exceed this: P(Z > 40) is below 1e-300. */
const Z_CEILING = 40;

function lowerEfficacyOf(upper: number, sides: Sides): number {
  return sides === 2 ? -upper : -Infinity;
}

/**
 * Root of an increasing function on [lo, hi], bracketed by stepping out from a
 * guess first: the recursion makes every evaluation costly, and a good guess
 * cuts Brent's iterations to a handful.
 */
function rootNear(f: (x: number) => number, guess: number, step: number, lo: number, hi: number, tolerance: number): number {
  let a = Math.min(hi, Math.max(lo, guess - step));
  let b = Math.min(hi, Math.max(lo, guess + step));
  let fa = f(a);
  let fb = f(b);
  for (let i = 0; fa > 0 && a > lo && i < 60; i++) {
    b = a; fb = fa;
    a = Math.max(lo, a - step * 2 ** (i + 1));
    fa = f(a);
  }
  for (let i = 0; fb < 0 && b < hi && i < 60; i++) {
    a = b; fa = fb;
    b = Math.min(hi, b + step * 2 ** (i + 1));
    fb = f(b);
  }
  if (fa >= 0) return a;
  if (fb <= 0) return b;
  return findRoot(f, a, b, { tolerance });
}

/**
 * Efficacy boundaries by error spending: `cumulativeAlpha[k]` is the alpha spent
 * by look k (both tails for a two-sided test).
 */
export function spendingBoundaries(times: readonly number[], cumulativeAlpha: readonly number[], sides: Sides, r = DEFAULT_GRID_SIZE): number[] {
  let state: ContinuationDensity = startingDensity();
  const bounds: number[] = [];
  let spent = 0;
  for (let k = 0; k < times.length; k++) {
    const t = times[k]!;
    const increment = Math.max(0, cumulativeAlpha[k]! - spent);
    const crossing = (b: number): number => probabilityAbove(state, t, b, 0) + (sides === 2 ? probabilityBelow(state, t, -b, 0) : 0);
    // The marginal tail bounds the crossing probability, so Φ⁻¹(1 − increment/sides) is close above the root.
    const guess = increment > 0 ? normalQuantile(1 - increment / sides) : Z_CEILING;
    const b = rootNear((x) => increment - crossing(x), Math.min(guess, Z_CEILING) - 0.05, 0.1, sides === 2 ? 0 : -Z_CEILING, Z_CEILING, 1e-11);
    bounds.push(b);
    spent += crossing(b);
    if (k < times.length - 1) state = advance(state, t, lowerEfficacyOf(b, sides), b, 0, r);
  }
  return bounds;
}

/**
 * Root of a smooth increasing function by the secant method from two nearby
 * starts, for the drift searches where each evaluation is a whole pass of the
 * recursion; falls back to bracketing when the secant steps misbehave.
 */
function secantRoot(f: (x: number) => number, x0: number, x1: number, lo: number, hi: number, tolerance: number): number {
  let a = x0;
  let fa = f(a);
  let b = x1;
  let fb = f(b);
  for (let i = 0; i < 12; i++) {
    if (Math.abs(fb) < 1e-12 || Math.abs(b - a) < tolerance) return b;
    if (fb === fa) break;
    const next = b - (fb * (b - a)) / (fb - fa);
    if (!(next > lo && next < hi) || Math.abs(next - b) > 1) break;
    a = b; fa = fb;
    b = next; fb = f(b);
  }
  return rootNear(f, b, Math.max(Math.abs(b - a), tolerance) * 4, lo, hi, tolerance);
}

function totalCrossing(times: readonly number[], upper: readonly number[], sides: Sides, drift: number, r: number): number {
  const exits = exitProbabilities(times, upper.map((u) => ({ upper: u, lowerEfficacy: lowerEfficacyOf(u, sides), futility: -Infinity })), drift, r);
  return exits.reduce((sum, e) => sum + e.upper + e.lowerEfficacy, 0);
}

export type ClassicalShape = "pocock" | "obrien-fleming";

/** Classical boundaries: Pocock's constant c, or O'Brien-Fleming's c/√t_k, with the constant c. */
export function classicalBoundaries(times: readonly number[], shape: ClassicalShape, alpha: number, sides: Sides, r = DEFAULT_GRID_SIZE): { constant: number; upper: number[] } {
  const shapeAt = (c: number): number[] => times.map((t) => (shape === "pocock" ? c : c / Math.sqrt(t)));
  // Between the single-look quantile and the Bonferroni one; the secant starts between them.
  const single = normalQuantile(1 - alpha / sides);
  const bonferroni = normalQuantile(1 - alpha / sides / times.length);
  const guess = shape === "pocock" ? 0.4 * single + 0.6 * bonferroni : single + 0.05;
  const constant = secantRoot((c) => alpha - totalCrossing(times, shapeAt(c), sides, 0, r), guess, guess + 0.01, 0.5 * single, bonferroni + 1, 1e-10);
  return { constant, upper: shapeAt(constant) };
}

/** Drift η = θ√I of a single-look test at level alpha with the given power (both tails counted when two-sided). */
export function fixedDesignDrift(alpha: number, power: number, sides: Sides): number {
  const c = normalQuantile(1 - alpha / sides);
  if (sides === 1) return c + normalQuantile(power);
  return findRoot((eta) => normalCdf(eta - c) + normalCdf(-eta - c) - power, 0, c + normalQuantile(power) + 1, { tolerance: 1e-13 });
}

/** Drift at which efficacy boundaries alone (no futility) reach the power. */
export function driftForPower(times: readonly number[], upper: readonly number[], sides: Sides, power: number, r = DEFAULT_GRID_SIZE): number {
  const last = upper[upper.length - 1]!;
  const guess = last + normalQuantile(power);
  return secantRoot((eta) => totalCrossing(times, upper, sides, eta, r) - power, guess, guess + 0.02, 0, 60, 1e-8);
}

/**
 * Futility boundaries by beta spending under drift η, with the efficacy
 * boundaries fixed. Returns the boundaries and the power they leave.
 */
export function futilityAtDrift(times: readonly number[], upper: readonly number[], cumulativeBeta: readonly number[], sides: Sides, drift: number, r = DEFAULT_GRID_SIZE, lastIsFinal = true): { futility: number[]; power: number } {
  let state = startingDensity();
  const futility: number[] = [];
  let power = 0;
  let betaSpent = 0;
  const last = times.length - 1;
  for (let k = 0; k <= last; k++) {
    const t = times[k]!;
    const b = upper[k]!;
    const lowerEff = lowerEfficacyOf(b, sides);
    const above = probabilityAbove(state, t, b, drift);
    const belowLowerEff = probabilityBelow(state, t, lowerEff, drift);
    power += above + belowLowerEff;
    let a: number;
    if (k === last && lastIsFinal) {
      a = b;
    } else {
      const increment = Math.max(0, cumulativeBeta[k]! - betaSpent);
      const stopped = (x: number): number => probabilityBelow(state, t, x, drift) - belowLowerEff;
      const floor = sides === 2 ? lowerEff : -Z_CEILING;
      if (stopped(b) <= increment) a = b;
      else if (increment <= 0 || stopped(floor) >= increment) a = floor;
      else a = rootNear((x) => stopped(x) - increment, drift * Math.sqrt(t) + normalQuantile(increment), 0.1, floor, b, 1e-11);
      betaSpent += stopped(a);
      if (k < last) state = advance(state, t, Math.max(a, lowerEff), b, drift, r);
    }
    futility.push(a);
    if (state.points.length === 0 && k < last) {
      // Every path has stopped: the later looks are never reached.
      for (let j = k + 1; j <= last; j++) futility.push(upper[j]!);
      break;
    }
  }
  return { futility, power };
}

/**
 * Drift and futility boundaries together: the drift at which beta-spending
 * futility boundaries leave power 1 − β (with a_K = b_K).
 */
export function futilityAndDrift(times: readonly number[], upper: readonly number[], cumulativeBeta: readonly number[], sides: Sides, power: number, r = DEFAULT_GRID_SIZE): { drift: number; futility: number[] } {
  const gap = (eta: number): number => futilityAtDrift(times, upper, cumulativeBeta, sides, eta, r).power - power;
  // Interim looks and futility stops only lose power, so the drift lies above
  // a level-alpha single look's; the guess starts a little higher.
  const alpha = totalCrossing([1], [upper[upper.length - 1]!], sides, 0, r);
  const fixed = fixedDesignDrift(Math.min(0.5, alpha), power, sides);
  const drift = secantRoot(gap, fixed * 1.05, fixed * 1.06, 0, 60, 1e-8);
  return { drift, futility: futilityAtDrift(times, upper, cumulativeBeta, sides, drift, r).futility };
}

export type { LookBoundaries };
