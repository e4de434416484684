// A doublet 1.35 FWHM apart sampled 2.5 times per FWHM (shaped like the Na D pair at 0.45 nm
// resolution and 0.18 nm per sample): where the grid falls so that no sample tops the fainter line,
// the peak finder cannot show it, and it must not be counted missing beside the stronger line's peak.
// The table is invented.
import { describe, expect, it } from "vitest";
import { analyzeSample } from "@/lib/spectrum/analysis";
import { synthesizeSpectrum } from "@/lib/spectrum/synthetic";
import { inventedLine } from "../../../support/invented-line";
import { linearCalibration } from "../../../support/linear-calibration";

const PIXELS = 2048;
const NM_PER_PX = 0.18;
const RESOLUTION_NM = 2.5 * NM_PER_PX;
const wavelengthOfPixel = (px: number) => 400 + NM_PER_PX * px;
const calibration = linearCalibration(PIXELS, wavelengthOfPixel);

// The stronger line 0.2 of a pixel past pixel 1000, the fainter 3.37 pixels further.
const STRONG_NM = wavelengthOfPixel(1000.2);
const FAINT_NM = wavelengthOfPixel(1003.57);
const table = [
  inventedLine("Xa I", STRONG_NM, { flame: 1000 }, { uncertaintyNm: 0.002 }),
  inventedLine("Xa I", FAINT_NM, { flame: 400 }, { uncertaintyNm: 0.002 }),
];

describe("a companion the samples cannot show", () => {
  it("is not counted missing beside the stronger line, on any of 10 noise draws", () => {
    for (let seed = 1; seed <= 10; seed++) {
      const sample = synthesizeSpectrum({
        pixelCount: PIXELS,
        wavelengthOfPixel,
        resolutionNm: RESOLUTION_NM,
        lines: [
          { wavelengthNm: STRONG_NM, amplitude: 19000 },
          { wavelengthNm: FAINT_NM, amplitude: 7000 },
        ],
        readNoiseCounts: 5,
        darkCounts: 100,
        seed,
      });
      const analysis = analyzeSample(sample.x, sample.y, table, {
        calibration,
        source: "flame",
        resolutionNm: RESOLUTION_NM,
      });
      const call = analysis.identification.calls.find((c) => c.species === "Xa I")!;
      expect(call.missingStrongCount, `seed ${seed}`).toBe(0);
      expect(call.verdict, `seed ${seed}`).toBe("present");
    }
  });
});
