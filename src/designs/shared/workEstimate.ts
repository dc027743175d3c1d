/**
 * A design's work estimate (Design.cost) assembled from counted parts: each
 * part is a number of like operations (power evaluations, looks of a
 * recursion, terms of an enumeration) times the CPU they were measured to take on the heaviest cases
 * of `npm run bench designs`; their sum and a fixed cost are multiplied by one
 * safety factor.
 */
import type { WorkEstimate } from "../design.js";

/**
 * Covers a slower run than the one measured (another process on the machine,
 * a colder JIT): the medians behind the per-operation costs varied by up to
 * a third between runs while other work shared the machine.
 */
export const SAFETY_FACTOR = 1.5;

/**
 * What any calculation costs beyond its counted parts: building the result,
 * and code paths a running Worker has not yet taken for this kind of input (a
 * first run took up to 3.6 ms where later runs of the same calculation took
 * 0.1 ms). The very first calculation of a design in a fresh Worker also
 * compiles its code, 20 to 300 ms here: a one-off that the budget's margin
 * below the Worker's CPU limit absorbs, not part of every estimate.
 */
export const FIXED_MS = 4;

export interface WorkPart {
  /** How many operations, an upper count read off the algorithm. */
  count: number;
  /** CPU milliseconds one operation takes at most, as measured. */
  msEach: number;
  /** The operations in words, after the count: "evaluations of the exact t power". */
  what: string;
}

/** Thousands separated, so counts read at a glance in a 422. */
export function formatCount(n: number): string {
  return String(Math.round(n)).replace(/\B(?=(\d{3})+(?!\d))/g, ",");
}

/** The estimate of the parts' total, with a breakdown naming each part and the fields that lower it. */
export function workEstimate(parts: WorkPart[], reduce: string[]): WorkEstimate {
  const counted = parts.filter((p) => p.count > 0);
  return {
    milliseconds: SAFETY_FACTOR * (FIXED_MS + counted.reduce((sum, p) => sum + p.count * p.msEach, 0)),
    breakdown: counted.map((p) => `${formatCount(p.count)} ${p.what}`).join(" + "),
    reduce,
  };
}
