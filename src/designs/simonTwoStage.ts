/**
 * Simon's two-stage design for a single-arm trial of response rate.
 *
 * Method: Simon R. Optimal two-stage designs for phase II clinical trials.
 * Controlled Clinical Trials 1989;10:1-10. Enrol n1 patients; stop if r1 or
 * fewer respond; otherwise enrol to n and declare the drug promising if more
 * than r respond in all. Among rules with P(declare promising | p0) ≤ alpha
 * and P(declare promising | p1) ≥ power, computed exactly by binomial
 * enumeration, the optimal design has the smallest expected size under p0 and
 * the minimax design the smallest n (ties broken by expected size under p0).
 * Admissible designs (Jung, Lee, Kim & George 2004, Statistics in Medicine
 * 23:561-569) minimize q·n + (1 - q)·E(N | p0) for some
 * weight q in [0, 1]; each is reported with the range of q on which it is best.
 *
 * Conventions: alpha is one-sided; r1 ≥ 0 (stage 1 can always stop the
 * trial); at the same (n1, r1, n) the smallest r within alpha is taken (the
 * most powerful); remaining ties keep the smaller n1, then the smaller r1; the
 * search covers every n up to maxN (see shared/simonSearch.ts).
 */
import { z } from "zod";
import { type Design, InfeasibleDesignError, type WorkEstimate } from "./design.js";
import type { Block, Fact, Section } from "../report/document.js";
import { TARGET_SLACK, checkResponseRates, responseRateFields } from "./shared/responseRates.js";
import { type AdmissibleCandidate, searchCanSucceed, searchSimon, searchTermsBound, surelyFindsDesign } from "./shared/simonSearch.js";
import {
  TWO_STAGE_MAX_N, type TwoStagePoint, type TwoStageRule, type TwoStageSummary, evaluateTwoStage, rateGrid, summarizeTwoStage,
} from "./shared/twoStage.js";
import { describeTwoStage, twoStageChart, twoStageRuleTable } from "./shared/twoStageReport.js";
import { designSection, protocolSection } from "./shared/reportSections.js";
import { workEstimate } from "./shared/workEstimate.js";

const SIMON_MAX_N = TWO_STAGE_MAX_N;

const count = (description: string) => z.number().int().min(0).max(SIMON_MAX_N).optional().describe(description);

const schema = z
  .strictObject({
    mode: z.enum(["search", "evaluate"]).default("search")
      .describe("search: find the optimal, minimax and admissible designs. evaluate: the operating characteristics of a design you give (r1, n1, r, n)."),
    ...responseRateFields,
    maxN: z.number().int().min(2).max(SIMON_MAX_N).default(100)
      .describe(`Largest total number of patients the search may consider (at most ${SIMON_MAX_N}).`),
    protocolDesign: z.enum(["optimal", "minimax"]).default("optimal")
      .describe("Which design the decision rules and the protocol paragraph describe, in search mode."),
    r1: count("Evaluate mode: stop after stage 1 if this many or fewer of the first n1 patients respond."),
    n1: count("Evaluate mode: number of patients in stage 1."),
    r: count("Evaluate mode: declare the drug promising if more than this many of all n patients respond."),
    n: count("Evaluate mode: total number of patients over both stages."),
    trueRates: z.array(z.number().min(0).max(1)).max(50).default([])
      .describe("Further true response rates (0 to 1) at which to report the probability of stopping early, of declaring promise, and the expected size."),
  })
  .superRefine((v, ctx) => {
    checkResponseRates(v, ctx);
    if (v.mode !== "evaluate") return;
    const issue = (path: string, message: string): void => ctx.addIssue({ code: "custom", path: [path], message });
    const missing = (["r1", "n1", "r", "n"] as const).filter((k) => v[k] === undefined);
    for (const k of missing) issue(k, "Evaluate mode needs the whole design: r1, n1, r and n.");
    if (missing.length > 0) return;
    const { r1, n1, r, n } = v as Required<typeof v>;
    if (n1 < 1) issue("n1", "Stage 1 needs at least one patient.");
    if (n1 >= n) issue("n", `The total size n (${n}) must exceed the stage-1 size n1 (${n1}).`);
    if (r1 >= n1) issue("r1", `The stage-1 stopping count r1 (${r1}) must be below n1 (${n1}), or stage 1 would always stop the trial.`);
    if (r < r1) issue("r", `The final count r (${r}) cannot be below the stage-1 count r1 (${r1}).`);
    if (r >= n) issue("r", `The final count r (${r}) must be below n (${n}), or the drug could never be declared promising.`);
  });

