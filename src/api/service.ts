/**
 * Freezing a calculation: normalize, derive the id, serve a stored record or
 * compute, seal and store a new one. The only place that joins designs and storage.
 */
import { COMPUTE_BUDGET_MS, OverBudgetError, assertWithinBudget } from "../designs/budget.js";
import { type AnyDesign, InfeasibleDesignError } from "../designs/design.js";
import { canonicalJson } from "../store/canonical.js";
import { type CalculationRecord, calculationId, sealRecord } from "../store/record.js";
import { type ReadOutcome, RecordStore } from "../store/recordStore.js";
import { ENGINE } from "../version.js";
import { ProblemError } from "./problem.js";

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
      throw new ProblemError(422, "infeasible-design", "No design meets these constraints", error.message, error.details);
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
    reduce: reduce.map((name) => ({ path: `inputs.${name}`, pointer: `/inputs/${name}` })),
  });
}

export async function freezeCalculation(
  store: RecordStore,
  design: AnyDesign,
  normalizedInputs: unknown,
  label: string | undefined,
  now: () => Date = () => new Date(),
): Promise<{ created: boolean; record: CalculationRecord }> {
  const inputs = freezeValue(normalizedInputs);
  const id = await calculationId(design.id, design.version, inputs, label);
  const existing = await store.read(id);
  if (existing.status === "found") return { created: false, record: existing.record };
  if (existing.status === "corrupt") throw corruptProblem(id, existing);
  const result = computeFrozen(design, inputs);
  const record = await sealRecord({
    id,
    design: design.id,
    designVersion: design.version,
    engine: ENGINE,
    inputs,
    ...(label !== undefined ? { label } : {}),
    result,
    createdAt: now().toISOString(),
  });
  const { created, outcome } = await store.putIfAbsent(record);
  if (outcome.status === "corrupt") throw corruptProblem(id, outcome);
  return { created, record: outcome.status === "found" ? outcome.record : record };
}

export function corruptProblem(id: string, outcome: Extract<ReadOutcome, { status: "corrupt" }>): ProblemError {
  return new ProblemError(500, "integrity-failure", "The stored record failed its integrity check",
    `Calculation ${id} is stored but ${outcome.reason}; it is not served as if sound. Report this id to the operators.`,
    { id, ...(outcome.storedDigest ? { storedDigest: outcome.storedDigest, computedDigest: outcome.computedDigest } : {}) });
}

/** Reads a record, turning a missing or corrupt one into the matching problem. */
export async function loadRecord(store: RecordStore, id: string): Promise<CalculationRecord> {
  const outcome = await store.read(id);
  if (outcome.status === "found") return outcome.record;
  if (outcome.status === "corrupt") throw corruptProblem(id, outcome);
  throw new ProblemError(404, "unknown-calculation", "No such calculation", `No calculation is stored under the id ${JSON.stringify(id)}.`);
}
