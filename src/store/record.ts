/**
 * A frozen calculation: its id is derived from what was asked, its digest from
 * everything it says, so a permalink cannot silently change.
 */
import { canonicalJson } from "./canonical.js";
import { sha256Hex } from "./hash.js";

export interface CalculationRecord {
  id: string;
  design: string;
  designVersion: number;
  engine: string;
  inputs: unknown;
  label?: string;
  result: unknown;
  createdAt: string;
  digest: string;
}

/** Hex digits of SHA-256 kept in an id: 128 bits, far beyond any collision risk. */
const ID_HEX_LENGTH = 32;

/** Id of a calculation: hash of design, design version, normalized inputs and label. */
export async function calculationId(design: string, designVersion: number, inputs: unknown, label: string | undefined): Promise<string> {
  const hex = await sha256Hex(canonicalJson({ design, designVersion, inputs, label: label ?? null }));
  return `c_${hex.slice(0, ID_HEX_LENGTH)}`;
}

export const ID_PATTERN = /^c_[0-9a-f]{32}$/;

/** Digest: SHA-256 of the canonical record without its digest field. */
export async function recordDigest(record: Omit<CalculationRecord, "digest"> & { digest?: string }): Promise<string> {
  const { digest: _ignored, ...rest } = record;
  return sha256Hex(canonicalJson(rest));
}

export async function sealRecord(record: Omit<CalculationRecord, "digest">): Promise<CalculationRecord> {
  return { ...record, digest: await recordDigest(record) };
}
