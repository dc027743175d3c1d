/**
 * Previews compute without storing; the form pages are served through the
 * Worker's ASSETS fallback in the test pool (no asset router sits in front of
 * SELF here). Checks are against the API contract in DESIGN.md and
 * DEVELOPERS.md, and against the calculations endpoint itself.
 */
import { env } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import { get, post } from "../support/http.js";

interface Catalog { designs: Array<{ id: string; example: Record<string, unknown> }> }
interface Preview { design: string; designVersion: number; inputs: Record<string, unknown>; result: unknown; question: string; sections: Array<{ id: string; title: string; blocks: unknown[] }>; cautions: string[] }

async function storedKeys(): Promise<string[]> {
  return (await env.CALCULATIONS.list()).keys.map((k) => k.name);
}

describe("POST /api/v1/designs/{id}/previews", () => {
  it("computes every design's example, returns its sections, and stores nothing", async () => {
    const before = await storedKeys();
    const catalog = await (await get("/api/v1/designs")).json<Catalog>();
    for (const design of catalog.designs) {
      const res = await post(`/api/v1/designs/${design.id}/previews`, { inputs: design.example });
      expect(res.status, design.id).toBe(200);
      expect(res.headers.get("cache-control")).toBe("no-store");
      const body = await res.json<Preview>();
      expect(body.design).toBe(design.id);
      expect(body.question.length, design.id).toBeGreaterThan(10);
      expect(body.sections.length, design.id).toBeGreaterThan(0);
      expect(body.sections.every((s) => s.id && s.title && Array.isArray(s.blocks)), design.id).toBe(true);
      expect(body.cautions[0]).toMatch(/qualified statistician/);
    }
    expect(await storedKeys()).toEqual(before);
  });

  it("gives the same normalized inputs and result as freezing the same request", async () => {
    const inputs = { delta: 3, sd: 7, power: 0.85 };
    const preview = await (await post("/api/v1/designs/two-means/previews", { inputs })).json<Preview>();
    const frozen = await post("/api/v1/designs/two-means/calculations", { inputs });
    expect(frozen.status).toBe(201);
    const record = await frozen.json<{ inputs: unknown; result: unknown }>();
    expect(preview.inputs).toEqual(record.inputs);
    expect(preview.result).toEqual(record.result);
    // Defaults are filled in, as DEVELOPERS.md says normalization does.
    expect(preview.inputs).toMatchObject({ alpha: 0.05, sides: 2, method: "exact-t" });
  });

  it("answers bad input with problem+json naming the field, and stores nothing", async () => {
    const before = await storedKeys();
    const res = await post("/api/v1/designs/two-means/previews", { inputs: { delta: 3, sd: -1 } });
    expect(res.status).toBe(400);
    expect(res.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    const problem = await res.json<{ errors: Array<{ path: string; pointer: string; message: string }> }>();
    expect(problem.errors.map((e) => e.pointer)).toEqual(["/inputs/sd"]);
    expect(problem.errors[0]!.path).toBe("inputs.sd");
    expect((await post("/api/v1/designs/no-such-design/previews", { inputs: {} })).status).toBe(404);
    expect((await post("/api/v1/designs/two-means/previews", "delta=3", { "content-type": "text/plain" })).status).toBe(415);
    expect((await post("/api/v1/designs/two-means/previews", "{not json")).status).toBe(400);
    expect(await storedKeys()).toEqual(before);
  });

  it("is described in the OpenAPI document for every design", async () => {
    const doc = await (await get("/api/v1/openapi.json")).json<{ paths: Record<string, { post?: { responses: Record<string, unknown> } }> }>();
    const catalog = await (await get("/api/v1/designs")).json<Catalog>();
    for (const design of catalog.designs) {
      expect(doc.paths[`/api/v1/designs/${design.id}/previews`]?.post?.responses["200"], design.id).toBeDefined();
    }
  });
});

describe("form pages", () => {
  it("serves the start page and the design page with a strict Content-Security-Policy", async () => {
    for (const path of ["/", "/design?id=two-means"]) {
      const res = await get(path);
      expect(res.status, path).toBe(200);
      expect(res.headers.get("content-type"), path).toMatch(/^text\/html/);
      const csp = res.headers.get("content-security-policy") ?? "";
      expect(csp, path).toContain("script-src 'self'");
      expect(csp, path).not.toContain("unsafe-inline");
      const html = await res.text();
      expect(html).toContain('<script type="module" src="/app.js"></script>');
      // No inline script or handler: every <script> has a src, no on*= attribute.
      expect(html).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
      expect(html).not.toMatch(/\son[a-z]+=/i);
    }
    const css = await get("/style.css");
    expect(css.status).toBe(200);
    expect(css.headers.get("content-type")).toMatch(/^text\/css/);
  });

  it("does not serve the script's TypeScript sources", async () => {
    const res = await get("/src/app.ts");
    expect(res.status).toBe(404);
  });

  it("leaves unknown API paths to the API's own 404", async () => {
    const res = await get("/api/v1/nothing-here");
    expect(res.status).toBe(404);
    expect(res.headers.get("content-type")).toMatch(/^application\/problem\+json/);
  });
});
