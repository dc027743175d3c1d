/** The catalog and one-design endpoints. */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { catalog, findDesign } from "../designs/catalog.js";
import type { AnyDesign } from "../designs/design.js";
import { inputJsonSchema } from "../designs/schema.js";
import { ProblemError } from "./problem.js";

export function describeDesign(design: AnyDesign) {
  return {
    id: design.id,
    version: design.version,
    stage: design.stage,
    title: design.title,
    summary: design.summary,
    inputSchema: inputJsonSchema(design),
    example: design.example,
    references: design.references,
    cautions: design.cautions,
    links: { calculations: `/api/v1/designs/${design.id}/calculations` },
  };
}

export function requireDesign(id: string): AnyDesign {
  const design = findDesign(id);
  if (!design) {
    throw new ProblemError(404, "unknown-design", "No such design",
      `There is no design called ${JSON.stringify(id)}. The catalog at /api/v1/designs lists them.`,
      { known: catalog.map((d) => d.id) });
  }
  return design;
}

export const designsRouter = new Hono<{ Bindings: Env }>()
  .get("/", (c) => c.json({ designs: catalog.map(describeDesign) }))
  .get("/:design", (c) => c.json(describeDesign(requireDesign(c.req.param("design")))));
