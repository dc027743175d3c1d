/**
 * Lays a chart of the document model out as drawing primitives in a box
 * (points, y pointing down). The SVG and PDF renderers only translate these
 * primitives, so both draw the same chart from the same model.
 *
 * Pure and platform-free: the form pages bundle it for the browser.
 */
import { GRID, INK, MARKER, MUTED, RULE, SERIES_COLOURS, SERIES_DASHES } from "../../reports/theme.js";
import type { Chart, ChartSeries } from "./document.js";

export type Anchor = "start" | "middle" | "end";

export type Primitive =
  | { type: "line"; x1: number; y1: number; x2: number; y2: number; stroke: string; width: number; dash?: readonly number[] }
  | { type: "polyline"; points: Array<[number, number]>; stroke: string; width: number; dash?: readonly number[] }
  | { type: "rect"; x: number; y: number; width: number; height: number; fill: string }
  | { type: "circle"; cx: number; cy: number; r: number; fill: string }
  | { type: "text"; x: number; y: number; text: string; size: number; anchor: Anchor; fill: string; bold?: boolean; rotate?: -90 };

export interface ChartLayout {
  width: number;
  height: number;
  primitives: Primitive[];
  /** One sentence describing the chart for screen readers. */
  description: string;
}

export interface ChartBox {
  width: number;
  height: number;
  fontSize?: number;
}

/** Width of a text run; an average-glyph estimate keeps SVG and PDF geometry identical. */
export function estimateTextWidth(text: string, size: number): number {
  return [...text].length * size * 0.56;
}

interface Scale {
  min: number;
  max: number;
  ticks: number[];
  step: number;
}

/** Tick step of 1, 2 or 5 × 10^k giving about `target` intervals (Heckbert 1990, "Nice numbers for graph labels"). */
function niceStep(span: number, target: number): number {
  const raw = span / Math.max(1, target);
  const power = 10 ** Math.floor(Math.log10(raw));
  const fraction = raw / power;
  const nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  return nice * power;
}

function niceScale(lo: number, hi: number, target: number, fixed: boolean): Scale {
  if (!(hi > lo)) {
    const pad = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    lo -= pad;
    hi += pad;
  }
  const step = niceStep(hi - lo, target);
  const min = fixed ? lo : Math.floor(lo / step + 1e-9) * step;
  const max = fixed ? hi : Math.ceil(hi / step - 1e-9) * step;
  const ticks: number[] = [];
  const first = Math.ceil(min / step - 1e-9) * step;
  for (let i = 0; i <= 50; i++) {
    const t = first + i * step;
    if (t > max + step * 1e-9) break;
    ticks.push(Math.abs(t) < step * 1e-9 ? 0 : t);
  }
  return { min, max, ticks, step };
}

function tickLabel(value: number, step: number): string {
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
  const text = value.toFixed(decimals);
  return text.startsWith("-") ? `−${text.slice(1)}` : text;
}

function finitePoints(series: ChartSeries): Array<[number, number]> {
  return series.points.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
}

function extent(values: number[]): [number, number] | null {
  if (values.length === 0) return null;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/** Words of a category label on at most `maxLines` lines of `maxWidth`; what does not fit is cut with an ellipsis. */
function labelLines(text: string, maxWidth: number, size: number, maxLines: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(/\s+/).filter((w) => w !== "")) {
    const next = line === "" ? word : `${line} ${word}`;
    if (estimateTextWidth(next, size) <= maxWidth || line === "") line = next;
    else {
      lines.push(line);
      line = word;
    }
  }
  if (line !== "") lines.push(line);
  if (lines.length > maxLines) {
    const kept = lines.slice(0, maxLines);
    kept[maxLines - 1] = `${kept[maxLines - 1]} ${lines.slice(maxLines).join(" ")}`;
    return kept.map((l) => truncate(l, maxWidth, size));
  }
  return lines.map((l) => truncate(l, maxWidth, size));
}

function truncate(text: string, maxWidth: number, size: number): string {
  if (estimateTextWidth(text, size) <= maxWidth) return text;
  const chars = [...text];
  const keep = Math.max(1, Math.floor(maxWidth / (size * 0.56)) - 1);
  return `${chars.slice(0, keep).join("")}…`;
}

/** Legend entries flowed left to right, wrapping to a new row when the plot's width is used up. */
function placeLegend(names: string[], left: number, plotWidth: number, size: number): Array<{ x: number; row: number; label: string }> {
  let x = left;
  let row = 0;
  return names.map((name) => {
    // A name may take a whole row before it is shortened.
    const label = truncate(name, plotWidth - 34, size);
    const w = 22 + estimateTextWidth(label, size) + 12;
    if (x + w > left + plotWidth && x > left) {
      x = left;
      row += 1;
    }
    const entry = { x, row, label };
    x += w;
    return entry;
  });
}

