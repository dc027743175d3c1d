// Security headers on every answer, CORS for the API, and the optional rate
// limit on computing requests, through the real Worker in workerd. The header
// set is common practice (OWASP Secure Headers project; no published source
// fixes the exact values).
import { env } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import type { Env } from "../../src/env.js";
import { type ProblemBody, type RecordBody, createCalculation, fetchWorker, get, post } from "../support/http.js";

const inputs = { delta: 0.5, sd: 1, alpha: 0.05, power: 0.8 };

function expectHardened(response: Response, what: string): string {
  const h = response.headers;
  expect(h.get("x-content-type-options"), what).toBe("nosniff");
  expect(h.get("referrer-policy"), what).toBe("no-referrer");
  expect(h.get("x-frame-options"), what).toBe("DENY");
  expect(h.get("strict-transport-security"), what).toMatch(/^max-age=\d{8,}/);
  const csp = h.get("content-security-policy") ?? "";
  expect(csp, what).toContain("frame-ancestors 'none'");
  expect(csp, what).toContain("base-uri 'none'");
  expect(csp, what).not.toMatch(/'unsafe-eval'|script-src[^;]*'unsafe-inline'|\*/);
  return csp;
}

describe("security headers", () => {
  it("are on every kind of answer the Worker writes, and on the form pages", async () => {
    const record = await (await createCalculation("two-means", inputs, "TW-12 headers")).json<RecordBody>();
    const answers: Array<[string, Promise<Response>]> = [
      ["health", get("/api/v1/health")],
      ["catalog", get("/api/v1/designs")],
      ["openapi", get("/api/v1/openapi.json")],
      ["created", createCalculation("two-means", inputs, "TW-12 headers 2")],
      ["record", get(`/api/v1/calculations/${record.id}`)],
      ["report page", get(`/c/${record.id}`)],
      ["json permalink", get(`/c/${record.id}.json`)],
      ["pdf", get(`/c/${record.id}.pdf`)],
      ["csv", get(`/c/${record.id}.csv`)],
      ["bibtex", get(`/c/${record.id}.bib`)],
      ["not modified", get(`/c/${record.id}.json`, { "if-none-match": `"${record.digest}"` })],
      ["404", get("/api/v1/nothing-here")],
      ["400", post("/api/v1/designs/two-means/calculations", { inputs: { ...inputs, sd: -1 } })],
      ["start page", get("/")],
      ["design page", get("/design")],
    ];
    for (const [what, pending] of answers) {
      const response = await pending;
      const csp = expectHardened(response, what);
      if (what === "report page") expect(csp).toMatch(/^default-src 'none'/);
      if (what === "start page" || what === "design page") expect(csp).toContain("script-src 'self'");
      else expect(csp, what).not.toContain("script-src");
      if (what !== "pdf" && what !== "start page" && what !== "design page") expect(csp, what).toMatch(/^default-src 'none'/);
      await response.arrayBuffer();
    }
  });
});

describe("CORS", () => {
  it("lets any origin read the API and the permalinks, without credentials", async () => {
    const record = await (await createCalculation("two-means", inputs, "TW-12 cors")).json<RecordBody>();
    for (const path of ["/api/v1/designs", `/api/v1/calculations/${record.id}`, `/c/${record.id}.json`]) {
      const response = await get(path, { origin: "https://registry.example.org" });
      expect(response.headers.get("access-control-allow-origin"), path).toBe("*");
      expect(response.headers.get("access-control-allow-credentials"), path).toBeNull();
      await response.arrayBuffer();
    }
    const created = await post("/api/v1/designs/two-means/calculations", { inputs, label: "TW-12 cors 2" }, { origin: "https://registry.example.org" });
    expect(created.headers.get("access-control-allow-origin")).toBe("*");
    expect(created.headers.get("access-control-expose-headers")).toMatch(/Location/);
  });

  it("answers a preflight for a JSON POST", async () => {
    const response = await fetchWorker("/api/v1/designs/two-means/calculations", {
      method: "OPTIONS",
      headers: { origin: "https://registry.example.org", "access-control-request-method": "POST", "access-control-request-headers": "content-type" },
    });
    expect(response.status).toBe(204);
    expect(response.headers.get("access-control-allow-origin")).toBe("*");
    expect(response.headers.get("access-control-allow-methods")).toMatch(/POST/);
    expect(response.headers.get("access-control-allow-headers")?.toLowerCase()).toContain("content-type");
  });

  it("is not offered on the form pages", async () => {
    const response = await get("/", { origin: "https://registry.example.org" });
    expect(response.headers.get("access-control-allow-origin")).toBeNull();
  });
});

/** A limiter that lets `allowed` requests through, then refuses, recording the keys it was asked about. */
function countingLimiter(allowed: number): RateLimit & { keys: string[] } {
  const keys: string[] = [];
  return { keys, limit: async ({ key }) => { keys.push(key); return { success: keys.length <= allowed }; } };
}

function withBindings(bindings: Partial<Env>, path: string, body: unknown): Promise<Response> {
  return fetchWorker(path, { method: "POST", headers: { "content-type": "application/json", "cf-connecting-ip": "203.0.113.7" }, body: JSON.stringify(body) }, bindings);
}

describe("the optional rate limit", () => {
  it("is off unless RATE_LIMIT is on: the limiter is never asked", async () => {
    const limiter = countingLimiter(0);
    const response = await withBindings({ COMPUTE_RATE_LIMITER: limiter }, "/api/v1/designs/two-means/previews", { inputs });
    expect(response.status).toBe(200);
    expect(limiter.keys).toEqual([]);
    expect(env.RATE_LIMIT).toBe("off");
  });

  it("when on, counts calculations and previews per address and answers 429 problem+json with Retry-After", async () => {
    const limiter = countingLimiter(2);
    const on = { RATE_LIMIT: "on", COMPUTE_RATE_LIMITER: limiter };
    expect((await withBindings(on, "/api/v1/designs/two-means/previews", { inputs })).status).toBe(200);
    expect((await withBindings(on, "/api/v1/designs/two-means/calculations", { inputs, label: "TW-12 limited" })).status).toBe(201);
    const refused = await withBindings(on, "/api/v1/designs/two-means/calculations", { inputs, label: "TW-12 limited 2" });
    expect(refused.status).toBe(429);
    expect(refused.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    expect(refused.headers.get("retry-after")).toBe("60");
    expect((await refused.json<ProblemBody>()).type).toMatch(/rate-limited$/);
    expect(limiter.keys).toEqual(["203.0.113.7", "203.0.113.7", "203.0.113.7"]);
    // Reading is never limited.
    const read = await fetchWorker("/api/v1/designs", {}, on);
    expect(read.status).toBe(200);
    expect(limiter.keys).toHaveLength(3);
  });

  it("uses the binding declared in wrangler.toml: 120 computing requests a minute per address, then 429", async () => {
    expect(env.COMPUTE_RATE_LIMITER, "the rate-limit binding is not configured").toBeDefined();
    const on = { RATE_LIMIT: "on" };
    // The count runs in fixed one-minute windows: should a window end during the loop, the refusal comes
    // later, never sooner, so the first refusal is looked for within two windows' worth of requests.
    const statuses: number[] = [];
    while (statuses.length < 241 && statuses.at(-1) !== 429) {
      statuses.push((await withBindings(on, "/api/v1/designs/two-means/previews", { inputs: { ...inputs, method: "normal" } })).status);
    }
    expect(statuses.at(-1)).toBe(429);
    expect(statuses.length).toBeGreaterThanOrEqual(121);
    expect(statuses.slice(0, -1).every((s) => s === 200)).toBe(true);
  });
});
