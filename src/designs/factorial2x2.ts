/**
 * Factorial 2×2: two treatments, A and B, each given or not, in one trial with
 * four equal cells (neither, A alone, B alone, both).
 *
 * Method: each main effect is tested at the margins, assuming no interaction
 * (Byar & Piantadosi 1985; Montgomery, Peters & Little 2003): participants with
 * A (cells A and AB) against those without (cells 0 and B), 2m against 2m for m
 * per cell.
 * - Means: the two-sample t test on the margins (twoMeansPower: exact power from
 *   the noncentral t on 4m − 2 degrees of freedom, or the normal approximation),
 *   σ the within-cell standard deviation. That power belongs to the analysis that
 *   adjusts for the other factor (the 2×2 analysis of variance, whose residual
 *   variance is σ²); a crude margin t test ignoring the other factor has variance
 *   σ² + (other effect)²/4 and less power.
 * - Proportions: the two-proportion test on the margins (twoProportionsPower:
 *   normal approximation, Fleiss, Levin & Paik 2003, with or without continuity
 *   correction); each margin's rate is the mean of its two cells' rates and is
 *   treated as binomial, which slightly overstates the variance of a mixture.
 *
 * Interaction contrast (stated in every report): I = (μ_AB − μ_A) − (μ_B − μ_0),
 * the effect of A with B minus the effect of A without B, estimated by
 * ȳ_AB − ȳ_A − ȳ_B + ȳ_0. With m per cell its variance is 4σ²/m, against σ²/m
 * for a main effect (ȳ_AB + ȳ_A)/2 − (ȳ_B + ȳ_0)/2; an interaction as large as
 * a main effect therefore needs four times the participants at the same α and
 * power. It is tested in the 2×2 analysis of variance (noncentral t on 4m − 4
 * degrees of freedom, or normal), for proportions by a Wald z test with the
 * variance Σ p(1 − p)/m at the alternative cell rates, never adjusted for
 * multiplicity, with the sides and α as entered, in the direction of the
 * assumed interaction.
 *
 * Multiplicity across the two main effects: none (each at α), Bonferroni (each
 * at α/2), or Holm's first step (sized at α/2 like Bonferroni; Holm 1979). Under
 * Holm the second test runs at α once the first rejects, so the power for each
 * factor under the full procedure is P(rejected at α/2) + P(rejected at α but not
 * at α/2) × P(the other rejected at α/2), the two margins' contrasts being
 * orthogonal and so independent under normal theory.
 *
 * Conventions: equal allocation to the four cells; rates higher-is-better for a
 * one-sided test; dropout inflates each cell to ⌈m / (1 − dropout)⌉; the design
 * size per cell is the larger of the two main effects' sizes.
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { normalCdf, normalQuantile } from "../stats/normal.js";
import { studentTQuantile } from "../stats/studentT.js";
import { noncentralTCdf, noncentralTSurvival } from "../stats/noncentralT.js";
import { type TwoMeansInput, twoMeansPower } from "./twoMeans.js";
import { twoProportionsPower } from "./shared/twoProportionsPower.js";
import { curveSizes, detectableEffect, inflateForDropout, rememberPower, smallestSampleSize } from "./shared/sizing.js";
import { designSection, protocolSection } from "./shared/reportSections.js";
import { checkComparativeCommon, comparativeCommonFields, probabilityField } from "./shared/fields.js";
import {
  DETECTABLE_EFFECT_EVALUATIONS, NORMAL_POWER_MS, POWER_CURVE_EVALUATIONS, T_POWER_MS, sizeSearchEvaluations,
} from "./shared/sizingCost.js";
import { formatCount, workEstimate } from "./shared/workEstimate.js";

const MAX_PER_CELL = 50000;
const { alpha, power, sides, dropout } = comparativeCommonFields;

const schema = z
  .strictObject({
    outcome: z.enum(["means", "proportions"]).default("means")
      .describe("Kind of primary outcome: a continuous measurement compared as means, or a binary response compared as proportions."),
    solveFor: z.enum(["sample-size", "power"]).default("sample-size")
      .meta({ title: "What to work out" })
      .describe("What to compute: the participants per cell for a target power, or the power with a given number per cell."),
    method: z.enum(["exact-t", "normal", "normal-corrected"]).optional()
      .describe("Means: exact-t (noncentral t, the default) or normal. Proportions: normal (the default) or normal-corrected (with continuity correction)."),
    multiplicity: z.enum(["none", "bonferroni", "holm"]).default("none")
      .describe("Adjustment across the two main-effect tests: none (each at alpha), bonferroni (each at alpha/2), or holm (sized at its first step, alpha/2; the second test runs at alpha once the first rejects)."),
    sd: z.number().gt(0, "The standard deviation must be a positive number in outcome units.").max(1e9).optional()
      .describe("Means: the within-cell standard deviation of the outcome, in outcome units."),
    effectA: z.number().min(-1e9).max(1e9).optional()
      .describe("Means: the main effect of treatment A, mean with A minus mean without A, in outcome units (assumed the same whether or not B is given)."),
    effectB: z.number().min(-1e9).max(1e9).optional()
      .describe("Means: the main effect of treatment B, mean with B minus mean without B, in outcome units."),
    controlRate: probabilityField("Proportions: response rate with neither treatment (between 0 and 1).").optional(),
    rateA: probabilityField("Proportions: response rate with A alone.").optional(),
    rateB: probabilityField("Proportions: response rate with B alone.").optional(),
    interaction: z.number().min(-1e9).max(1e9).optional()
      .describe("Interaction to size for, I = (with both − A alone) − (B alone − neither): in outcome units for means, as a difference of rate differences for proportions. Defaults to the size of A's main effect."),
    alpha,
    power,
    sides,
    dropout,
    nPerCell: z.number().int().min(2).max(MAX_PER_CELL).optional()
      .describe("Evaluable participants in each of the four cells, when solving for power."),
  })
  .superRefine((v, ctx) => {
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    const means = v.outcome === "means";
    if (means) {
      if (v.sd === undefined) issue("sd", "Give the within-cell standard deviation of the outcome.");
      for (const key of ["effectA", "effectB"] as const) {
        const effect = v[key];
        if (effect === undefined) issue(key, `Give the main effect of treatment ${key.slice(-1)} (mean with it minus mean without it).`);
        else if (effect === 0) issue(key, `A main effect of 0 means treatment ${key.slice(-1)} does nothing; there is no effect to detect.`);
        else if (v.sides === 1 && effect < 0) issue(key, "A one-sided test looks for benefit: enter the effect so that positive favours the treatment.");
      }
      for (const key of ["controlRate", "rateA", "rateB"] as const) if (v[key] !== undefined) issue(key, "Rates apply to a proportions outcome; leave them out for means.");
      if (v.method === "normal-corrected") issue("method", "The continuity correction applies to proportions; for means choose exact-t or normal.");
    } else {
      for (const key of ["controlRate", "rateA", "rateB"] as const) if (v[key] === undefined) issue(key, "Give the response rate in each of the three cells: neither, A alone and B alone.");
      for (const key of ["sd", "effectA", "effectB"] as const) if (v[key] !== undefined) issue(key, "The standard deviation and effects in outcome units apply to means; for proportions give the rates.");
      if (v.method === "exact-t") issue("method", "The exact t method applies to means; for proportions choose normal or normal-corrected.");
      const { controlRate: p0, rateA: pA, rateB: pB } = v;
      if (p0 !== undefined && pA !== undefined && pB !== undefined && p0 > 0 && p0 < 1 && pA > 0 && pA < 1 && pB > 0 && pB < 1) {
        if (pA === p0) issue("rateA", "Treatment A alone gives the same rate as neither: there is no main effect of A to detect.");
        if (pB === p0) issue("rateB", "Treatment B alone gives the same rate as neither: there is no main effect of B to detect.");
        if (v.sides === 1 && pA < p0) issue("rateA", "A one-sided test looks for benefit: the rate with A must be higher than with neither (use the rate of the good outcome).");
        if (v.sides === 1 && pB < p0) issue("rateB", "A one-sided test looks for benefit: the rate with B must be higher than with neither (use the rate of the good outcome).");
        const both = pA + pB - p0;
        if (!(both > 0 && both < 1)) {
          issue("rateB", `With no interaction the rate with both treatments would be ${both.toFixed(3)}, outside 0 to 1: effects this large cannot add on the rate-difference scale.`);
        } else if (!(both + (v.interaction ?? pA - p0) > 0 && both + (v.interaction ?? pA - p0) < 1)) {
          issue("interaction", v.interaction !== undefined
            ? `This interaction puts the rate with both treatments at ${(both + v.interaction).toFixed(3)}, outside 0 to 1.`
            : `The default interaction, as large as A's effect, puts the rate with both treatments at ${(both + pA - p0).toFixed(3)}, outside 0 to 1; give a smaller interaction.`);
        }
      }
    }
    if (v.interaction === 0) issue("interaction", "An interaction of 0 is the absence of one; give the size of interaction you want to be able to detect.");
    if (v.solveFor === "power" && v.nPerCell === undefined) issue("nPerCell", "Give the number of evaluable participants per cell when solving for power.");
    checkComparativeCommon({ ...v, hypothesis: "superiority" }, ctx);
  })
  .transform((v) => {
    const mainA = v.outcome === "means" ? v.effectA! : v.rateA! - v.controlRate!;
    return {
      ...v,
      sides: v.sides ?? 2,
      method: v.method ?? (v.outcome === "means" ? "exact-t" as const : "normal" as const),
      interaction: v.interaction ?? mainA,
    };
  });

export type Factorial2x2Input = z.output<typeof schema>;
type Factor = "A" | "B";

export interface MainEffectResult {
  factor: Factor;
  /** Difference at the margins: in outcome units, or in rates. */
  effect: number;
  /** Level of this main-effect test after the multiplicity adjustment. */
  alpha: number;
  /** Smallest evaluable size per cell giving this main effect the target power; null if beyond the bound. */
  requiredPerCell: number | null;
  /** Power at the design's size per cell. */
  power: number;
  /** Power under the full Holm procedure at the design's size (only for multiplicity "holm"). */
  powerUnderHolm: number | null;
  /** Margin rates without and with the factor (proportions only). */
  marginRates: [number, number] | null;
}

