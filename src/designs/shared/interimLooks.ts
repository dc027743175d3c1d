/**
 * Interim looks as an option of the comparative designs: the fixed design's
 * sample size (or events) times the inflation factor of a group-sequential plan
 * gives the maximum, and each look happens at its information fraction of it.
 *
 * Conventions: information is taken proportional to the number of participants
 * with the outcome (or of events), so look k happens at ⌈t_k × maximum⌉; per-arm
 * maxima are ⌈IF × n⌉ in each arm, so the allocation ratio is kept and the
 * power is at least that of the unrounded design.
 */
import { z } from "zod";
import type { Block, Section } from "../../report/document.js";
import { type GroupSequentialPlan, equallySpaced, planGroupSequential } from "./groupSequentialPlan.js";
import { inflateForDropout } from "./sizing.js";
import { boundaryMethodText, decisionTable, exitTable } from "./groupSequentialReport.js";

const spendingFamilies = ["obrien-fleming-type", "pocock-type", "hwang-shih-decani"] as const;

const MIN_GAP = 0.01;

/** Bounds that keep every boundary finite and every probability resolvable. */
export const MIN_ALPHA = 1e-5;
export const MAX_POWER = 0.9999;

/** The host design's alpha and power, checked for a group-sequential plan. */
export function refineInterimTest(alpha: number, power: number, issue: (path: string, message: string) => void): void {
  if (alpha < MIN_ALPHA) issue("alpha", `With interim looks, alpha must be at least ${MIN_ALPHA}.`);
  if (power > MAX_POWER) issue("power", `With interim looks, power must be at most ${MAX_POWER}.`);
}

/** Fields that define the boundaries of a group-sequential plan. */
export const groupSequentialFields = {
  informationFractions: z.array(z.number().min(MIN_GAP).max(1)).min(1).max(10).optional()
    .describe("Information fraction at each look, increasing and ending at 1 (the final analysis). Equally spaced when left out."),
  efficacyBoundary: z.enum([...spendingFamilies, "pocock", "obrien-fleming"]).default("obrien-fleming-type")
    .describe("Efficacy boundaries: obrien-fleming-type, pocock-type or hwang-shih-decani alpha spending (Lan & DeMets 1983; Hwang, Shih & DeCani 1990), or the classical constant boundaries pocock (Pocock 1977) or obrien-fleming (O'Brien & Fleming 1979)."),
  efficacyGamma: z.number().min(-10).max(10).default(-4)
    .describe("γ of the Hwang-Shih-DeCani alpha-spending function, from -10 to 10: negative spends little alpha early (-4 resembles O'Brien-Fleming), positive spends more (1 resembles Pocock), 0 spends in proportion to information."),
  futilityBoundary: z.enum(["none", ...spendingFamilies]).default("none")
    .describe("Non-binding futility boundaries by beta spending with this function, or none."),
  futilityGamma: z.number().min(-10).max(10).default(-2)
    .describe("γ of the Hwang-Shih-DeCani beta-spending function for futility, from -10 to 10."),
};

/** Cross-field checks of the information fractions, with the issue at the offending element. */
export function refineFractions(fractions: number[] | undefined, looks: number, field: string, issue: (path: Array<string | number>, message: string) => void): void {
  if (fractions === undefined) return;
  if (fractions.length !== looks) {
    issue([field], `Give one information fraction per look: ${looks} look${looks === 1 ? "" : "s"} but ${fractions.length} fraction${fractions.length === 1 ? "" : "s"}.`);
  }
  for (let i = 1; i < fractions.length; i++) {
    if (!(fractions[i]! >= fractions[i - 1]! + MIN_GAP - 1e-12)) {
      issue([field, i], `Information fractions must increase from look to look (by at least ${MIN_GAP}): look ${i + 1} is at ${fractions[i]}, look ${i} at ${fractions[i - 1]}.`);
    }
  }
  const last = fractions[fractions.length - 1];
  if (last !== undefined && Math.abs(last - 1) > 1e-9) {
    issue([field, fractions.length - 1], "The last information fraction must be 1: the final analysis is at the maximum information.");
  }
}

/** The optional `interimLooks` input of a comparative design. */
export const interimLooksField = z
  .strictObject({
    looks: z.number().int().min(2).max(10).default(3)
      .describe("Number of analyses K, interim and final (2 to 10)."),
    ...groupSequentialFields,
  })
  .superRefine((v, ctx) => refineFractions(v.informationFractions, v.looks, "informationFractions", (path, message) => ctx.addIssue({ code: "custom", path, message })))
  .transform((v) => ({ ...v, informationFractions: v.informationFractions ?? equallySpaced(v.looks) }))
  .optional()
  .describe("Interim analyses: a group-sequential plan whose maximum size is the fixed-design size times the inflation factor. Leave out for a single final analysis. Alpha, power and sides are those of the design.");

export type InterimLooksInput = NonNullable<z.output<typeof interimLooksField>>;

export interface InterimLooksLook {
  look: number;
  informationFraction: number;
  /** Participants with the outcome (or events) at this look, cumulative. */
  cumulative: number;
  efficacyZ: number;
  efficacyNominalP: number;
  futilityZ: number | null;
  futilityNominalP: number | null;
}

export interface InterimLooksResult {
  unit: "participants" | "events";
  fixedTotal: number;
  inflationFactor: number;
  /** Maximum per arm (participants only; null for events). */
  maximumArms: { n1: number; n2: number } | null;
  maximumTotal: number;
  /** Participants to enrol for the maximum after dropout (null for events). */
  maximumEnrolled: number | null;
  looks: InterimLooksLook[];
  expectedTotalNull: number;
  expectedTotalAlternative: number;
  plan: GroupSequentialPlan;
}

