// What every answer to a POST must be, whatever was sent: never a 5xx, never
// slow enough to look hung, a well-formed record or preview on success, and on
// refusal an RFC 9457 problem whose errors name the place in the body.
import { ID_PATTERN } from "../../../src/store/record.js";

/** Longer than any admitted calculation could take (the compute budget is 2 s) even on a loaded machine. */
export const HANG_LIMIT_MS = 20_000;

const REFUSALS = new Set([400, 413, 415, 422]);

interface FieldErrorBody { path?: unknown; pointer?: unknown; message?: unknown }

function fail(what: string, status: number, text: string, why: string): never {
  throw new Error(`${why}\n  sent: ${what.slice(0, 400)}\n  answer: ${status} ${text.slice(0, 600)}`);
}

/** The dotted path a JSON Pointer names (RFC 6901 unescaping), for checking that both name one place. */
function pathOfPointer(pointer: string): string {
  return pointer.split("/").slice(1).map((s) => s.replace(/~1/g, "/").replace(/~0/g, "~")).join(".");
}

function checkFieldErrors(errors: unknown, prefix: string, fail: (why: string) => never): void {
  if (!Array.isArray(errors) || errors.length === 0) fail("a refusal without `errors` naming where the problem is");
  for (const e of errors as FieldErrorBody[]) {
    if (typeof e.path !== "string" || typeof e.pointer !== "string" || typeof e.message !== "string" || e.message.length === 0) fail(`a malformed field error ${JSON.stringify(e)}`);
    if (e.pointer !== "" && !e.pointer.startsWith("/")) fail(`pointer ${JSON.stringify(e.pointer)} is not a JSON Pointer`);
    if (pathOfPointer(e.pointer) !== e.path) fail(`path ${JSON.stringify(e.path)} and pointer ${JSON.stringify(e.pointer)} name different places`);
    if (!e.pointer.startsWith(prefix)) fail(`pointer ${JSON.stringify(e.pointer)} is outside ${prefix}`);
  }
}

/** Checks one answer; throws with the request and the answer when the contract is broken. */
export async function expectContract(response: Response, elapsedMs: number, route: "calculations" | "previews", what: string): Promise<void> {
  const text = await response.text();
  const status = response.status;
  const no = (why: string): never => fail(what, status, text, why);
  if (status >= 500) no("a 5xx answer to a client's request");
  if (elapsedMs > HANG_LIMIT_MS) no(`took ${Math.round(elapsedMs)} ms`);
  const type = response.headers.get("content-type") ?? "";
  let body: Record<string, unknown>;
  try {
    body = JSON.parse(text) as Record<string, unknown>;
  } catch {
    return no("an answer that is not JSON");
  }
  if (status === 200 || status === 201) {
    if (!type.startsWith("application/json")) no(`success with content-type ${type}`);
    if (route === "calculations") {
      if (typeof body.id !== "string" || !ID_PATTERN.test(body.id) || typeof body.digest !== "string") no("a record without id or digest");
    } else if (status !== 200 || !("result" in body) || !Array.isArray(body.sections)) {
      no("a preview without result or sections");
    }
    return;
  }
  if (!REFUSALS.has(status)) no(`status ${status} is not one this route gives`);
  if (!type.startsWith("application/problem+json")) no(`a refusal with content-type ${type}`);
  for (const member of ["type", "title", "detail"] as const) {
    if (typeof body[member] !== "string" || (body[member] as string).length === 0) no(`a problem without ${member}`);
  }
  if (body.status !== status) no("a problem whose status differs from the answer's");
  if (status === 400 || status === 413) checkFieldErrors(body.errors, "", no);
  if (status === 422) {
    checkFieldErrors(body.errors, "/inputs/", no);
    if (typeof body.field !== "string") no("a 422 without the field it names");
  }
}
