// Requests and problem documents for the integration tests (Workers runtime only).
import { createExecutionContext, env, waitOnExecutionContext } from "cloudflare:test";
import { expect } from "vitest";
import type { Env } from "../../src/env.js";
import worker from "../../src/index.js";

export const ORIGIN = "https://trialwright.test";

/** An RFC 9457 problem document as the API writes it; designs add their own members (bound, field, ...). */
export interface ProblemBody {
  type: string;
  title: string;
  status: number;
  detail: string;
  errors?: Array<{ path: string; pointer: string; message: string }>;
  bound?: number;
  field?: string;
  [key: string]: unknown;
}
export type Problem = ProblemBody;

export interface RecordBody {
  id: string;
  design: string;
  designVersion: number;
  engine: string;
  inputs: Record<string, unknown>;
  label?: string;
  result: Record<string, unknown>;
  createdAt: string;
  digest: string;
}

/**
 * One request through the Worker's own fetch handler, in this runtime, with the
 * test pool's bindings (real KV, Durable Objects, assets), some replaced when
 * a test injects faults. Called directly rather than through SELF.fetch, whose
 * cost per request grows with every request a test file makes (from about
 * 0.1 ms to over 100 ms after a few hundred), which long property runs cannot afford.
 */
export async function fetchWorker(path: string, init: RequestInit = {}, bindings: Partial<Env> = {}): Promise<Response> {
  const ctx = createExecutionContext();
  const response = await worker.fetch(new Request(`${ORIGIN}${path}`, init), { ...env, ...bindings }, ctx);
  await waitOnExecutionContext(ctx);
  return response;
}

export function post(path: string, body: unknown, headers: Record<string, string> = {}): Promise<Response> {
  return fetchWorker(path, {
    method: "POST",
    headers: { "content-type": "application/json", ...headers },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
}

export function get(path: string, headers: Record<string, string> = {}): Promise<Response> {
  return fetchWorker(path, { headers });
}

/** POSTs `{ inputs, label? }` to a design's calculations endpoint. */
export function createCalculation(design: string, inputs: unknown, label?: string): Promise<Response> {
  return post(`/api/v1/designs/${design}/calculations`, label === undefined ? { inputs } : { inputs, label });
}

/** POSTs `{ inputs }` to a design's calculations endpoint. */
export function postCalculation(design: string, inputs: unknown): Promise<Response> {
  return createCalculation(design, inputs);
}

/** Asserts a 400 problem+json and reads it. */
async function badRequest(res: Response): Promise<Problem> {
  expect(res.status).toBe(400);
  expect(res.headers.get("content-type")).toMatch(/application\/problem\+json/);
  return res.json<Problem>();
}

/** Asserts a 400 problem+json with an error at `path` that reads like `message` (a field may carry several). */
export async function expectFieldError(res: Response, path: string, message: RegExp): Promise<void> {
  const problem = await badRequest(res);
  const messages = (problem.errors ?? []).filter((e) => e.path === path).map((e) => e.message);
  expect(messages.some((m) => message.test(m)), JSON.stringify(problem.errors)).toBe(true);
}

/** Asserts a 400 problem+json with an error at `path`. */
export async function expectErrorAt(res: Response, path: string): Promise<void> {
  const problem = await badRequest(res);
  expect(problem.errors?.map((e) => e.path)).toContain(path);
}
