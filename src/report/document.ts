/**
 * The document model: what a report says, independent of how it is drawn.
 * Designs produce sections of blocks; the HTML and PDF renderers draw them.
 * Numbers stay numbers here so that CSV and JSON keep full precision; a column
 * or fact says how many digits a reader sees.
 */

export type Cell = string | number | null;

export interface Column {
  key: string;
  label: string;
  /** Significant decimals shown for numeric cells; integers are shown as they are. */
  digits?: number;
  unit?: string;
}

export interface Table {
  /** Stable, url-safe: also the CSV file name. */
  id: string;
  caption: string;
  columns: Column[];
  rows: Cell[][];
  note?: string;
}

export interface Fact {
  label: string;
  value: Cell;
  digits?: number;
  unit?: string;
  note?: string;
  /** Key facts lead the report and the form's result panel. */
  key?: boolean;
}

export interface ChartSeries {
  name: string;
  points: Array<[number, number]>;
  style?: "line" | "step" | "points" | "bars";
}

export interface ChartMarker {
  axis: "x" | "y";
  value: number;
  label: string;
}

export interface Chart {
  id: string;
  title: string;
  xLabel: string;
  yLabel: string;
  series: ChartSeries[];
  markers?: ChartMarker[];
  xDomain?: [number, number];
  yDomain?: [number, number];
  /** Category labels for bar charts, indexed by x. */
  categories?: string[];
}

export type Block =
  | { kind: "facts"; facts: Fact[] }
  | { kind: "table"; table: Table }
  | { kind: "chart"; chart: Chart }
  | { kind: "paragraph"; text: string }
  | { kind: "protocol"; text: string }
  | { kind: "list"; items: string[] };

export interface Section {
  id: string;
  title: string;
  blocks: Block[];
}

/** Fixed-decimal formatting used by every renderer, so HTML, PDF and CSV agree. */
export function formatNumber(value: number, digits?: number): string {
  if (!Number.isFinite(value)) return value > 0 ? "∞" : value < 0 ? "−∞" : "—";
  if (digits === undefined) {
    return Number.isInteger(value) ? String(value) : String(Number(value.toPrecision(6)));
  }
  return value.toFixed(digits);
}

/** A column's heading as every format prints it: the label, then its unit in parentheses. */
export function columnHeading(c: Column): string {
  return c.unit ? `${c.label} (${c.unit})` : c.label;
}

export function formatCell(value: Cell, digits?: number): string {
  if (value === null) return "—";
  if (typeof value === "number") return formatNumber(value, Number.isInteger(value) && digits === undefined ? undefined : digits);
  return value;
}
