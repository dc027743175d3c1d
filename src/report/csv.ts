/**
 * One table of the document model as CSV (RFC 4180: comma-separated, CRLF,
 * quotes doubled). Numbers keep full precision; column units join the header.
 */
import { type Cell, type Table, columnHeading } from "./document.js";

function field(value: string): string {
  return /[",\r\n]/.test(value) || /^\s|\s$/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** Spreadsheet programs run cells that start with = + - @ as formulas; a leading apostrophe keeps text text (OWASP CSV injection advice). */
function textCell(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

function cell(value: Cell): string {
  if (value === null) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  return field(textCell(value));
}

export function tableCsv(table: Table): string {
  const header = table.columns.map((c) => field(textCell(columnHeading(c))));
  return [header.join(","), ...table.rows.map((row) => table.columns.map((_, i) => cell(row[i] ?? null)).join(","))].join("\r\n") + "\r\n";
}
