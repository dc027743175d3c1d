/**
 * The 3+3 dose-escalation design: its operating characteristics computed
 * exactly by enumerating every sequence of cohort outcomes (no simulation).
 *
 * Method: the rule-based design described by Storer (1989) and reviewed by
 * Le Tourneau, Lee & Siu (2009). Cohorts of 3 at the current dose, starting at
 * the lowest:
 *   0 of 3 with a DLT      → escalate to the next dose;
 *   1 of 3                 → treat 3 more at the same dose; escalate if 1 of 6;
 *   2 or more of 3, or of 6 → stop escalating: the MTD is the next lower dose.
 * Each cohort's number of DLTs is Binomial(3, p) at the dose's true DLT
 * probability p, so the probability of clearing a dose is
 * (1-p)^3 + 3p(1-p)^2 (1-p)^3.
 *
 * Conventions:
 * - mtdRule "next-lower-dose": the MTD is declared at the next lower dose
 *   whatever its number of patients (3 or 6).
 * - mtdRule "next-lower-dose-with-six": the declared MTD must have 6 patients
 *   with at most 1 DLT. If the next lower dose has only 3, 3 more are treated
 *   there; 2 or more DLTs among its 6 de-escalate again, down to no dose.
 * - The highest dose is declared the MTD when it clears the escalation rule
 *   (no dose above it was tested). Under "next-lower-dose-with-six" it too
 *   must have 6 patients: after 0 of 3 at the top, 3 more are treated there.
 * - Stopping at the lowest dose selects no dose.
 * - The scenario's probabilities need not increase with dose: the rules and
 *   the enumeration do not depend on it.
 */
import { z } from "zod";
import type { Design, WorkEstimate } from "./design.js";
import type { Section } from "../report/document.js";
import { binomialPmf } from "../stats/binomial.js";
import { threePlusThreeWork } from "./shared/doseFindingCost.js";
import { STORER_1989 } from "./shared/doseFindingReferences.js";
import { designSection, protocolSection } from "./shared/reportSections.js";

export const MAX_DOSES = 12;
const COHORT = 3;

export type MtdRule = "next-lower-dose" | "next-lower-dose-with-six";

export interface ThreePlusThreeOperatingCharacteristics {
  /** P(dose i is declared the MTD), per dose. */
  selectionProbability: number[];
  /** P(no dose is declared the MTD: the lowest dose is too toxic). */
  noDoseProbability: number;
  /** P(dose i treats at least one cohort). */
  treatedProbability: number[];
  /** P(dose i clears the escalation rule | it is reached): 0 of 3, or 1 of 6. */
  escalationProbability: number[];
  expectedPatients: number[];
  expectedDlts: number[];
  expectedTotalPatients: number;
  expectedTotalDlts: number;
  /** [total patients, probability], for every total that can occur. */
  sampleSizeDistribution: Array<[number, number]>;
}

/**
 * Exact operating characteristics of the 3+3 design for one scenario.
 * @param probabilities true DLT probability at each dose, lowest first, each in (0, 1)
 * @param mtdRule where the MTD is declared after a dose proves too toxic
 * @returns selection probabilities, expected patients and DLTs per dose and in total
 * @example threePlusThreeOperatingCharacteristics([0.05, 0.1, 0.2, 0.35], "next-lower-dose")
 */
