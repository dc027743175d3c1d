// The frozen-calculation contract of DESIGN.md, exercised through the real
// Worker (SELF.fetch) against miniflare's KV.
import { SELF, env } from "cloudflare:test";
import { describe, expect, it } from "vitest";
import { ORIGIN, type ProblemBody, type RecordBody, createCalculation, get, post } from "../support/http.js";
import { twoMeans } from "../../src/designs/twoMeans.js";

const inputs = { delta: 0.5, sd: 1, alpha: 0.05, power: 0.8 };

describe("freezing a calculation", () => {
  it("answers 201 then 200 with one id for the same request", async () => {
    const first = await createCalculation("two-means", inputs, "TW-417 pain study");
    expect(first.status).toBe(201);
    const a = await first.json<RecordBody>();
    const second = await createCalculation("two-means", inputs, "TW-417 pain study");
    expect(second.status).toBe(200);
    const b = await second.json<RecordBody>();
    expect(b.id).toBe(a.id);
    expect(b.createdAt).toBe(a.createdAt);
    expect(b.digest).toBe(a.digest);
    expect(a.id).toMatch(/^c_[0-9a-f]{32}$/);
    expect(first.headers.get("location")).toBe(`/api/v1/calculations/${a.id}`);
  });

  it("gives the same id when defaults are spelled out, and another id for another label", async () => {
    const plain = await (await createCalculation("two-means", inputs)).json<RecordBody>();
    const spelled = await (await createCalculation("two-means", { ...inputs, method: "exact-t", allocationRatio: 1, dropout: 0, sides: 2 })).json<RecordBody>();
    expect(spelled.id).toBe(plain.id);
    const labelled = await (await createCalculation("two-means", inputs, "Another title")).json<RecordBody>();
    expect(labelled.id).not.toBe(plain.id);
    const padded = await (await createCalculation("two-means", inputs, "  Another title ")).json<RecordBody>();
    expect(padded.id).toBe(labelled.id);
  });

  it("stores normalized inputs and the result (64 per group, Cohen 1988 table 2.4.1)", async () => {
    const record = await (await createCalculation("two-means", inputs)).json<RecordBody>();
    expect(record.design).toBe("two-means");
    expect(record.designVersion).toBe(twoMeans.version);
    expect(record.engine).toMatch(/^trialwright \d+\.\d+\.\d+$/);
    expect(record.inputs).toMatchObject({ ...inputs, method: "exact-t", sides: 2, allocationRatio: 1, dropout: 0 });
    expect(record.result).toMatchObject({ n1: 64, n2: 64, total: 128 });
  });

  it("serves the record at the API, as a JSON permalink and as an HTML page", async () => {
    const record = await (await createCalculation("two-means", inputs, "Página <b>α</b>")).json<RecordBody>();
    const api = await get(`/api/v1/calculations/${record.id}`);
    expect(api.status).toBe(200);
    expect(await api.json()).toEqual(record);
    const json = await get(`/c/${record.id}.json`);
    expect(json.status).toBe(200);
    expect(await json.json()).toEqual(record);
    const html = await get(`/c/${record.id}`);
    expect(html.status).toBe(200);
    expect(html.headers.get("content-type")).toMatch(/text\/html/);
    const page = await html.text();
    expect(page).toContain("Página &lt;b&gt;α&lt;/b&gt;");
    expect(page).not.toContain("<b>α</b>");
    expect(page).toContain(record.digest);
    expect(page).toMatch(/>delta<\/th>\s*<td[^>]*>0\.5</);
  });

  it("detects a record whose stored bytes were altered", async () => {
    const record = await (await createCalculation("two-means", { ...inputs, power: 0.85 })).json<RecordBody>();
    const key = `calc:${record.id}`;
    const stored = await env.CALCULATIONS.get(key, "text");
    expect(stored).not.toBeNull();
    await env.CALCULATIONS.put(key, stored!.replace('"n1":', '"n1":1'));
    const res = await get(`/api/v1/calculations/${record.id}`);
    expect(res.status).toBe(500);
    expect(res.headers.get("content-type")).toMatch(/application\/problem\+json/);
    const problem = await res.json<ProblemBody>();
    expect(problem.type).toMatch(/integrity-failure$/);
    expect(problem.storedDigest).toBe(record.digest);
    expect((await get(`/c/${record.id}`)).status).toBe(500);
    // A repeated POST does not serve the altered record as sound, and does not overwrite it.
    expect((await createCalculation("two-means", { ...inputs, power: 0.85 })).status).toBe(500);
    expect(await env.CALCULATIONS.get(key, "text")).not.toBe(stored);
  });

  it("detects stored bytes that are not JSON", async () => {
    const record = await (await createCalculation("two-means", { ...inputs, power: 0.86 })).json<RecordBody>();
    await env.CALCULATIONS.put(`calc:${record.id}`, "{not json");
    expect((await get(`/api/v1/calculations/${record.id}`)).status).toBe(500);
  });
});

