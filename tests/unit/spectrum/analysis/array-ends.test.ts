// A line whose centre lies within one instrument width of the array's end has part of its profile off
// the detector and no top a peak finder can take: it is not counted missing, and a species whose
// strong line sits there keeps the call its other lines earn. The table is invented.
import { describe, expect, it } from "vitest";
import { analyzeSample } from "@/lib/spectrum/analysis";
import { synthesizeSpectrum } from "@/lib/spectrum/synthetic";
import { inventedLine } from "../../../support/invented-line";
import { linearCalibration } from "../../../support/linear-calibration";

const PIXELS = 2048;
const RESOLUTION_NM = 0.6;
/** A linear grating over 400–700 nm, 0.147 nm per pixel: a line is 4.1 pixels wide. */
const wavelengthOfPixel = (px: number) => 400 + (300 * px) / (PIXELS - 1);
const calibration = linearCalibration(PIXELS, wavelengthOfPixel);

const line = (airNm: number, flame: number) =>
  inventedLine("Xa I", airNm, { flame }, { ionStage: 1, uncertaintyNm: 0.002 });
// Its strongest line 0.02 nm inside the red end, on the last pixel, two more well inside.
const table = [line(699.98, 1000), line(520, 500), line(610, 400)];

const sample = synthesizeSpectrum({
  pixelCount: PIXELS,
  wavelengthOfPixel,
  resolutionNm: RESOLUTION_NM,
  lines: [
    { wavelengthNm: 699.98, amplitude: 8000 },
    { wavelengthNm: 520, amplitude: 4000 },
    { wavelengthNm: 610, amplitude: 3200 },
  ],
  readNoiseCounts: 5,
  darkCounts: 100,
  seed: 11,
});

describe("lines at the array's ends", () => {
  const analysis = analyzeSample(sample.x, sample.y, table, {
    calibration,
    source: "flame",
    resolutionNm: RESOLUTION_NM,
  });
  const call = analysis.identification.calls.find((c) => c.species === "Xa I")!;

  it("does not count a line on the last pixel as missing", () => {
    expect(analysis.rangeNm[1]).toBeCloseTo(700, 6);
    expect(call.missing.map((m) => m.referenceNm)).not.toContain(699.98);
    expect(call.missingStrongCount).toBe(0);
  });

  it("calls the species on the lines a peak can show", () => {
    expect(call.seen.map((s) => s.referenceNm).sort()).toEqual([520, 610]);
    expect(call.verdict).toBe("present");
  });
});