export function threePlusThreeOperatingCharacteristics(
  probabilities: readonly number[],
  mtdRule: MtdRule = "next-lower-dose",
): ThreePlusThreeOperatingCharacteristics {
  const k = probabilities.length;
  if (k < 1 || k > MAX_DOSES || probabilities.some((p) => !(p > 0 && p < 1))) {
    throw new RangeError(`threePlusThreeOperatingCharacteristics needs 1 to ${MAX_DOSES} probabilities in (0, 1).`);
  }
  const cohortPmf = probabilities.map((p) => [0, 1, 2, 3].map((x) => binomialPmf(x, COHORT, p)));
  const withSix = mtdRule === "next-lower-dose-with-six";

  const selection = new Array<number>(k).fill(0);
  const treated = new Array<number>(k).fill(0);
  const expectedPatients = new Array<number>(k).fill(0);
  const expectedDlts = new Array<number>(k).fill(0);
  const bySize = new Map<number, number>();
  let noDose = 0;
  // Path state, undone on the way back up the recursion.
  const patients = new Array<number>(k).fill(0);
  let total = 0;

  const finish = (selected: number, probability: number): void => {
    if (selected < 0) noDose += probability; else selection[selected]! += probability;
    bySize.set(total, (bySize.get(total) ?? 0) + probability);
  };

  /**
   * Treats one cohort at `dose`, reached with `probability`, then runs `next`,
   * which branches on the outcome classes that lead to different decisions.
   * The cohort's DLT count is Binomial(3, p) whatever follows, so expected
   * patients and DLTs are added here; outcomes that lead to the same state (2
   * or 3 DLTs) are merged rather than enumerated apart.
   */
  const treat = (dose: number, probability: number, next: () => void): void => {
    expectedPatients[dose]! += COHORT * probability;
    expectedDlts[dose]! += COHORT * probabilities[dose]! * probability;
    patients[dose]! += COHORT;
    total += COHORT;
    next();
    patients[dose]! -= COHORT;
    total -= COHORT;
  };

  /** The dose proved too toxic: declare, or confirm, the next lower one. */
  const tooToxic = (dose: number, probability: number): void => {
    if (withSix) confirm(dose - 1, probability); else finish(dose - 1, probability);
  };

  /**
   * Under the six-patient rule: the candidate MTD needs 6 patients with at most
   * 1 DLT. A candidate with 3 patients cleared with 0 of 3, so 3 more pass
   * with at most 1 DLT among them.
   */
  const confirm = (dose: number, probability: number): void => {
    if (dose < 0) { finish(-1, probability); return; }
    if (patients[dose]! >= 2 * COHORT) { finish(dose, probability); return; }
    const [f0, f1, f2, f3] = cohortPmf[dose]! as [number, number, number, number];
    treat(dose, probability, () => {
      finish(dose, probability * (f0 + f1));
      confirm(dose - 1, probability * (f2 + f3));
    });
  };

  /** The dose cleared the escalation rule. */
  const cleared = (dose: number, probability: number): void => {
    if (dose + 1 < k) escalate(dose + 1, probability);
    else if (withSix) confirm(dose, probability);
    else finish(dose, probability);
  };

  const escalate = (dose: number, probability: number): void => {
    treated[dose]! += probability;
    const [f0, f1, f2, f3] = cohortPmf[dose]! as [number, number, number, number];
    treat(dose, probability, () => {
      cleared(dose, probability * f0);
      tooToxic(dose, probability * (f2 + f3));
      treat(dose, probability * f1, () => {
        cleared(dose, probability * f1 * f0);
        tooToxic(dose, probability * f1 * (f1 + f2 + f3));
      });
    });
  };

  escalate(0, 1);

  // Clearing a dose is the same local event wherever it is reached: sum its branches.
  const escalationProbability = cohortPmf.map((f) => f[0]! + f[1]! * f[0]!);
  const expectedTotalPatients = expectedPatients.reduce((a, b) => a + b, 0);
  const expectedTotalDlts = expectedDlts.reduce((a, b) => a + b, 0);
  return {
    selectionProbability: selection,
    noDoseProbability: noDose,
    treatedProbability: treated,
    escalationProbability,
    expectedPatients,
    expectedDlts,
    expectedTotalPatients,
    expectedTotalDlts,
    sampleSizeDistribution: [...bySize.entries()].sort((a, b) => a[0] - b[0]),
  };
}

