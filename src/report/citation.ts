/**
 * Citation entries for a frozen calculation: BibTeX (@misc with url and
 * urldate, as biblatex and natbib styles read them) and RIS (type ELEC). Both
 * carry the permalink, the id, the SHA-256 digest and the date of access.
 */
import type { ReportDocument } from "./build.js";

/** The date of access, as YYYY-MM-DD in UTC. */
export function accessDate(now: Date): string {
  return now.toISOString().slice(0, 10);
}

/** Escapes BibTeX's special characters so a label is read as text. */
export function escapeBibtex(text: string): string {
  return text
    .replace(/[\\{}]/g, (ch) => ({ "\\": "\\textbackslash{}", "{": "\\{", "}": "\\}" })[ch]!)
    .replace(/[&%$#_]/g, (ch) => `\\${ch}`)
    .replace(/~/g, "\\textasciitilde{}")
    .replace(/\^/g, "\\textasciicircum{}")
    .replace(/[\r\n]+/g, " ");
}

function entryTitle(doc: ReportDocument): string {
  return doc.record.label ? `${doc.record.label}: ${doc.designTitle}` : doc.designTitle;
}

export function toBibtex(doc: ReportDocument, accessed: Date): string {
  const r = doc.record;
  const field = (name: string, value: string): string => `  ${name.padEnd(12)} = {${value}},`;
  return [
    `@misc{trialwright_${r.id.slice(2, 14)},`,
    field("author", "{Trialwright}"),
    field("title", `{${escapeBibtex(entryTitle(doc))}}`),
    field("year", r.createdAt.slice(0, 4)),
    field("date", r.createdAt.slice(0, 10)),
    field("howpublished", `\\url{${doc.permalink}}`),
    field("url", doc.permalink),
    field("urldate", accessDate(accessed)),
    field("version", `${doc.designId} v${r.designVersion}; ${escapeBibtex(r.engine)}`),
    field("note", `Frozen calculation ${r.id}, SHA-256 digest ${r.digest}. Accessed ${accessDate(accessed)}`),
    "}",
    "",
  ].join("\n");
}

/** RIS lines end in CRLF and a tag is six characters: two letters, two spaces, a hyphen, a space. */
export function toRis(doc: ReportDocument, accessed: Date): string {
  const r = doc.record;
  const clean = (s: string): string => s.replace(/[\r\n]+/g, " ");
  const lines: Array<[string, string]> = [
    ["TY", "ELEC"],
    ["AU", "Trialwright"],
    ["TI", clean(entryTitle(doc))],
    ["PY", r.createdAt.slice(0, 4)],
    ["DA", r.createdAt.slice(0, 10).replace(/-/g, "/")],
    ["UR", doc.permalink],
    ["Y2", accessDate(accessed).replace(/-/g, "/")],
    ["ET", `${doc.designId} v${r.designVersion}; ${r.engine}`],
    ["ID", r.id],
    ["N1", `Frozen calculation ${r.id}, SHA-256 digest ${r.digest}. Accessed ${accessDate(accessed)}.`],
    ["ER", ""],
  ];
  return lines.map(([tag, value]) => `${tag}  - ${value}`.trimEnd() + "\r\n").join("");
}
