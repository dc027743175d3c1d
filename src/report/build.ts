/**
 * Builds the full document of a frozen calculation: the design's own sections
 * framed by what every report carries, in the order a reader needs them: the
 * question, the key facts, the inputs, the design, its references, then
 * provenance (versions, id, digest, creation time), how to cite, and the caution.
 */
import type { AnyDesign, Citation } from "../designs/design.js";
import { fieldDescriptions } from "../designs/schema.js";
import type { CalculationRecord } from "../store/record.js";
import type { Cell, Fact, Section, Table } from "./document.js";

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
  designId: string;
  designSummary: string;
  /** The design's headline facts, shown first. */
  keyFacts: Fact[];
  references: Citation[];
  cautions: string[];
}

/** Structured inputs in words: lists joined by commas, objects as "key: value", a named object led by its name. */
function inputText(value: unknown): string {
  if (value === null || value === undefined) return "—";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value !== "object") return String(value);
  if (Array.isArray(value)) {
    const flat = value.every((v) => v === null || typeof v !== "object");
    return value.map(inputText).join(flat ? ", " : "; ");
  }
  const entries = Object.entries(value as Record<string, unknown>);
  const name = entries.find(([k, v]) => (k === "name" || k === "label") && typeof v === "string");
  const rest = entries.filter((e) => e !== name).map(([k, v]) => `${k}: ${inputText(v)}`).join(", ");
  return name ? `${String(name[1])} (${rest})` : rest;
}

function inputCell(value: unknown): Cell {
  if (value === null || value === undefined) return null;
  if (typeof value === "number" || typeof value === "string") return value;
  return inputText(value);
}

/** Plain-text citation of a calculation. */
export function citationText(design: AnyDesign, record: CalculationRecord, permalink: string): string {
  const year = record.createdAt.slice(0, 4);
  const what = record.label ? `${record.label}: ${design.title}` : design.title;
  return `Trialwright (${year}). ${what} [design ${design.id} v${record.designVersion}; ${record.engine}]. Frozen calculation ${record.id}, SHA-256 ${record.digest}. ${permalink}`;
}

/** Tables of the design's own sections (not the inputs): the ones offered as CSV. */
export function mainTables(doc: ReportDocument): Table[] {
  return doc.sections
    .filter((s) => !FRAME_SECTIONS.has(s.id))
    .flatMap((s) => s.blocks.flatMap((b) => (b.kind === "table" ? [b.table] : [])));
}

/** Every table of the report, inputs included, by id. */
export function findTable(doc: ReportDocument, tableId: string): Table | undefined {
  for (const s of doc.sections) for (const b of s.blocks) if (b.kind === "table" && b.table.id === tableId) return b.table;
  return undefined;
}

const FRAME_SECTIONS = new Set(["summary", "inputs", "references", "provenance", "citation", "caution"]);

export function buildReport(design: AnyDesign, record: CalculationRecord, origin: string): ReportDocument {
  const inputs = record.inputs as Record<string, unknown>;
  const descriptions = fieldDescriptions(design);
  const permalink = `${origin}/c/${record.id}`;
  const citation = citationText(design, record, permalink);
  const designSections = design.document(inputs, record.result) as Section[];
  const keyFacts = designSections.flatMap((s) => s.blocks.flatMap((b) => (b.kind === "facts" ? b.facts.filter((f) => f.key) : [])));
  const cautions = [CAUTION, ...design.cautions];
  const sections: Section[] = [
    ...(keyFacts.length > 0 ? [{ id: "summary", title: "At a glance", blocks: [{ kind: "facts" as const, facts: keyFacts }] }] : []),
    {
      id: "inputs",
      title: "Inputs",
      blocks: [{
        kind: "table",
        table: {
          id: "inputs",
          caption: "Inputs as normalized, defaults filled in",
          columns: [
            { key: "field", label: "Input" },
            { key: "value", label: "Value" },
            { key: "meaning", label: "Meaning" },
          ],
          rows: Object.keys(inputs).sort().map((k) => [k, inputCell(inputs[k]), descriptions[k] ?? ""]),
        },
      }],
    },
    ...designSections,
    { id: "references", title: "References", blocks: [{ kind: "list", items: design.references.map((r) => r.text + (r.doi ? ` doi:${r.doi}` : "")) }] },
    {
      id: "provenance",
      title: "About this calculation",
      blocks: [{
        kind: "facts",
        facts: [
          { label: "Design", value: `${design.title} (${design.id}, version ${record.designVersion})` },
          { label: "Engine", value: record.engine },
          { label: "Calculation id", value: record.id },
          { label: "Created", value: record.createdAt },
          { label: "Digest (SHA-256)", value: record.digest },
          { label: "Permalink", value: permalink },
        ],
      }, {
        kind: "paragraph",
        text: "The id is derived from the design, its version, the inputs and the label; the digest covers the whole stored record. The record is never changed: a new version of the method gives a new id.",
      }],
    },
    { id: "citation", title: "How to cite this calculation", blocks: [{ kind: "paragraph", text: citation }] },
    { id: "caution", title: "Caution", blocks: [{ kind: "list", items: cautions }] },
  ];
  return {
    title: record.label ?? design.title,
    designTitle: design.title,
    question: design.question(inputs),
    sections,
    record,
    permalink,
    citation,
    designId: design.id,
    designSummary: design.summary,
    keyFacts,
    references: design.references,
    cautions,
  };
}
