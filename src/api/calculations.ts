/** Creating and reading frozen calculations. */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { ID_PATTERN } from "../store/record.js";
import { durableLedger } from "../store/ledger.js";
import { RecordStore } from "../store/recordStore.js";
import { requireDesign } from "./designs.js";
import { ProblemError } from "./problem.js";
import { freezeCalculation, loadRecord } from "./service.js";
import { parseCalculationRequest, readBoundedText, requireJsonContent } from "./validation.js";

/** Canonical JSON is JSON: a stored record's text is served as it stands, without parsing and writing it again. */
export const JSON_TYPE = "application/json; charset=utf-8";

export function requireId(id: string): string {
  if (!ID_PATTERN.test(id)) {
    throw new ProblemError(404, "unknown-calculation", "No such calculation",
      `${JSON.stringify(id.slice(0, 80))} is not a calculation id (ids look like c_ followed by 32 hexadecimal digits).`);
  }
  return id;
}

export const createRouter = new Hono<{ Bindings: Env }>().post("/:design/calculations", async (c) => {
  const design = requireDesign(c.req.param("design"));
  requireJsonContent(c.req.header("content-type"));
  const text = await readBoundedText(c.req.raw);
  const { inputs, label } = parseCalculationRequest(design, text);
  const outcome = await freezeCalculation(new RecordStore(c.env.CALCULATIONS), durableLedger(c.env.LEDGER), design, inputs, label);
  // Not frozen: the result travels inside the problem, with no id, Location or link to a permalink that does not exist.
  if (!outcome.frozen) throw outcome.problem;
  const { created, record } = outcome;
  c.header("Location", `/api/v1/calculations/${record.id}`);
  c.header("Link", `</c/${record.id}>; rel="alternate"; type="text/html"`);
  return c.json(record, created ? 201 : 200);
});

export const readRouter = new Hono<{ Bindings: Env }>().get("/:id", async (c) => {
  const { text } = await loadRecord(new RecordStore(c.env.CALCULATIONS), requireId(c.req.param("id")));
  return c.body(text, 200, { "content-type": JSON_TYPE });
});