export interface InteractionResult {
  effect: number;
  standardErrorPerRootCell: number;
  alpha: number;
  requiredPerCell: number | null;
  requiredTotal: number | null;
  /** Power at the design's size per cell. */
  power: number;
  /** Interaction size over the design size; about 4 for an interaction as large as the main effect. */
  sizeRatio: number | null;
  /** Cell rates under the interaction alternative: neither, A, B, both (proportions only). */
  cellRates: [number, number, number, number] | null;
}

export interface Factorial2x2Result {
  nPerCell: number;
  total: number;
  enrolledPerCell: number;
  enrolledTotal: number;
  /** The main effect whose size sets the design (the larger requirement), or null when solving for power. */
  sizedBy: Factor | null;
  /** Means: the smallest main effect (outcome units) detected with the target power at this size and level. */
  detectableMainEffect: number | null;
  mainEffects: MainEffectResult[];
  interaction: InteractionResult;
  /** [total evaluable, power] for each main effect and for the interaction. */
  powerCurves: { A: Array<[number, number]>; B: Array<[number, number]>; interaction: Array<[number, number]> };
}

function mainEffectAlpha(input: Factorial2x2Input): number {
  return input.multiplicity === "none" ? input.alpha : input.alpha / 2;
}

function marginRates(input: Factorial2x2Input, factor: Factor): [number, number] {
  const p0 = input.controlRate!;
  const pA = input.rateA!;
  const pB = input.rateB!;
  const both = pA + pB - p0;
  return factor === "A" ? [(p0 + pB) / 2, (pA + both) / 2] : [(p0 + pA) / 2, (pB + both) / 2];
}

