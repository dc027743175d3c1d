/**
 * Group-sequential design: efficacy (and optional futility) boundaries for K
 * interim and final looks at given information fractions.
 *
 * Method: the joint distribution of the sequential Z statistics, computed by
 * recursive numerical integration (Armitage, McPherson & Rowe 1969; Jennison &
 * Turnbull 2000, chapter 19). Efficacy boundaries by alpha spending (Lan &
 * DeMets 1983) with the O'Brien-Fleming-type and Pocock-type functions of Lan &
 * DeMets or the Hwang, Shih & DeCani (1990) family, or the classical constant
 * boundaries of Pocock (1977) and O'Brien & Fleming (1979). Futility by beta
 * spending (Pampallona, Tsiatis & Kim 2001), non-binding.
 *
 * Conventions:
 * - Z is oriented so that positive favours the experimental arm. A two-sided test
 *   is symmetric (±b_k) and spends alpha/2 in each tail; a one-sided test spends
 *   alpha in the upper tail.
 * - Futility stops when Z_k < a_k; the efficacy boundaries are computed ignoring
 *   futility (non-binding), so stopping or not at a futility boundary never
 *   raises the type I error above alpha.
 * - Power counts rejection in either tail for two-sided tests; the inflation
 *   factor compares the maximum information with that of a single-look test of
 *   the same alpha, power and sides.
 * - "observed-looks" recomputes the boundaries at the information fractions
 *   actually reached (of the planned maximum), keeping the spending functions and
 *   the planned maximum information; the final analysis spends all alpha left.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import { protocolSection } from "./shared/reportSections.js";
import type { Block, Section } from "../report/document.js";
import {
  type GroupSequentialPlan, type GroupSequentialSpec, equallySpaced, planGroupSequential, recomputeAtObservedLooks,
} from "./shared/groupSequentialPlan.js";
import { boundaryChart, boundaryMethodText, decisionTable, exitTable, groupSequentialReferences } from "./shared/groupSequentialReport.js";
import { MAX_POWER, MIN_ALPHA, groupSequentialFields, refineFractions } from "./shared/interimLooks.js";
import { groupSequentialWork } from "./shared/groupSequentialCost.js";
import { type WorkPart, workEstimate } from "./shared/workEstimate.js";

const schema = z
  .strictObject({
    mode: z.enum(["plan", "observed-looks"]).default("plan")
      .describe("plan: boundaries at the planned looks. observed-looks: boundaries recomputed at the information fractions actually reached, keeping the spending functions (the planned design is shown beside them)."),
    looks: z.number().int().min(1).max(10).default(3)
      .describe("Number of planned looks K, the final analysis included (1 to 10)."),
    ...groupSequentialFields,
    sides: z.union([z.literal(1), z.literal(2)]).default(2)
      .describe("1 for a one-sided test (efficacy in favour of the experimental arm only), 2 for a two-sided test with symmetric boundaries."),
    alpha: z.number().min(MIN_ALPHA).max(0.5).default(0.05)
      .describe("Type I error rate of the whole sequence of looks (for a two-sided test, split equally between the two tails)."),
    power: z.number().gt(0).max(MAX_POWER).default(0.9)
      .describe("Power at the alternative the maximum information is planned for (1 - beta)."),
    observedFractions: z.array(z.number().gt(0).max(1.5)).min(1).max(10).optional()
      .describe("observed-looks mode: information fractions actually reached at the looks held so far (of the planned maximum information), in increasing order; a value of 1 or more is the final analysis."),
    lastObservedIsFinal: z.boolean().default(false)
      .describe("observed-looks mode: whether the last observed look is the final analysis (it then spends all the alpha left, even before the planned maximum information)."),
  })
  .superRefine((v, ctx) => {
    const issue = (path: Array<string | number>, message: string): void => ctx.addIssue({ code: "custom", path, message });
    refineFractions(v.informationFractions, v.looks, "informationFractions", issue);
    if (v.power <= v.alpha) issue(["power"], "Power must exceed alpha: a test that rejects no more often than chance is not a test.");
    if (v.mode === "observed-looks") {
      if (v.efficacyBoundary === "pocock" || v.efficacyBoundary === "obrien-fleming") {
        issue(["efficacyBoundary"], "Recomputing boundaries at the observed looks needs a spending function (obrien-fleming-type, pocock-type or hwang-shih-decani): classical constant boundaries are fixed in advance for planned looks.");
      }
      const obs = v.observedFractions;
      if (obs === undefined) {
        issue(["observedFractions"], "Give the information fractions reached at the looks held so far.");
      } else {
        for (let i = 1; i < obs.length; i++) {
          if (!(obs[i]! > obs[i - 1]! + 0.005)) issue(["observedFractions", i], "Observed information fractions must increase from look to look (by at least 0.005).");
        }
        for (let i = 0; i < obs.length - 1; i++) {
          if (obs[i]! >= 1) issue(["observedFractions", i], "Only the last observed look can reach the planned maximum information: a look at a fraction of 1 or more is the final analysis.");
        }
      }
    } else if (v.observedFractions !== undefined) {
      issue(["observedFractions"], "Observed fractions are used only in observed-looks mode; set mode to observed-looks or leave them out.");
    }
  })
  .transform((v) => {
    const obs = v.observedFractions;
    return {
      ...v,
      informationFractions: v.informationFractions ?? equallySpaced(v.looks),
      lastObservedIsFinal: obs !== undefined && (v.lastObservedIsFinal || obs[obs.length - 1]! >= 1),
    };
  });

export type GroupSequentialInput = z.output<typeof schema>;

export interface GroupSequentialResult {
  planned: GroupSequentialPlan;
  /** observed-looks mode: the boundaries at the looks actually held. */
  observed: GroupSequentialPlan | null;
}

