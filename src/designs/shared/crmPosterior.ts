/**
 * The CRM posterior of the model parameter a given patients and DLTs per dose:
 *   π(a | data) ∝ exp(-a²/(2σ²)) Π_i p_i(a)^y_i (1 - p_i(a))^(n_i - y_i).
 *
 * Every integral is taken over a window around the posterior mode, split at
 * the mode, whose ends are where the log posterior has fallen by a fixed
 * amount below its maximum (e^-36 ≈ 2e-16 for the fast rule, e^-50 for the
 * reference), found by stepping outward in units of the curvature scale; the
 * mass left outside is below double precision.
 * - `crmPosterior` integrates with the adaptive Gauss-Kronrod rule of
 *   quadrature.ts and finds credible limits by root finding on the posterior
 *   distribution function: the reference, for single decisions.
 * - `CrmFastPosterior` uses a fixed Gauss-Legendre rule on each half of the
 *   window (geometric convergence for this analytic integrand), reusing its
 *   buffers, for the thousands of updates of a simulation; a test checks it
 *   against the reference to 1e-9.
 */
import { integrate } from "../../stats/quadrature.js";
import { gaussLegendreRule } from "../../stats/gaussLegendre.js";
import { findRoot } from "../../stats/rootFinding.js";
import { type CrmModel, type CrmModelKind, doseConstants, doseProbability, parameterForProbability } from "./crmModel.js";

const WINDOW_STEPS = [4, 6, 9, 13, 19, 28, 40, 60, 90, 140];
const PARAMETER_LIMIT = 300;

/** The log posterior (up to a constant) and its first two derivatives, for one data set. */
class LogPosterior {
  readonly kind: CrmModelKind;
  readonly constants: Float64Array;
  readonly intercept: number;
  readonly precision: number;
  private readonly tried: Int32Array;
  private readonly n: Float64Array;
  private readonly y: Float64Array;
  private triedCount = 0;
  /** Set by derivatives(). */
  d1 = 0;
  d2 = 0;

  constructor(model: CrmModel) {
    this.kind = model.kind;
    this.constants = doseConstants(model);
    this.intercept = model.intercept;
    this.precision = 1 / model.priorVariance;
    const k = model.skeleton.length;
    this.tried = new Int32Array(k);
    this.n = new Float64Array(k);
    this.y = new Float64Array(k);
  }

  setData(patients: ArrayLike<number>, dlts: ArrayLike<number>): void {
    this.triedCount = 0;
    for (let i = 0; i < this.constants.length; i++) {
      if (patients[i]! > 0) {
        const j = this.triedCount++;
        this.tried[j] = i;
        this.n[j] = patients[i]!;
        this.y[j] = dlts[i]!;
      }
    }
  }