const schema = z
  .strictObject({
    doses: z.array(z.string().trim().min(1).max(40).describe("A dose label, e.g. \"20 mg/m²\"."))
      .min(1, "Give at least one dose.").max(MAX_DOSES, `At most ${MAX_DOSES} doses can be enumerated; drop or merge dose levels.`)
      .describe(`Dose labels from lowest to highest (1 to ${MAX_DOSES} doses).`),
    dltProbabilities: z.array(z.number().gt(0, "A DLT probability must be strictly between 0 and 1.").lt(1, "A DLT probability must be strictly between 0 and 1.").describe("True probability of a DLT at this dose, strictly between 0 and 1."))
      .min(1, "Give at least one DLT probability.").max(MAX_DOSES, `At most ${MAX_DOSES} doses can be enumerated; drop or merge dose levels.`)
      .describe("The scenario: the true probability of a dose-limiting toxicity at each dose, in the same order as the dose labels."),
    mtdRule: z.enum(["next-lower-dose", "next-lower-dose-with-six"]).default("next-lower-dose")
      .describe("next-lower-dose: after 2 or more DLTs at a dose, the next lower dose is the MTD. next-lower-dose-with-six: the MTD must have 6 patients with at most 1 DLT; 3 more are treated at the next lower dose if it has only 3, de-escalating again after 2 or more DLTs among 6."),
  })
  .superRefine((v, ctx) => {
    if (v.dltProbabilities.length !== v.doses.length) {
      ctx.addIssue({
        code: "custom",
        path: ["dltProbabilities"],
        message: `Give one DLT probability per dose: ${v.doses.length} dose label${v.doses.length === 1 ? "" : "s"} but ${v.dltProbabilities.length} probabilit${v.dltProbabilities.length === 1 ? "y" : "ies"}.`,
      });
    }
    const seen = new Map<string, number>();
    v.doses.forEach((label, i) => {
      const first = seen.get(label);
      if (first !== undefined) {
        ctx.addIssue({ code: "custom", path: ["doses", i], message: `The label "${label}" is used twice (doses ${first + 1} and ${i + 1}); give each dose its own label.` });
      } else seen.set(label, i);
    });
  });

export type ThreePlusThreeInput = z.output<typeof schema>;

export interface ThreePlusThreeResult extends ThreePlusThreeOperatingCharacteristics {
  /** Index of the dose most likely to be declared the MTD, or -1 when "no dose" is most likely. */
  mostLikelySelection: number;
}

function computeThreePlusThree(input: ThreePlusThreeInput): ThreePlusThreeResult {
  const oc = threePlusThreeOperatingCharacteristics(input.dltProbabilities, input.mtdRule);
  let mostLikelySelection = -1;
  let best = oc.noDoseProbability;
  oc.selectionProbability.forEach((p, i) => { if (p > best) { best = p; mostLikelySelection = i; } });
  return { ...oc, mostLikelySelection };
}

/** The enumeration's work grows as 2^doses (shared/doseFindingCost.ts); at most 12 doses keep it within a few milliseconds. */
function costThreePlusThree(input: ThreePlusThreeInput): WorkEstimate {
  return { ...threePlusThreeWork(input.doses.length), reduce: ["doses"] };
}

const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;

function decisionRules(mtdRule: MtdRule): Array<[string, string]> {
  const rows: Array<[string, string]> = [
    ["0 of 3", "Escalate to the next higher dose (at the highest dose: it is the MTD" + (mtdRule === "next-lower-dose-with-six" ? " once 3 more patients give at most 1 DLT among 6)" : ")")],
    ["1 of 3", "Treat 3 more patients at the same dose"],
    ["1 of 6", "Escalate to the next higher dose (at the highest dose: it is the MTD)"],
    ["2 or more of 3, or 2 or more of 6", "Stop escalating; the MTD is the next lower dose (none if this is the lowest dose)"],
  ];
  if (mtdRule === "next-lower-dose-with-six") {
    rows.push(
      ["Next lower dose has 3 patients", "Treat 3 more there before declaring it the MTD"],
      ["At most 1 of 6 at that dose", "It is the MTD"],
      ["2 or more of 6 at that dose", "De-escalate again to the next lower dose and apply the same check (none if it was the lowest)"],
    );
  }
  return rows;
}

