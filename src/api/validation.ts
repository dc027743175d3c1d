/**
 * Turns request bodies into validated design inputs, or into a 400 problem
 * that names every bad field with a sentence a clinician can act on.
 */
import { z } from "zod";
import type { AnyDesign } from "../designs/design.js";
import { type FieldError, ProblemError, dottedPath, pointerOf } from "./problem.js";

export const MAX_BODY_BYTES = 64 * 1024;
export const MAX_LABEL_LENGTH = 300;

// zod's own wording for a bound; any other message was written by a design for clinicians.
const DEFAULT_BOUND_MESSAGE = /^Too (small|big):/;

function issueMessage(issue: z.core.$ZodIssue): string {
  if ((issue.code === "too_small" || issue.code === "too_big") && !DEFAULT_BOUND_MESSAGE.test(issue.message)) return issue.message;
  switch (issue.code) {
    case "unrecognized_keys":
      return `Unknown field${issue.keys.length > 1 ? "s" : ""}: ${issue.keys.join(", ")}. Check the spelling against the design's schema.`;
    case "invalid_type":
      if (issue.input === undefined) return "This field is required.";
      return `Expected ${issue.expected}, got ${describeValue(issue.input)}.`;
    case "too_small":
      return `Must be ${issue.inclusive ? "at least" : "greater than"} ${String(issue.minimum)}${issue.origin === "array" ? " items" : issue.origin === "string" ? " characters" : ""}.`;
    case "too_big":
      return `Must be ${issue.inclusive ? "at most" : "less than"} ${String(issue.maximum)}${issue.origin === "array" ? " items" : issue.origin === "string" ? " characters" : ""}.`;
    case "invalid_value":
      return `Must be one of: ${issue.values.map((v) => JSON.stringify(v)).join(", ")}.`;
    case "invalid_union":
      return "Does not match any of the accepted forms.";
    case "not_multiple_of":
      return `Must be a multiple of ${String(issue.divisor)}.`;
    default:
      return issue.message;
  }
}

function describeValue(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "a list";
  if (typeof value === "string") return `the text ${JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value)}`;
  if (typeof value === "number" && !Number.isFinite(value)) return "a non-finite number";
  return `a ${typeof value}`;
}

export function fieldErrors(error: z.ZodError, prefix: PropertyKey[] = []): FieldError[] {
  const out: FieldError[] = [];
  for (const issue of error.issues) {
    if (issue.code === "unrecognized_keys") {
      // One entry per unknown field, so a form can mark each.
      for (const key of issue.keys) {
        const path = [...prefix, ...issue.path, key];
        out.push({ path: dottedPath(path), pointer: pointerOf(path), message: `Unknown field "${key}". Check the spelling against the design's schema.` });
      }
      continue;
    }
    const path = [...prefix, ...issue.path];
    out.push({ path: dottedPath(path), pointer: pointerOf(path), message: issueMessage(issue) });
  }
  return out;
}

export function invalidInput(errors: FieldError[]): ProblemError {
  const count = errors.length;
  return new ProblemError(400, "invalid-input", "The request has invalid fields",
    `${count} field${count === 1 ? "" : "s"} need${count === 1 ? "s" : ""} attention: ${errors.map((e) => `${e.path || "(body)"}: ${e.message}`).join(" ")}`,
    { errors });
}

const envelope = z.strictObject({
  inputs: z.record(z.string(), z.unknown()),
  label: z.string().max(MAX_LABEL_LENGTH).optional(),
});

export interface CalculationRequest {
  inputs: unknown;
  label: string | undefined;
}

/** A body sent as something other than JSON is refused (415); no Content-Type at all is read as JSON. */
export function requireJsonContent(contentType: string | undefined): void {
  if (contentType && !/^application\/(.+\+)?json\b/i.test(contentType)) {
    throw new ProblemError(415, "unsupported-media-type", "Send JSON", "The request body must be application/json.");
  }
}

/** Reads the body with its size bounded, whatever Content-Length claims. */
export async function readBoundedText(request: Request): Promise<string> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > MAX_BODY_BYTES) throw tooLarge();
  if (!request.body) return "";
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > MAX_BODY_BYTES) {
      await reader.cancel();
      throw tooLarge();
    }
    chunks.push(value);
  }
  const all = new Uint8Array(size);
  let offset = 0;
  for (const chunk of chunks) {
    all.set(chunk, offset);
    offset += chunk.byteLength;
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(all);
  } catch {
    throw new ProblemError(400, "malformed-body", "The body is not UTF-8", "Send the request body as UTF-8 encoded JSON.", { errors: [bodyError("The body is not valid UTF-8.")] });
  }
}

function tooLarge(): ProblemError {
  return new ProblemError(413, "body-too-large", "The request body is too large", `Request bodies are limited to ${MAX_BODY_BYTES} bytes.`,
    { limit: MAX_BODY_BYTES, errors: [bodyError(`Longer than ${MAX_BODY_BYTES} bytes.`)] });
}

/** An error about the whole body: the empty path, and the JSON Pointer "" (RFC 6901: the whole document). */
function bodyError(message: string): FieldError {
  return { path: "", pointer: "", message };
}

/** Parses and validates `{ inputs, label? }` against the design's schema. */
export function parseCalculationRequest(design: AnyDesign, text: string): { inputs: unknown; label: string | undefined } {
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch (e) {
    const reason = text.trim() === "" ? "the body is empty" : e instanceof Error ? e.message : "syntax error";
    throw new ProblemError(400, "malformed-json", "The body is not valid JSON",
      `The request body could not be parsed as JSON (${reason}). Send {"inputs": {...}}.`, { errors: [bodyError(`Not valid JSON: ${reason}.`)] });
  }
  const shape = envelope.safeParse(body);
  if (!shape.success) throw invalidInput(fieldErrors(shape.error));
  const inputs = design.input.safeParse(shape.data.inputs);
  if (!inputs.success) throw invalidInput(fieldErrors(inputs.error, ["inputs"]));
  return { inputs: inputs.data, label: normalizeLabel(shape.data.label) };
}

/** NFC-normalized, trimmed; an empty label is no label, so both give one id. */
export function normalizeLabel(label: string | undefined): string | undefined {
  if (label === undefined) return undefined;
  const clean = label.normalize("NFC").trim();
  return clean.length > 0 ? clean : undefined;
}