  value(a: number): number {
    const t = Math.exp(a);
    let sum = -0.5 * a * a * this.precision;
    for (let j = 0; j < this.triedCount; j++) {
      const c = this.constants[this.tried[j]!]!;
      const n = this.n[j]!;
      const y = this.y[j]!;
      if (this.kind === "power") {
        const u = t * c; // log p, negative
        if (y > 0) sum += y * u;
        if (n > y) sum += (n - y) * Math.log(-Math.expm1(u));
      } else {
        const eta = this.intercept + t * c;
        // log p = -log(1 + e^-η), log(1 - p) = -log(1 + e^η), each in its stable form.
        const softPlus = eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta));
        sum += y * (eta - softPlus) - (n - y) * softPlus;
      }
    }
    return sum;
  }

  derivatives(a: number): void {
    const t = Math.exp(a);
    let d1 = -a * this.precision;
    let d2 = -this.precision;
    for (let j = 0; j < this.triedCount; j++) {
      const c = this.constants[this.tried[j]!]!;
      const n = this.n[j]!;
      const y = this.y[j]!;
      if (this.kind === "power") {
        const v = -t * c;
        // v·p/(1 - p) = v/(e^v - 1), which tends to 1 as v → 0 and to 0 as v → ∞.
        const vr = v === 0 ? 1 : v / Math.expm1(v);
        d1 += -y * v + (n - y) * vr;
        d2 += -y * v + (n - y) * (vr - vr * (v + vr));
      } else {
        const u = t * c;
        const p = 1 / (1 + Math.exp(-(this.intercept + u)));
        d1 += u * (y - n * p);
        d2 += u * (y - n * p) - n * u * u * p * (1 - p);
      }
    }
    this.d1 = d1;
    this.d2 = d2;
  }

  /** The mode, by Newton's method safeguarded with bisection inside a bracket of the score's sign change. */
  mode(start: number): number {
    let a = start;
    this.derivatives(a);
    let lo = a;
    let hi = a;
    let step = 1;
    // |a| ≤ 300 keeps exp(a) and every p_i finite; no data set moves the mode that far.
    for (let i = 0; i < 80 && lo > -PARAMETER_LIMIT && this.scoreAt(lo) <= 0; i++) { lo = Math.max(lo - step, -PARAMETER_LIMIT); step *= 2; }
    step = 1;
    for (let i = 0; i < 80 && hi < PARAMETER_LIMIT && this.scoreAt(hi) >= 0; i++) { hi = Math.min(hi + step, PARAMETER_LIMIT); step *= 2; }
    for (let i = 0; i < 100; i++) {
      this.derivatives(a);
      if (this.d1 > 0) lo = a; else hi = a;
      let next = this.d2 < 0 ? a - this.d1 / this.d2 : NaN;
      if (!(next > lo && next < hi)) next = (lo + hi) / 2;
      if (Math.abs(next - a) < 1e-12 * (1 + Math.abs(a)) || hi - lo < 1e-13) return next;
      a = next;
    }
    return a;
  }

  private scoreAt(a: number): number {
    this.derivatives(a);
    return this.d1;
  }

  /** Curvature scale 1/√(-ℓ''(mode)), the prior's σ when the curvature is not negative. */
  scale(mode: number): number {
    this.derivatives(mode);
    return this.d2 < 0 ? 1 / Math.sqrt(-this.d2) : Math.sqrt(1 / this.precision);
  }

  /** How far from the mode (in scale units, one side) the log posterior has fallen by `drop`. */
  reach(mode: number, peak: number, scale: number, direction: 1 | -1, drop: number): number {
    for (const k of WINDOW_STEPS) if (peak - this.value(mode + direction * k * scale) >= drop) return k;
    return WINDOW_STEPS[WINDOW_STEPS.length - 1]!;
  }
}

export interface CrmPosteriorSummary {
  /** Posterior mean of the DLT probability at each dose. */
  meanProbability: number[];
  /** Posterior mean of a. */
  meanParameter: number;
  /** p_i at the posterior mean of a (the plug-in estimate of O'Quigley, Pepe & Fisher 1990). */
  plugInProbability: number[];
  /** Equal-tailed credible limits for each p_i at the requested level. */
  credibleLower: number[];
  credibleUpper: number[];
  /** P(p_1 > target | data). */
  probabilityLowestAboveTarget: number;
}

/**
 * Reference posterior summary by adaptive Gauss-Kronrod quadrature (relative
 * accuracy about 1e-12 on each integral).
 */
