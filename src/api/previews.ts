/**
 * Previews: compute a design without storing it, so the form can show results
 * while inputs change. Same body and validation as a calculation; nothing is
 * written, no id is derived. The answer is the normalized inputs, the result
 * and the design's document sections, which the form renders.
 */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { InfeasibleDesignError } from "../designs/design.js";
import { CAUTION } from "../report/build.js";
import { canonicalJson } from "../store/canonical.js";
import { requireDesign } from "./designs.js";
import { ProblemError } from "./problem.js";
import { parseCalculationRequest, readBoundedText } from "./validation.js";

export const previewRouter = new Hono<{ Bindings: Env }>().post("/:design/previews", async (c) => {
  const design = requireDesign(c.req.param("design"));
  const type = c.req.header("content-type") ?? "";
  if (type && !/^application\/(.+\+)?json\b/i.test(type)) {
    throw new ProblemError(415, "unsupported-media-type", "Send JSON", "The request body must be application/json.");
  }
  const { inputs: parsed } = parseCalculationRequest(design, await readBoundedText(c.req.raw));
  // The same canonical round trip as a frozen calculation, so a preview shows what freezing would store.
  const inputs = JSON.parse(canonicalJson(parsed)) as Record<string, unknown>;
  let result: unknown;
  try {
    result = JSON.parse(canonicalJson(design.compute(inputs)));
  } catch (error) {
    if (error instanceof InfeasibleDesignError) {
      throw new ProblemError(422, "infeasible-design", "No design meets these constraints", error.message, error.details);
    }
    throw error;
  }
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
