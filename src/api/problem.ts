/**
 * Errors as RFC 9457 problem details (application/problem+json).
 * Every error the API sends is built here.
 */
import type { Context } from "hono";
import type { ContentfulStatusCode } from "hono/utils/http-status";

export interface FieldError {
  /** Dotted path into the request body: "inputs.delta", "inputs.doses.2". */
  path: string;
  /** JSON Pointer (RFC 6901) to the same place: "/inputs/delta". */
  pointer: string;
  message: string;
}

export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  errors?: FieldError[];
  [extension: string]: unknown;
}

const TYPE_BASE = "https://trialwright.dev/problems/";

/** Thrown anywhere in a handler; the app's error handler turns it into a response. */
export class ProblemError extends Error {
  constructor(
    readonly status: ContentfulStatusCode,
    readonly slug: string,
    readonly title: string,
    readonly detail: string,
    readonly extensions: Record<string, unknown> = {},
  ) {
    super(detail);
  }

  toProblem(instance?: string): Problem {
    return {
      type: `${TYPE_BASE}${this.slug}`,
      title: this.title,
      status: this.status,
      detail: this.detail,
      ...(instance ? { instance } : {}),
      ...this.extensions,
    };
  }
}

export function problemResponse(c: Context, error: ProblemError): Response {
  const body = error.toProblem(new URL(c.req.url).pathname);
  const retry = error.extensions.retryAfterSeconds;
  return c.body(JSON.stringify(body, null, 2), error.status, {
    "content-type": "application/problem+json; charset=utf-8",
    "cache-control": "no-store",
    ...(typeof retry === "number" ? { "retry-after": String(retry) } : {}),
  });
}

export function pointerOf(path: ReadonlyArray<PropertyKey>): string {
  return path.map((p) => `/${String(p).replace(/~/g, "~0").replace(/\//g, "~1")}`).join("");
}

export function dottedPath(path: ReadonlyArray<PropertyKey>): string {
  return path.map(String).join(".");
}
