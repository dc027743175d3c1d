/**
 * Sections that every design's report opens or closes with, built in one
 * place so that their ids and titles, which the renderers and the form key
 * on, stay the same across designs.
 */
import type { Block, ChartMarker, Fact, Section } from "../../report/document.js";

/** The "Design" section: its facts first, then the design's own blocks. */
export function designSection(facts: Fact[], blocks: Block[] = []): Section {
  return { id: "design", title: "Design", blocks: [{ kind: "facts", facts }, ...blocks] };
}

/** The closing paragraph, ready to paste: "for the protocol" before a trial, "for the report" after one. */
export function protocolSection(text: string, purpose: "protocol" | "report" = "protocol"): Section {
  return { id: "protocol", title: `Statistical paragraph for the ${purpose}`, blocks: [{ kind: "protocol", text }] };
}

/**
 * The operating characteristics of a single-arm rule as one probability
 * against the true response rate over [0, 1].
 */
export function responseRateCurveSection(
  chart: { id: string; title: string; yLabel: string; points: Array<[number, number]>; markers: ChartMarker[] },
): Section {
  return {
    id: "operating-characteristics",
    title: "Operating characteristics",
    blocks: [{
      kind: "chart",
      chart: {
        id: chart.id,
        title: chart.title,
        xLabel: "True response rate",
        yLabel: chart.yLabel,
        xDomain: [0, 1],
        yDomain: [0, 1],
        series: [{ name: chart.yLabel, points: chart.points, style: "line" }],
        markers: chart.markers,
      },
    }],
  };
}