function mainEffectSize(input: Factorial2x2Input, factor: Factor): number {
  if (input.outcome === "means") return factor === "A" ? input.effectA! : input.effectB!;
  const [without, withFactor] = marginRates(input, factor);
  return withFactor - without;
}

/** Power of the margins' t (or normal) test for a difference in means `effect`, 2m against 2m. */
function marginMeansPower(input: Factorial2x2Input, effect: number, perCell: number, level: number): number {
  const marginal: TwoMeansInput = {
    solveFor: "power", hypothesis: "superiority", delta: effect, sd: input.sd!,
    method: input.method === "normal" ? "normal" : "exact-t", alpha: level, power: input.power, sides: input.sides,
    allocationRatio: 1, dropout: 0,
  };
  return twoMeansPower(marginal, { n1: 2 * perCell, n2: 2 * perCell }, effect);
}

/** Power of a main-effect test on the margins, 2m against 2m, at level `level`. */
export function mainEffectPower(input: Factorial2x2Input, factor: Factor, perCell: number, level: number): number {
  const margins = { n1: 2 * perCell, n2: 2 * perCell };
  if (input.outcome === "means") return marginMeansPower(input, mainEffectSize(input, factor), perCell, level);
  const [p1, p2] = marginRates(input, factor);
  return twoProportionsPower(p1, p2, margins, { hypothesis: "superiority", sides: input.sides, alpha: level }, input.method === "normal-corrected" ? "normal-corrected" : "normal");
}

