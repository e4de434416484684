// One wording of a detection limit for the page, the report, the PDF and the CSV.
import { describe, it, expect } from "vitest";
import { detectionLimitText } from "@/lib/reports/detection-limit-text";

describe("detectionLimitText", () => {
  it("words a limit in counts, as a share of the strongest peak, at its line", () => {
    expect(
      detectionLimitText({
        lineNm: 422.673,
        principal: true,
        noiseCounts: 30.4,
        counts: 152,
        relativeToStrongest: 0.0123,
      }),
    ).toBe("< 152 counts (1.2 % of the strongest peak) at 422.67 nm");
    expect(
      detectionLimitText({
        lineNm: 650,
        principal: false,
        noiseCounts: 1.2,
        counts: 6,
        relativeToStrongest: null,
      }),
    ).toBe("< 6.0 counts at 650.00 nm, the strongest line in range");
    expect(
      detectionLimitText({
        lineNm: 600,
        principal: true,
        noiseCounts: 300,
        counts: 1500,
        relativeToStrongest: 0.25,
      }),
    ).toBe("< 1500 counts (25 % of the strongest peak) at 600.00 nm");
  });

  it("says — where there is none", () => {
    expect(detectionLimitText(null)).toBe("—");
    expect(detectionLimitText(undefined)).toBe("—");
  });
});
