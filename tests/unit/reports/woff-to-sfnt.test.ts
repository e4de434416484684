// WOFF 1 → sfnt: the unpacked font is the same font to fontkit (glyphs, names, layout) and reports
// rendered from it hold the same text and the same embedded fonts.
import fs from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { woffToSfnt } from "@/lib/reports/woff-to-sfnt";

const FILES = ["IBMPlexSans-Regular.woff", "IBMPlexSans-SemiBold.woff", "IBMPlexMono-Regular.woff"];

type Font = {
  numGlyphs: number;
  postscriptName: string;
  unitsPerEm: number;
  layout(text: string): { glyphs: { id: number; advanceWidth: number }[] };
};
// fontkit is pdfkit's font reader (no types of its own): the one that embeds the report's fonts.
const fontkit = createRequire(import.meta.url)("fontkit") as { create(bytes: Buffer): Font };
const open = (bytes: Buffer) => fontkit.create(bytes);

describe("woffToSfnt", () => {
  it.each(FILES)("unpacks %s into the same font", (file) => {
    const woff = fs.readFileSync(path.resolve("fonts", file));
    const sfnt = woffToSfnt(woff);
    // An sfnt starts with its flavour (0x00010000 for TrueType outlines, "OTTO" for CFF), not "wOFF".
    expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4));
    // WOFF's header records the size of the font it wraps (totalSfntSize).
    expect(sfnt.length).toBe(woff.readUInt32BE(16));
    const a = open(woff);
    const b = open(sfnt);
    expect(b.numGlyphs).toBe(a.numGlyphs);
    expect(b.postscriptName).toBe(a.postscriptName);
    expect(b.unitsPerEm).toBe(a.unitsPerEm);
    const text = "Na I 589.00 nm · λ ± Δ σ — Emberline 0123456789";
    const glyphs = (f: Font) => f.layout(text).glyphs.map((g) => [g.id, g.advanceWidth]);
    expect(glyphs(b)).toEqual(glyphs(a));
  });

  it("refuses bytes that are not WOFF 1", () => {
    expect(() =>
      woffToSfnt(Buffer.from("not a font at all, not even close to one..........")),
    ).toThrow(RangeError);
  });
});