function interactionCellRates(input: Factorial2x2Input): [number, number, number, number] {
  const p0 = input.controlRate!;
  const pA = input.rateA!;
  const pB = input.rateB!;
  return [p0, pA, pB, pA + pB - p0 + input.interaction];
}

/** SE of the interaction estimate times √m: 2σ for means, √Σ p(1 − p) for proportions. */
function interactionSpread(input: Factorial2x2Input): number {
  if (input.outcome === "means") return 2 * input.sd!;
  return Math.sqrt(interactionCellRates(input).reduce((s, p) => s + p * (1 - p), 0));
}

/** Power of the interaction test with m per cell, in the direction of the assumed interaction. */
export function interactionPower(input: Factorial2x2Input, perCell: number): number {
  const ncp = (Math.abs(input.interaction) * Math.sqrt(perCell)) / interactionSpread(input);
  const p = input.sides === 2 ? 1 - input.alpha / 2 : 1 - input.alpha;
  if (input.outcome === "means" && input.method === "exact-t") {
    const df = 4 * perCell - 4;
    const c = studentTQuantile(p, df);
    // The two tails are computed separately and can sum past 1 when power is near 1.
    return Math.min(1, noncentralTSurvival(c, df, ncp) + (input.sides === 2 ? noncentralTCdf(-c, df, ncp) : 0));
  }
  const c = normalQuantile(p);
  return normalCdf(ncp - c) + (input.sides === 2 ? normalCdf(-ncp - c) : 0);
}

/** Smallest m per cell reaching the target, or null beyond the bound. */
function requiredPerCell(powerAt: (perCell: number) => number, target: number, field: string): number | null {
  try {
    return smallestSampleSize({ powerAt: (a) => powerAt(a.n1), target, allocationRatio: 1, minimum: 2, maximum: MAX_PER_CELL, unit: "per cell", field }).n1;
  } catch (error) {
    if (error instanceof InfeasibleDesignError) return null;
    throw error;
  }
}

/**
 * Means: the smallest main effect detected with the target power with m per
 * cell, to 1e-10 of its standard error σ/√m; the ceiling, 50 standard errors,
 * is far beyond any detectable effect.
 */
function detectableMeansEffect(input: Factorial2x2Input, perCell: number, level: number): number {
  const se = input.sd! / Math.sqrt(perCell);
  return detectableEffect((e) => marginMeansPower(input, e, perCell, level), input.power, 0, 50 * se, "nPerCell", se);
}

const effectField = (input: Factorial2x2Input, factor: Factor): string => (input.outcome === "means" ? `effect${factor}` : `rate${factor}`);

/**
 * The work before computing, in power evaluations (sizingCost.ts): three size
 * searches up to the bound per cell (A, B and the interaction, whatever is
 * solved for), Holm's extra powers, the detectable main effect for means, and
 * three power curves. At most a few milliseconds for any admitted input, so no
 * input is refused.
 */
