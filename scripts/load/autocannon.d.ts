// The parts of autocannon's untyped API (8.0) that the load test uses.
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  export interface Request {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    body?: string;
    /** Called before each request is built; the returned object is sent. */
    setupRequest?: (request: Request, context: Record<string, unknown>) => Request;
    onResponse?: (status: number, body: string, context: Record<string, unknown>, headers: Record<string, string | string[]>) => void;
  }

  export interface Options {
    url: string;
    connections: number;
    amount?: number;
    timeout?: number;
    sampleInt?: number;
    requests?: Request[];
  }

  export interface Result {
    errors: number;
    timeouts: number;
    non2xx: number;
    statusCodeStats: Record<string, { count: number }>;
  }

  export interface Instance extends EventEmitter {
    stop(): void;
  }

  export default function autocannon(options: Options, done: (error: Error | null, result: Result) => void): Instance;
}
