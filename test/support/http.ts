// Requests and problem documents for the integration tests (Workers runtime only).
import { SELF } from "cloudflare:test";
import { expect } from "vitest";

export interface Problem {
  status: number;
  detail: string;
  bound?: number;
  field?: string;
  errors?: Array<{ path: string; message: string }>;
}

/** POSTs `{ inputs }` to a design's calculations endpoint. */
export function postCalculation(design: string, inputs: unknown): Promise<Response> {
  return SELF.fetch(`https://example.com/api/v1/designs/${design}/calculations`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ inputs }),
  });
}

/** Asserts a 400 problem+json whose error at `path` reads like `message`. */
export async function expectFieldError(res: Response, path: string, message: RegExp): Promise<void> {
  expect(res.status).toBe(400);
  expect(res.headers.get("content-type")).toMatch(/application\/problem\+json/);
  const problem = await res.json<Problem>();
  const error = problem.errors?.find((e) => e.path === path);
  expect(error?.message, JSON.stringify(problem.errors)).toMatch(message);
}