function specOf(input: GroupSequentialInput): GroupSequentialSpec {
  return {
    informationFractions: input.informationFractions,
    efficacyBoundary: input.efficacyBoundary,
    efficacyGamma: input.efficacyGamma,
    futilityBoundary: input.futilityBoundary,
    futilityGamma: input.futilityGamma,
    alpha: input.alpha,
    power: input.power,
    sides: input.sides,
  };
}

/**
 * The work before computing, in looks of the recursion (groupSequentialCost.ts):
 * the planned looks, and the observed looks when the boundaries are recomputed.
 * At most 20 looks, estimated at most about 0.25 s, so no input is refused.
 */
export function costGroupSequential(input: GroupSequentialInput): WorkEstimate {
  const futility = input.futilityBoundary !== "none";
  const parts: WorkPart[] = [groupSequentialWork(input.looks, futility, "planned looks")];
  if (input.mode === "observed-looks") parts.push(groupSequentialWork(input.observedFractions?.length ?? 0, futility, "observed looks"));
  return workEstimate(parts, input.mode === "observed-looks" ? ["looks", "observedFractions"] : ["looks"]);
}

export function computeGroupSequential(input: GroupSequentialInput): GroupSequentialResult {
  const spec = specOf(input);
  const planned = planGroupSequential(spec);
  const observed = input.mode === "observed-looks"
    ? recomputeAtObservedLooks(spec, planned, input.observedFractions!, input.lastObservedIsFinal)
    : null;
  return { planned, observed };
}

const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;

function protocolText(input: GroupSequentialInput, p: GroupSequentialPlan): string {
  const spec = specOf(input);
  const fractions = p.looks.map((l) => l.informationFraction.toFixed(2)).join(", ");
  const bounds = p.looks.map((l) => l.efficacyZ.toFixed(3)).join(", ");
  const futility = p.looks.some((l) => l.futilityZ !== null)
    ? ` The trial may stop for futility when Z falls below ${p.looks.map((l) => (l.futilityZ === null ? "—" : l.futilityZ.toFixed(3))).join(", ")} at the successive looks; these futility boundaries come from beta spending (${boundaryMethodText({ ...spec, efficacyBoundary: spec.futilityBoundary === "none" ? "pocock-type" : spec.futilityBoundary, efficacyGamma: spec.futilityGamma }, "beta")}) and are non-binding: the efficacy boundaries were computed ignoring them, so the type I error stays at most ${input.alpha} whether or not the trial stops at a futility boundary.`
    : "";
  const analyses = p.looks.length === 1
    ? "The trial has a single final analysis at the maximum information. "
    : `The trial has ${p.looks.length} analyses, ${p.looks.length - 1} interim and one final, at ${fractions} of the maximum information. `;
  return analyses +
    `${input.sides === 2 ? "A two-sided" : "A one-sided"} test at overall level α = ${input.alpha} is kept by ${boundaryMethodText(spec, "alpha")}; ` +
    `the efficacy boundaries on the Z scale are ${bounds}${input.sides === 2 ? " in absolute value" : ""} (nominal ${input.sides === 2 ? "two-sided" : "one-sided"} p-values ${p.looks.map((l) => l.efficacyNominalP.toPrecision(3)).join(", ")}).${futility} ` +
    `To keep ${pct(input.power, 0)} power the maximum information is ${p.inflationFactor.toFixed(4)} times that of a single-analysis design; the expected information is ${p.expectedInformationNull.toFixed(3)} times the single-analysis information if there is no effect and ${p.expectedInformationAlternative.toFixed(3)} times it under the alternative. ` +
    `Boundaries were computed by recursive numerical integration (Armitage, McPherson & Rowe 1969; Jennison & Turnbull 2000, chapter 19); if the looks happen at other information fractions, the boundaries will be recomputed from the same spending function.`;
}

