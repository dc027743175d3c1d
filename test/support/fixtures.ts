import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { dirname, join } from "node:path";
import { expect } from "vitest";

const root = join(dirname(fileURLToPath(import.meta.url)), "..", "fixtures");

export interface FixtureFile<C> {
  source: string;
  note: string;
  tolerance: number;
  cases: C[];
}

/** Reads test/fixtures/<relative>; the files are written by the generator beside them. */
export function loadFixture<C>(relative: string): FixtureFile<C> {
  return JSON.parse(readFileSync(join(root, relative), "utf8")) as FixtureFile<C>;
}

/**
 * Asserts |actual - expected| ≤ tolerance × scale and, on failure, prints the inputs,
 * both values, the difference and the tolerance.
 */
export function expectClose(
  actual: number,
  expected: number,
  tolerance: number,
  inputs: Record<string, unknown>,
  mode: "absolute" | "relative" = "absolute",
): void {
  const scale = mode === "relative" ? Math.max(Math.abs(expected), Number.MIN_VALUE) : 1;
  const difference = Math.abs(actual - expected);
  const ok = actual === expected || difference <= tolerance * scale;
  if (!ok) {
    expect.fail(
      `inputs ${JSON.stringify(inputs)}: got ${actual}, expected ${expected}, ` +
        `difference ${difference} (${mode} ${difference / scale}), tolerance ${tolerance} ${mode}`,
    );
  }
}
