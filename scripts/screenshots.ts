/**
 * `npm run screenshots`: every page at desktop and phone width, written to
 * out/screenshots/ (git-ignored). The Worker runs under `wrangler dev` with a
 * throwaway store; each design page is shot with its example computed, once
 * more after freezing, and its report; then a field error, an infeasible
 * design and an unknown design.
 */
import { mkdirSync } from "node:fs";
import { resolve } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser } from "../test/browser/browser.js";
import { startWorker } from "../test/browser/server.js";

const root = resolve(import.meta.dirname, "..");
const out = resolve(root, "out/screenshots");
const VIEWPORTS = [
  { name: "desktop", width: 1280, height: 900 },
  { name: "phone", width: 390, height: 844 },
];

async function settle(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const status = document.getElementById("status")?.textContent ?? "";
    return !/Computing|Freezing/.test(status) && !document.querySelector(".loading");
  }, undefined, { timeout: 60000 });
}

mkdirSync(out, { recursive: true });
const worker = await startWorker(root);
const browser = await launchBrowser();
try {
  const catalog = await (await fetch(`${worker.url}/api/v1/designs`)).json() as { designs: Array<{ id: string }> };
  for (const viewport of VIEWPORTS) {
    const context = await browser.newContext({ viewport: { width: viewport.width, height: viewport.height }, deviceScaleFactor: 1 });
    const page = await context.newPage();
    page.setDefaultTimeout(60000);
    page.on("pageerror", (e) => console.error(`page error: ${e.message}`));
    // The error, infeasible and unknown-design shots answer 400, 422 and 404 on purpose; anything else is worth a look.
    page.on("console", (m) => { if (m.type() === "error" && !/status of (400|404|422)/.test(m.text())) console.error(`console: ${m.text()}`); });
    await page.goto(`${worker.url}/`);
    await page.waitForSelector(".design-card");
    await page.screenshot({ path: `${out}/start-${viewport.name}.png`, fullPage: true });
    await page.fill("#search", "zzzz-nothing");
    await page.screenshot({ path: `${out}/start-search-empty-${viewport.name}.png` });
    for (const { id } of catalog.designs) {
      await page.goto(`${worker.url}/design?id=${id}`);
      await page.waitForSelector("#preview-head .key-facts, #problem:not([hidden])", { timeout: 60000 });
      await settle(page);
      await page.screenshot({ path: `${out}/design-${id}-${viewport.name}.png`, fullPage: true });
      await page.click("#freeze-button");
      await page.waitForSelector("#frozen .frozen", { timeout: 60000 });
      await page.screenshot({ path: `${out}/design-${id}-frozen-${viewport.name}.png`, fullPage: true });
      const link = await page.inputValue("#permalink");
      await page.goto(link);
      await page.screenshot({ path: `${out}/report-${id}-${viewport.name}.png`, fullPage: true });
    }
    await page.goto(`${worker.url}/design?id=two-means`);
    await page.waitForSelector("#preview-head .key-facts");
    await page.fill("#f-sd", "-3");
    await page.press("#f-sd", "Enter");
    await page.waitForSelector("#err-sd:not([hidden])");
    await page.screenshot({ path: `${out}/design-two-means-error-${viewport.name}.png`, fullPage: true });
    if (catalog.designs.some((d) => d.id === "simon-two-stage")) {
      await page.goto(`${worker.url}/design?id=simon-two-stage`);
      await page.waitForSelector("#preview-head .key-facts");
      await page.fill("#f-maxN", "8");
      await page.waitForSelector("#problem:not([hidden])", { timeout: 60000 });
      await page.screenshot({ path: `${out}/design-simon-two-stage-infeasible-${viewport.name}.png` });
    }
    await page.goto(`${worker.url}/design?id=no-such-design`);
    await page.waitForSelector("h1");
    await page.screenshot({ path: `${out}/design-unknown-${viewport.name}.png` });
    await context.close();
  }
  console.log(`screenshots in ${out}`);
} finally {
  await browser.close();
  await worker.stop();
}