export function crmPosterior(model: CrmModel, patients: ArrayLike<number>, dlts: ArrayLike<number>, target: number, credibleLevel = 0.9): CrmPosteriorSummary {
  const lp = new LogPosterior(model);
  lp.setData(patients, dlts);
  const mode = lp.mode(0);
  const peak = lp.value(mode);
  const scale = lp.scale(mode);
  const lo = mode - lp.reach(mode, peak, scale, -1, 50) * scale;
  const hi = mode + lp.reach(mode, peak, scale, 1, 50) * scale;
  const density = (a: number): number => Math.exp(lp.value(a) - peak);
  const options = { absoluteTolerance: 1e-16, relativeTolerance: 1e-13 };
  const both = (g: (a: number) => number): number => integrate(g, lo, mode, options) + integrate(g, mode, hi, options);
  const leftMass = integrate(density, lo, mode, options);
  const total = leftMass + integrate(density, mode, hi, options);
  const cdf = (q: number): number => {
    if (q <= lo) return 0;
    if (q >= hi) return 1;
    return (q <= mode ? integrate(density, lo, q, options) : leftMass + integrate(density, mode, q, options)) / total;
  };
  const k = model.skeleton.length;
  const c = lp.constants;
  const meanProbability = Array.from({ length: k }, (_, i) => both((a) => density(a) * doseProbability(model.kind, c[i]!, model.intercept, a)) / total);
  const meanParameter = both((a) => density(a) * a) / total;
  const tail = (1 - credibleLevel) / 2;
  const quantile = (p: number): number => findRoot((q) => cdf(q) - p, lo, hi, { tolerance: 1e-13 });
  const aLow = quantile(tail);
  const aHigh = quantile(1 - tail);
  const at = (i: number, a: number): number => doseProbability(model.kind, c[i]!, model.intercept, a);
  return {
    meanProbability,
    meanParameter,
    plugInProbability: Array.from({ length: k }, (_, i) => at(i, meanParameter)),
    // p_i decreases in a, so the upper quantile of a gives the lower limit of p_i.
    credibleLower: Array.from({ length: k }, (_, i) => at(i, aHigh)),
    credibleUpper: Array.from({ length: k }, (_, i) => at(i, aLow)),
    probabilityLowestAboveTarget: cdf(parameterForProbability(model.kind, c[0]!, model.intercept, target)),
  };
}

/** Grid of the fast rule: a from -GRID_LIMIT to GRID_LIMIT, panels of width FINEST_PANEL × 2^level. */
const GRID_LIMIT = 24;
/** From 0.0125 (posteriors of a thousand patients or a tight prior) to 0.8; each level is tabulated only when first needed. */
const FINEST_PANEL = 0.0125;
const LEVELS = 7;
/** Widest panel of either model. */
const MAX_PANEL = 0.8;

/**
 * Widest panel for a model: the logistic model's p_i(a) has poles where
 * a0 + e^a x_i = ±iπ, atan(π/a0) from the real axis whatever x_i (0.81 at
 * a0 = 3, 0.30 at a0 = 10), and a Gauss-Legendre panel no wider than that
 * distance keeps the 8-node rule within 1e-9 of the adaptive reference. The
 * power model's integrand is entire.
 */
export function widestPanel(model: Pick<CrmModel, "kind" | "intercept">): number {
  return model.kind === "logistic" ? Math.min(MAX_PANEL, Math.atan(Math.PI / model.intercept)) : MAX_PANEL;
}

/** The widest width of the grid's panels that a model uses: FINEST_PANEL × 2^level, not above widestPanel. */
export function gridPanelWidth(model: Pick<CrmModel, "kind" | "intercept">): number {
  const widest = widestPanel(model);
  let level = 0;
  while (level + 1 < LEVELS && FINEST_PANEL * 2 ** (level + 1) <= widest) level++;
  return FINEST_PANEL * 2 ** level;
}
/** Scale units around the mode that keep the finest panels. */
const INNER_REACH = 6;
/** Gauss-Legendre nodes per panel of the fast rule. */
export const FAST_NODES_PER_PANEL = 8;

/** Per-node tables of one panel width: nodes, weights, log prior, and per dose log p, log(1 - p), p. */
interface GridLevel {
  width: number;
  panels: number;
  a: Float64Array;
  weight: Float64Array;
  logPrior: Float64Array;
  logP: Float64Array;
  log1mP: Float64Array;
  p: Float64Array;
}

/**
 * Posterior means and P(p_1 > target) by a fixed composite Gauss-Legendre rule
 * on a grid of panels whose model probabilities are tabulated once, so that an
 * update costs one exponential per node. The panel width is the largest grid
 * width not above the posterior's curvature scale nor the model's widest panel
 * (widestPanel: 0.8, less for a logistic intercept above 3.05); the panels
 * cover the window where the log posterior is within 36 of its maximum. The tests check agreement with the adaptive
 * reference to 1e-9.
 */
