// REPRODUCIBILITY check, not a correctness check: the dose-finding simulations
// must reproduce, byte for byte, the output recorded earlier by
// test/fixtures/dose-finding-reproducibility/record.ts (our own output). The
// same file is checked inside the Workers runtime by
// test/integration/doseFinding.test.ts. Correctness is checked against R in
// crm.test.ts and boin.test.ts.
import { describe, expect, it } from "vitest";
import { crm } from "../../../src/designs/crm.js";
import { boin } from "../../../src/designs/boin.js";
import { doseFindingComparison } from "../../../src/designs/doseFindingComparison.js";
import type { AnyDesign } from "../../../src/designs/design.js";
import { canonicalJson } from "../../../src/store/canonical.js";
import { loadFixture } from "../../support/fixtures.js";

const designs: AnyDesign[] = [crm, boin, doseFindingComparison];

describe("dose-finding simulations are reproducible in Node (own recorded output)", () => {
  const f = loadFixture<{ design: string; inputs: Record<string, unknown>; result: string }>("dose-finding-reproducibility/simulations.json");
  for (const [i, c] of f.cases.entries()) {
    it(`${c.design} plan ${i + 1} gives the recorded bytes`, () => {
      const design = designs.find((d) => d.id === c.design)!;
      expect(canonicalJson(design.compute(design.input.parse(c.inputs)))).toBe(c.result);
    });
  }
});
