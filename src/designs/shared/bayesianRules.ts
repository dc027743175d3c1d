/**
 * Stopping boundaries of Bayesian monitoring rules for a single-arm binary
 * outcome with a Beta(a, b) prior: the posterior-probability rule (Thall, Simon
 * & Estey 1995) and the predictive-probability futility rule (Lee & Liu 2008).
 * A boundary is, per check, the event count at which the rule stops; it turns
 * a probability rule into a table a clinic can follow.
 */
import { betaCdf, betaSurvival } from "../../stats/beta.js";
import { betaBinomialPmfArray } from "../../stats/betaBinomial.js";

export interface BoundaryCheck {
  patients: number;
  /** Toxicity: stop if events ≥ this. Futility: stop if events ≤ this. null: no count stops here. */
  stopAt: number | null;
}

/** Consecutive checks sharing one stopping count. */
export interface BoundaryRun {
  events: number;
  fromPatients: number;
  toPatients: number;
}

/** Check sizes: firstCheck, then every cohortSize, below maxN; and maxN itself when asked. */
export function checkSchedule(firstCheck: number, cohortSize: number, maxN: number, includeMaxN: boolean): number[] {
  const out: number[] = [];
  for (let n = firstCheck; n < maxN; n += cohortSize) out.push(n);
  if (includeMaxN) out.push(maxN);
  return out;
}

export function runsOf(boundary: readonly BoundaryCheck[]): BoundaryRun[] {
  const runs: BoundaryRun[] = [];
  for (const c of boundary) {
    if (c.stopAt === null) continue;
    const last = runs[runs.length - 1];
    if (last && last.events === c.stopAt) last.toPatients = c.patients;
    else runs.push({ events: c.stopAt, fromPatients: c.patients, toPatients: c.patients });
  }
  return runs;
}

export interface PosteriorRule {
  monitor: "toxicity" | "response";
  limit: number;
  threshold: number;
  priorA: number;
  priorB: number;
}

/** P(rate beyond the limit | x events of n): above it for toxicity, below it for response. */
export function posteriorBeyond(rule: PosteriorRule, x: number, n: number): number {
  return rule.monitor === "response"
    ? betaCdf(rule.limit, rule.priorA + x, rule.priorB + n - x)
    : betaSurvival(rule.limit, rule.priorA + x, rule.priorB + n - x);
}

/**
 * The posterior rule's boundary. Toxicity: the smallest count whose posterior
 * probability above the limit exceeds the threshold. Response: the largest count
 * whose posterior probability below the limit exceeds it.
 */
export function posteriorBoundary(rule: PosteriorRule, checks: readonly number[]): BoundaryCheck[] {
  const stops = (x: number, n: number): boolean => posteriorBeyond(rule, x, n) > rule.threshold;
  const out: BoundaryCheck[] = [];
  // Both boundaries are non-decreasing in n (the posterior moves toward the
  // limit's safe side as non-events accrue), so each scan resumes where the last ended.
  let k = 0;
  for (const n of checks) {
    if (rule.monitor === "response") {
      if (!stops(0, n)) { out.push({ patients: n, stopAt: null }); continue; }
      while (k + 1 <= n && stops(k + 1, n)) k++;
      out.push({ patients: n, stopAt: k });
    } else {
      while (k <= n && !stops(k, n)) k++;
      out.push({ patients: n, stopAt: k <= n ? k : null });
    }
  }
  return out;
}

export interface PredictiveRule {
  p0: number;
  priorA: number;
  priorB: number;
  maxN: number;
}

/** Smallest response count among maxN with P(p > p0 | x, maxN) > efficacyThreshold, or null. */
export function finalSuccessCount(rule: PredictiveRule, efficacyThreshold: number, maxN = rule.maxN): number | null {
  for (let x = 0; x <= maxN; x++) {
    if (betaSurvival(rule.p0, rule.priorA + x, rule.priorB + maxN - x) > efficacyThreshold) return x;
  }
  return null;
}

/**
 * PP(x, n): the predictive probability of at least s responses among maxN,
 * given x among the first n: P(Y ≥ s - x), Y ~ BetaBinomial(maxN - n, a + x, b + n - x).
 * Lee & Liu's sum of predictive weights over the future counts that end in
 * success reduces to this tail because the final rule is "at least s".
 */
export function predictiveProbability(rule: PredictiveRule, s: number, x: number, n: number): number {
  const m = rule.maxN - n;
  const need = s - x;
  if (need <= 0) return 1;
  if (need > m) return 0;
  const pmf = betaBinomialPmfArray(m, rule.priorA + x, rule.priorB + n - x);
  let sum = 0;
  for (let y = need; y <= m; y++) sum += pmf[y]!;
  return Math.min(1, sum);
}

/**
 * PP by count at each check, for counts 0, 1, ... up to the first whose PP
 * reaches `ceiling` (PP increases with x, so larger counts cannot stop a rule
 * whose futility threshold is at most the ceiling). Computed backward from
 * PP(x, maxN) = 1[x ≥ s] by the martingale identity
 * PP(x, n) = q PP(x + 1, n + 1) + (1 - q) PP(x, n + 1), q = (a + x) / (a + b + n)
 * the predictive probability that the next patient responds: O(maxN²) for
 * the whole table, the same quantity as the beta-binomial tail.
 */
export function predictiveTable(rule: PredictiveRule, s: number, checks: readonly number[], ceiling: number): number[][] {
  const N = rule.maxN;
  const out: number[][] = new Array<number[]>(checks.length);
  if (checks.length === 0) return out;
  const index = new Map(checks.map((n, i) => [n, i]));
  let next = new Float64Array(N + 1);
  let current = new Float64Array(N + 1);
  for (let x = 0; x <= N; x++) next[x] = x >= s ? 1 : 0;
  for (let n = N - 1; n >= checks[0]!; n--) {
    for (let x = 0; x <= n; x++) {
      const q = (rule.priorA + x) / (rule.priorA + rule.priorB + n);
      current[x] = Math.min(1, q * next[x + 1]! + (1 - q) * next[x]!);
    }
    const i = index.get(n);
    if (i !== undefined) {
      const row: number[] = [];
      for (let x = 0; x <= n; x++) {
        row.push(current[x]!);
        if (current[x]! >= ceiling) break;
      }
      out[i] = row;
    }
    [next, current] = [current, next];
  }
  return out;
}

/** The futility boundary from a PP table: the largest count with PP below the threshold. */
export function futilityBoundary(table: readonly number[][], checks: readonly number[], futilityThreshold: number): BoundaryCheck[] {
  return checks.map((n, i) => {
    const row = table[i]!;
    let x = 0;
    while (x < row.length && row[x]! < futilityThreshold) x++;
    return { patients: n, stopAt: x > 0 ? x - 1 : null };
  });
}