export class CrmFastPosterior {
  readonly meanProbability: Float64Array;
  meanParameter = 0;
  probabilityLowestAboveTarget = 0;
  private readonly lp: LogPosterior;
  private readonly model: CrmModel;
  private readonly doseCount: number;
  private readonly safetyParameter: number;
  private readonly maxPanel: number;
  private readonly levels: Array<GridLevel | undefined> = [];
  /** Per tried dose: non-DLTs, DLTs and table offset (scratch for update). */
  private readonly patients: Float64Array;
  private readonly dlts: Float64Array;
  private readonly offsets: Int32Array;
  private lastMode = 0;
  /** Running sums of one update. */
  private tried = 0;
  private peak = 0;
  private total = 0;
  private first = 0;
  private lower = 0;

  constructor(model: CrmModel, target: number) {
    this.lp = new LogPosterior(model);
    this.model = model;
    this.doseCount = model.skeleton.length;
    this.meanProbability = new Float64Array(this.doseCount);
    this.patients = new Float64Array(this.doseCount);
    this.dlts = new Float64Array(this.doseCount);
    this.offsets = new Int32Array(this.doseCount);
    this.safetyParameter = parameterForProbability(model.kind, this.lp.constants[0]!, model.intercept, target);
    this.maxPanel = widestPanel(model);
  }

  /** Forgets the warm start (call at the start of each simulated trial). */
  reset(): void {
    this.lastMode = 0;
  }

