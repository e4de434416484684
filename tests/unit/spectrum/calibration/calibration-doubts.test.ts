// When a calibration is doubtful: too few pairs, too little of the array covered, an end resting on one or
// two isolated pairs, or an automatic pairing of low confidence. Fits are made by the core from pairs laid
// on a known straight grating (0.25 nm per pixel from 400 nm over 2048 pixels).
import { describe, expect, it } from "vitest";
import { calibrationDoubts, fitCalibration } from "@/lib/spectrum/calibration";

const DOMAIN: [number, number] = [0, 2047];
const wavelengthOf = (pixel: number) => 400 + 0.25 * pixel;
const fitAt = (pixels: number[]) =>
  fitCalibration(
    pixels.map((x) => ({ x, wavelengthNm: wavelengthOf(x), xUncertainty: 0.05 })),
    { model: "polynomial", degree: 1, domain: DOMAIN },
  );
const spread = (n: number, from: number, to: number) =>
  Array.from({ length: n }, (_, i) => from + ((to - from) * i) / (n - 1));

describe("calibrationDoubts", () => {
  it("has no doubt about 9 evenly spread pairs over 90 % of the array with a confident pairing", () => {
    expect(calibrationDoubts(fitAt(spread(9, 100, 1940)), { automaticConfidence: 0.9 })).toEqual(
      [],
    );
  });

  it("doubts fewer than 6 pairs (the automatic pairing's own minimum), and not 6", () => {
    const five = calibrationDoubts(fitAt(spread(5, 100, 1940)));
    expect(five).toHaveLength(1);
    expect(five[0]).toMatch(/Only 5 pairs are used/);
    expect(calibrationDoubts(fitAt(spread(6, 100, 1940)))).toEqual([]);
  });

  it("doubts pairs that cover under 60 % of the array, and says how much they cover", () => {
    // 41 % of the 2047-pixel span.
    const doubts = calibrationDoubts(fitAt(spread(9, 600, 600 + 0.41 * 2047 + 1)));
    expect(doubts).toEqual([
      "The pairs cover 41 % of the array; wavelengths outside are extrapolated.",
    ]);
    // 61 %: no doubt.
    expect(calibrationDoubts(fitAt(spread(9, 400, 400 + 0.61 * 2047)))).toEqual([]);
  });

  it("never prints 60 % for a share just under the threshold", () => {
    const doubts = calibrationDoubts(fitAt(spread(9, 400, 400 + 0.598 * 2047)));
    expect(doubts).toHaveLength(1);
    expect(doubts[0]).toMatch(/cover 59 %/);
  });

  it("doubts one short-wavelength pair beyond a gap of over 30 % of the covered span", () => {
    // Eight pairs from 900 to 1900 px, one at 100 px: the gap is 800 of 1800 px (44 %).
    const doubts = calibrationDoubts(fitAt([100, ...spread(8, 900, 1900)]));
    expect(doubts).toHaveLength(1);
    expect(doubts[0]).toMatch(
      /^The short-wavelength end rests on 1 pair \(425\.0 nm\) beyond a gap of 200\.0 nm/,
    );
    expect(doubts[0]).toMatch(/44 % of the covered 425\.0–875\.0 nm/);
  });

  it("doubts two long-wavelength pairs beyond a wide gap, and not a gap of 30 % or less", () => {
    const two = calibrationDoubts(fitAt([...spread(7, 100, 1000), 1700, 1900]));
    expect(two).toHaveLength(1);
    expect(two[0]).toMatch(/^The long-wavelength end rests on 2 pairs \(825\.0 and 875\.0 nm\)/);
    // The widest gap is 500 of 1800 px (28 %).
    expect(calibrationDoubts(fitAt([...spread(7, 100, 1000), 1500, 1900]))).toEqual([]);
  });

  it("doubts a low automatic confidence only when the pairing was automatic", () => {
    const fit = fitAt(spread(9, 100, 1940));
    expect(calibrationDoubts(fit, { automaticConfidence: 0.42 })).toEqual([
      "The automatic pairing's confidence is 0.42, under 0.5: some peaks may be paired with the wrong lines.",
    ]);
    expect(calibrationDoubts(fit, { automaticConfidence: 0.5 })).toEqual([]);
    expect(calibrationDoubts(fit)).toEqual([]);
  });

  it("counts only the pairs the fit used, and lists every doubt at once", () => {
    const fit = fitAt(spread(5, 600, 1000));
    const withRejected = {
      ...fit,
      pairs: [
        ...fit.pairs,
        { ...fit.pairs[0], x: 2000, wavelengthNm: wavelengthOf(2000), used: false },
      ],
    };
    const doubts = calibrationDoubts(withRejected, { automaticConfidence: 0.2 });
    expect(doubts.map((d) => d.slice(0, 20))).toEqual([
      "Only 5 pairs are use",
      "The pairs cover 19 %",
      "The automatic pairin",
    ]);
  });

  it("refuses thresholds outside their range", () => {
    const fit = fitAt(spread(9, 100, 1940));
    expect(() => calibrationDoubts(fit, { minCoveredFraction: 1.5 })).toThrow(RangeError);
    expect(() => calibrationDoubts(fit, { minPairs: 0 })).toThrow(RangeError);
    expect(() => calibrationDoubts(fit, { automaticConfidence: Number.NaN })).toThrow(RangeError);
  });
});
