/**
 * Charts on the form pages: the report's own SVG renderer (src/report/svg.ts),
 * so the live result and the frozen report draw the same picture. Its markup is
 * parsed as SVG (not HTML) and adopted, which keeps the page free of inline
 * script and of innerHTML.
 */
import type { Chart } from "../../src/report/document.js";
import { renderChartSvg } from "../../src/report/svg.js";
import { h } from "./dom.js";

/** On a phone a 640-unit chart would shrink its lettering below legibility; lay it out narrower instead. */
const narrow = (): boolean => window.matchMedia("(max-width: 40rem)").matches;

export function chartElement(chart: Chart, idPrefix: string): Element {
  const box = narrow() ? { width: 360, height: 300 } : { width: 640, height: 300 };
  const parsed = new DOMParser().parseFromString(renderChartSvg(chart, { idPrefix, ...box }), "image/svg+xml");
  const root = parsed.documentElement;
  if (root.namespaceURI !== "http://www.w3.org/2000/svg" || parsed.getElementsByTagName("parsererror").length > 0) {
    return h("p", { class: "note" }, `The chart “${chart.title}” could not be drawn; its numbers are in the tables.`);
  }
  return document.importNode(root, true);
}
