/**
 * Report rendering: the PDF of the largest catalog example (budget 200 ms),
 * the HTML page, and a cached PDF permalink served through the app from an
 * in-memory KV, counting that it neither recomputes nor redraws.
 */
import { benchAsync, bench } from "./harness.js";
import { catalog } from "../src/designs/catalog.js";
import { app } from "../src/index.js";
import { type ReportDocument, buildReport } from "../src/report/build.js";
import { REPORT_FONTS } from "../src/report/fonts.js";
import { renderHtml } from "../src/report/html.js";
import { renderPdf } from "../src/report/pdf.js";
import { memoryEnv } from "../test/support/memoryBindings.js";
import { exampleRecord } from "../test/support/report.js";

const docs: ReportDocument[] = [];
for (const design of catalog) {
  const doc = buildReport(design, await exampleRecord(design, "TW-417 bench"), "https://trialwright.example");
  docs.push(doc);
}
const byCells = (d: ReportDocument): number => d.sections.flatMap((s) => s.blocks).reduce((n, b) => n + (b.kind === "table" ? b.table.rows.length * b.table.columns.length : b.kind === "chart" ? 200 : 10), 0);
const largest = [...docs].sort((a, b) => byCells(b) - byCells(a))[0]!;

await benchAsync(`PDF of the largest example (${largest.designId}, ${byCells(largest)} cells)`, () => renderPdf(largest, REPORT_FONTS), { runs: 15, warmup: 10, budgetMs: 200 });
bench(`HTML of the largest example (${largest.designId})`, () => renderHtml(largest), { runs: 30 });

// A cached permalink: freeze through the API, draw the PDF once, then count what the cached answers do.
const env = memoryEnv();
const kv = env.CALCULATIONS;
const design = catalog.find((d) => d.id === largest.designId)!;
const created = await app.fetch(new Request(`https://trialwright.example/api/v1/designs/${design.id}/calculations`, {
  method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ inputs: design.example, label: "TW-417 cached" }),
}), env);
const { id } = (await created.json()) as { id: string };
const first = await app.fetch(new Request(`https://trialwright.example/c/${id}.pdf`), env);
await first.arrayBuffer();
let computes = 0;
let documents = 0;
const { compute, document } = design;
design.compute = (input: unknown) => { computes++; return compute(input); };
design.document = (input: unknown, result: unknown) => { documents++; return document(input, result); };
const putsBefore = kv.puts;
let rendering = "";
await benchAsync(`cached PDF permalink (${design.id}, KV hit)`, async () => {
  const res = await app.fetch(new Request(`https://trialwright.example/c/${id}.pdf`), env);
  rendering = res.headers.get("x-trialwright-rendering") ?? "";
  await res.arrayBuffer();
}, { runs: 50, warmup: 5 });
await benchAsync(`cached PDF permalink, 304 on If-None-Match`, async () => {
  const res = await app.fetch(new Request(`https://trialwright.example/c/${id}.pdf`, { headers: { "if-none-match": first.headers.get("etag")! } }), env);
  await res.arrayBuffer();
}, { runs: 50, warmup: 5 });
design.compute = compute;
design.document = document;
console.log(`cached answers: rendering header "${rendering}", compute() calls ${computes}, document() calls ${documents}, KV writes ${kv.puts - putsBefore}`);