export type SimonTwoStageInput = z.output<typeof schema>;

export interface AdmissibleDesign extends TwoStageSummary {
  lowestWeight: number;
  highestWeight: number;
}

export interface SimonTwoStageResult {
  mode: "search" | "evaluate";
  optimal: TwoStageSummary | null;
  minimax: TwoStageSummary | null;
  admissible: AdmissibleDesign[];
  /** The design the rules and protocol text describe: the chosen one in search mode, the given one in evaluate mode. */
  design: TwoStageSummary;
  /** Evaluate mode: whether the given design keeps alpha and reaches power. */
  meetsTargets: boolean;
  curves: Array<{ name: string; points: TwoStagePoint[] }>;
  atRequestedRates: TwoStagePoint[];
}

/**
 * After a search up to maxN found nothing, the smallest total that has a
 * design (the minimax n of a search up to SIMON_MAX_N), to tell the user how
 * far the search must go; the totals already searched are not searched again.
 */
function smallestWorkingMaxN(input: SimonTwoStageInput): number | null {
  return searchSimon({ ...input, maxN: SIMON_MAX_N }, input.maxN + 1)?.minimax.n ?? null;
}

/**
 * The compute budget (budget.ts). A search costs its binomial terms
 * (searchTermsBound). An empty search up to maxN is followed by one over the
 * larger totals, and the two together add no more than one search up to
 * SIMON_MAX_N, so the count is of a search up to maxN when a design within
 * maxN is certain (surelyFindsDesign), up to SIMON_MAX_N otherwise, and none
 * when the most powerful test on SIMON_MAX_N patients cannot reach the power
 * (both searches then stop before they start). The search also tabulates 4
 * binomial distributions a total; an evaluation costs one distribution of
 * each stage per rate.
 *
 * Constants from `npm run bench designs` (the simon-two-stage heaviest cases,
 * median CPU over 3 runs while other work shared the machine): the search up
 * to 300 whose only design has 300 patients sums 0.045·300⁴ terms in 550 ms,
 * 1.5 ns a term (an empty search up to 299 continued to 300 sums as many
 * terms in about the same time); 1.8 ns is taken. A pair of distributions of 300
 * patients, or an evaluation at one rate, took under 10 µs.
 */
const MS_PER_SEARCH_TERM = 1.8e-6;
const MS_PER_DISTRIBUTION_PAIR = 0.01;

/** The largest total the searches of this input may visit: maxN, SIMON_MAX_N, or 0 when none runs. */
function searchReach(input: SimonTwoStageInput): number {
  if (!searchCanSucceed({ ...input, maxN: SIMON_MAX_N })) return 0;
  return searchCanSucceed(input) && surelyFindsDesign(input) ? input.maxN : SIMON_MAX_N;
}