/**
 * The group-sequential maximum, per-look sizes and boundaries from a fixed design.
 * @param fixed the fixed design's per-arm sizes (participants) or total (events)
 */
export function planInterimLooks(
  options: InterimLooksInput,
  test: { alpha: number; power: number; sides: 1 | 2 },
  fixed: { unit: "participants"; n1: number; n2: number; dropout?: number } | { unit: "events"; total: number },
): InterimLooksResult {
  const plan = planGroupSequential({ ...options, ...test });
  const inflate = (n: number): number => Math.ceil(n * plan.inflationFactor - 1e-9);
  const maximumArms = fixed.unit === "participants" ? { n1: inflate(fixed.n1), n2: inflate(fixed.n2) } : null;
  const fixedTotal = fixed.unit === "participants" ? fixed.n1 + fixed.n2 : fixed.total;
  const maximumTotal = maximumArms ? maximumArms.n1 + maximumArms.n2 : inflate(fixedTotal);
  const maximumEnrolled = maximumArms && fixed.unit === "participants"
    ? inflateForDropout(maximumArms.n1, fixed.dropout ?? 0) + inflateForDropout(maximumArms.n2, fixed.dropout ?? 0)
    : null;
  const looks = plan.looks.map((l, k): InterimLooksLook => ({
    look: l.look,
    informationFraction: l.informationFraction,
    cumulative: k === plan.looks.length - 1 ? maximumTotal : Math.ceil(l.informationFraction * maximumTotal - 1e-9),
    efficacyZ: l.efficacyZ,
    efficacyNominalP: l.efficacyNominalP,
    futilityZ: l.futilityZ,
    futilityNominalP: l.futilityNominalP,
  }));
  return {
    unit: fixed.unit,
    fixedTotal,
    inflationFactor: plan.inflationFactor,
    maximumArms,
    maximumTotal,
    maximumEnrolled,
    looks,
    // Expected information in units of the fixed design, scaled to its size.
    expectedTotalNull: plan.expectedInformationNull * fixedTotal,
    expectedTotalAlternative: plan.expectedInformationAlternative * fixedTotal,
    plan,
  };
}

/** The interim-looks section of a comparative design's report. */
export function interimLooksSections(options: InterimLooksInput, sides: 1 | 2, r: InterimLooksResult): Section[] {
  const unit = r.unit === "participants" ? "participants" : "events";
  const blocks: Block[] = [
    {
      kind: "facts",
      facts: [
        { label: `Maximum ${unit} (all looks)`, value: r.maximumTotal, key: true },
        { label: "Inflation factor", value: r.inflationFactor, digits: 4 },
        { label: `Fixed-design ${unit}`, value: r.fixedTotal },
        ...(r.maximumArms ? [
          { label: "Maximum control arm", value: r.maximumArms.n1 },
          { label: "Maximum experimental arm", value: r.maximumArms.n2 },
        ] : []),
        ...(r.maximumEnrolled !== null && r.maximumEnrolled !== r.maximumTotal ? [{ label: "Maximum to enrol after dropout", value: r.maximumEnrolled, key: true }] : []),
        { label: `Expected ${unit}, no effect`, value: r.expectedTotalNull, digits: 1 },
        { label: `Expected ${unit}, alternative`, value: r.expectedTotalAlternative, digits: 1, key: true },
      ],
    },
    { kind: "table", table: decisionTable(r.plan, sides, "interim-looks", { label: r.unit === "participants" ? "Participants with outcome" : "Events", values: r.looks.map((l) => l.cumulative) }) },
    { kind: "table", table: exitTable(r.plan, sides, "interim-exit-probabilities") },
    { kind: "paragraph", text: `${interimLooksProtocolText(options, sides, r)}` },
  ];
  return [{ id: "interim-looks", title: "Interim analyses (group-sequential)", blocks }];
}

/** One protocol sentence for the interim analyses, to follow the design's paragraph. */
export function interimLooksProtocolText(options: InterimLooksInput, sides: 1 | 2, r: InterimLooksResult): string {
  const unit = r.unit === "participants" ? "participants with the outcome assessed" : "events";
  const when = r.looks.slice(0, -1).map((l) => `${l.cumulative}`).join(", ");
  const futility = r.looks.some((l) => l.futilityZ !== null)
    ? ` Non-binding futility boundaries (${boundaryMethodText({ efficacyBoundary: options.futilityBoundary === "none" ? "pocock-type" : options.futilityBoundary, efficacyGamma: options.futilityGamma }, "beta")}) are Z < ${r.looks.map((l) => (l.futilityZ === null ? "—" : l.futilityZ.toFixed(3))).join(", ")}; the efficacy boundaries were computed ignoring them.`
    : "";
  return `Interim analyses are planned after ${when} ${unit}, and the final analysis after ${r.maximumTotal} (the fixed-design ${r.fixedTotal} times the inflation factor ${r.inflationFactor.toFixed(4)}, rounded up). ` +
    `The type I error is controlled by ${boundaryMethodText(options, "alpha")}: the trial stops for efficacy when ${sides === 2 ? "|Z|" : "Z"} reaches ${r.looks.map((l) => l.efficacyZ.toFixed(3)).join(", ")} at the successive analyses.${futility}`;
}