  private level(index: number): GridLevel {
    const hit = this.levels[index];
    if (hit) return hit;
    const width = FINEST_PANEL * 2 ** index;
    const panels = Math.round((2 * GRID_LIMIT) / width);
    const rule = gaussLegendreRule(FAST_NODES_PER_PANEL);
    const m = rule.nodes.length;
    const count = panels * m;
    const k = this.doseCount;
    const g: GridLevel = {
      width, panels,
      a: new Float64Array(count), weight: new Float64Array(count), logPrior: new Float64Array(count),
      logP: new Float64Array(count * k), log1mP: new Float64Array(count * k), p: new Float64Array(count * k),
    };
    const c = this.lp.constants;
    for (let q = 0; q < panels; q++) {
      const centre = -GRID_LIMIT + (q + 0.5) * width;
      for (let j = 0; j < m; j++) {
        const node = q * m + j;
        const a = centre + (width / 2) * rule.nodes[j]!;
        g.a[node] = a;
        g.weight[node] = (width / 2) * rule.weights[j]!;
        g.logPrior[node] = -0.5 * a * a * this.lp.precision;
        const t = Math.exp(a);
        for (let i = 0; i < k; i++) {
          let logP: number;
          let log1mP: number;
          if (this.model.kind === "power") {
            logP = t * c[i]!;
            log1mP = Math.log(-Math.expm1(logP));
          } else {
            const eta = this.model.intercept + t * c[i]!;
            const softPlus = eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta));
            logP = eta - softPlus;
            log1mP = -softPlus;
          }
          // Node-major, so that one node's doses sit together in memory.
          g.logP[node * k + i] = logP;
          g.log1mP[node * k + i] = log1mP;
          g.p[node * k + i] = Math.exp(logP);
        }
      }
    }
    this.levels[index] = g;
    return g;
  }

  update(patients: ArrayLike<number>, dlts: ArrayLike<number>): void {
    const lp = this.lp;
    lp.setData(patients, dlts);
    const mode = lp.mode(this.lastMode);
    this.lastMode = mode;
    const peak = lp.value(mode);
    const scale = lp.scale(mode);
    const lo = Math.max(-GRID_LIMIT, mode - lp.reach(mode, peak, scale, -1, 36) * scale);
    const hi = Math.min(GRID_LIMIT, mode + lp.reach(mode, peak, scale, 1, 36) * scale);
    let fineIndex = 0;
    while (fineIndex + 1 < LEVELS && FINEST_PANEL * 2 ** (fineIndex + 1) <= Math.min(scale, this.maxPanel)) fineIndex++;
    // Beyond INNER_REACH scale units of the mode the density is small and, where a
    // long prior-dominated tail remains, smooth on a longer scale: panels up to
    // four times wider there (never above the model's widest panel).
    let coarseIndex = fineIndex;
    while (coarseIndex + 1 < LEVELS && coarseIndex < fineIndex + 2 && FINEST_PANEL * 2 ** (coarseIndex + 1) <= this.maxPanel) coarseIndex++;
    const fine = this.level(fineIndex);
    const coarse = this.level(coarseIndex);
    const ratio = 2 ** (coarseIndex - fineIndex);
    const innerLo = mode - INNER_REACH * scale;
    const innerHi = mode + INNER_REACH * scale;
    const k = this.doseCount;
    let tried = 0;
    for (let i = 0; i < k; i++) {
      const n = patients[i]!;
      if (n > 0) {
        this.offsets[tried] = i;
        this.dlts[tried] = dlts[i]!;
        this.patients[tried] = n - dlts[i]!;
        tried++;
      }
    }
    this.tried = tried;
    this.peak = peak;
    this.meanProbability.fill(0);
    this.total = 0;
    this.first = 0;
    this.lower = 0;
    const firstPanel = Math.max(0, Math.floor((lo + GRID_LIMIT) / coarse.width));
    const lastPanel = Math.min(coarse.panels - 1, Math.floor((hi + GRID_LIMIT) / coarse.width));
    for (let q = firstPanel; q <= lastPanel; q++) {
      const start = -GRID_LIMIT + q * coarse.width;
      if (start + coarse.width > innerLo && start < innerHi) {
        for (let f = q * ratio; f < (q + 1) * ratio; f++) this.addPanel(fine, f);
      } else {
        this.addPanel(coarse, q);
      }
    }
    for (let i = 0; i < k; i++) this.meanProbability[i]! /= this.total;
    this.meanParameter = this.first / this.total;
    this.probabilityLowestAboveTarget = this.safetyParameter >= -GRID_LIMIT + (lastPanel + 1) * coarse.width ? 1 : Math.min(1, this.lower / this.total);
  }

  /** Adds one tabulated panel's nodes to the running sums; the panel holding a* adds only its part below a* to the lower mass. */
  private addPanel(g: GridLevel, panel: number): void {
    const m = FAST_NODES_PER_PANEL;
    const k = this.doseCount;
    const tried = this.tried;
    const offsets = this.offsets;
    const events = this.dlts;
    const nonEvents = this.patients;
    const logP = g.logP;
    const log1mP = g.log1mP;
    const p = g.p;
    const means = this.meanProbability;
    const peak = this.peak;
    const start = -GRID_LIMIT + panel * g.width;
    const below = start + g.width <= this.safetyParameter;
    let total = 0;
    let first = 0;
    for (let node = panel * m; node < (panel + 1) * m; node++) {
      const base = node * k;
      let l = g.logPrior[node]! - peak;
      for (let j = 0; j < tried; j++) {
        const at = base + offsets[j]!;
        l += events[j]! * logP[at]! + nonEvents[j]! * log1mP[at]!;
      }
      // Below e^-40 of the peak a node adds nothing a double can hold next to the total.
      if (l < -40) continue;
      const w = g.weight[node]! * Math.exp(l);
      total += w;
      first += w * g.a[node]!;
      for (let i = 0; i < k; i++) means[i]! += w * p[base + i]!;
    }
    this.total += total;
    this.first += first;
    if (below) this.lower += total;
    else if (start < this.safetyParameter) this.lower += this.partialMass(start, this.safetyParameter, peak);
  }

  private partialMass(a0: number, a1: number, peak: number): number {
    if (a1 <= a0) return 0;
    const rule = gaussLegendreRule(FAST_NODES_PER_PANEL);
    const centre = (a0 + a1) / 2;
    const width = (a1 - a0) / 2;
    let mass = 0;
    for (let j = 0; j < rule.nodes.length; j++) mass += rule.weights[j]! * width * Math.exp(this.lp.value(centre + width * rule.nodes[j]!) - peak);
    return mass;
  }
}
