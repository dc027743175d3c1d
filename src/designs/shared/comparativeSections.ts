/**
 * Report blocks shared by the two-arm comparative designs (two means, two
 * proportions, the AB/BA crossover): the same facts, per-arm table and power
 * curves in the same words, so that the reports and the form read alike.
 */
import type { Block, ChartMarker, ChartSeries, Fact, Section } from "../../report/document.js";
import { protocolSection } from "./reportSections.js";
import { type ArmSizes, inflateForDropout } from "./sizing.js";
import { type InterimLooksInput, type InterimLooksResult, interimLooksProtocolText, interimLooksSections } from "./interimLooks.js";

export interface TwoArmCounts {
  n1: number;
  n2: number;
  total: number;
  enrolled1: number;
  enrolled2: number;
  enrolledTotal: number;
  power: number;
}

/** The headline facts of a parallel two-arm design: arm sizes, enrolment, achieved power. */
export function twoArmFacts(r: TwoArmCounts): Fact[] {
  return [
    { label: "Control arm (n1)", value: r.n1, key: true },
    { label: "Experimental arm (n2)", value: r.n2, key: true },
    { label: "Total evaluable", value: r.total, key: true },
    { label: "Total to enrol after dropout", value: r.enrolledTotal, key: true },
    { label: "Achieved power", value: r.power, digits: 4, key: true },
  ];
}

/** Participants per arm, evaluable and to enrol. */
export function twoArmTable(r: TwoArmCounts): Block {
  return {
    kind: "table",
    table: {
      id: "arms",
      caption: "Participants per arm",
      columns: [{ key: "arm", label: "Arm" }, { key: "evaluable", label: "Evaluable" }, { key: "enrolled", label: "To enrol" }],
      rows: [["Control", r.n1, r.enrolled1], ["Experimental", r.n2, r.enrolled2], ["Total", r.total, r.enrolledTotal]],
    },
  };
}

/** Power against the total size, with the target power and the chosen size marked. */
export function powerCurveChart(c: { title: string; xLabel: string; series: ChartSeries[]; target: number; total: number }): Block {
  return {
    kind: "chart",
    chart: {
      id: "power-curve",
      title: c.title,
      xLabel: c.xLabel,
      yLabel: "Power",
      yDomain: [0, 1],
      series: c.series,
      markers: [{ axis: "y", value: c.target, label: `target ${c.target}` }, { axis: "x", value: c.total, label: `n = ${c.total}` }],
    },
  };
}

/** The power curve as a table, for reading off other sizes. */
export function powerCurveTable(points: Array<[number, number]>, totalLabel: string): Block {
  return {
    kind: "table",
    table: {
      id: "power-curve",
      caption: "Power at other sample sizes",
      columns: [{ key: "total", label: totalLabel }, { key: "power", label: "Power", digits: 4 }],
      rows: points.map(([n, p]) => [n, p]),
    },
  };
}

/** Power against the true effect at the chosen sizes, the assumed effect and the target marked. */
export function effectCurveChart(c: { title: string; xLabel: string; points: Array<[number, number]>; effect: ChartMarker; target: number }): Block {
  return {
    kind: "chart",
    chart: {
      id: "effect-curve",
      title: c.title,
      xLabel: c.xLabel,
      yLabel: "Power",
      yDomain: [0, 1],
      series: [{ name: "Power", points: [...c.points].sort((a, b) => a[0] - b[0]), style: "line" }],
      markers: [c.effect, { axis: "y", value: c.target, label: `target ${c.target}` }],
    },
  };
}

/** The interim-looks sections, when planned, then the protocol paragraph (with the looks' sentence appended). */
export function closingSections(interimLooks: InterimLooksInput | undefined, sides: 1 | 2, looks: InterimLooksResult | undefined, protocol: string, afterLooks = ""): Section[] {
  if (!interimLooks || !looks) return [protocolSection(protocol)];
  return [...interimLooksSections(interimLooks, sides, looks), protocolSection(`${protocol} ${interimLooksProtocolText(interimLooks, sides, looks)}${afterLooks}`)];
}

/** The counts of a two-arm result from its evaluable sizes: each arm inflated for dropout on its own. */
export function twoArmCounts(arms: ArmSizes, dropout: number, power: number): TwoArmCounts {
  const enrolled1 = inflateForDropout(arms.n1, dropout);
  const enrolled2 = inflateForDropout(arms.n2, dropout);
  return { n1: arms.n1, n2: arms.n2, total: arms.n1 + arms.n2, enrolled1, enrolled2, enrolledTotal: enrolled1 + enrolled2, power };
}
