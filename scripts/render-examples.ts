/**
 * Writes every catalog example's report for a person to look at: the HTML
 * page, screenshots of it at desktop and phone widths (headless Chromium), the
 * browser's print of it on A4 and Letter, and the PDF with each page as PNG
 * (pdftoppm). Output goes to out/examples/ (git-ignored).
 *
 *   npm run render-examples [design-id ...]
 */
import { execFileSync } from "node:child_process";
import { mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { type Page, chromium } from "playwright-core";
import { catalog } from "../src/designs/catalog.js";
import { buildReport } from "../src/report/build.js";
import { REPORT_FONTS } from "../src/report/fonts.js";
import { renderHtml } from "../src/report/html.js";
import { renderPdf } from "../src/report/pdf.js";
import { exampleRecord } from "../test/support/report.js";

const OUT = join(process.cwd(), "out", "examples");
const ORIGIN = "https://trialwright.example";
const LABEL = "TW-417 planning, Nørreby & Saint-Élan sites";
const only = process.argv.slice(2);

/** Full-page screenshots cut into screen-sized pieces, so each stays legible when viewed. */
async function screens(page: Page, prefix: string, width: number, height: number): Promise<void> {
  await page.setViewportSize({ width, height });
  const total = await page.evaluate(() => document.documentElement.scrollHeight);
  for (let y = 0, n = 1; y < total; y += height, n++) {
    await page.screenshot({ path: `${prefix}-${n}.png`, fullPage: true, clip: { x: 0, y, width, height: Math.min(height, total - y) } });
  }
}

const browser = await chromium.launch({
  executablePath: "/usr/bin/chromium",
  args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking"],
});
try {
  for (const design of catalog) {
    if (only.length > 0 && !only.includes(design.id)) continue;
    const dir = join(OUT, design.id);
    rmSync(dir, { recursive: true, force: true });
    mkdirSync(dir, { recursive: true });
    const record = await exampleRecord(design, LABEL);
    const doc = buildReport(design, record, ORIGIN);
    const html = renderHtml(doc);
    writeFileSync(join(dir, "report.html"), html);
    const started = performance.now();
    const pdf = await renderPdf(doc, REPORT_FONTS);
    const pdfMs = performance.now() - started;
    writeFileSync(join(dir, "report.pdf"), pdf);
    execFileSync("pdftoppm", ["-r", "70", "-png", join(dir, "report.pdf"), join(dir, "pdf-page")]);

    const page = await browser.newPage({ viewport: { width: 1100, height: 900 } });
    // Any request beyond the page itself would break "self-contained": count them.
    let external = 0;
    await page.route("**/*", (route) => { external++; return route.abort(); });
    await page.setContent(html, { waitUntil: "load" });
    await screens(page, join(dir, "html-desktop"), 1100, 1500);
    await screens(page, join(dir, "html-phone"), 390, 1200);
    for (const format of ["A4", "Letter"] as const) {
      const file = join(dir, `print-${format.toLowerCase()}.pdf`);
      await page.pdf({ path: file, format, printBackground: true });
      execFileSync("pdftoppm", ["-r", "50", "-png", file, join(dir, `print-${format.toLowerCase()}`)]);
    }
    await page.close();
    console.log(`${design.id.padEnd(28)} PDF ${String(pdf.length).padStart(7)} bytes in ${pdfMs.toFixed(0)} ms, ${external} external requests → ${dir}`);
  }
  // A label made of script payloads, opened with JavaScript enabled: nothing may run.
  const design = catalog[0]!;
  const payload = `<script>alert(1)</script><img src=x onerror=alert(2)><svg onload=alert(3)>`;
  const record = await exampleRecord(design, payload);
  const page = await browser.newPage();
  let dialogs = 0;
  page.on("dialog", (dialog) => { dialogs++; void dialog.dismiss(); });
  await page.setContent(renderHtml(buildReport(design, record, ORIGIN)), { waitUntil: "load" });
  const heading = await page.textContent("h1");
  console.log(`markup label: ${dialogs} scripts ran; the heading reads ${JSON.stringify(heading)}`);
  await page.close();
} finally {
  await browser.close();
}
