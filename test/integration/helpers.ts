import { SELF } from "cloudflare:test";

export const ORIGIN = "https://trialwright.test";

export interface ProblemBody {
  type: string;
  title: string;
  status: number;
  detail: string;
  errors?: Array<{ path: string; pointer: string; message: string }>;
  [key: string]: unknown;
}

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

export function post(path: string, body: unknown, headers: Record<string, string> = {}): Promise<Response> {
  return SELF.fetch(`${ORIGIN}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json", ...headers },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
}

export function get(path: string, headers: Record<string, string> = {}): Promise<Response> {
  return SELF.fetch(`${ORIGIN}${path}`, { headers });
}

export function createCalculation(design: string, inputs: unknown, label?: string): Promise<Response> {
  return post(`/api/v1/designs/${design}/calculations`, label === undefined ? { inputs } : { inputs, label });
}
