/**
 * Freezing: store the calculation under its permanent id and hand over the
 * link, the citation and the report files.
 */
import type { AnyDesign } from "../../src/designs/design.js";
import { citationText } from "../../src/report/build.js";
import type { CalculationRecord, DesignEntry } from "./api.js";
import { copyText, h } from "./dom.js";

const FORMATS: Array<{ suffix: string; label: string; download: boolean }> = [
  { suffix: ".pdf", label: "PDF report", download: true },
  { suffix: ".csv", label: "Tables as CSV", download: true },
  { suffix: ".bib", label: "BibTeX (.bib)", download: true },
  { suffix: ".ris", label: "RIS (.ris)", download: true },
  { suffix: ".json", label: "Record as JSON", download: false },
];

export function frozenElement(design: DesignEntry, record: CalculationRecord, created: boolean, status: (m: string) => void): HTMLElement {
  const permalink = `${location.origin}/c/${record.id}`;
  // The same citation the report prints; only the design's id and title enter it.
  const citation = citationText({ id: design.id, title: design.title } as AnyDesign, record, permalink);
  const linkField = h("input", { id: "permalink", type: "text", readonly: true, value: permalink, class: "code", "aria-describedby": "permalink-note" });
  const citationField = h("textarea", { id: "citation", readonly: true, rows: 4 }, citation);
  const copyLink = h("button", { type: "button", class: "small", "data-copy": "link" }, "Copy link");
  const copyCitation = h("button", { type: "button", class: "small", "data-copy": "citation" }, "Copy citation");
  copyLink.addEventListener("click", () => void copyText(permalink, linkField).then((ok) => status(ok ? "Link copied." : "The link is selected: copy it with your keyboard.")));
  copyCitation.addEventListener("click", () => void copyText(citation, citationField).then((ok) => status(ok ? "Citation copied." : "The citation is selected: copy it with your keyboard.")));
  const heading = h("h3", { tabindex: -1, id: "frozen-heading" }, created ? "Frozen" : "Already frozen");
  return h("div", { class: "frozen", "data-id": record.id },
    heading,
    h("p", { id: "permalink-note" }, created
      ? "This calculation is stored under a permanent link. The same inputs and label always give the same link."
      : "These inputs and label were frozen before; this is their permanent link."),
    h("div", { class: "copy-row" }, h("label", { for: "permalink" }, "Permanent link"), h("div", { class: "with-button" }, linkField, copyLink)),
    h("p", {}, h("a", { href: `/c/${record.id}`, class: "open-report" }, "Open the report")),
    h("div", { class: "copy-row" }, h("label", { for: "citation" }, "How to cite it"), citationField, copyCitation),
    h("ul", { class: "formats" }, ...FORMATS.map((f) => h("li", {}, h("a", { href: `/c/${record.id}${f.suffix}`, download: f.download ? `${record.id}${f.suffix}` : undefined, "data-format": f.suffix.slice(1) }, f.label)))));
}