export function costSimonTwoStage(input: SimonTwoStageInput): WorkEstimate {
  if (input.mode === "evaluate") {
    // Both summary rates, the chart's grid and the requested rates.
    const rates = 2 + rateGrid(input.p0, input.p1).length + input.trueRates.length;
    return workEstimate([{ count: rates, msEach: MS_PER_DISTRIBUTION_PAIR, what: "evaluations of the given design at a response rate" }], ["trueRates"]);
  }
  const reach = searchReach(input);
  if (reach === 0) {
    return workEstimate([{ count: 2, msEach: MS_PER_DISTRIBUTION_PAIR, what: `most powerful tests, which show that no rule on ${SIMON_MAX_N} patients reaches the power: no search` }], ["maxN"]);
  }
  const scope = reach > input.maxN
    ? `up to ${SIMON_MAX_N} patients, since no design within maxN = ${input.maxN} is certain and the smallest maxN that works would be looked for`
    : `up to ${reach} patients`;
  return workEstimate([
    { count: searchTermsBound(reach), msEach: MS_PER_SEARCH_TERM, what: `binomial terms at most, searching every stage-1 size, stopping count and total ${scope}` },
    { count: 4 * reach, msEach: MS_PER_DISTRIBUTION_PAIR / 2, what: "binomial distributions tabulated for the search" },
  ], ["maxN"]);
}

export function computeSimonTwoStage(input: SimonTwoStageInput): SimonTwoStageResult {
  const summary = (d: TwoStageRule): TwoStageSummary => summarizeTwoStage(d, input.p0, input.p1);
  const grid = rateGrid(input.p0, input.p1);
  const curve = (d: TwoStageRule): TwoStagePoint[] => grid.map((p) => evaluateTwoStage(d, p));
  if (input.mode === "evaluate") {
    const rule = { r1: input.r1!, n1: input.n1!, r: input.r!, n: input.n! };
    const design = summary(rule);
    return {
      mode: "evaluate",
      optimal: null,
      minimax: null,
      admissible: [],
      design,
      meetsTargets: design.alpha <= input.alpha + TARGET_SLACK && design.power >= input.power - TARGET_SLACK,
      curves: [{ name: describeTwoStage(rule), points: curve(rule) }],
      atRequestedRates: input.trueRates.map((p) => evaluateTwoStage(rule, p)),
    };
  }
  const found = searchSimon(input);
  if (!found) {
    const smallestMaxN = smallestWorkingMaxN(input);
    throw new InfeasibleDesignError(
      smallestMaxN === null
        ? `No two-stage design with at most ${SIMON_MAX_N} patients keeps alpha at ${input.alpha} and reaches power ${input.power} for p0 = ${input.p0} and p1 = ${input.p1}. Widen the gap between p0 and p1, or relax alpha or power.`
        : `No two-stage design with at most ${input.maxN} patients meets these targets; the smallest maxN that gives one is ${smallestMaxN}.`,
      { field: "maxN", bound: input.maxN, ...(smallestMaxN === null ? {} : { smallestMaxN }) },
    );
  }
  const optimal = summary(found.optimal);
  const minimax = summary(found.minimax);
  const design = input.protocolDesign === "optimal" ? optimal : minimax;
  const sameDesign = found.optimal.n === found.minimax.n && found.optimal.n1 === found.minimax.n1 && found.optimal.r1 === found.minimax.r1 && found.optimal.r === found.minimax.r;
  return {
    mode: "search",
    optimal,
    minimax,
    admissible: found.admissible.map((d: AdmissibleCandidate) => ({ ...summary(d), lowestWeight: d.lowestWeight, highestWeight: d.highestWeight })),
    design,
    meetsTargets: true,
    curves: sameDesign
      ? [{ name: "optimal and minimax", points: curve(found.optimal) }]
      : [{ name: "optimal", points: curve(found.optimal) }, { name: "minimax", points: curve(found.minimax) }],
    atRequestedRates: input.trueRates.map((p) => evaluateTwoStage(design, p)),
  };
}

const pct = (x: number, d = 1): string => `${(x * 100).toFixed(d)}%`;

function designRow(label: string, d: TwoStageSummary, weights: string): Array<string | number> {
  return [label, d.r1, d.n1, d.r, d.n, d.expectedSampleSize0, d.expectedSampleSize1, d.probabilityOfEarlyTermination0, d.probabilityOfEarlyTermination1, d.alpha, d.power, weights];
}