describe("not found", () => {
  it("unknown design gives 404 problem+json", async () => {
    const res = await createCalculation("no-such-design", inputs);
    expect(res.status).toBe(404);
    expect(res.headers.get("content-type")).toMatch(/application\/problem\+json/);
    expect((await get("/api/v1/designs/no-such-design")).status).toBe(404);
  });
  it("unknown or malformed ids give 404", async () => {
    for (const path of ["/api/v1/calculations/c_00000000000000000000000000000000", "/api/v1/calculations/nope", "/c/c_00000000000000000000000000000000", "/c/../../etc/passwd", "/c/c_0.json"]) {
      const res = await get(path);
      expect(res.status, path).toBe(404);
    }
  });
});

describe("bad input", () => {
  const create = (body: unknown) => post("/api/v1/designs/two-means/calculations", body);

  it("malformed JSON gives 400", async () => {
    for (const body of ["{", "", "nul", "{\"inputs\": {\"delta\": 0.5,}}", "\u0000"]) {
      const res = await create(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect((await res.json<ProblemBody>()).type).toMatch(/malformed-json$/);
    }
  });

  it("wrong types give 400 naming each field", async () => {
    const res = await create({ inputs: { delta: "half", sd: true, alpha: null } });
    expect(res.status).toBe(400);
    const problem = await res.json<ProblemBody>();
    const paths = problem.errors!.map((e) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["inputs.delta", "inputs.sd", "inputs.alpha"]));
    expect(problem.errors!.find((e) => e.path === "inputs.delta")!.pointer).toBe("/inputs/delta");
  });

  it("out-of-range values give 400 with the path and a readable sentence", async () => {
    const res = await create({ inputs: { delta: 0.5, sd: -1, alpha: 0.7, power: 1.2, dropout: 0.95 } });
    expect(res.status).toBe(400);
    const problem = await res.json<ProblemBody>();
    const byPath = Object.fromEntries(problem.errors!.map((e) => [e.path, e.message]));
    expect(byPath["inputs.sd"]).toMatch(/at least 1e-9/);
    expect(byPath["inputs.alpha"]).toMatch(/at most 0\.5/);
    expect(byPath["inputs.power"]).toMatch(/less than 1/);
    expect(byPath["inputs.dropout"]).toMatch(/at most 0\.9/);
  });

  it("NaN-like strings and huge numbers are refused", async () => {
    for (const value of ["NaN", "Infinity", "-Infinity", "1e999", "0x10", ""]) {
      const res = await create({ inputs: { delta: value, sd: 1 } });
      expect(res.status, value).toBe(400);
      expect((await res.json<ProblemBody>()).errors!.map((e) => e.path)).toContain("inputs.delta");
    }
    const overflow = await create('{"inputs":{"delta":1e999,"sd":1}}');
    expect(overflow.status).toBe(400);
  });

  it("unknown fields give 400 with their path, in inputs and in the envelope", async () => {
    const res = await create({ inputs: { delta: 0.5, sd: 1, sdd: 2 }, lable: "x" });
    expect(res.status).toBe(400);
    const paths = (await res.json<ProblemBody>()).errors!.map((e) => e.path);
    expect(paths).toContain("lable");
    const inner = await create({ inputs: { delta: 0.5, sd: 1, sdd: 2 } });
    expect((await inner.json<ProblemBody>()).errors!.map((e) => e.path)).toContain("inputs.sdd");
  });

  it("cross-field rules give 400 at the right field", async () => {
    const res = await create({ inputs: { hypothesis: "non-inferiority", delta: 0, sd: 1 } });
    expect(res.status).toBe(400);
    const problem = await res.json<ProblemBody>();
    expect(problem.errors!.map((e) => e.path)).toContain("inputs.margin");
    const power = await create({ inputs: { delta: 1, sd: 1, alpha: 0.3, power: 0.2 } });
    expect((await power.json<ProblemBody>()).errors!.map((e) => e.path)).toContain("inputs.power");
  });

  it("a body that is not an object, or lacks inputs, gives 400", async () => {
    for (const body of ["[]", "42", "\"text\"", "null", "{}", "{\"inputs\": [1,2]}"]) {
      expect((await create(body)).status, body).toBe(400);
    }
  });

  it("an oversized body gives 413, with or without a Content-Length", async () => {
    const big = JSON.stringify({ inputs: { delta: 0.5, sd: 1 }, label: "x".repeat(70 * 1024) });
    const res = await create(big);
    expect(res.status).toBe(413);
    expect((await res.json<ProblemBody>()).status).toBe(413);
    const stream = new ReadableStream({
      start(controller) {
        controller.enqueue(new TextEncoder().encode(big));
        controller.close();
      },
    });
    const chunked = await SELF.fetch(`${ORIGIN}/api/v1/designs/two-means/calculations`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: stream,
    });
    expect(chunked.status).toBe(413);
  });

  it("infeasible targets give 422 naming the bound", async () => {
    const res = await create({ inputs: { delta: 0.001, sd: 10, power: 0.99 } });
    expect(res.status).toBe(422);
    const problem = await res.json<ProblemBody>();
    expect(problem.bound).toBe(100000);
    expect(problem.detail).toMatch(/100000/);
  });

  it("a non-JSON content type gives 415", async () => {
    const res = await post("/api/v1/designs/two-means/calculations", JSON.stringify({ inputs }), { "content-type": "text/plain" });
    expect(res.status).toBe(415);
  });
});