function documentThreePlusThree(input: ThreePlusThreeInput, r: ThreePlusThreeResult): Section[] {
  const labels = input.doses;
  const selected = r.mostLikelySelection >= 0 ? labels[r.mostLikelySelection]! : "no dose";
  const ruleText = input.mtdRule === "next-lower-dose-with-six"
    ? "the MTD is the next lower dose, which must have 6 patients with at most 1 DLT: if it has only 3, 3 more are treated there, and 2 or more DLTs among its 6 patients lead to a further de-escalation"
    : "the MTD is the dose below the first dose at which 2 or more patients have a DLT";
  const scenario = labels.map((l, i) => `${l}: ${input.dltProbabilities[i]}`).join("; ");
  const selectionText = labels.map((l, i) => `${l} ${pct(r.selectionProbability[i]!)}`).join(", ");
  const protocol =
    `Dose escalation will follow the 3+3 design (Storer 1989) over ${labels.length} dose level${labels.length === 1 ? "" : "s"} (${labels.join(", ")}), starting at ${labels[0]}. ` +
    `Patients are treated in cohorts of 3. If none of 3 patients has a dose-limiting toxicity (DLT), the next cohort receives the next higher dose; if 1 of 3 has a DLT, 3 more patients are treated at the same dose and escalation continues if no more than 1 of the 6 has a DLT; if 2 or more patients at a dose have a DLT, escalation stops and ${ruleText}. ` +
    `Under an assumed scenario of true DLT probabilities (${scenario}), exact enumeration of all cohort outcomes gives the probability of declaring each dose the MTD as ${selectionText}, and of declaring no dose ${pct(r.noDoseProbability)}. ` +
    `The expected number of patients is ${r.expectedTotalPatients.toFixed(1)} and the expected number of patients with a DLT is ${r.expectedTotalDlts.toFixed(2)}.`;
  return [
    designSection([
      { label: "Most likely MTD", value: selected, key: true, note: `probability ${pct(r.mostLikelySelection >= 0 ? r.selectionProbability[r.mostLikelySelection]! : r.noDoseProbability)}` },
      { label: "Expected patients", value: r.expectedTotalPatients, digits: 2, key: true },
      { label: "Expected patients with a DLT", value: r.expectedTotalDlts, digits: 2, key: true },
      { label: "Probability no dose is declared the MTD", value: r.noDoseProbability, digits: 4, key: true },
      { label: "MTD rule", value: input.mtdRule === "next-lower-dose-with-six" ? "next lower dose, confirmed with 6 patients" : "next lower dose" },
    ], [
      {
        kind: "table",
        table: {
          id: "decision-rules",
          caption: "Decision rules: patients with a DLT among those treated at the current dose",
          columns: [{ key: "observed", label: "Patients with a DLT at the current dose" }, { key: "action", label: "Action" }],
          rows: decisionRules(input.mtdRule),
        },
      },
    ]),
    {
      id: "operating-characteristics",
      title: "Operating characteristics (exact)",
      blocks: [
        {
          kind: "table",
          table: {
            id: "operating-characteristics",
            caption: "Per dose, under the assumed scenario",
            columns: [
              { key: "dose", label: "Dose" },
              { key: "dlt", label: "True DLT probability", digits: 3 },
              { key: "selected", label: "P(declared MTD)", digits: 4 },
              { key: "treated", label: "P(dose is used)", digits: 4 },
              { key: "clears", label: "P(escalation past the dose | reached)", digits: 4 },
              { key: "patients", label: "Expected patients", digits: 2 },
              { key: "dlts", label: "Expected DLTs", digits: 2 },
            ],
            rows: [
              ...labels.map((l, i) => [l, input.dltProbabilities[i]!, r.selectionProbability[i]!, r.treatedProbability[i]!, r.escalationProbability[i]!, r.expectedPatients[i]!, r.expectedDlts[i]!]),
              ["No dose", null, r.noDoseProbability, null, null, null, null],
              ["Total", null, null, null, null, r.expectedTotalPatients, r.expectedTotalDlts],
            ],
            note: "Computed by enumerating every sequence of cohort outcomes; no simulation. P(escalation past the dose | reached) is (1-p)^3 + 3p(1-p)^2 (1-p)^3.",
          },
        },
        {
          kind: "chart",
          chart: {
            id: "selection",
            title: "Probability of declaring each dose the MTD",
            xLabel: "Dose",
            yLabel: "Probability",
            yDomain: [0, 1],
            categories: ["None", ...labels],
            series: [
              { name: "P(declared MTD)", style: "bars", points: [[0, r.noDoseProbability], ...r.selectionProbability.map((p, i): [number, number] => [i + 1, p])] },
              { name: "True DLT probability", style: "points", points: input.dltProbabilities.map((p, i): [number, number] => [i + 1, p]) },
            ],
          },
        },
        {
          kind: "table",
          table: {
            id: "sample-size-distribution",
            caption: "Distribution of the number of patients treated",
            columns: [{ key: "patients", label: "Patients" }, { key: "probability", label: "Probability", digits: 4 }],
            rows: r.sampleSizeDistribution.map(([n, p]) => [n, p]),
          },
        },
      ],
    },
    protocolSection(protocol),
  ];
}

