// The run's spectrum as JCAMP-DX: read back through the app's own parser to the same points, in nm,
// with the medium stated and the run, calibration and release named in ##$ labels.
import { describe, expect, it } from "vitest";
import { formatRunSpectrumJdx, type RunSpectrumJdxInput } from "@/lib/reports/spectrum-jdx";
import { parseSpectrumFile } from "@/lib/spectrum/io";

function input(
  wavelengthNm: Float64Array,
  counts: Float64Array,
  medium: RunSpectrumJdxInput["medium"] = "air",
): RunSpectrumJdxInput {
  return {
    wavelengthNm,
    counts,
    medium,
    runId: "0f3c9a12-4b5d-4e6f-8a7b-1c2d3e4f5a6b",
    versionNumber: 2,
    calibrationId: "33333333-4444-4555-8666-777777777777",
    releaseId: "44444444-5555-4666-8777-888888888888",
    releaseNumber: 3,
    sampleSha256: "ab".repeat(32),
    sampleFileName: "flame.csv",
    softwareVersion: "0.1.0",
    origin: "Flame Screening",
    analysedAt: "2026-03-01T10:15:00.000Z",
  };
}

describe("formatRunSpectrumJdx", () => {
  it("writes an uneven calibrated axis that reads back to exactly the same points", () => {
    const n = 500;
    // A cubic pixel-to-nm mapping, as a grating calibration gives: unevenly spaced wavelengths.
    const x = Float64Array.from(
      { length: n },
      (_, i) => 400 + 0.2 * i + 1e-5 * i * i - 3e-9 * i * i * i,
    );
    const y = Float64Array.from(
      { length: n },
      (_, i) => 100 + 5000 * Math.exp(-(((i - 250) / 3) ** 2)) + (i % 7) * 0.25,
    );
    const text = formatRunSpectrumJdx(input(x, y));
    const back = parseSpectrumFile(text);
    expect(back.xUnit).toBe("nm");
    expect(back.medium).toBe("air");
    expect(Array.from(back.x)).toEqual(Array.from(x));
    expect(Array.from(back.y)).toEqual(Array.from(y));
    expect(text).toContain("##XUNITS=NANOMETERS");
    expect(text).toContain("##$MEDIUM=AIR");
    expect(text).not.toContain("WAVELENGTH MEDIUM");
    expect(text).toContain("##$EMBERLINE RUN ID=0f3c9a12-4b5d-4e6f-8a7b-1c2d3e4f5a6b");
    expect(text).toContain("##$EMBERLINE CALIBRATION ID=33333333-4444-4555-8666-777777777777");
    expect(text).toContain("##$EMBERLINE LINE RELEASE ID=44444444-5555-4666-8777-888888888888");
    expect(text).toMatch(/^##TITLE=Emberline run 0f3c9a12 v2: .* \(air wavelengths\)$/m);
    expect(text).toContain("##DATE=26/03/01\n");
    expect(text.split("\n").every((line) => line.length <= 80)).toBe(true);
  });

  it("writes an even axis of integer counts that reads back within the writer's 1e-9 of a step", () => {
    const n = 1000;
    const x = Float64Array.from({ length: n }, (_, i) => 350 + 0.5 * i);
    const y = Float64Array.from({ length: n }, (_, i) => (i * 37) % 4096);
    const back = parseSpectrumFile(formatRunSpectrumJdx(input(x, y, null)));
    expect(back.x.length).toBe(n);
    for (let i = 0; i < n; i++) {
      expect(Math.abs(back.x[i] - x[i])).toBeLessThanOrEqual(0.5 * 1e-9);
      expect(back.y[i]).toBe(y[i]);
    }
    expect(back.medium).toBeUndefined();
  });

  it("says so when the medium is not known", () => {
    const text = formatRunSpectrumJdx(
      input(Float64Array.of(500, 501, 503), Float64Array.of(1, 2, 3), null),
    );
    expect(text).toContain("##$MEDIUM=NOT STATED");
    expect(text.match(/MEDIUM=/g)).toHaveLength(1);
  });
});
