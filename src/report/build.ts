/**
 * Builds the full document of a frozen calculation: the design's own sections
 * framed by what every report carries (question, inputs, references,
 * provenance, how to cite, caution).
 */
import type { AnyDesign } from "../designs/design.js";
import { fieldDescriptions } from "../designs/schema.js";
import type { CalculationRecord } from "../store/record.js";
import type { Cell, Section } from "./document.js";

export const CAUTION =
  "Trialwright is a planning aid. Every design it computes must be reviewed by a qualified statistician before use; " +
  "the study protocol, the ethics committee and the regulator decide what is run.";

export interface ReportDocument {
  title: string;
  designTitle: string;
  question: string;
  sections: Section[];
  record: CalculationRecord;
  permalink: string;
  citation: string;
}

function inputCell(value: unknown): Cell {
  if (value === null || value === undefined) return null;
  if (typeof value === "number" || typeof value === "string") return value;
  if (typeof value === "boolean") return value ? "yes" : "no";
  return JSON.stringify(value);
}

/** Plain-text citation of a calculation. */
export function citationText(design: AnyDesign, record: CalculationRecord, permalink: string): string {
  const year = record.createdAt.slice(0, 4);
  const what = record.label ? `${record.label}: ${design.title}` : design.title;
  return `Trialwright (${year}). ${what} [design ${design.id} v${record.designVersion}; ${record.engine}]. Frozen calculation ${record.id}, SHA-256 ${record.digest}. ${permalink}`;
}

export function buildReport(design: AnyDesign, record: CalculationRecord, origin: string): ReportDocument {
  const inputs = record.inputs as Record<string, unknown>;
  const descriptions = fieldDescriptions(design);
  const permalink = `${origin}/c/${record.id}`;
  const citation = citationText(design, record, permalink);
  const sections: Section[] = [
    {
      id: "inputs",
      title: "Inputs",
      blocks: [{
        kind: "table",
        table: {
          id: "inputs",
          caption: "Inputs as normalized, defaults filled in",
          columns: [
            { key: "field", label: "Field" },
            { key: "value", label: "Value" },
            { key: "meaning", label: "Meaning" },
          ],
          rows: Object.keys(inputs).sort().map((k) => [k, inputCell(inputs[k]), descriptions[k] ?? ""]),
        },
      }],
    },
    ...design.document(inputs, record.result),
    { id: "references", title: "References", blocks: [{ kind: "list", items: design.references.map((r) => r.text + (r.doi ? ` doi:${r.doi}` : "")) }] },
    {
      id: "provenance",
      title: "Provenance",
      blocks: [{
        kind: "facts",
        facts: [
          { label: "Calculation id", value: record.id },
          { label: "Design", value: `${design.id}, version ${record.designVersion}` },
          { label: "Engine", value: record.engine },
          { label: "Created", value: record.createdAt },
          { label: "Digest (SHA-256)", value: record.digest },
          { label: "Permalink", value: permalink },
        ],
      }],
    },
    { id: "citation", title: "How to cite this calculation", blocks: [{ kind: "paragraph", text: citation }] },
    { id: "caution", title: "Caution", blocks: [{ kind: "list", items: [CAUTION, ...design.cautions] }] },
  ];
  return {
    title: record.label ?? design.title,
    designTitle: design.title,
    question: design.question(inputs),
    sections,
    record,
    permalink,
    citation,
  };
}