function documentSimon(input: SimonTwoStageInput, res: SimonTwoStageResult): Section[] {
  const d = res.design;
  const which = res.mode === "evaluate" ? "given" : input.protocolDesign;
  const facts: Fact[] = [
    { label: "Stage 1: patients (n1)", value: d.n1, key: true },
    { label: "Stage 1: stop if responses ≤ (r1)", value: d.r1, key: true },
    { label: "Total patients (n)", value: d.n, key: true },
    { label: "Promising if responses > (r)", value: d.r, key: true },
    { label: "Exact alpha (at p0)", value: d.alpha, digits: 4, key: true },
    { label: "Exact power (at p1)", value: d.power, digits: 4, key: true },
    { label: "Expected size at p0", value: d.expectedSampleSize0, digits: 2 },
    { label: "Expected size at p1", value: d.expectedSampleSize1, digits: 2 },
    { label: "Probability of early termination at p0", value: d.probabilityOfEarlyTermination0, digits: 4 },
    { label: "Probability of early termination at p1", value: d.probabilityOfEarlyTermination1, digits: 4 },
    ...(res.mode === "evaluate" ? [{ label: "Meets the alpha and power targets", value: res.meetsTargets ? "yes" : "no", key: true }] : []),
  ];
  const blocks: Block[] = [{ kind: "table", table: twoStageRuleTable(d) }];
  if (res.mode === "search") {
    const weight = (a: AdmissibleDesign): string => `${+a.lowestWeight.toFixed(3)}–${+a.highestWeight.toFixed(3)}`;
    const last = res.admissible.length - 1;
    // The minimax design is best at weight 1 and the optimal at weight 0: they open and close the list.
    const label = (i: number): string => (i === 0 && i === last ? "Minimax and optimal" : i === 0 ? "Minimax" : i === last ? "Optimal" : "Admissible");
    const rows = res.admissible.map((a, i) => designRow(label(i), a, weight(a)));
    blocks.push({
      kind: "table",
      table: {
        id: "designs",
        caption: `Designs with alpha ≤ ${input.alpha} and power ≥ ${input.power}, n ≤ ${input.maxN}`,
        columns: [
          { key: "design", label: "Design" },
          { key: "r1", label: "r1" }, { key: "n1", label: "n1" }, { key: "r", label: "r" }, { key: "n", label: "n" },
          { key: "en0", label: "E(N) at p0", digits: 2 }, { key: "en1", label: "E(N) at p1", digits: 2 },
          { key: "pet0", label: "PET at p0", digits: 3 }, { key: "pet1", label: "PET at p1", digits: 3 },
          { key: "alpha", label: "Alpha", digits: 4 }, { key: "power", label: "Power", digits: 4 },
          { key: "weights", label: "Best for q" },
        ],
        rows,
        note: "Every admissible design (Jung et al. 2004), from the minimax to the optimal design. Each minimizes q·n + (1 − q)·E(N at p0) for every weight q in its range: q = 1 counts only the maximum size n, q = 0 only the expected size at p0. E(N): expected number of patients; PET: probability of early termination.",
      },
    });
  }
  const pointRows = (points: TwoStagePoint[]) => points.map((p) => [p.rate, p.probabilityOfEarlyTermination, p.probabilityOfPromise, p.expectedSampleSize]);
  const ocColumns = [
    { key: "rate", label: "True response rate" },
    { key: "pet", label: "P(stop after stage 1)", digits: 4 },
    { key: "promise", label: "P(declare promising)", digits: 4 },
    { key: "en", label: "Expected size", digits: 2 },
  ];
  const ocBlocks: Block[] = [
    { kind: "chart", chart: twoStageChart("operating-characteristics", "Probability of stopping after stage 1 and of declaring promise, against the true response rate", res.curves, input.p0, input.p1) },
    {
      kind: "table",
      table: {
        id: "operating-characteristics",
        caption: `Operating characteristics of the ${which} design (${describeTwoStage(d)})`,
        columns: ocColumns,
        rows: pointRows(rateGrid(input.p0, input.p1).filter((p) => Math.round(p * 100) % 10 === 0 || p === input.p0 || p === input.p1).map((p) => evaluateTwoStage(d, p))),
      },
    },
  ];
  if (res.atRequestedRates.length > 0) {
    ocBlocks.push({ kind: "table", table: { id: "requested-rates", caption: "At the requested true response rates", columns: ocColumns, rows: pointRows(res.atRequestedRates) } });
  }
  const protocol = `The trial follows Simon's two-stage design${res.mode === "search" ? ` (the ${which} design; Simon 1989)` : " (Simon 1989)"} to test the null hypothesis that the true response rate is at most ${input.p0} against the alternative that it is at least ${input.p1}. ` +
    `In stage 1, ${d.n1} evaluable patients are enrolled; if ${d.r1} or fewer respond, the trial stops for lack of activity. Otherwise ${d.n - d.n1} further patients are enrolled, for ${d.n} in total, and the drug is declared promising if ${d.r + 1} or more respond. ` +
    `Computed exactly from the binomial distribution, the probability of declaring the drug promising is ${d.alpha.toFixed(4)} when the true rate is ${input.p0} (one-sided alpha; target at most ${input.alpha}) and ${d.power.toFixed(4)} when it is ${input.p1} (power; target at least ${input.power}). ` +
    `If the true rate is ${input.p0}, the trial stops after stage 1 with probability ${d.probabilityOfEarlyTermination0.toFixed(3)} and the expected number of patients is ${d.expectedSampleSize0.toFixed(1)}; if it is ${input.p1}, these are ${d.probabilityOfEarlyTermination1.toFixed(3)} and ${d.expectedSampleSize1.toFixed(1)}.`;
  return [
    designSection(facts, blocks),
    { id: "operating-characteristics", title: "Operating characteristics", blocks: ocBlocks },
    protocolSection(protocol),
  ];
}

