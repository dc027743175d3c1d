/**
 * OpenAPI 3.1 description of the API, generated from the designs' zod schemas
 * (OpenAPI 3.1 schemas are JSON Schema draft 2020-12, which zod emits directly).
 * One create path per design, so each request body has its exact schema.
 */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { catalog } from "../designs/catalog.js";
import { inputJsonSchema } from "../designs/schema.js";
import { ENGINE_VERSION } from "../version.js";
import { MAX_LABEL_LENGTH } from "./validation.js";

const problemResponse = (description: string) => ({
  description,
  content: { "application/problem+json": { schema: { $ref: "#/components/schemas/Problem" } } },
});

const recordResponse = (description: string) => ({
  description,
  content: { "application/json": { schema: { $ref: "#/components/schemas/CalculationRecord" } } },
});

/** The refusals shared by every path that takes a design's inputs (calculations and previews). */
const INPUT_PROBLEMS = {
  "400": problemResponse("Malformed JSON or invalid inputs; `errors` names each field."),
  "404": problemResponse("Unknown design."),
  "413": problemResponse("Body larger than 64 KiB."),
  "415": problemResponse("Body is not JSON."),
  "422": problemResponse("Valid inputs, but no design meets the constraints within the bounds (`infeasible-design`), or the calculation would need more than one request's compute budget (`over-compute-budget`, naming the fields to reduce)."),
  "429": problemResponse("Too many calculations from this client in a short time (only where the rate limit is configured); see Retry-After."),
};

const notFrozenResponse = (description: string, retryLater: boolean) => ({
  description,
  ...(retryLater ? { headers: { "Retry-After": { description: "Seconds after which to send the request again.", schema: { type: "integer" } } } } : {}),
  content: { "application/problem+json": { schema: { $ref: "#/components/schemas/NotFrozenProblem" } } },
});

const schemaName = (designId: string): string =>
  designId.split("-").map((p) => p.charAt(0).toUpperCase() + p.slice(1)).join("") + "Inputs";

