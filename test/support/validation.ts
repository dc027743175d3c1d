// Reading a design's zod validation errors in the unit tests.
import { expect } from "vitest";
import type { z } from "zod";

/** Asserts that the inputs are refused and returns each issue as its dotted path and message. */
export function schemaIssues(schema: z.ZodType, inputs: Record<string, unknown>): Array<{ path: string; message: string }> {
  const result = schema.safeParse(inputs);
  expect(result.success).toBe(false);
  return result.success ? [] : result.error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
}
