/** The start page: every design, grouped by trial stage, with a search box. */
import { type DesignEntry, callApi } from "./api.js";
import { h, replaceChildren } from "./dom.js";
import { STAGES } from "./stages.js";

const normalized = (text: string): string => text.normalize("NFKD").replace(/[\u0300-\u036f]/g, "").toLowerCase();

export async function startCatalogPage(root: HTMLElement): Promise<void> {
  const answer = await callApi<{ designs: DesignEntry[] }>("/api/v1/designs");
  if (!answer.ok) {
    replaceChildren(root, h("p", { class: "alert", role: "alert" }, `The catalog could not be loaded: ${answer.problem.detail}`));
    return;
  }
  const designs = answer.body.designs;
  const search = h("input", { id: "search", type: "search", autocomplete: "off", spellcheck: "false", "aria-describedby": "search-help search-count" });
  const count = h("p", { id: "search-count", class: "count", role: "status" });
  const entries: Array<{ design: DesignEntry; item: HTMLLIElement; text: string }> = [];
  const groups = STAGES.map(({ stage, title, aim }) => {
    const list = h("ul", { class: "design-list" });
    for (const design of designs.filter((d) => d.stage === stage)) {
      const item = h("li", { class: "design-card", "data-design": design.id },
        h("h3", {}, h("a", { href: `/design?id=${encodeURIComponent(design.id)}` }, design.title)),
        h("p", {}, design.summary),
        h("p", { class: "design-id" }, h("code", {}, design.id)));
      entries.push({ design, item, text: normalized(`${design.title} ${design.summary} ${design.id} ${title}`) });
      list.append(item);
    }
    const empty = h("p", { class: "empty" }, "No design in this stage yet.");
    const section = h("section", { class: "stage", "data-stage": stage, "aria-labelledby": `stage-${stage}` },
      h("h2", { id: `stage-${stage}` }, title), h("p", { class: "aim" }, aim), list.childElementCount > 0 ? list : empty);
    return { section, list, empty };
  });
  const filter = (): void => {
    const words = normalized(search.value).split(/\s+/).filter(Boolean);
    let shown = 0;
    for (const entry of entries) {
      const match = words.every((w) => entry.text.includes(w));
      entry.item.hidden = !match;
      if (match) shown += 1;
    }
    for (const group of groups) {
      const visible = [...group.list.children].some((c) => !(c as HTMLElement).hidden);
      group.section.hidden = words.length > 0 && !visible;
    }
    count.textContent = words.length === 0
      ? `${designs.length} design${designs.length === 1 ? "" : "s"} in the catalog.`
      : shown === 0 ? "No design matches. Try fewer or other words." : `${shown} of ${designs.length} designs match.`;
  };
  search.addEventListener("input", filter);
  const jumps = h("nav", { class: "stage-jumps", "aria-label": "Stages" }, h("ul", {}, ...STAGES.map(({ stage, title }) => {
    const n = designs.filter((d) => d.stage === stage).length;
    return h("li", {}, h("a", { href: `#stage-${stage}` }, title, h("span", { class: "n" }, ` ${n}`)));
  })));
  replaceChildren(root,
    jumps,
    h("div", { class: "search" },
      h("label", { for: "search" }, "Find a design"),
      h("p", { id: "search-help", class: "help" }, "Type a method, an outcome or a word from the summary: “response rate”, “dose”, “means”."),
      search, count),
    ...groups.map((g) => g.section));
  filter();
}