export function openApiDocument(): Record<string, unknown> {
  const designPaths: Record<string, unknown> = {};
  const designSchemas: Record<string, unknown> = {};
  for (const design of catalog) {
    const name = schemaName(design.id);
    designSchemas[name] = inputJsonSchema(design);
    designPaths[`/api/v1/designs/${design.id}/calculations`] = {
      post: {
        operationId: `create-${design.id}`,
        summary: `Freeze a ${design.title} calculation`,
        description: design.summary,
        tags: [design.stage],
        requestBody: {
          required: true,
          content: {
            "application/json": {
              schema: {
                type: "object",
                additionalProperties: false,
                required: ["inputs"],
                properties: {
                  inputs: { $ref: `#/components/schemas/${name}` },
                  label: { type: "string", maxLength: MAX_LABEL_LENGTH, description: "Optional study title shown on the report; part of the id." },
                },
              },
              example: { inputs: design.example, label: "Example study" },
            },
          },
        },
        responses: {
          "201": recordResponse("A new calculation was computed and frozen."),
          "200": recordResponse("The same request was frozen before; the stored record is returned."),
          ...INPUT_PROBLEMS,
          "500": notFrozenResponse("The record stored under this id failed its integrity check (`integrity-failure`); it is not served, and the calculation computed afresh is in `calculation`, not frozen.", false),
          "503": notFrozenResponse("Storage failed (`storage-unavailable`): the calculation was computed and is in `calculation`, but it was not frozen and has no permalink. The same request sent again later freezes it under the same id.", true),
        },
      },
    };
    designPaths[`/api/v1/designs/${design.id}/previews`] = {
      post: {
        operationId: `preview-${design.id}`,
        summary: `Compute a ${design.title} calculation without storing it`,
        description: "Same body as a calculation. Nothing is stored and no id is given; the answer is the normalized inputs, the result and the report sections.",
        tags: [design.stage],
        requestBody: (designPaths[`/api/v1/designs/${design.id}/calculations`] as { post: { requestBody: unknown } }).post.requestBody,
        responses: {
          "200": { description: "The computed design, not stored.", content: { "application/json": { schema: { $ref: "#/components/schemas/Preview" } } } },
          ...INPUT_PROBLEMS,
        },
      },
    };
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "Trialwright API",
      version: ENGINE_VERSION,
      description: "Clinical trial designs computed exactly and frozen under permanent ids. A planning aid: every design must be reviewed by a qualified statistician; the protocol, the ethics committee and the regulator decide.",
    },
    jsonSchemaDialect: "https://json-schema.org/draft/2020-12/schema",
    paths: {
      "/api/v1/designs": {
        get: { operationId: "list-designs", summary: "The catalog of designs", responses: { "200": { description: "Every design with its input schema and example.", content: { "application/json": { schema: { type: "object", properties: { designs: { type: "array", items: { $ref: "#/components/schemas/Design" } } } } } } } } },
      },
      "/api/v1/designs/{design}": {
        get: {
          operationId: "get-design",
          summary: "One design",
          parameters: [{ name: "design", in: "path", required: true, schema: { type: "string", enum: catalog.map((d) => d.id) } }],
          responses: { "200": { description: "The design.", content: { "application/json": { schema: { $ref: "#/components/schemas/Design" } } } }, "404": problemResponse("Unknown design.") },
        },
      },
      ...designPaths,
      "/api/v1/calculations/{id}": {
        get: {
          operationId: "get-calculation",
          summary: "A frozen calculation",
          parameters: [{ name: "id", in: "path", required: true, schema: { type: "string", pattern: "^c_[0-9a-f]{32}$" } }],
          responses: {
            "200": recordResponse("The record, its digest verified."),
            "404": problemResponse("No calculation under this id."),
            "500": problemResponse("The stored record failed its integrity check."),
            "503": problemResponse("Storage could not be read; try again after Retry-After seconds."),
          },
        },
      },
      "/c/{id}": {
        get: {
          operationId: "permalink",
          summary: "Permalink of a calculation: the report as HTML",
          parameters: [{ name: "id", in: "path", required: true, description: "The id, optionally followed by .json", schema: { type: "string" } }],
          responses: { "200": { description: "The report.", content: { "text/html": { schema: { type: "string" } }, "application/json": { schema: { $ref: "#/components/schemas/CalculationRecord" } } } }, "304": { description: "Not modified (ETag is the digest)." }, "404": problemResponse("No calculation under this id."), "500": problemResponse("The stored record failed its integrity check."), "503": problemResponse("Storage could not be read; try again after Retry-After seconds.") },
        },
      },
      "/api/v1/health": {
        get: { operationId: "health", summary: "Answers at once when the Worker runs; touches no storage", responses: { "200": { description: "Running.", content: { "application/json": { schema: { type: "object", required: ["status", "engine"], properties: { status: { const: "ok" }, engine: { type: "string" } } } } } } } },
      },
    },
    components: {
      schemas: {
        ...designSchemas,
        Problem: {
          type: "object",
          description: "RFC 9457 problem details.",
          required: ["type", "title", "status", "detail"],
          properties: {
            type: { type: "string", format: "uri" },
            title: { type: "string" },
            status: { type: "integer" },
            detail: { type: "string" },
            instance: { type: "string" },
            errors: { type: "array", items: { type: "object", required: ["path", "pointer", "message"], properties: { path: { type: "string" }, pointer: { type: "string" }, message: { type: "string" } } } },
          },
        },
        NotFrozenProblem: {
          description: "A problem whose calculation was computed but not frozen: no id, no digest, no permalink.",
          allOf: [
            { $ref: "#/components/schemas/Problem" },
            {
              type: "object",
              required: ["frozen", "calculation"],
              properties: {
                frozen: { const: false },
                retryAfterSeconds: { type: "integer" },
                calculation: {
                  type: "object",
                  required: ["design", "designVersion", "engine", "inputs", "result"],
                  properties: { design: { type: "string" }, designVersion: { type: "integer" }, engine: { type: "string" }, inputs: { type: "object" }, label: { type: "string" }, result: { type: "object" } },
                },
              },
            },
          ],
        },
        CalculationRecord: {
          type: "object",
          required: ["id", "design", "designVersion", "engine", "inputs", "result", "createdAt", "digest"],
          properties: {
            id: { type: "string", pattern: "^c_[0-9a-f]{32}$" },
            design: { type: "string" },
            designVersion: { type: "integer" },
            engine: { type: "string" },
            inputs: { type: "object" },
            label: { type: "string" },
            result: { type: "object" },
            createdAt: { type: "string", format: "date-time" },
            digest: { type: "string", pattern: "^[0-9a-f]{64}$" },
          },
        },
        Preview: {
          type: "object",
          required: ["design", "designVersion", "inputs", "result", "question", "sections", "cautions"],
          properties: {
            design: { type: "string" },
            designVersion: { type: "integer" },
            inputs: { type: "object" },
            result: { type: "object" },
            question: { type: "string" },
            sections: { type: "array", items: { type: "object", required: ["id", "title", "blocks"] } },
            cautions: { type: "array", items: { type: "string" } },
          },
        },
        Design: {
          type: "object",
          required: ["id", "version", "stage", "title", "summary", "inputSchema", "example"],
          properties: {
            id: { type: "string" },
            version: { type: "integer" },
            stage: { type: "string", enum: ["dose-finding", "activity", "comparative", "monitoring"] },
            title: { type: "string" },
            summary: { type: "string" },
            inputSchema: { type: "object" },
            example: { type: "object" },
            references: { type: "array", items: { type: "object" } },
            cautions: { type: "array", items: { type: "string" } },
          },
        },
      },
    },
  };
}

// Built on the first request rather than at start-up (it walks every design's schema), then kept: the catalog does not change in a running Worker.
let served: Record<string, unknown> | undefined;
export const openApiRouter = new Hono<{ Bindings: Env }>().get("/openapi.json", (c) => c.json((served ??= openApiDocument())));