export function costFactorial2x2(input: Factorial2x2Input): WorkEstimate {
  const means = input.outcome === "means";
  const exact = means && input.method === "exact-t";
  const count = 3 * sizeSearchEvaluations(2, MAX_PER_CELL) + (input.multiplicity === "holm" ? 6 : 0) + 3 +
    (means ? DETECTABLE_EFFECT_EVALUATIONS : 0) + 3 * POWER_CURVE_EVALUATIONS;
  return workEstimate([{
    count,
    msEach: exact ? T_POWER_MS : NORMAL_POWER_MS,
    what: `evaluations of the ${exact ? "noncentral t" : "normal"} power: searches of sizes up to ${formatCount(MAX_PER_CELL)} per cell for both main effects and the interaction${means ? ", the detectable main effect" : ""} and three power curves`,
  }], []);
}

export function computeFactorial2x2(input: Factorial2x2Input): Factorial2x2Result {
  const level = mainEffectAlpha(input);
  // Each power is asked for again at the chosen size and on the curve, so each size is computed once.
  const perCell = (power: (m: number) => number): ((m: number) => number) => {
    const remembered = rememberPower((a) => power(a.n1));
    return (m) => remembered({ n1: m, n2: m });
  };
  const atLevel = {
    A: perCell((m) => mainEffectPower(input, "A", m, level)),
    B: perCell((m) => mainEffectPower(input, "B", m, level)),
  };
  const interactionAt = perCell((m) => interactionPower(input, m));
  const required = {
    A: requiredPerCell(atLevel.A, input.power, effectField(input, "A")),
    B: requiredPerCell(atLevel.B, input.power, effectField(input, "B")),
  };
  let nPerCell: number;
  let sizedBy: Factor | null = null;
  if (input.solveFor === "sample-size") {
    for (const factor of ["A", "B"] as const) {
      if (required[factor] === null) {
        throw new InfeasibleDesignError(
          `No size up to ${MAX_PER_CELL} per cell gives the main effect of ${factor} the target power ${input.power}; the effect is too small to detect.`,
          { bound: MAX_PER_CELL, field: effectField(input, factor) },
        );
      }
    }
    sizedBy = required.A! >= required.B! ? "A" : "B";
    nPerCell = Math.max(required.A!, required.B!);
  } else {
    nPerCell = input.nPerCell!;
  }
  const powerAt = (factor: Factor, m: number, a: number): number => mainEffectPower(input, factor, m, a);
  const holm = (factor: Factor, other: Factor, m: number): number => {
    const strict = powerAt(factor, m, input.alpha / 2);
    return strict + (powerAt(factor, m, input.alpha) - strict) * powerAt(other, m, input.alpha / 2);
  };
  const mainEffects: MainEffectResult[] = (["A", "B"] as const).map((factor) => ({
    factor,
    effect: mainEffectSize(input, factor),
    alpha: level,
    requiredPerCell: required[factor],
    power: atLevel[factor](nPerCell),
    powerUnderHolm: input.multiplicity === "holm" ? holm(factor, factor === "A" ? "B" : "A", nPerCell) : null,
    marginRates: input.outcome === "proportions" ? marginRates(input, factor) : null,
  }));
  const detectableMainEffect = input.outcome === "means" ? detectableMeansEffect(input, nPerCell, level) : null;
  const interactionPerCell = requiredPerCell(interactionAt, input.power, "interaction");
  const enrolledPerCell = inflateForDropout(nPerCell, input.dropout);
  const sizes = curveSizes(nPerCell, 2);
  const curve = (f: (m: number) => number): Array<[number, number]> => sizes.map((m) => [4 * m, f(m)]);
  return {
    nPerCell,
    total: 4 * nPerCell,
    enrolledPerCell,
    enrolledTotal: 4 * enrolledPerCell,
    sizedBy,
    detectableMainEffect,
    mainEffects,
    interaction: {
      effect: input.interaction,
      standardErrorPerRootCell: interactionSpread(input),
      alpha: input.alpha,
      requiredPerCell: interactionPerCell,
      requiredTotal: interactionPerCell === null ? null : 4 * interactionPerCell,
      power: interactionAt(nPerCell),
      sizeRatio: interactionPerCell === null ? null : interactionPerCell / nPerCell,
      cellRates: input.outcome === "proportions" ? interactionCellRates(input) : null,
    },
    powerCurves: {
      A: curve(atLevel.A),
      B: curve(atLevel.B),
      interaction: curve(interactionAt),
    },
  };
}

