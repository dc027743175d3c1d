/**
 * Draws a chart of the document model as SVG. Used until the report's own SVG
 * renderer can be shared with the page; the same model, so the same picture
 * in substance: axes with round ticks, lines, steps, points or bars, markers.
 */
import type { Chart, ChartSeries } from "../../src/report/document.js";
import { svg } from "./dom.js";

const WIDTH = 640;
const HEIGHT = 340;
const MARGIN = { top: 16, right: 20, bottom: 52, left: 64 };
/** Ink colours with at least 4.5:1 contrast on white, distinct in hue and in dash. */
const INKS = ["#0b5b66", "#a1460a", "#5b3a9e", "#a3123d"];
const DASHES = ["", "6 4", "2 3", "10 3 2 3"];

function niceTicks(low: number, high: number, count = 5): number[] {
  if (!(high > low)) return [low];
  const raw = (high - low) / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? raw;
  const ticks: number[] = [];
  for (let t = Math.ceil(low / step) * step; t <= high + step * 1e-9; t += step) ticks.push(Number(t.toPrecision(12)));
  return ticks;
}

function extent(values: number[], fallback: [number, number]): [number, number] {
  const finite = values.filter(Number.isFinite);
  if (finite.length === 0) return fallback;
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (lo === hi) {
    lo -= 1;
    hi += 1;
  }
  return [lo, hi];
}

const tickLabel = (t: number): string => (Math.abs(t) >= 1e5 || (t !== 0 && Math.abs(t) < 1e-3) ? t.toExponential(1) : String(Number(t.toPrecision(6))));

