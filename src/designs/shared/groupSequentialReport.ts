/** Report blocks shared by the group-sequential design and the interim-looks option. */
import type { Chart, Table } from "../../report/document.js";
import type { Citation } from "../design.js";
import type { GroupSequentialPlan, GroupSequentialSpec } from "./groupSequentialPlan.js";

/** The boundary method in words, for alpha (efficacy) or beta (futility) spending. */
export function boundaryMethodText(spec: Pick<GroupSequentialSpec, "efficacyBoundary" | "efficacyGamma">, error: "alpha" | "beta"): string {
  switch (spec.efficacyBoundary) {
    case "pocock":
      return "Pocock's constant boundaries (Pocock 1977)";
    case "obrien-fleming":
      return "O'Brien-Fleming boundaries (O'Brien & Fleming 1979)";
    case "obrien-fleming-type":
      return `the O'Brien-Fleming-type ${error}-spending function of Lan & DeMets (1983)`;
    case "pocock-type":
      return `the Pocock-type ${error}-spending function of Lan & DeMets (1983)`;
    case "hwang-shih-decani":
      return `the Hwang-Shih-DeCani ${error}-spending function with γ = ${spec.efficacyGamma} (Hwang, Shih & DeCani 1990)`;
  }
}

/** The decision rules per look, as a table a data monitoring committee can follow. */
export function decisionTable(p: GroupSequentialPlan, sides: 1 | 2, id: string, extra?: { label: string; values: number[] }): Table {
  const hasFutility = p.looks.some((l) => l.futilityZ !== null);
  return {
    id,
    caption: sides === 2
      ? "Decision rules: stop for efficacy when |Z| reaches the boundary (direction given by the sign of Z)"
      : "Decision rules: stop for efficacy when Z reaches the boundary",
    columns: [
      { key: "look", label: "Look" },
      { key: "fraction", label: "Information fraction", digits: 3 },
      ...(extra ? [{ key: "size", label: extra.label }] : []),
      { key: "efficacyZ", label: sides === 2 ? "Efficacy |Z| ≥" : "Efficacy Z ≥", digits: 3 },
      { key: "efficacyP", label: sides === 2 ? "Nominal two-sided p ≤" : "Nominal one-sided p ≤", digits: 5 },
      ...(hasFutility ? [
        { key: "futilityZ", label: "Futility: Z <", digits: 3 },
        { key: "futilityP", label: "Futility: one-sided p >", digits: 4 },
      ] : []),
      { key: "alphaSpent", label: "Alpha spent at look", digits: 5 },
      { key: "cumulativeAlpha", label: "Alpha spent up to look", digits: 5 },
    ],
    rows: p.looks.map((l, k) => [
      l.look, l.informationFraction,
      ...(extra ? [extra.values[k]!] : []),
      l.efficacyZ, l.efficacyNominalP,
      ...(hasFutility ? [l.futilityZ, l.futilityNominalP] : []),
      l.alphaSpent, l.cumulativeAlphaSpent,
    ]),
    note: hasFutility ? "Futility boundaries are non-binding: the efficacy boundaries were computed ignoring them." : undefined,
  };
}

/** Probabilities of stopping at each look, under no effect and under the alternative. */
export function exitTable(p: GroupSequentialPlan, sides: 1 | 2, id: string): Table {
  const hasFutility = p.looks.some((l) => l.futilityZ !== null);
  return {
    id,
    caption: "Probability of stopping at each look",
    columns: [
      { key: "look", label: "Look" },
      { key: "fraction", label: "Information fraction", digits: 3 },
      { key: "nullEfficacy", label: sides === 2 ? "No effect: efficacy (either tail)" : "No effect: efficacy", digits: 5 },
      ...(hasFutility ? [{ key: "nullFutility", label: "No effect: futility", digits: 4 }] : []),
      { key: "altEfficacy", label: "Alternative: efficacy", digits: 4 },
      ...(hasFutility ? [{ key: "altFutility", label: "Alternative: futility", digits: 4 }] : []),
    ],
    rows: p.looks.map((l) => [
      l.look, l.informationFraction,
      l.underNull.efficacy + l.underNull.lowerEfficacy,
      ...(hasFutility ? [l.underNull.futility] : []),
      l.underAlternative.efficacy + l.underAlternative.lowerEfficacy,
      ...(hasFutility ? [l.underAlternative.futility] : []),
    ]),
    note: hasFutility ? "Stopping probabilities assume every futility stop is made; the final look's futility column is the probability of ending without rejecting." : undefined,
  };
}