const fmt = (x: number, d = 3): string => x.toFixed(d);
const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;

function describeMultiplicity(input: Factorial2x2Input): string {
  switch (input.multiplicity) {
    case "none":
      return `each main effect is tested at α = ${input.alpha} without adjustment for the two tests`;
    case "bonferroni":
      return `each main effect is tested at α = ${input.alpha / 2} (Bonferroni adjustment of α = ${input.alpha} across the two main effects)`;
    case "holm":
      return `the two main effects are tested by the Holm procedure at overall α = ${input.alpha}: the smaller p-value is compared with ${input.alpha / 2} and, if it is significant, the other with ${input.alpha}; the sample size is set at the first step (${input.alpha / 2})`;
  }
}

function describeMethod(input: Factorial2x2Input): string {
  if (input.outcome === "means") {
    return `a model with both treatments, each main effect compared at the margins (${input.method === "normal" ? "power by the normal approximation" : "power by the two-sample t test, exact from the noncentral t distribution"})`;
  }
  return input.method === "normal-corrected" ? "the two-proportion test at the margins (normal approximation with continuity correction)" : "the two-proportion test at the margins (normal approximation, variance pooled under the null)";
}

function effectText(input: Factorial2x2Input, m: MainEffectResult): string {
  if (input.outcome === "means") return `${m.effect} (difference in means)`;
  const [without, withFactor] = m.marginRates!;
  return `${fmt(m.effect, 3)} (response rate ${fmt(without, 3)} without ${m.factor} and ${fmt(withFactor, 3)} with ${m.factor}, at the margins)`;
}

