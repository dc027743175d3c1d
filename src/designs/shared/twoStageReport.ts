/** Report blocks shared by the two-stage single-arm designs: the rule as a clinic applies it. */
import type { Chart, Table } from "../../report/document.js";
import type { TwoStagePoint, TwoStageRule } from "./twoStage.js";

export function twoStageRuleTable(rule: TwoStageRule, id = "decision-rules"): Table {
  return {
    id,
    caption: `Decision rules: ${describeTwoStage(rule)}`,
    columns: [
      { key: "when", label: "When" },
      { key: "patients", label: "Evaluable patients so far" },
      { key: "rule", label: "Rule" },
    ],
    rows: [
      ["End of stage 1", rule.n1, `Stop for lack of activity if ${rule.r1} or fewer respond; otherwise enrol ${rule.n - rule.n1} more.`],
      ["End of stage 2", rule.n, `Declare the drug promising if ${rule.r + 1} or more respond in all ${rule.n}; otherwise not promising.`],
    ],
  };
}

/** "r1/n1, then r/n", the usual shorthand. */
export function describeTwoStage(rule: TwoStageRule): string {
  return `${rule.r1}/${rule.n1}, then ${rule.r}/${rule.n}`;
}

export function twoStageChart(id: string, title: string, curves: Array<{ name: string; points: TwoStagePoint[] }>, p0: number, p1: number): Chart {
  return {
    id,
    title,
    xLabel: "True response rate",
    yLabel: "Probability",
    xDomain: [0, 1],
    yDomain: [0, 1],
    series: curves.flatMap((c) => [
      { name: `Stop after stage 1 (${c.name})`, points: c.points.map((p): [number, number] => [p.rate, p.probabilityOfEarlyTermination]), style: "line" as const },
      { name: `Declare promising (${c.name})`, points: c.points.map((p): [number, number] => [p.rate, p.probabilityOfPromise]), style: "line" as const },
    ]),
    markers: [
      { axis: "x", value: p0, label: `p0 = ${p0}` },
      { axis: "x", value: p1, label: `p1 = ${p1}` },
    ],
  };
}