export function layoutChart(chart: Chart, box: ChartBox): ChartLayout {
  const size = box.fontSize ?? 8;
  const { width, height } = box;
  const primitives: Primitive[] = [];
  const series = chart.series.map((s) => ({ ...s, points: finitePoints(s) }));
  const isBars = series.some((s) => s.style === "bars");
  const categories = chart.categories ?? [];

  const xs = series.flatMap((s) => s.points.map((p) => p[0]));
  const ys = series.flatMap((s) => s.points.map((p) => p[1]));
  for (const m of chart.markers ?? []) if (Number.isFinite(m.value)) (m.axis === "x" ? xs : ys).push(m.value);
  if (isBars) ys.push(0);
  const xExtent = chart.xDomain ?? extent(xs) ?? [0, 1];
  const yExtent = chart.yDomain ?? extent(ys) ?? [0, 1];

  const legend = series.length > 1;
  const yScale = niceScale(yExtent[0], yExtent[1], Math.max(3, Math.round(height / 45)), chart.yDomain !== undefined);
  const yLabels = yScale.ticks.map((t) => tickLabel(t, yScale.step));
  const left = size * 2.4 + Math.max(...yLabels.map((l) => estimateTextWidth(l, size)), size) + 6;
  const right = size * 1.5;
  // Bars sit on category bands; other charts on a continuous x axis.
  const bandCount = isBars ? Math.max(categories.length, ...xs.map((x) => Math.round(x) + 1), 1) : 0;
  const plotWidth = Math.max(10, width - left - right);
  const legendEntries = legend ? placeLegend(series.map((s) => s.name), left, plotWidth, size) : [];
  // The plot starts below the last legend row, however many rows a narrow chart needs.
  const legendRows = legendEntries.length > 0 ? Math.max(...legendEntries.map((e) => e.row)) + 1 : 0;
  const top = legend ? size * 1.6 + legendRows * size * 1.4 : size * 1.6;
  const categoryLines = isBars
    ? [...Array(bandCount).keys()].map((t) => labelLines(categories[t] ?? String(t), plotWidth / bandCount - 3, size, 2))
    : [];
  const labelRows = Math.max(1, ...categoryLines.map((l) => l.length));
  const bottom = size * (3.1 + 1.15 * labelRows);
  const plot = { x: left, y: top, width: plotWidth, height: Math.max(10, height - top - bottom) };

  const xScale = isBars
    ? { min: -0.5, max: bandCount - 0.5, ticks: [...Array(bandCount).keys()], step: 1 }
    : niceScale(xExtent[0], xExtent[1], Math.max(3, Math.round(plot.width / 70)), chart.xDomain !== undefined);
  const px = (x: number): number => plot.x + ((x - xScale.min) / (xScale.max - xScale.min)) * plot.width;
  const py = (y: number): number => plot.y + plot.height - ((y - yScale.min) / (yScale.max - yScale.min)) * plot.height;
  const clampY = (y: number): number => Math.min(plot.y + plot.height, Math.max(plot.y, py(y)));
  const clampX = (x: number): number => Math.min(plot.x + plot.width, Math.max(plot.x, px(x)));

  yScale.ticks.forEach((t, i) => {
    const y = py(t);
    primitives.push({ type: "line", x1: plot.x, y1: y, x2: plot.x + plot.width, y2: y, stroke: GRID, width: 0.6 });
    primitives.push({ type: "text", x: plot.x - 4, y: y + size * 0.35, text: yLabels[i]!, size, anchor: "end", fill: MUTED });
  });
  const xLabelAt = (t: number): string => (isBars ? categories[t] ?? String(t) : tickLabel(t, xScale.step));
  const bandWidth = plot.width / Math.max(1, xScale.max - xScale.min);
  for (const t of xScale.ticks) {
    const x = px(t);
    if (!isBars) primitives.push({ type: "line", x1: x, y1: plot.y, x2: x, y2: plot.y + plot.height, stroke: GRID, width: 0.6 });
    primitives.push({ type: "line", x1: x, y1: plot.y + plot.height, x2: x, y2: plot.y + plot.height + 3, stroke: RULE, width: 0.6 });
    const lines = isBars ? categoryLines[t] ?? [] : [xLabelAt(t)];
    lines.forEach((label, k) => {
      primitives.push({ type: "text", x, y: plot.y + plot.height + size * (1.5 + 1.15 * k), text: label, size, anchor: "middle", fill: MUTED });
    });
  }
  primitives.push({ type: "line", x1: plot.x, y1: plot.y + plot.height, x2: plot.x + plot.width, y2: plot.y + plot.height, stroke: INK, width: 0.8 });
  primitives.push({ type: "line", x1: plot.x, y1: plot.y, x2: plot.x, y2: plot.y + plot.height, stroke: INK, width: 0.8 });
  primitives.push({ type: "text", x: plot.x + plot.width / 2, y: height - size * 0.8, text: chart.xLabel, size, anchor: "middle", fill: INK });
  primitives.push({ type: "text", x: size * 1.1, y: plot.y + plot.height / 2, text: chart.yLabel, size, anchor: "middle", fill: INK, rotate: -90 });

  const barSeries = series.filter((s) => s.style === "bars");
  series.forEach((s, index) => {
    const stroke = SERIES_COLOURS[index % SERIES_COLOURS.length]!;
    const dash = SERIES_DASHES[index % SERIES_DASHES.length]!;
    const style = s.style ?? "line";
    if (style === "bars") {
      const slot = barSeries.indexOf(s);
      const groupWidth = bandWidth * 0.78;
      const barWidth = groupWidth / barSeries.length;
      for (const [x, y] of s.points) {
        const x0 = px(x) - groupWidth / 2 + slot * barWidth;
        const base = clampY(Math.max(yScale.min, Math.min(0, yScale.max)));
        const yTop = clampY(y);
        primitives.push({ type: "rect", x: x0, y: Math.min(base, yTop), width: Math.max(0.5, barWidth - 0.8), height: Math.abs(base - yTop), fill: stroke });
      }
    } else if (style === "points") {
      for (const [x, y] of s.points) {
        if (x < xScale.min || x > xScale.max || y < yScale.min || y > yScale.max) continue;
        primitives.push({ type: "circle", cx: px(x), cy: py(y), r: 2.2, fill: stroke });
      }
    } else {
      const sorted = [...s.points].sort((a, b) => a[0] - b[0]);
      const path: Array<[number, number]> = [];
      sorted.forEach(([x, y], i) => {
        if (style === "step" && i > 0) path.push([clampX(x), path[path.length - 1]![1]]);
        path.push([clampX(x), clampY(y)]);
      });
      if (path.length === 1) primitives.push({ type: "circle", cx: path[0]![0], cy: path[0]![1], r: 2.2, fill: stroke });
      else if (path.length > 1) primitives.push({ type: "polyline", points: path, stroke, width: 1.6, dash });
    }
  });

  for (const m of chart.markers ?? []) {
    if (!Number.isFinite(m.value)) continue;
    if (m.axis === "x") {
      if (m.value < xScale.min || m.value > xScale.max) continue;
      const x = px(m.value);
      primitives.push({ type: "line", x1: x, y1: plot.y, x2: x, y2: plot.y + plot.height, stroke: MARKER, width: 0.9, dash: [3, 2] });
      const nearRight = x > plot.x + plot.width * 0.7;
      primitives.push({ type: "text", x: nearRight ? x - 3 : x + 3, y: plot.y + size * 1.1, text: m.label, size, anchor: nearRight ? "end" : "start", fill: MARKER });
    } else {
      if (m.value < yScale.min || m.value > yScale.max) continue;
      const y = py(m.value);
      primitives.push({ type: "line", x1: plot.x, y1: y, x2: plot.x + plot.width, y2: y, stroke: MARKER, width: 0.9, dash: [3, 2] });
      const above = y - plot.y > size * 1.5;
      primitives.push({ type: "text", x: plot.x + plot.width - 3, y: above ? y - 3 : y + size + 2, text: m.label, size, anchor: "end", fill: MARKER });
    }
  }

  if (legend) {
    series.forEach((s, index) => {
      const colour = SERIES_COLOURS[index % SERIES_COLOURS.length]!;
      const { x, row, label } = legendEntries[index]!;
      const y = size * 1.2 + row * size * 1.4;
      if (s.style === "bars") primitives.push({ type: "rect", x, y: y - size * 0.7, width: 14, height: size * 0.8, fill: colour });
      else if (s.style === "points") primitives.push({ type: "circle", cx: x + 8, cy: y - size * 0.3, r: 2.2, fill: colour });
      else primitives.push({ type: "line", x1: x, y1: y - size * 0.3, x2: x + 16, y2: y - size * 0.3, stroke: colour, width: 1.6, dash: SERIES_DASHES[index % SERIES_DASHES.length]! });
      primitives.push({ type: "text", x: x + 20, y, text: label, size, anchor: "start", fill: INK });
    });
  }

  if (xs.length === 0) {
    primitives.push({ type: "text", x: plot.x + plot.width / 2, y: plot.y + plot.height / 2, text: "No data to draw", size, anchor: "middle", fill: MUTED });
  }

  const seriesText = series.map((s) => {
    const pts = s.points;
    const xr = extent(pts.map((p) => p[0]));
    return xr ? `${s.name}: ${pts.length} points, ${chart.xLabel} from ${xr[0]} to ${xr[1]}` : `${s.name}: no points`;
  }).join("; ");
  return { width, height, primitives, description: `${chart.title}. ${chart.yLabel} against ${chart.xLabel}. ${seriesText}.` };
}