export function chartElement(chart: Chart): SVGSVGElement {
  const bars = chart.series.some((s) => s.style === "bars");
  const xs = chart.series.flatMap((s) => s.points.map((p) => p[0])).concat((chart.markers ?? []).filter((m) => m.axis === "x").map((m) => m.value));
  const ys = chart.series.flatMap((s) => s.points.map((p) => p[1])).concat((chart.markers ?? []).filter((m) => m.axis === "y").map((m) => m.value));
  let [x0, x1] = chart.xDomain ?? extent(xs, [0, 1]);
  const [y0raw, y1] = chart.yDomain ?? extent(ys.concat(bars ? [0] : []), [0, 1]);
  const y0 = y0raw;
  if (bars && !chart.xDomain) {
    x0 -= 0.5;
    x1 += 0.5;
  }
  const plotW = WIDTH - MARGIN.left - MARGIN.right;
  const plotH = HEIGHT - MARGIN.top - MARGIN.bottom;
  const sx = (x: number): number => MARGIN.left + ((x - x0) / (x1 - x0)) * plotW;
  const sy = (y: number): number => MARGIN.top + plotH - ((y - y0) / (y1 - y0)) * plotH;
  const titleId = `chart-${chart.id}-title`;
  const root = svg("svg", { viewBox: `0 0 ${WIDTH} ${HEIGHT}`, role: "img", "aria-labelledby": titleId, class: "chart" }, svg("title", { id: titleId }, chart.title));
  const axes = svg("g", { class: "axes", "font-size": 12, fill: "#333" });
  const yTicks = niceTicks(y0, y1);
  for (const t of yTicks) {
    axes.append(svg("line", { x1: MARGIN.left, x2: WIDTH - MARGIN.right, y1: sy(t), y2: sy(t), stroke: "#e3e6ea" }));
    axes.append(svg("text", { x: MARGIN.left - 8, y: sy(t) + 4, "text-anchor": "end" }, tickLabel(t)));
  }
  const xTicks = bars && chart.categories ? chart.categories.map((_, i) => i) : niceTicks(x0, x1, 6);
  for (const t of xTicks) {
    if (t < x0 || t > x1) continue;
    axes.append(svg("line", { x1: sx(t), x2: sx(t), y1: MARGIN.top + plotH, y2: MARGIN.top + plotH + 5, stroke: "#555" }));
    axes.append(svg("text", { x: sx(t), y: MARGIN.top + plotH + 19, "text-anchor": "middle" }, bars && chart.categories ? chart.categories[t] ?? String(t) : tickLabel(t)));
  }
  axes.append(svg("line", { x1: MARGIN.left, x2: WIDTH - MARGIN.right, y1: MARGIN.top + plotH, y2: MARGIN.top + plotH, stroke: "#555" }));
  axes.append(svg("line", { x1: MARGIN.left, x2: MARGIN.left, y1: MARGIN.top, y2: MARGIN.top + plotH, stroke: "#555" }));
  axes.append(svg("text", { x: MARGIN.left + plotW / 2, y: HEIGHT - 10, "text-anchor": "middle" }, chart.xLabel));
  axes.append(svg("text", { x: 14, y: MARGIN.top + plotH / 2, "text-anchor": "middle", transform: `rotate(-90 14 ${MARGIN.top + plotH / 2})` }, chart.yLabel));
  root.append(axes);
  const barSeries = chart.series.filter((s) => s.style === "bars");
  chart.series.forEach((series, i) => root.append(drawSeries(series, i, sx, sy, y0, barSeries.indexOf(series), barSeries.length, plotW / Math.max(1, x1 - x0))));
  for (const marker of chart.markers ?? []) {
    const g = svg("g", { class: "marker", "font-size": 11, fill: "#333" });
    if (marker.axis === "x") {
      g.append(svg("line", { x1: sx(marker.value), x2: sx(marker.value), y1: MARGIN.top, y2: MARGIN.top + plotH, stroke: "#333", "stroke-dasharray": "3 3" }));
      g.append(svg("text", { x: sx(marker.value) + 4, y: MARGIN.top + 12 }, marker.label));
    } else {
      g.append(svg("line", { x1: MARGIN.left, x2: WIDTH - MARGIN.right, y1: sy(marker.value), y2: sy(marker.value), stroke: "#333", "stroke-dasharray": "3 3" }));
      g.append(svg("text", { x: WIDTH - MARGIN.right - 4, y: sy(marker.value) - 5, "text-anchor": "end" }, marker.label));
    }
    root.append(g);
  }
  if (chart.series.length > 1) {
    const legend = svg("g", { class: "legend", "font-size": 12, fill: "#222" });
    chart.series.forEach((s, i) => {
      const y = MARGIN.top + 8 + i * 16;
      legend.append(svg("line", { x1: MARGIN.left + 10, x2: MARGIN.left + 34, y1: y, y2: y, stroke: INKS[i % INKS.length]!, "stroke-width": 3, "stroke-dasharray": DASHES[i % DASHES.length]! }));
      legend.append(svg("text", { x: MARGIN.left + 40, y: y + 4 }, s.name));
    });
    root.append(legend);
  }
  return root;
}

function drawSeries(series: ChartSeries, index: number, sx: (x: number) => number, sy: (y: number) => number, y0: number, barIndex: number, barCount: number, unit: number): SVGGElement {
  const ink = INKS[index % INKS.length]!;
  const g = svg("g", { class: "series" }, svg("title", {}, series.name));
  const points = series.points.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
  switch (series.style) {
    case "bars": {
      const width = (unit * 0.8) / Math.max(1, barCount);
      for (const [x, y] of points) {
        const left = sx(x) - (unit * 0.8) / 2 + barIndex * width;
        g.append(svg("rect", { x: left, y: Math.min(sy(y), sy(y0)), width: Math.max(1, width - 2), height: Math.abs(sy(y0) - sy(y)), fill: ink }));
      }
      break;
    }
    case "points":
      for (const [x, y] of points) g.append(svg("circle", { cx: sx(x), cy: sy(y), r: 3.5, fill: ink }));
      break;
    default: {
      const step = series.style === "step";
      const d = points.map(([x, y], i) => {
        if (i === 0) return `M${sx(x).toFixed(1)},${sy(y).toFixed(1)}`;
        return step ? `H${sx(x).toFixed(1)}V${sy(y).toFixed(1)}` : `L${sx(x).toFixed(1)},${sy(y).toFixed(1)}`;
      }).join("");
      g.append(svg("path", { d, fill: "none", stroke: ink, "stroke-width": 2.5, "stroke-dasharray": DASHES[index % DASHES.length]! }));
    }
  }
  return g;
}
