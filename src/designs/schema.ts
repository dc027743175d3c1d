/**
 * JSON Schema (draft 2020-12) of a design's inputs, generated from its zod
 * schema: the one source of validation, the OpenAPI document, the form and the
 * field descriptions in reports. Cross-field rules (refinements) are not
 * expressible there; the API reports them with their field paths.
 */
import { z } from "zod";
import type { AnyDesign } from "./design.js";

export type JsonSchema = Record<string, unknown> & {
  properties?: Record<string, JsonSchema>;
  required?: string[];
  description?: string;
};

const cache = new Map<string, JsonSchema>();

export function inputJsonSchema(design: AnyDesign): JsonSchema {
  const hit = cache.get(design.id);
  if (hit) return hit;
  const schema = z.toJSONSchema(design.input, { io: "input", target: "draft-2020-12", unrepresentable: "any" }) as JsonSchema;
  delete schema.$schema;
  cache.set(design.id, schema);
  return schema;
}

/** Field name → description, for the inputs table of a report. */
export function fieldDescriptions(design: AnyDesign): Record<string, string> {
  const properties = inputJsonSchema(design).properties ?? {};
  return Object.fromEntries(Object.entries(properties).map(([k, v]) => [k, typeof v.description === "string" ? v.description : ""]));
}