export const simonTwoStage: Design<SimonTwoStageInput, SimonTwoStageResult> = {
  id: "simon-two-stage",
  version: 1,
  stage: "activity",
  title: "Simon two-stage design",
  summary: "Single-arm two-stage design that stops early when the response rate is plainly too low: optimal, minimax and admissible designs with exact alpha and power, or the characteristics of a given design.",
  input: schema,
  example: {
    mode: "search",
    p0: 0.1,
    p1: 0.3,
    alpha: 0.05,
    power: 0.8,
    maxN: 60,
    protocolDesign: "optimal",
    trueRates: [0.2],
  },
  compute: computeSimonTwoStage,
  cost: costSimonTwoStage,
  question: (input) => input.mode === "evaluate"
    ? `How does the two-stage rule ${input.r1}/${input.n1}, then ${input.r}/${input.n} behave: how often does it stop early and declare the drug promising, at response rates ${input.p0} (uninteresting) and ${input.p1} (target) and across other true rates?`
    : `Which two-stage single-arm design, with at most ${input.maxN} patients, declares the drug promising with probability at most ${input.alpha} if its response rate is ${input.p0} and at least ${input.power} if it is ${input.p1}, while stopping early as often as possible when it is not active?`,
  document: documentSimon,
  references: [
    { key: "Simon 1989", text: "Simon R. Optimal two-stage designs for phase II clinical trials. Controlled Clinical Trials. 1989;10(1):1-10.", doi: "10.1016/0197-2456(89)90015-9" },
    { key: "Jung et al. 2004", text: "Jung SH, Lee T, Kim K, George SL. Admissible two-stage designs for phase II cancer clinical trials. Statistics in Medicine. 2004;23(4):561-569." },
  ],
  cautions: [
    "Alpha and power hold only if the trial follows the rule: enrolling past a stopping point, or judging on patients who are not evaluable, changes both.",
    "At the end of a two-stage trial the plain proportion of responders is biased by the early stop; report the p-value, confidence interval and estimate that account for the design (the two-stage-inference design).",
    "The response rates p0 and p1 are assumptions; justify p0 from the outcomes of current treatment in the same population.",
  ],
};
