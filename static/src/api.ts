/** What the pages read from the API, and one way to call it. */
import type { Section } from "../../src/report/document.js";
import type { Stage } from "../../src/designs/design.js";
import type { Problem as ApiProblem } from "../../src/api/problem.js";

export type { Stage };

export interface JsonSchema {
  type?: string | string[];
  title?: string;
  description?: string;
  default?: unknown;
  enum?: unknown[];
  const?: unknown;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  exclusiveMaximum?: number;
  minItems?: number;
  maxItems?: number;
  minLength?: number;
  maxLength?: number;
  items?: JsonSchema;
  properties?: Record<string, JsonSchema>;
  required?: string[];
  unit?: string;
}

export interface DesignEntry {
  id: string;
  version: number;
  stage: Stage;
  title: string;
  summary: string;
  inputSchema: JsonSchema;
  example: Record<string, unknown>;
  references: Array<{ key: string; text: string; doi?: string }>;
  cautions: string[];
}

export type { FieldError } from "../../src/api/problem.js";

/** The API's problem document; `field` is the input a 422 names. */
export type Problem = ApiProblem & { field?: string };

export interface Preview {
  design: string;
  designVersion: number;
  inputs: Record<string, unknown>;
  result: unknown;
  question: string;
  sections: Section[];
  cautions: string[];
}

export interface CalculationRecord {
  id: string;
  design: string;
  designVersion: number;
  engine: string;
  inputs: Record<string, unknown>;
  label?: string;
  result: unknown;
  createdAt: string;
  digest: string;
}

export type Answer<T> = { ok: true; status: number; body: T } | { ok: false; status: number; problem: Problem };

function asProblem(status: number, body: unknown): Problem {
  if (body && typeof body === "object" && "detail" in body) return body as Problem;
  return { type: "about:blank", title: "Unexpected answer", status, detail: `The service answered ${status}.` };
}

/** GET or POST JSON; problem+json answers come back as values, network failures and aborts throw. */
export async function callApi<T>(path: string, init: { body?: unknown; signal?: AbortSignal } = {}): Promise<Answer<T>> {
  const response = await fetch(path, {
    method: init.body === undefined ? "GET" : "POST",
    headers: init.body === undefined ? { accept: "application/json" } : { "content-type": "application/json", accept: "application/json" },
    ...(init.body === undefined ? {} : { body: JSON.stringify(init.body) }),
    ...(init.signal ? { signal: init.signal } : {}),
  });
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    body = null;
  }
  return response.ok ? { ok: true, status: response.status, body: body as T } : { ok: false, status: response.status, problem: asProblem(response.status, body) };
}
