// The permalinks inside the Workers runtime: every format of every catalog
// design, digest ETags with 304s, immutable caching, and the PDF rendered once
// and then served from KV. Expected header values are HTTP's own (RFC 9110
// ETag/If-None-Match, RFC 9111 Cache-Control immutable per RFC 8246).
import { SELF, env } from "cloudflare:test";
import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { catalog } from "../../src/designs/catalog.js";
import { PDF_RENDERING_VERSION } from "../../src/api/permalinks.js";

interface StoredRecord {
  id: string;
  digest: string;
  design: string;
  inputs: unknown;
  result: unknown;
}

const ORIGIN = "https://example.com";

async function freeze(design: string, inputs: unknown, label: string): Promise<StoredRecord> {
  const res = await SELF.fetch(`${ORIGIN}/api/v1/designs/${design}/calculations`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ inputs, label }),
  });
  expect([200, 201]).toContain(res.status);
  return res.json<StoredRecord>();
}

const get = (path: string, headers: Record<string, string> = {}): Promise<Response> => SELF.fetch(`${ORIGIN}${path}`, { headers });

function expectImmutable(res: Response, digest: string): void {
  expect(res.headers.get("etag")).toBe(`"${digest}"`);
  expect(res.headers.get("cache-control")).toBe("public, max-age=31536000, immutable");
}

