/**
 * Previews: compute a design without storing it, so the form can show results
 * while inputs change. Same body and validation as a calculation; nothing is
 * written, no id is derived. The answer is the normalized inputs, the result
 * and the design's document sections, which the form renders.
 */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { CAUTION } from "../report/build.js";
import { requireDesign } from "./designs.js";
import { computeFrozen, freezeValue } from "./service.js";
import { parseCalculationRequest, readBoundedText, requireJsonContent } from "./validation.js";

export const previewRouter = new Hono<{ Bindings: Env }>().post("/:design/previews", async (c) => {
  const design = requireDesign(c.req.param("design"));
  requireJsonContent(c.req.header("content-type"));
  const { inputs: parsed } = parseCalculationRequest(design, await readBoundedText(c.req.raw));
  // The same canonical round trip as a frozen calculation, so a preview shows what freezing would store.
  const inputs = freezeValue(parsed as Record<string, unknown>);
  const result = computeFrozen(design, inputs);
  c.header("Cache-Control", "no-store");
  return c.json({
    design: design.id,
    designVersion: design.version,
    inputs,
    result,
    question: design.question(inputs),
    sections: design.document(inputs, result),
    cautions: [CAUTION, ...design.cautions],
  });
});
