// An uploaded file read as one instrument's spectrum: the file's own header first, then what the uploader
// states, then the instrument's export profile, then values that are exactly the detector's pixel
// indices; pixel axes stored counted from 0; the profile offered from a file that said what it holds.
import { describe, expect, it } from "vitest";
import {
  SpectrumParseError,
  detectorPixelOrigin,
  readInstrumentFile,
  type InstrumentExportFrame,
} from "@/lib/spectrum/io";
import type { ExportProfile } from "@/lib/spectrum/types";

const PIXELS = 64;
const bench = (exportProfile: ExportProfile | null = null): InstrumentExportFrame => ({
  name: "Bench B",
  pixels: PIXELS,
  nominalRangeNm: [400, 700],
  exportProfile,
});

/** Rows of x and counts; `cell` writes a number as the file would (decimal comma or point). */
function rows(xs: number[], separator: string, decimal: "." | "," = "."): string {
  const cell = (value: number) =>
    decimal === "," ? String(value).replace(".", ",") : String(value);
  return xs.map((x, i) => `${cell(x)}${separator}${cell(100 + ((i * 7) % 13) + 0.5)}`).join("\n");
}
const range = (from: number, count: number, step = 1) =>
  Array.from({ length: count }, (_, i) => Number((from + i * step).toFixed(6)));
const wavelengths = range(420.5, 200, 1.25);

function parseError(run: () => unknown): SpectrumParseError {
  try {
    run();
  } catch (error) {
    if (error instanceof SpectrumParseError) return error;
    throw error;
  }
  throw new Error("expected a SpectrumParseError");
}

describe("detectorPixelOrigin", () => {
  it("tells 0 or 1 only for exactly the detector's indices, in either direction", () => {
    expect(detectorPixelOrigin(range(0, PIXELS), PIXELS)).toBe(0);
    expect(detectorPixelOrigin(range(1, PIXELS), PIXELS)).toBe(1);
    expect(detectorPixelOrigin(range(1, PIXELS).reverse(), PIXELS)).toBe(1);
    expect(detectorPixelOrigin(range(0, PIXELS - 1), PIXELS)).toBeNull();
    expect(detectorPixelOrigin(range(2, PIXELS), PIXELS)).toBeNull();
    expect(detectorPixelOrigin(range(0, PIXELS, 2), PIXELS)).toBeNull();
    expect(detectorPixelOrigin([...range(0, PIXELS - 1), PIXELS], PIXELS)).toBeNull();
  });
});

