import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import type { AnyDesign } from "../../src/designs/design.js";
import { type ReportDocument, buildReport } from "../../src/report/build.js";
import type { ReportFonts } from "../../src/report/pdf.js";
import { canonicalJson } from "../../src/store/canonical.js";
import { type CalculationRecord, calculationId, sealRecord } from "../../src/store/record.js";
import { ENGINE } from "../../src/version.js";

const fontDir = join(dirname(fileURLToPath(import.meta.url)), "..", "..", "reports", "fonts");

/** The committed report fonts, read from disk (Node has no Data-module loader). */
export const TEST_FONTS: ReportFonts = {
  regular: new Uint8Array(readFileSync(join(fontDir, "DejaVuSans.ttf"))),
  bold: new Uint8Array(readFileSync(join(fontDir, "DejaVuSans-Bold.ttf"))),
};

/** A sealed record of the design's example, as the service would store it. */
export async function exampleRecord(design: AnyDesign, label?: string): Promise<CalculationRecord> {
  const inputs = JSON.parse(canonicalJson(design.input.parse(design.example))) as unknown;
  const result = JSON.parse(canonicalJson(design.compute(inputs))) as unknown;
  return sealRecord({
    id: await calculationId(design.id, design.version, inputs, label),
    design: design.id,
    designVersion: design.version,
    engine: ENGINE,
    inputs,
    ...(label !== undefined ? { label } : {}),
    result,
    createdAt: "2026-12-01T08:30:00.000Z",
  });
}

export async function exampleReport(design: AnyDesign, label?: string): Promise<ReportDocument> {
  return buildReport(design, await exampleRecord(design, label), "https://trialwright.example");
}

/** Text of a PDF as poppler's pdftotext extracts it (reading order, UTF-8). */
export function pdfText(bytes: Uint8Array): string {
  const dir = mkdtempSync(join(tmpdir(), "tw-pdf-"));
  try {
    const file = join(dir, "report.pdf");
    writeFileSync(file, bytes);
    return execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