describe("every catalog design renders as HTML and PDF", () => {
  for (const design of catalog) {
    it(design.id, async () => {
      const record = await freeze(design.id, design.example, `Catalog check ${design.id}`);
      const html = await get(`/c/${record.id}`);
      expect(html.status).toBe(200);
      expect(html.headers.get("content-type")).toMatch(/^text\/html/);
      expect(html.headers.get("content-security-policy")).toContain("default-src 'none'");
      expectImmutable(html, record.digest);
      const page = await html.text();
      expect(page).toContain(record.digest);
      // Each chart is drawn twice (a wide and a narrow drawing, one shown by the stylesheet).
      const charts = design.document(record.inputs, record.result).flatMap((s) => s.blocks).filter((b) => b.kind === "chart").length;
      expect(page.split("<svg").length - 1).toBe(2 * charts);
      expect(page).not.toMatch(/<script|src="http|href="\/\//i);

      const pdf = await get(`/c/${record.id}.pdf`);
      expect(pdf.status).toBe(200);
      expect(pdf.headers.get("content-type")).toBe("application/pdf");
      expectImmutable(pdf, record.digest);
      const bytes = new Uint8Array(await pdf.arrayBuffer());
      expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe("%PDF-");
      expect(new TextDecoder("latin1").decode(bytes.slice(-1024))).toContain("%%EOF");
    });
  }
});

describe("one calculation in every format", async () => {
  const design = catalog.find((d) => d.id === "two-means") ?? catalog[0]!;
  const label = `Permalink formats ${design.id}`;

  it("answers 304 to a matching If-None-Match in every format, strong, weak or listed", async () => {
    const record = await freeze(design.id, design.example, label);
    for (const suffix of ["", ".json", ".pdf", ".csv", ".bib", ".ris"]) {
      const path = `/c/${record.id}${suffix}`;
      const fresh = await get(path);
      expect(fresh.status, path).toBe(200);
      expectImmutable(fresh, record.digest);
      await fresh.arrayBuffer();
      for (const tag of [`"${record.digest}"`, `W/"${record.digest}"`, `"other", "${record.digest}"`]) {
        const again = await get(path, { "if-none-match": tag });
        expect(again.status, `${path} with ${tag}`).toBe(304);
        expectImmutable(again, record.digest);
        expect(await again.text()).toBe("");
      }
      const stale = await get(path, { "if-none-match": '"0000"' });
      expect(stale.status).toBe(200);
      await stale.arrayBuffer();
    }
  });

  it("renders the PDF once: the second request is served from KV, not drawn again", async () => {
    const record = await freeze(design.id, design.example, `${label}, cache`);
    const first = await get(`/c/${record.id}.pdf`);
    expect(first.headers.get("x-trialwright-rendering")).toBe("rendered");
    const firstBytes = new Uint8Array(await first.arrayBuffer());
    const stored = await env.CALCULATIONS.get(`render:pdf-v${PDF_RENDERING_VERSION}-a4-example.com:${record.id}`, "arrayBuffer");
    expect(stored).not.toBeNull();
    expect(new Uint8Array(stored!)).toEqual(firstBytes);

    const second = await get(`/c/${record.id}.pdf`);
    expect(second.headers.get("x-trialwright-rendering")).toBe("cached");
    expect(new Uint8Array(await second.arrayBuffer())).toEqual(firstBytes);

    // Replacing the cached bytes shows the answer really comes from KV.
    const marker = new TextEncoder().encode("%PDF-1.7 cached marker");
    await env.CALCULATIONS.put(`render:pdf-v${PDF_RENDERING_VERSION}-a4-example.com:${record.id}`, marker);
    const third = await get(`/c/${record.id}.pdf`);
    expect(new Uint8Array(await third.arrayBuffer())).toEqual(marker);
  });

  it("answers HEAD with the headers of GET and no body (RFC 9110 §9.3.2)", async () => {
    const record = await freeze(design.id, design.example, label);
    const head = await SELF.fetch(`${ORIGIN}/c/${record.id}.pdf`, { method: "HEAD" });
    expect(head.status).toBe(200);
    expect(head.headers.get("content-type")).toBe("application/pdf");
    expectImmutable(head, record.digest);
    expect((await head.arrayBuffer()).byteLength).toBe(0);
  });

  it("draws Letter paper on request and refuses an unknown paper size", async () => {
    const record = await freeze(design.id, design.example, label);
    const letter = await get(`/c/${record.id}.pdf?paper=letter`);
    expect(letter.status).toBe(200);
    // 612 × 792 points is US Letter (ANSI/ASME Y14.1); A4 is 595.28 × 841.89 (ISO 216).
    const pages = (await PDFDocument.load(await letter.arrayBuffer())).getPages();
    for (const page of pages) expect(page.getSize()).toEqual({ width: 612, height: 792 });
    const bad = await get(`/c/${record.id}.pdf?paper=a3`);
    expect(bad.status).toBe(400);
    expect(bad.headers.get("content-type")).toMatch(/problem\+json/);
  });

  it("serves each table as CSV, the first design table by default", async () => {
    const record = await freeze(design.id, design.example, label);
    const first = await get(`/c/${record.id}.csv`);
    expect(first.status).toBe(200);
    expect(first.headers.get("content-type")).toMatch(/^text\/csv/);
    const text = await first.text();
    expect(text).toMatch(/\r\n$/);
    const inputs = await get(`/c/${record.id}.csv?table=inputs`);
    expect((await inputs.text()).split("\r\n")[0]).toBe("Input,Value,Meaning");
    const missing = await get(`/c/${record.id}.csv?table=no-such-table`);
    expect(missing.status).toBe(404);
    expect(missing.headers.get("cache-control") ?? "").not.toContain("immutable");
    expect((await missing.json<{ detail: string }>()).detail).toContain("inputs");
  });

  it("gives BibTeX and RIS entries with the permalink, the digest and today's date of access", async () => {
    const record = await freeze(design.id, design.example, label);
    const today = new Date().toISOString().slice(0, 10);
    const bib = await (await get(`/c/${record.id}.bib`)).text();
    expect(bib).toMatch(/^@misc\{/);
    expect(bib).toContain(`url          = {${ORIGIN}/c/${record.id}}`);
    expect(bib).toContain(record.digest);
    expect(bib).toContain(`urldate      = {${today}}`);
    const ris = await (await get(`/c/${record.id}.ris`)).text();
    // RIS tags: "TY  - " opens, "ER  -" closes, UR is the address, Y2 the access date (RIS format specification).
    expect(ris.startsWith("TY  - ELEC\r\n")).toBe(true);
    expect(ris).toContain(`UR  - ${ORIGIN}/c/${record.id}\r\n`);
    expect(ris).toContain(`Y2  - ${today.replace(/-/g, "/")}\r\n`);
    expect(ris).toContain(record.digest);
    expect(ris.endsWith("ER  -\r\n")).toBe(true);
  });

  it("answers 404 problems for an unknown format or id, without immutable caching", async () => {
    const record = await freeze(design.id, design.example, label);
    const format = await get(`/c/${record.id}.docx`);
    expect(format.status).toBe(404);
    expect(format.headers.get("cache-control") ?? "").not.toContain("immutable");
    const id = await get(`/c/c_${"0".repeat(32)}.pdf`);
    expect(id.status).toBe(404);
  });

  it("draws a PDF for a label with emoji, right-to-left and CJK text inside the Worker", async () => {
    const record = await freeze(design.id, design.example, "TW-417 😀👩‍🔬 שלום עולם مرحبا 試験 Étude α");
    const res = await get(`/c/${record.id}.pdf`);
    expect(res.status).toBe(200);
    const loaded = await PDFDocument.load(await res.arrayBuffer());
    expect(loaded.getPageCount()).toBeGreaterThan(0);
    expect(loaded.getTitle()).toContain("TW-417");
  });

  it("shows a label carrying markup as text in the page", async () => {
    const record = await freeze(design.id, design.example, `<script>alert("x")</script><img src=x onerror=alert(1)>`);
    const page = await (await get(`/c/${record.id}`)).text();
    expect(page).not.toMatch(/<script|<img/i);
    expect(page).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;");
  });
});
