// Reading printed numbers back out of a design's document, so tests can check
// what a report shows, not only the result it was drawn from.
import type { Cell, Chart, Fact, Section, Table } from "../../src/report/document.js";

/** The table with this id; fails the test when the document has none. */
export function documentTable(sections: Section[], id: string): Table {
  const table = sections.flatMap((s) => s.blocks).flatMap((b) => (b.kind === "table" && b.table.id === id ? [b.table] : []))[0];
  if (!table) throw new Error(`no table "${id}" in the document`);
  return table;
}

/** The chart with this id; fails the test when the document has none. */
export function documentChart(sections: Section[], id: string): Chart {
  const chart = sections.flatMap((s) => s.blocks).flatMap((b) => (b.kind === "chart" && b.chart.id === id ? [b.chart] : []))[0];
  if (!chart) throw new Error(`no chart "${id}" in the document`);
  return chart;
}

/** The fact with this label, or undefined when the document does not print it. */
export function documentFact(sections: Section[], label: string): Fact | undefined {
  return sections.flatMap((s) => s.blocks).flatMap((b) => (b.kind === "facts" ? b.facts : [])).find((f) => f.label === label);
}

/** The cell in column `key` of the first row whose first cell is `first`. */
export function tableCell(table: Table, first: Cell, key: string): Cell {
  const row = table.rows.find((r) => r[0] === first);
  const column = table.columns.findIndex((c) => c.key === key);
  if (!row || column < 0) throw new Error(`no row "${String(first)}" or column "${key}" in table "${table.id}"`);
  return row[column]!;
}