export const threePlusThree: Design<ThreePlusThreeInput, ThreePlusThreeResult> = {
  id: "three-plus-three",
  version: 1,
  stage: "dose-finding",
  title: "3+3 dose escalation",
  summary: "Exact operating characteristics of the 3+3 dose-escalation rules for a scenario of true DLT probabilities: how often each dose is declared the MTD, and how many patients and DLTs to expect.",
  input: schema,
  example: {
    doses: ["TW-417 10 mg", "TW-417 20 mg", "TW-417 40 mg", "TW-417 70 mg", "TW-417 100 mg"],
    dltProbabilities: [0.05, 0.1, 0.2, 0.33, 0.5],
    mtdRule: "next-lower-dose",
  },
  compute: computeThreePlusThree,
  cost: costThreePlusThree,
  question: (input) =>
    `If the true DLT probabilities at ${input.doses.join(", ")} are ${input.dltProbabilities.join(", ")}, how often does the 3+3 design declare each dose the MTD${input.mtdRule === "next-lower-dose-with-six" ? " (with 6 patients required at the MTD)" : ""}, and how many patients and DLTs should be expected?`,
  document: documentThreePlusThree,
  references: [
    STORER_1989,
    { key: "Le Tourneau, Lee & Siu 2009", text: "Le Tourneau C, Lee JJ, Siu LL. Dose escalation methods in phase I cancer clinical trials. Journal of the National Cancer Institute. 2009;101(10):708-720.", doi: "10.1093/jnci/djp079" },
    { key: "Lin & Shih 2001", text: "Lin Y, Shih WJ. Statistical properties of the traditional algorithm-based designs for phase I cancer clinical trials. Biostatistics. 2001;2(2):203-215.", doi: "10.1093/biostatistics/2.2.203" },
  ],
  cautions: [
    "The 3+3 design does not target a DLT rate: the dose it declares the MTD has, on average, a DLT probability well below 33%, and it is often declared after only 6 patients, so its DLT rate is poorly estimated.",
    "The operating characteristics hold only for the assumed scenario of true DLT probabilities; run several scenarios, including ones where the lowest dose is already too toxic.",
  ],
};