function documentFactorial(input: Factorial2x2Input, r: Factorial2x2Result): Section[] {
  const [a, b] = r.mainEffects as [MainEffectResult, MainEffectResult];
  const sides = input.sides === 2 ? "two-sided" : "one-sided";
  const dropoutText = input.dropout > 0 ? ` Allowing for ${pct(input.dropout)} loss, ${r.enrolledPerCell} participants per cell (${r.enrolledTotal} in total) will be enrolled.` : "";
  const sd = input.outcome === "means" ? ` and a within-cell standard deviation of ${input.sd}` : "";
  const interactionText = r.interaction.requiredTotal === null
    ? `Detecting an interaction of ${fmt(r.interaction.effect, 3)} with ${pct(input.power, 0)} power would need more than ${MAX_PER_CELL} per cell; with this design its power is ${pct(r.interaction.power)}.`
    : `The trial is not sized to detect an interaction: an interaction of ${fmt(r.interaction.effect, 3)} (defined as the effect of A with B minus the effect of A without B) would need ${r.interaction.requiredPerCell} per cell (${r.interaction.requiredTotal} in total, ${fmt(r.interaction.sizeRatio!, 2)} times this design) for ${pct(input.power, 0)} power; with this design its power is ${pct(r.interaction.power)}.`;
  const sizing = input.solveFor === "sample-size"
    ? `A 2×2 factorial design with ${r.nPerCell} evaluable participants in each of the four cells (${r.total} in total, ${2 * r.nPerCell} per margin) gives ${pct(a.power)} power to detect a main effect of A of ${effectText(input, a)} and ${pct(b.power)} power for a main effect of B of ${effectText(input, b)}, assuming no interaction${sd}. The analysis uses ${describeMethod(input)}, ${sides}; ${describeMultiplicity(input)}.`
    : `With ${r.nPerCell} evaluable participants in each of the four cells (${r.total} in total) of a 2×2 factorial design, the power is ${pct(a.power)} for a main effect of A of ${effectText(input, a)} and ${pct(b.power)} for a main effect of B of ${effectText(input, b)}, assuming no interaction${sd}. The analysis uses ${describeMethod(input)}, ${sides}; ${describeMultiplicity(input)}.`;
  const holm = input.multiplicity === "holm" ? ` Under the full Holm procedure the power is ${pct(a.powerUnderHolm!)} for A and ${pct(b.powerUnderHolm!)} for B.` : "";
  const protocol = `${sizing}${holm}${dropoutText} ${interactionText}`;
  const requiredCell = (n: number | null): number | string => (n === null ? `> ${MAX_PER_CELL}` : n);
  const curves = r.powerCurves;
  return [
    designSection([
      { label: "Evaluable per cell", value: r.nPerCell, key: true, note: r.sizedBy ? `set by the main effect of ${r.sizedBy}` : undefined },
      { label: "Total evaluable", value: r.total, key: true },
      { label: "Total to enrol after dropout", value: r.enrolledTotal, key: true },
      { label: "Power, main effect of A", value: a.power, digits: 4, key: true },
      { label: "Power, main effect of B", value: b.power, digits: 4, key: true },
      { label: "Total to detect the interaction", value: r.interaction.requiredTotal === null ? `> ${4 * MAX_PER_CELL}` : r.interaction.requiredTotal, key: true },
      { label: "Level of each main-effect test", value: a.alpha, digits: 4, note: input.multiplicity === "none" ? "no adjustment" : input.multiplicity === "bonferroni" ? "Bonferroni, α/2" : "Holm's first step, α/2" },
      { label: "Power for the interaction at this size", value: r.interaction.power, digits: 4 },
      ...(r.detectableMainEffect === null ? [] : [{ label: "Smallest main effect detectable at this size", value: r.detectableMainEffect, digits: 4, note: `with ${pct(input.power, 0)} power at level ${a.alpha}` }]),
    ], [
      {
        kind: "table",
        table: {
          id: "effects",
          caption: "Sample size for each question, beside the interaction",
          columns: [
            { key: "question", label: "Question" },
            { key: "effect", label: "Effect", digits: 4 },
            { key: "alpha", label: "Level", digits: 4 },
            { key: "perCell", label: "Needed per cell" },
            { key: "total", label: "Needed in total" },
            { key: "power", label: "Power at this design", digits: 4 },
            { key: "holm", label: "Power under Holm", digits: 4 },
          ],
          rows: [
            ...r.mainEffects.map((m) => [`Main effect of ${m.factor} (margins)`, m.effect, m.alpha, requiredCell(m.requiredPerCell), m.requiredPerCell === null ? null : 4 * m.requiredPerCell, m.power, m.powerUnderHolm]),
            ["Interaction (AB − A) − (B − neither)", r.interaction.effect, r.interaction.alpha, requiredCell(r.interaction.requiredPerCell), r.interaction.requiredTotal, r.interaction.power, null],
          ],
          note: `The interaction estimate ȳ_AB − ȳ_A − ȳ_B + ȳ_0 has variance ${input.outcome === "means" ? "4σ²/m" : "Σ p(1 − p)/m"} with m per cell, four times that of a main effect${input.outcome === "means" ? " (σ²/m)" : " (about)"}: an interaction as large as a main effect needs about four times the participants.`,
        },
      },
      {
        kind: "table",
        table: {
          id: "cells",
          caption: "Participants per cell",
          columns: [
            { key: "cell", label: "Cell" },
            { key: "evaluable", label: "Evaluable" },
            { key: "enrolled", label: "To enrol" },
            ...(input.outcome === "proportions" ? [{ key: "rate", label: "Rate assumed, no interaction", digits: 3 }] : []),
          ],
          rows: (["Neither", "A alone", "B alone", "A and B"] as const).map((cell, i) => {
            const base: Array<string | number> = [cell, r.nPerCell, r.enrolledPerCell];
            if (input.outcome === "proportions") {
              const rates = [input.controlRate!, input.rateA!, input.rateB!, input.rateA! + input.rateB! - input.controlRate!];
              base.push(rates[i]!);
            }
            return base;
          }),
        },
      },
    ]),
    {
      id: "operating-characteristics",
      title: "Power against sample size",
      blocks: [
        {
          kind: "chart",
          chart: {
            id: "power-curve",
            title: "Power against total sample size: main effects and interaction",
            xLabel: "Total evaluable participants (four cells)",
            yLabel: "Power",
            yDomain: [0, 1],
            series: [
              { name: "Main effect of A", points: curves.A, style: "line" },
              { name: "Main effect of B", points: curves.B, style: "line" },
              { name: "Interaction", points: curves.interaction, style: "line" },
            ],
            markers: [
              { axis: "y", value: input.power, label: `target ${input.power}` },
              { axis: "x", value: r.total, label: `N = ${r.total}` },
            ],
          },
        },
        {
          kind: "table",
          table: {
            id: "power-curve",
            caption: "Power at other sample sizes",
            columns: [
              { key: "total", label: "Total evaluable" },
              { key: "powerA", label: "Power, A", digits: 4 },
              { key: "powerB", label: "Power, B", digits: 4 },
              { key: "powerInteraction", label: "Power, interaction", digits: 4 },
            ],
            rows: curves.A.map(([n, p], i) => [n, p, curves.B[i]![1], curves.interaction[i]![1]]),
          },
        },
      ],
    },
    protocolSection(protocol),
  ];
}