function planSections(input: GroupSequentialInput, p: GroupSequentialPlan, idPrefix: string, titlePrefix: string): Section[] {
  const hasFutility = p.looks.some((l) => l.futilityZ !== null);
  const facts: Block = {
    kind: "facts",
    facts: [
      { label: "Looks (K)", value: p.looks.length, key: true },
      { label: "Inflation factor (maximum over fixed-design information)", value: p.inflationFactor, digits: 4, key: true },
      { label: "Expected information, no effect (× fixed design)", value: p.expectedInformationNull, digits: 4, key: true },
      { label: "Expected information, alternative (× fixed design)", value: p.expectedInformationAlternative, digits: 4, key: true },
      { label: "Power at the alternative", value: p.power, digits: 4 },
      { label: "Drift η = θ√I_max", value: p.drift, digits: 4 },
      ...(p.classicalConstant !== null ? [{ label: "Classical constant c", value: p.classicalConstant, digits: 4 }] : []),
      ...(hasFutility ? [{ label: "Type I error if every futility stop is made", value: p.typeIErrorWithFutilityStops, digits: 5, note: `at most α = ${input.alpha}; the efficacy boundaries assume none is made` }] : []),
    ],
  };
  const blocks: Block[] = [facts, { kind: "table", table: decisionTable(p, input.sides, `${idPrefix}boundaries`) }];
  if (hasFutility) {
    blocks.push({ kind: "paragraph", text: "The futility boundaries are non-binding: the efficacy boundaries were computed ignoring them, so the trial may continue past a futility boundary without raising the type I error above alpha." });
  }
  return [
    { id: `${idPrefix}design`, title: `${titlePrefix}Boundaries`, blocks },
    {
      id: `${idPrefix}operating-characteristics`,
      title: `${titlePrefix}Exit probabilities`,
      blocks: [
        { kind: "table", table: exitTable(p, input.sides, `${idPrefix}exit-probabilities`) },
        { kind: "chart", chart: boundaryChart(p, input.sides, `${idPrefix}boundary-chart`) },
      ],
    },
  ];
}

function documentGroupSequential(input: GroupSequentialInput, r: GroupSequentialResult): Section[] {
  const sections = planSections(input, r.planned, "", input.mode === "observed-looks" ? "Planned design: " : "");
  if (r.observed) {
    const o = r.observed;
    const blocks: Block[] = [
      { kind: "paragraph", text: `Boundaries recomputed at the ${o.looks.length} look${o.looks.length === 1 ? "" : "s"} actually held, at information fractions ${o.looks.map((l) => l.informationFraction.toFixed(3)).join(", ")} of the planned maximum, with the same spending function${input.futilityBoundary === "none" ? "" : "s"}. ${input.lastObservedIsFinal ? "The last look is the final analysis and spends all the alpha left." : "The last look is an interim; later looks will spend the rest."} Exit probabilities under the alternative assume the planned maximum information.` },
      { kind: "table", table: decisionTable(o, input.sides, "observed-boundaries") },
      { kind: "table", table: exitTable(o, input.sides, "observed-exit-probabilities") },
      { kind: "chart", chart: boundaryChart(o, input.sides, "observed-boundary-chart") },
    ];
    if (input.lastObservedIsFinal) {
      blocks.splice(1, 0, { kind: "facts", facts: [{ label: "Power at the planned alternative, as run", value: o.power, digits: 4, key: true }] });
    }
    sections.unshift({ id: "observed-looks", title: "Boundaries at the looks actually held", blocks });
  }
  sections.push(protocolSection(protocolText(input, r.planned)));
  return sections;
}

export const groupSequential: Design<GroupSequentialInput, GroupSequentialResult> = {
  id: "group-sequential",
  version: 2,
  stage: "monitoring",
  title: "Group-sequential boundaries",
  summary: "Efficacy and optional non-binding futility boundaries for up to 10 looks by alpha and beta spending or the classical Pocock and O'Brien-Fleming boundaries, with exit probabilities, the inflation factor and the expected information.",
  input: schema,
  example: {
    mode: "plan",
    looks: 4,
    informationFractions: [0.25, 0.5, 0.75, 1],
    efficacyBoundary: "obrien-fleming-type",
    efficacyGamma: -4,
    futilityBoundary: "hwang-shih-decani",
    futilityGamma: -2,
    sides: 1,
    alpha: 0.025,
    power: 0.9,
    lastObservedIsFinal: false,
  },
  compute: computeGroupSequential,
  cost: costGroupSequential,
  question: (input) =>
    `Where should the boundaries lie at ${input.looks} look${input.looks === 1 ? "" : "s"} (at ${input.informationFractions.map((t) => t.toFixed(2)).join(", ")} of the information) so that the ${input.sides === 2 ? "two-sided" : "one-sided"} type I error stays at ${input.alpha} with ${input.power * 100}% power, and how much more information than a single analysis does that take?`,
  document: documentGroupSequential,
  references: groupSequentialReferences,
  cautions: [
    "Boundaries are on the Z scale of a normally distributed statistic with known variance; with small samples, convert the nominal p-values to the test actually used (for example a t test) rather than comparing t statistics with Z boundaries.",
    "The spending function must be fixed in the protocol before the first look; changing it after seeing interim results invalidates the type I error control.",
    "Information fractions are proportions of the planned maximum information (patients with the outcome observed, or events), not of calendar time or of patients enrolled.",
  ],
};