/** Boundaries on the Z scale against the information fraction. */
export function boundaryChart(p: GroupSequentialPlan, sides: 1 | 2, id: string): Chart {
  const upper: Array<[number, number]> = p.looks.map((l) => [l.informationFraction, l.efficacyZ]);
  const series: Chart["series"] = [{ name: "Efficacy boundary", points: upper, style: "line" }];
  if (sides === 2) series.push({ name: "Lower efficacy boundary", points: p.looks.map((l) => [l.informationFraction, -l.efficacyZ]), style: "line" });
  const futility = p.looks.filter((l) => l.futilityZ !== null).map((l): [number, number] => [l.informationFraction, l.futilityZ!]);
  if (futility.length > 0) series.push({ name: "Futility boundary (non-binding)", points: futility, style: "line" });
  const top = Math.min(8, Math.max(...p.looks.map((l) => l.efficacyZ)) + 0.5);
  const bottom = sides === 2 ? -top : Math.max(-4, Math.min(0, ...futility.map(([, z]) => z)) - 0.5);
  return {
    id,
    title: "Boundaries on the Z scale against the information fraction",
    xLabel: "Information fraction",
    yLabel: "Z",
    xDomain: [0, Math.max(1, ...p.looks.map((l) => l.informationFraction))],
    yDomain: [bottom, top],
    series,
    markers: [{ axis: "y", value: 0, label: "Z = 0" }],
  };
}

export const groupSequentialReferences: Citation[] = [
  { key: "Armitage, McPherson & Rowe 1969", text: "Armitage P, McPherson CK, Rowe BC. Repeated significance tests on accumulating data. Journal of the Royal Statistical Society, Series A. 1969;132(2):235-244.", doi: "10.2307/2343787" },
  { key: "Jennison & Turnbull 2000", text: "Jennison C, Turnbull BW. Group Sequential Methods with Applications to Clinical Trials. Boca Raton: Chapman & Hall/CRC; 2000. Chapters 2, 7 and 19." },
  { key: "Lan & DeMets 1983", text: "Lan KKG, DeMets DL. Discrete sequential boundaries for clinical trials. Biometrika. 1983;70(3):659-663.", doi: "10.2307/2336502" },
  { key: "Pocock 1977", text: "Pocock SJ. Group sequential methods in the design and analysis of clinical trials. Biometrika. 1977;64(2):191-199.", doi: "10.2307/2335684" },
  { key: "O'Brien & Fleming 1979", text: "O'Brien PC, Fleming TR. A multiple testing procedure for clinical trials. Biometrics. 1979;35(3):549-556.", doi: "10.2307/2530245" },
  { key: "Hwang, Shih & DeCani 1990", text: "Hwang IK, Shih WJ, DeCani JS. Group sequential designs using a family of type I error probability spending functions. Statistics in Medicine. 1990;9(12):1439-1445.", doi: "10.1002/sim.4780091207" },
  { key: "Pampallona, Tsiatis & Kim 2001", text: "Pampallona S, Tsiatis AA, Kim K. Interim monitoring of group sequential trials using spending functions for the type I and type II error probabilities. Drug Information Journal. 2001;35(4):1113-1121.", doi: "10.1177/009286150103500408" },
];
