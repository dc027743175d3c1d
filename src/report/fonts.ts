/**
 * The report fonts, bundled into the Worker as binary modules (wrangler's
 * `Data` rule for .ttf; the test and script loaders provide the same module).
 * DejaVu Sans: its Bitstream Vera licence (reports/fonts/LICENSE.txt) permits
 * redistribution.
 */
import regular from "../../reports/fonts/DejaVuSans.ttf";
import bold from "../../reports/fonts/DejaVuSans-Bold.ttf";
import type { ReportFonts } from "./pdf.js";

export const REPORT_FONTS: ReportFonts = { regular: new Uint8Array(regular), bold: new Uint8Array(bold) };
