// The OpenAPI document, checked by a general-purpose validator of the OpenAPI
// 3.1 specification (@seriousme/openapi-schema-validator, which validates
// against the specification's published JSON Schema).
import { Validator } from "@seriousme/openapi-schema-validator";
import { describe, expect, it } from "vitest";
import { openApiDocument } from "../../../src/api/openapi.js";
import { catalog } from "../../../src/designs/catalog.js";

describe("OpenAPI document", () => {
  it("is a valid OpenAPI 3.1 document", async () => {
    const validator = new Validator();
    const result = await validator.validate(openApiDocument() as Record<string, unknown>);
    expect(result.errors ?? [], JSON.stringify(result.errors, null, 2)).toEqual([]);
    expect(result.valid).toBe(true);
    expect(validator.version).toBe("3.1");
  });

  it("the validator does reject a broken copy (so the check above can fail)", async () => {
    const broken = { ...openApiDocument(), info: { title: 42 } };
    const result = await new Validator().validate(broken as Record<string, unknown>);
    expect(result.valid).toBe(false);
  });

  it("describes one create path per design with that design's input schema", () => {
    const doc = openApiDocument() as { paths: Record<string, { post?: { requestBody: { content: Record<string, { schema: { properties: { inputs: { $ref: string } } } }> } } }>; components: { schemas: Record<string, unknown> } };
    for (const design of catalog) {
      const path = doc.paths[`/api/v1/designs/${design.id}/calculations`];
      expect(path?.post, design.id).toBeDefined();
      const ref = path!.post!.requestBody.content["application/json"]!.schema.properties.inputs.$ref;
      const name = ref.split("/").pop()!;
      expect(doc.components.schemas[name], design.id).toBeDefined();
    }
  });
});