describe("readInstrumentFile", () => {
  it("reads a headerless file through the profile, in every layout, with the profile's medium", () => {
    const profile: ExportProfile = { firstColumn: "nm", medium: "air" };
    const layouts: [string, "." | ","][] = [
      [",", "."],
      ["\t", "."],
      [";", ","],
      [";", "."],
      ["   ", "."],
      ["\t", ","],
      [" ", ","],
    ];
    for (const [separator, decimal] of layouts) {
      const reading = readInstrumentFile(rows(wavelengths, separator, decimal), bench(profile));
      const what = JSON.stringify([separator, decimal]);
      expect(reading.refusal, what).toBeNull();
      expect(reading.firstColumnFrom, what).toBe("profile");
      expect(reading.firstColumn, what).toBe("nm");
      expect(reading.spectrum.xUnit, what).toBe("nm");
      expect(reading.spectrum.medium, what).toBe("air");
      expect(Array.from(reading.spectrum.x), what).toEqual(wavelengths);
      expect(reading.spectrum.y[1], what).toBe(107.5);
      // An instrument with a profile is offered none.
      expect(reading.proposedProfile, what).toBeNull();
    }
  });

  it("reads a headerless column of exactly the detector's indices as pixels, stored counted from 0", () => {
    const fromZero = readInstrumentFile(rows(range(0, PIXELS), ","), bench());
    expect(fromZero).toMatchObject({
      firstColumn: "pixel-from-0",
      firstColumnFrom: "pixel-count",
      proposedProfile: null,
      refusal: null,
    });
    expect(Array.from(fromZero.spectrum.x)).toEqual(range(0, PIXELS));

    const fromOne = readInstrumentFile(rows(range(1, PIXELS), "\t"), bench());
    expect(fromOne.firstColumn).toBe("pixel-from-1");
    expect(fromOne.spectrum.xUnit).toBe("pixel");
    expect(Array.from(fromOne.spectrum.x)).toEqual(range(0, PIXELS));
    expect(fromOne.spectrum.meta.firstColumn).toBe("pixel-from-1");
  });

  it("refuses, never guesses, a headerless file that nothing decides", () => {
    // One index short of the detector: not its whole index, so not decided by the count.
    const error = parseError(() => readInstrumentFile(rows(range(0, PIXELS - 1), ","), bench()));
    expect(error.code).toBe("unit-unknown");
    expect(parseError(() => readInstrumentFile(rows(wavelengths, ";", ","), bench())).code).toBe(
      "unit-unknown",
    );
    // A header saying "wavelength" without a unit is not settled by a pixel profile.
    const pixelProfile = bench({ firstColumn: "pixel-from-0", medium: null });
    expect(
      parseError(() =>
        readInstrumentFile(`wavelength,counts\n${rows(wavelengths, ",")}`, pixelProfile),
      ).code,
    ).toBe("unit-unknown");
  });

  it("offers a profile from a header or a statement, not from the count or an existing profile", () => {
    const header = readInstrumentFile(
      `wavelength (nm, vacuum),counts\n${rows(wavelengths, ",")}`,
      bench(),
    );
    expect(header.firstColumnFrom).toBe("file");
    expect(header.proposedProfile).toEqual({ firstColumn: "nm", medium: "vacuum" });

    const stated = readInstrumentFile(rows(wavelengths, ","), bench(), {
      firstColumn: "nm",
      medium: "air",
    });
    expect(stated.firstColumnFrom).toBe("stated");
    expect(stated.proposedProfile).toEqual({ firstColumn: "nm", medium: "air" });

    const pixelHeader = readInstrumentFile(`pixel,counts\n${rows(range(1, PIXELS), ",")}`, bench());
    expect(pixelHeader.proposedProfile).toEqual({ firstColumn: "pixel-from-1", medium: null });

    const statedOnProfile = readInstrumentFile(
      rows(wavelengths, ","),
      bench({ firstColumn: "angstrom", medium: null }),
      { firstColumn: "nm" },
    );
    expect(statedOnProfile.spectrum.xUnit).toBe("nm");
    expect(statedOnProfile.proposedProfile).toBeNull();

    // Pixels whose counting nothing tells are stored as numbered and propose nothing.
    const cropped = readInstrumentFile(`pixel,counts\n${rows(range(10, 30), ",")}`, bench());
    expect(cropped.firstColumn).toBeNull();
    expect(cropped.proposedProfile).toBeNull();
    expect(cropped.spectrum.x[0]).toBe(10);

    // Micrometres are read as nm, but a headerless file of this instrument would not be in nm.
    const microns = readInstrumentFile(
      `wavelength (µm),counts\n${rows(
        wavelengths.map((nm) => nm / 1000),
        ",",
      )}`,
      bench(),
    );
    expect(microns.spectrum.xUnit).toBe("nm");
    expect(microns.proposedProfile).toBeNull();
  });

  it("takes the profile's medium only for the profile's own unit when the file does not say", () => {
    const profile = bench({ firstColumn: "nm", medium: "vacuum" });
    expect(
      readInstrumentFile(`wavelength (nm),counts\n${rows(wavelengths, ",")}`, profile).spectrum
        .medium,
    ).toBe("vacuum");
    expect(
      readInstrumentFile(`wavelength (nm, air),counts\n${rows(wavelengths, ",")}`, profile).spectrum
        .medium,
    ).toBe("air");
    expect(
      readInstrumentFile(
        `wavelength (Å),counts\n${rows(
          wavelengths.map((nm) => nm * 10),
          ",",
        )}`,
        profile,
      ).spectrum.medium,
    ).toBeUndefined();
  });

  it("counts a cropped pixel file as the profile says, and stores it counted from 0", () => {
    const reading = readInstrumentFile(
      rows(range(5, 40), " "),
      bench({ firstColumn: "pixel-from-1", medium: null }),
    );
    expect(reading.firstColumn).toBe("pixel-from-1");
    expect(reading.spectrum.x[0]).toBe(4);
    expect(reading.spectrum.x[39]).toBe(43);
  });

  it("lets the detector's whole index outrank the profile's counting, and says so", () => {
    const reading = readInstrumentFile(
      rows(range(0, PIXELS), ","),
      bench({ firstColumn: "pixel-from-1", medium: null }),
    );
    expect(reading.refusal).toBeNull();
    expect(reading.firstColumn).toBe("pixel-from-0");
    expect(reading.warnings).toEqual([
      "This file counts its pixels from 0, though Bench B's export profile says its files count from 1; it is read counting from 0.",
    ]);
  });

  it("refuses a stated or profiled counting the values contradict, naming the counting that fits", () => {
    const stated = readInstrumentFile(rows(range(0, PIXELS), ","), bench(), {
      firstColumn: "pixel-from-1",
    });
    expect(stated.refusal).toEqual({
      message:
        "This file's first column runs over pixels 0 to 63. Counted from 1, as stated for this upload, that goes " +
        "past the ends of Bench B's 64 pixels (1 to 64); counted from 0 it fits.",
      otherCounting: "pixel-from-0",
    });
    expect(stated.proposedProfile).toBeNull();

    const profiled = readInstrumentFile(
      rows(range(30, PIXELS - 29), ","),
      bench({ firstColumn: "pixel-from-0", medium: null }),
    );
    expect(profiled.refusal?.otherCounting).toBe("pixel-from-1");
    expect(profiled.refusal?.message).toMatch(/as Bench B's export profile says/);

    // Beyond the detector under either counting: the plain refusal, no counting to suggest.
    const beyond = readInstrumentFile(rows(range(0, 2 * PIXELS), ","), bench(), {
      firstColumn: "pixel-from-0",
    });
    expect(beyond.refusal?.otherCounting).toBeNull();
    expect(beyond.refusal?.message).toMatch(/recorded on another detector/);
  });

  it("warns when a wavelength profile reads a column that is exactly the detector's indices", () => {
    const reading = readInstrumentFile(
      rows(range(0, PIXELS), ","),
      bench({ firstColumn: "nm", medium: "air" }),
    );
    expect(reading.spectrum.xUnit).toBe("nm");
    expect(reading.warnings[0]).toBe(
      "This file's first column is the integers 0 to 63, as Bench B's pixel indices would be, but its export " +
        "profile reads it as wavelengths in nm: check the profile, or say what this file holds.",
    );
  });

  it("refuses a statement the header contradicts, saying which", () => {
    const error = parseError(() =>
      readInstrumentFile(`pixel,counts\n${rows(range(0, PIXELS), ",")}`, bench(), {
        firstColumn: "nm",
      }),
    );
    expect(error.code).toBe("unit-conflict");
    expect(error.stated).toBe("xUnit");
  });
});
