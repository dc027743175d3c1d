/**
 * Report layout shared by the HTML, SVG and PDF renderers: one palette, one
 * type scale, one set of page sizes, so the page, the chart and the PDF look
 * like the same document.
 */

/** Okabe & Ito (2008) colour-blind-safe palette; series also differ by dash so grey print still separates them. */
export const SERIES_COLOURS = ["#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000"] as const;
export const SERIES_DASHES: ReadonlyArray<readonly number[]> = [[], [6, 3], [2, 2], [8, 3, 2, 3], [4, 4], [1, 3], [10, 2]];

export const INK = "#1a1a1a";
export const MUTED = "#5a5a5a";
export const RULE = "#c8c8c8";
export const GRID = "#e6e6e6";
export const ACCENT = "#1f4e79";
export const PROTOCOL_BACKGROUND = "#f1f5fa";
export const KEY_BACKGROUND = "#f6f6f2";
export const MARKER = "#7a1f1f";

/** Page sizes in PostScript points (1/72 inch). */
export const PAPER = {
  a4: { width: 595.28, height: 841.89 },
  letter: { width: 612, height: 792 },
} as const;
export type Paper = keyof typeof PAPER;

/** Margins that fit both A4 and Letter: Letter is wider, A4 taller. */
export const PAGE_MARGIN = { top: 62, bottom: 58, left: 54, right: 54 } as const;

/** Type scale in points, used by the PDF; the HTML stylesheet uses the same ratios in rem. */
export const TYPE = { body: 9.5, small: 7.5, caption: 8.5, h1: 17, h2: 12.5, eyebrow: 8, table: 8.5, chart: 8 } as const;

/** A headline value longer than this many characters (a list, a model name) is set at body size, not headline size. */
export const LONG_KEY_VALUE = 14;
