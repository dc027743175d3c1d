/**
 * Text for the PDF: what the embedded font can draw, in the order it is seen.
 *
 * - Characters the font lacks (CJK, emoji) become U+FFFD, so any label renders
 *   and none can break the font subsetter; invisible formatting characters
 *   (joiners, variation selectors, bidi controls) are dropped.
 * - Right-to-left runs (Hebrew, Arabic) are reversed into visual order, a
 *   simplification of the Unicode Bidirectional Algorithm (UAX #9) that is
 *   right for a run of one direction inside a left-to-right line; Arabic
 *   letters keep their isolated forms.
 * - Glyphs come straight from the font's character map, unshaped (no kerning,
 *   no ligatures), so widths are sums of advance widths and extracted text has
 *   one glyph per character.
 */
import type { Font } from "@pdf-lib/fontkit";

const REPLACEMENT = 0xfffd;

function isIgnorable(cp: number): boolean {
  return (cp >= 0x200b && cp <= 0x200f) || (cp >= 0x202a && cp <= 0x202e) || (cp >= 0x2060 && cp <= 0x206f) ||
    cp === 0xfeff || (cp >= 0xfe00 && cp <= 0xfe0f) || (cp >= 0xe0000 && cp <= 0xe0fff) || (cp >= 0x1f3fb && cp <= 0x1f3ff) ||
    cp === 0xad;
}

function isRightToLeft(cp: number): boolean {
  return (cp >= 0x0590 && cp <= 0x08ff) || (cp >= 0xfb1d && cp <= 0xfdff) || (cp >= 0xfe70 && cp <= 0xfefc) ||
    (cp >= 0x10800 && cp <= 0x10fff) || (cp >= 0x1e800 && cp <= 0x1efff);
}

function isStrongLeftToRight(cp: number): boolean {
  return (cp >= 0x41 && cp <= 0x5a) || (cp >= 0x61 && cp <= 0x7a) || (cp >= 0xc0 && cp <= 0x24f && cp !== 0xd7 && cp !== 0xf7) ||
    (cp >= 0x370 && cp <= 0x58f);
}

/** Reverses a right-to-left run; numbers inside it (European digits, UAX #9 class EN) keep their left-to-right order. */
function reverseRun(chars: string[]): string[] {
  const tokens: string[] = [];
  for (let i = 0; i < chars.length;) {
    if (/[0-9]/.test(chars[i]!)) {
      let j = i + 1;
      while (j < chars.length && (/[0-9]/.test(chars[j]!) || (/[.,:]/.test(chars[j]!) && /[0-9]/.test(chars[j + 1] ?? "")))) j++;
      tokens.push(chars.slice(i, j).join(""));
      i = j;
    } else tokens.push(chars[i++]!);
  }
  return tokens.reverse();
}

export class FontMetrics {
  private readonly widths = new Map<number, number>();
  private readonly present = new Map<number, boolean>();
  private readonly scale: number;

  constructor(readonly font: Font) {
    this.scale = 1 / font.unitsPerEm;
  }

  has(cp: number): boolean {
    let hit = this.present.get(cp);
    if (hit === undefined) {
      hit = this.font.hasGlyphForCodePoint(cp);
      this.present.set(cp, hit);
    }
    return hit;
  }

  /** Keeps what the font can draw, in logical order. */
  sanitize(text: string): string {
    let out = "";
    for (const ch of text.normalize("NFC")) {
      const cp = ch.codePointAt(0)!;
      if (cp === 0x09 || cp === 0x0a || cp === 0x0d) out += " ";
      else if (cp < 0x20 || (cp >= 0x7f && cp < 0xa0) || isIgnorable(cp)) continue;
      else if (this.has(cp)) out += ch;
      else out += String.fromCodePoint(this.has(REPLACEMENT) ? REPLACEMENT : 0x3f);
    }
    return out;
  }

  /** Width of sanitized text at a size, in points. */
  width(text: string, size: number): number {
    let units = 0;
    for (const ch of text) {
      const cp = ch.codePointAt(0)!;
      let w = this.widths.get(cp);
      if (w === undefined) {
        w = this.font.glyphForCodePoint(cp).advanceWidth;
        this.widths.set(cp, w);
      }
      units += w;
    }
    return units * this.scale * size;
  }
}

/** Reverses right-to-left runs (with the spaces and marks between their letters) into visual order. */
export function visualOrder(line: string): string {
  const chars = [...line];
  if (!chars.some((c) => isRightToLeft(c.codePointAt(0)!))) return line;
  const out: string[] = [];
  let i = 0;
  while (i < chars.length) {
    if (!isRightToLeft(chars[i]!.codePointAt(0)!)) {
      out.push(chars[i++]!);
      continue;
    }
    // A run extends over neutrals while another right-to-left letter follows before any strong left-to-right one.
    let end = i;
    let j = i;
    while (j < chars.length) {
      const cp = chars[j]!.codePointAt(0)!;
      if (isRightToLeft(cp)) end = j;
      else if (isStrongLeftToRight(cp)) break;
      j++;
    }
    out.push(...reverseRun(chars.slice(i, end + 1)));
    i = end + 1;
  }
  return out.join("");
}

/** Breaks sanitized text into lines no wider than maxWidth; words longer than a line break between characters. */
export function wrapText(metrics: FontMetrics, text: string, size: number, maxWidth: number): string[] {
  const lines: string[] = [];
  const space = metrics.width(" ", size);
  let line = "";
  let lineWidth = 0;
  for (const word of text.split(/ +/)) {
    if (word === "") continue;
    let w = metrics.width(word, size);
    let rest = word;
    if (line !== "" && lineWidth + space + w <= maxWidth) {
      line += ` ${rest}`;
      lineWidth += space + w;
      continue;
    }
    if (line !== "") lines.push(line);
    line = "";
    lineWidth = 0;
    while (w > maxWidth) {
      let piece = "";
      let pieceWidth = 0;
      const chars = [...rest];
      let k = 0;
      for (; k < chars.length; k++) {
        const cw = metrics.width(chars[k]!, size);
        if (pieceWidth + cw > maxWidth && piece !== "") break;
        piece += chars[k];
        pieceWidth += cw;
      }
      lines.push(piece);
      rest = chars.slice(k).join("");
      w = metrics.width(rest, size);
    }
    line = rest;
    lineWidth = w;
  }
  if (line !== "" || lines.length === 0) lines.push(line);
  return lines;
}
