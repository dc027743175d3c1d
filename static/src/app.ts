/** The pages' one script: each page names itself in <body data-page>. */
import { startCatalogPage } from "./catalogPage.js";
import { startDesignPage } from "./designPage.js";
import { h, replaceChildren } from "./dom.js";

const root = document.getElementById("app");
const page = document.body.dataset.page;
if (root) {
  const start = page === "design" ? startDesignPage : startCatalogPage;
  start(root).catch((error: unknown) => {
    replaceChildren(root, h("p", { class: "alert", role: "alert" }, `The page could not start: ${error instanceof Error ? error.message : String(error)}. Reload to try again.`));
  });
}