export const factorial2x2: Design<Factorial2x2Input, Factorial2x2Result> = {
  id: "factorial-2x2",
  version: 4,
  stage: "comparative",
  title: "Factorial 2×2 (two treatments in one trial)",
  summary: "Participants per cell for testing two treatments' main effects at the margins of a 2×2 factorial trial, with a choice of multiplicity adjustment, and the size an interaction would need beside it; means or proportions.",
  input: schema,
  example: {
    outcome: "means",
    solveFor: "sample-size",
    method: "exact-t",
    multiplicity: "bonferroni",
    sd: 12,
    effectA: 5,
    effectB: 4,
    interaction: 5,
    alpha: 0.05,
    power: 0.9,
    sides: 2,
    dropout: 0.1,
  },
  compute: computeFactorial2x2,
  cost: costFactorial2x2,
  question: (input) => {
    const effects = input.outcome === "means"
      ? `main effects of ${input.effectA} (A) and ${input.effectB} (B) in outcome units, standard deviation ${input.sd}`
      : `response rates of ${input.controlRate} with neither treatment, ${input.rateA} with A alone and ${input.rateB} with B alone`;
    const lead = input.solveFor === "sample-size"
      ? `How many participants per cell does a 2×2 factorial trial need for ${input.power * 100}% power on each main effect`
      : `What power does a 2×2 factorial trial with ${input.nPerCell} participants per cell have on each main effect`;
    return `${lead}, with ${effects}, ${input.sides === 2 ? "two-sided" : "one-sided"} α = ${input.alpha} (${input.multiplicity === "none" ? "no multiplicity adjustment" : input.multiplicity === "bonferroni" ? "Bonferroni across the two" : "Holm across the two"}), and how many would an interaction of ${input.interaction} need?`;
  },
  document: documentFactorial,
  references: [
    { key: "Byar & Piantadosi 1985", text: "Byar DP, Piantadosi S. Factorial designs for randomized clinical trials. Cancer Treatment Reports. 1985;69(10):1055-1063." },
    { key: "Montgomery, Peters & Little 2003", text: "Montgomery AA, Peters TJ, Little P. Design, analysis and presentation of factorial randomised controlled trials. BMC Medical Research Methodology. 2003;3:26.", doi: "10.1186/1471-2288-3-26" },
    { key: "Holm 1979", text: "Holm S. A simple sequentially rejective multiple test procedure. Scandinavian Journal of Statistics. 1979;6(2):65-70." },
    { key: "Fleiss, Levin & Paik 2003", text: "Fleiss JL, Levin B, Paik MC. Statistical Methods for Rates and Proportions. 3rd ed. Hoboken, NJ: Wiley; 2003. Chapter 4." },
    { key: "Lenth 1989", text: "Lenth RV. Algorithm AS 243: cumulative distribution function of the non-central t distribution. Journal of the Royal Statistical Society, Series C (Applied Statistics). 1989;38(1):185-189.", doi: "10.2307/2347693" },
  ],
  cautions: [
    "Main effects are estimated at the margins on the assumption that the two treatments do not interact. If they do, each margin mixes the effect of one treatment with and without the other, and the power stated here does not hold; a trial sized for main effects has little power to detect an interaction of the same size.",
    "The power stated is for the analysis that adjusts each main effect for the other treatment (both in one model, σ the within-cell standard deviation); comparing the margins while ignoring the other treatment adds its effect to the variance and loses power.",
    "The interaction is defined as (both − A alone) − (B alone − neither); some texts halve it, which halves the number quoted for the same cell means but not the sample size needed.",
  ],
};
