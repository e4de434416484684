// A spectrum's first column against the instrument it is uploaded to: pixels must lie on its detector
// (from 0 or from 1), a wavelength axis mostly outside its nominal range is said before storing.
import { describe, expect, it } from "vitest";
import { spectrumFitToInstrument } from "@/lib/spectrum/io";

const bench = { name: "Bench A", pixels: 2048, nominalRangeNm: [400, 700] as [number, number] };
const axis = (from: number, to: number, n = 100) =>
  Float64Array.from({ length: n }, (_, i) => from + ((to - from) * i) / (n - 1));

describe("spectrumFitToInstrument", () => {
  it("takes pixels 0 to 2047 or 1 to 2048 and refuses pixels the detector does not have", () => {
    expect(spectrumFitToInstrument(axis(0, 2047), "pixel", bench)).toEqual({
      refusal: null,
      warnings: [],
    });
    expect(spectrumFitToInstrument(axis(1, 2048), "pixel", bench).refusal).toBeNull();
    const longer = spectrumFitToInstrument(axis(0, 4095), "pixel", bench);
    expect(longer.refusal).toBe(
      "This file's first column runs over pixels 0 to 4095, but Bench A has 2,048 pixels (0 to 2047): it was " +
        "recorded on another detector or with other binning. Upload it to the instrument it was recorded on.",
    );
    expect(spectrumFitToInstrument(axis(-3, 2000), "pixel", bench).refusal).toMatch(
      /pixels -3 to 2000/,
    );
  });

  it("holds a pixel axis to one counting when it is known", () => {
    expect(
      spectrumFitToInstrument(axis(1, 2048), "pixel", bench, { pixelOrigin: 1 }).refusal,
    ).toBeNull();
    expect(
      spectrumFitToInstrument(axis(0, 2047), "pixel", bench, { pixelOrigin: 0 }).refusal,
    ).toBeNull();
    // 1 to 2048 counted from 0 ends one pixel past the detector.
    expect(spectrumFitToInstrument(axis(1, 2048), "pixel", bench, { pixelOrigin: 0 }).refusal).toBe(
      "This file's first column runs over pixels 1 to 2048, but Bench A has 2,048 pixels (0 to 2047, counted " +
        "from 0): it was recorded on another detector or with other binning. Upload it to the instrument it was recorded on.",
    );
    expect(
      spectrumFitToInstrument(axis(0, 2047), "pixel", bench, { pixelOrigin: 1 }).refusal,
    ).toMatch(/\(1 to 2048, counted from 1\)/);
  });

  it("says when a wavelength file lies mostly outside the nominal range, in nm whatever its unit", () => {
    expect(spectrumFitToInstrument(axis(420, 680), "nm", bench).warnings).toEqual([]);
    // 650–950 nm: 50 of 300 nm inside.
    const red = spectrumFitToInstrument(axis(650, 950), "nm", bench);
    expect(red.refusal).toBeNull();
    expect(red.warnings).toEqual([
      "This file covers 650 to 950 nm, and only 17 % of it lies in Bench A's nominal range (400 to 700 nm): check that it was recorded on this instrument.",
    ]);
    // The same in ångström (10 Å = 1 nm) and in wavenumbers (10⁷/λ cm⁻¹).
    expect(spectrumFitToInstrument(axis(6500, 9500), "angstrom", bench).warnings).toEqual(
      red.warnings,
    );
    expect(
      spectrumFitToInstrument(axis(1e7 / 950, 1e7 / 650), "wavenumber", bench).warnings[0],
    ).toMatch(/only 17 %/);
  });
});
