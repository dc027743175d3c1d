/**
 * Draws a chart of the document model as an inline SVG string. Platform-free
 * (no DOM, no Worker APIs): the report pages and the form pages' browser
 * bundle both use it.
 *
 * @example
 *   import { renderChartSvg } from "../src/report/svg.js";
 *   element.innerHTML = renderChartSvg(section.blocks[0].chart);
 */
import type { Chart } from "./document.js";
import { type ChartBox, type Primitive, layoutChart } from "./chartLayout.js";
import { escapeMarkup } from "./escape.js";

const r = (v: number): string => String(Math.round(v * 100) / 100);

function dashAttribute(dash: readonly number[] | undefined): string {
  return dash && dash.length > 0 ? ` stroke-dasharray="${dash.join(" ")}"` : "";
}

function primitiveSvg(p: Primitive): string {
  switch (p.type) {
    case "line":
      return `<line x1="${r(p.x1)}" y1="${r(p.y1)}" x2="${r(p.x2)}" y2="${r(p.y2)}" stroke="${p.stroke}" stroke-width="${p.width}"${dashAttribute(p.dash)}/>`;
    case "polyline":
      return `<polyline fill="none" stroke="${p.stroke}" stroke-width="${p.width}" stroke-linejoin="round"${dashAttribute(p.dash)} points="${p.points.map(([x, y]) => `${r(x)},${r(y)}`).join(" ")}"/>`;
    case "rect":
      return `<rect x="${r(p.x)}" y="${r(p.y)}" width="${r(p.width)}" height="${r(p.height)}" fill="${p.fill}"/>`;
    case "circle":
      return `<circle cx="${r(p.cx)}" cy="${r(p.cy)}" r="${r(p.r)}" fill="${p.fill}"/>`;
    case "text": {
      const transform = p.rotate ? ` transform="rotate(${p.rotate} ${r(p.x)} ${r(p.y)})"` : "";
      return `<text x="${r(p.x)}" y="${r(p.y)}" font-size="${p.size}" text-anchor="${p.anchor}" fill="${p.fill}"${p.bold ? ' font-weight="bold"' : ""}${transform}>${escapeMarkup(p.text)}</text>`;
    }
  }
}

export interface SvgOptions extends Partial<ChartBox> {
  /** Prefix for element ids, unique within the page. */
  idPrefix?: string;
}

/**
 * @param chart a chart block of the document model
 * @returns an `<svg>` element that scales to its container, with a title and description for screen readers
 */
export function renderChartSvg(chart: Chart, options: SvgOptions = {}): string {
  const layout = layoutChart(chart, { width: options.width ?? 640, height: options.height ?? 300, fontSize: options.fontSize ?? 10 });
  const id = escapeMarkup(`${options.idPrefix ?? "chart"}-${chart.id}`);
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${r(layout.width)} ${r(layout.height)}" role="img" aria-labelledby="${id}-title ${id}-desc" font-family="'DejaVu Sans', system-ui, sans-serif" class="chart">` +
    `<title id="${id}-title">${escapeMarkup(chart.title)}</title><desc id="${id}-desc">${escapeMarkup(layout.description)}</desc>` +
    layout.primitives.map(primitiveSvg).join("") +
    "</svg>";
}
