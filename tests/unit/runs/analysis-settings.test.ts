// A run's settings are shown with their values, and a blank one with the default the core used.
import { describe, expect, it } from "vitest";
import { analysisSettingRows, SETTING_PLACEHOLDERS } from "@/components/runs/analysis-settings";
import { analyzeSample, makeRandom } from "@/lib/spectrum";
import { SAMPLE_ANALYSIS_DEFAULTS } from "@/lib/spectrum/analysis/sample-analysis-defaults";

describe("analysisSettingRows", () => {
  it("names the defaults a run left blank", () => {
    expect(analysisSettingRows({})).toEqual([
      { label: "Detection threshold (min SNR, minSnr)", value: "5 (default)", isDefault: true },
      { label: "Match window (k·σ, k)", value: "3 (default)", isDefault: true },
      {
        label: "Temperature for intensities (temperatureK)",
        value: "none: the table's relative intensities (default)",
        isDefault: true,
      },
    ]);
    expect(SETTING_PLACEHOLDERS.minSnr).toBe("5 (default)");
  });

  it("shows a chosen value as it is, with its unit", () => {
    const rows = analysisSettingRows({ minSnr: 8, temperatureK: 2500 });
    expect(rows.map((r) => [r.value, r.isDefault])).toEqual([
      ["8", false],
      ["3 (default)", true],
      ["2500 K", false],
    ]);
  });

  it("states the defaults the core really uses: a blank minSnr reports what minSnr 5 reports", () => {
    const random = makeRandom(5);
    const x = Float64Array.from({ length: 400 }, (_, i) => 500 + i * 0.25);
    const y = Float64Array.from(x, (nm) => {
      const line = (centre: number, height: number) =>
        height * Math.exp(-0.5 * ((nm - centre) / 0.4) ** 2);
      // Lines at SNR ≈ 3, 5.5 and 40 over unit noise: the default threshold keeps the two upper.
      return 100 + line(540, 3) + line(560, 5.5) + line(580, 40) + random.normal();
    });
    const blank = analyzeSample(x, y, []);
    const explicit = analyzeSample(x, y, [], { ...SAMPLE_ANALYSIS_DEFAULTS });
    expect(blank.peaks.map((p) => p.wavelengthNm)).toEqual(
      explicit.peaks.map((p) => p.wavelengthNm),
    );
    const stricter = analyzeSample(x, y, [], { minSnr: 20 });
    expect(stricter.peaks.length).toBeLessThan(blank.peaks.length);
  });
});
