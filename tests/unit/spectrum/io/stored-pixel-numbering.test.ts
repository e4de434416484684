// A calibration's lamp and a sample must count pixels alike: an older upload counted from 1 against
// one stored from 0 (its counting known) is one pixel off; anything else is left as it always was.
import { describe, expect, it } from "vitest";
import {
  pixelNumberingDiffers,
  storedPixelNumbering,
} from "@/lib/spectrum/io/stored-pixel-numbering";

const known = { xUnit: "pixel", firstColumn: "pixel-from-1", minX: 0 };
const olderFrom1 = { xUnit: "pixel", firstColumn: null, minX: 1 };
const olderFrom0 = { xUnit: "pixel", firstColumn: null, minX: 0 };
const olderCropped = { xUnit: "pixel", firstColumn: null, minX: 212 };

describe("stored pixel numbering", () => {
  it("tells known, older-from-1 and other older axes apart", () => {
    expect(storedPixelNumbering(known)).toBe("known");
    expect(storedPixelNumbering(olderFrom1)).toBe("file-from-1");
    expect(storedPixelNumbering(olderFrom0)).toBe("file");
    expect(storedPixelNumbering(olderCropped)).toBe("file");
    expect(storedPixelNumbering({ xUnit: "nm", firstColumn: null, minX: 1 })).toBe("file");
  });

  it("flags only a known axis against an older one counted from 1, either way round", () => {
    expect(pixelNumberingDiffers(olderFrom1, known)).toBe(true);
    expect(pixelNumberingDiffers(known, olderFrom1)).toBe(true);
    expect(pixelNumberingDiffers(known, known)).toBe(false);
    expect(pixelNumberingDiffers(olderFrom1, olderFrom1)).toBe(false);
    expect(pixelNumberingDiffers(olderFrom0, known)).toBe(false);
    expect(pixelNumberingDiffers(olderCropped, known)).toBe(false);
  });
});
