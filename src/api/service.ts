/**
 * Freezing a calculation: normalize, derive the id, serve a stored record or
 * compute, seal and store a new one. The only place that joins designs and storage.
 */
import { COMPUTE_BUDGET_MS, OverBudgetError, assertWithinBudget } from "../designs/budget.js";
import { type AnyDesign, InfeasibleDesignError } from "../designs/design.js";
import { canonicalJson } from "../store/canonical.js";
import { type CalculationRecord, calculationId, sealRecord } from "../store/record.js";
import type { RecordLedger } from "../store/ledger.js";
import { type ReadOutcome, type RecordStore, verifyRecordText } from "../store/recordStore.js";
import { StorageUnavailableError } from "../store/storageError.js";
import { ENGINE } from "../version.js";
import { type FieldError, ProblemError } from "./problem.js";

/** Round trip through canonical JSON: the inputs hashed are exactly the inputs stored and computed on. */
export function freezeValue<T>(value: T): T {
  return JSON.parse(canonicalJson(value)) as T;
}

/**
 * The design computed on frozen inputs, its result frozen the same way. Work
 * beyond the compute budget is refused before it starts, and an infeasible
 * design is a 422.
 */
export function computeFrozen(design: AnyDesign, inputs: unknown): unknown {
  try {
    assertWithinBudget(design, inputs);
    return freezeValue(design.compute(inputs));
  } catch (error) {
    if (error instanceof OverBudgetError) throw overBudgetProblem(error);
    if (error instanceof InfeasibleDesignError) {
      throw new ProblemError(422, "infeasible-design", "No design meets these constraints", error.message,
        { ...error.details, errors: [inputError(error.details.field, error.message)] });
    }
    throw error;
  }
}

/** A 422 that names the fields to reduce, as `field` (the first, which forms mark) and as paths and pointers. */
function overBudgetProblem(error: OverBudgetError): ProblemError {
  const { milliseconds, breakdown, reduce } = error.estimate;
  return new ProblemError(422, "over-compute-budget", "This calculation needs more computing than one request may use", error.message, {
    estimatedMilliseconds: Math.ceil(milliseconds),
    budgetMilliseconds: COMPUTE_BUDGET_MS,
    breakdown,
    ...(reduce[0] !== undefined ? { field: reduce[0] } : {}),
    errors: reduce.map((name) => inputError(name, "Lower this to bring the calculation within the compute budget.")),
  });
}

/** A 422's pointer to the input it names, in the same form as a 400's field errors. */
function inputError(name: string, message: string): FieldError {
  return { path: `inputs.${name}`, pointer: `/inputs/${name}`, message };
}

/** What a calculation request got: a frozen record, or a result that could not be frozen (and has no permalink). */
export type FreezeOutcome =
  | { frozen: true; created: boolean; record: CalculationRecord }
  | { frozen: false; problem: ProblemError };

/** The computed calculation without id, digest or creation time: what is answered when it cannot be frozen. */
export type UnfrozenCalculation = Omit<CalculationRecord, "id" | "digest" | "createdAt">;

/**
 * Serves the stored record for these inputs, or computes and freezes a new one.
 * Freezing needs to know that nothing is stored under the id yet (a KV read
 * that fails leaves that unknown, so nothing is written) and the ledger's word
 * on which record the id stands for (so racing requests share one record).
 * When storage fails, the computed calculation is still answered, inside a
 * problem that says it was not frozen.
 */
export async function freezeCalculation(
  store: RecordStore,
  ledger: RecordLedger,
  design: AnyDesign,
  normalizedInputs: unknown,
  label: string | undefined,
  now: () => Date = () => new Date(),
): Promise<FreezeOutcome> {
  const inputs = freezeValue(normalizedInputs);
  const id = await calculationId(design.id, design.version, inputs, label);
  const existing = await settle(store.read(id));
  if (existing.ok && existing.value.status === "found") return { frozen: true, created: false, record: existing.value.record };
  const calculation: UnfrozenCalculation = {
    design: design.id,
    designVersion: design.version,
    engine: ENGINE,
    inputs,
    ...(label !== undefined ? { label } : {}),
    result: computeFrozen(design, inputs),
  };
  if (!existing.ok) return { frozen: false, problem: notFrozen(calculation, existing.error) };
  if (existing.value.status === "corrupt") return { frozen: false, problem: corruptProblem(id, existing.value, calculation) };
  const record = await sealRecord({ id, ...calculation, createdAt: now().toISOString() });
  const claimed = await settle(ledger.claim(id, canonicalJson(record)));
  if (!claimed.ok) return { frozen: false, problem: notFrozen(calculation, claimed.error) };
  const outcome = await verifyRecordText(id, claimed.value.text);
  if (outcome.status !== "found") return { frozen: false, problem: corruptProblem(id, outcome, calculation) };
  const written = await settle(store.write(id, claimed.value.text));
  if (!written.ok) return { frozen: false, problem: notFrozen(calculation, written.error) };
  return { frozen: true, created: claimed.value.created, record: outcome.record };
}

type Settled<T> = { ok: true; value: T } | { ok: false; error: StorageUnavailableError };

/** A storage operation's value, or its StorageUnavailableError; any other failure is a bug and propagates. */
async function settle<T>(operation: Promise<T>): Promise<Settled<T>> {
  try {
    return { ok: true, value: await operation };
  } catch (error) {
    if (error instanceof StorageUnavailableError) return { ok: false, error };
    throw error;
  }
}

/** Seconds after which a client may try storage again. */
const STORAGE_RETRY_SECONDS = 30;

function notFrozen(calculation: UnfrozenCalculation, error: StorageUnavailableError): ProblemError {
  console.error(error, error.cause);
  return new ProblemError(503, "storage-unavailable", "Computed, but not frozen",
    `${error.message} The calculation below was computed but not stored, so it has no permalink yet. Send the same request again later to freeze it; it will get the same id.`,
    { frozen: false, retryAfterSeconds: STORAGE_RETRY_SECONDS, calculation });
}

/** Storage failed while reading a record: nothing can be served now. */
export function storageProblem(error: StorageUnavailableError): ProblemError {
  console.error(error, error.cause);
  return new ProblemError(503, "storage-unavailable", "Storage is unavailable", `${error.message} Try again later.`, { retryAfterSeconds: STORAGE_RETRY_SECONDS });
}

export function corruptProblem(id: string, outcome: Extract<ReadOutcome, { status: "corrupt" }>, calculation?: UnfrozenCalculation): ProblemError {
  return new ProblemError(500, "integrity-failure", "The stored record failed its integrity check",
    `Calculation ${id} is stored but ${outcome.reason}; it is not served as if sound. Report this id to the operators.` +
      (calculation ? " The calculation below was computed afresh and not stored." : ""),
    { id, ...(outcome.storedDigest ? { storedDigest: outcome.storedDigest, computedDigest: outcome.computedDigest } : {}), ...(calculation ? { frozen: false, calculation } : {}) });
}

/**
 * Reads a verified record with its canonical text (which is its JSON answer
 * as it stands), turning a missing or corrupt one, or failed storage, into the matching problem.
 */
export async function loadRecord(store: RecordStore, id: string): Promise<{ record: CalculationRecord; text: string }> {
  const read = await settle(store.read(id));
  if (!read.ok) throw storageProblem(read.error);
  const outcome = read.value;
  if (outcome.status === "found") return outcome;
  if (outcome.status === "corrupt") throw corruptProblem(id, outcome);
  throw new ProblemError(404, "unknown-calculation", "No such calculation", `No calculation is stored under the id ${JSON.stringify(id)}.`);
}
