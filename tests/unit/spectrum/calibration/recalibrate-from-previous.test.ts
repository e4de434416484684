// Recalibration from the instrument's previous calibration: today's axis is yesterday's moved by a
// small shift and stretch. It must find that drift among many unlisted peaks, say so, refuse a lamp
// whose lines repeat so evenly that another drift explains it as well, and give up (for the caller's
// fresh fit) when the previous calibration cannot describe today's array.
import { describe, expect, it } from "vitest";
import {
  autoPairLampPeaks,
  evaluateCalibration,
  fitCalibration,
  type CalibrationModel,
  type LampLine,
  type LampPeak,
} from "@/lib/spectrum/calibration";
import { pairingContext } from "@/lib/spectrum/calibration/lamp-pairing-setup";
import { recalibrateFromPrevious } from "@/lib/spectrum/calibration/recalibrate-from-previous";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import { HG_NE_AR_LINES } from "./lamp-lines";
import { gaussian } from "./synthetic-lamp";

const domain: [number, number] = [0, 2047];
/** Yesterday's axis: a curved grating, 400–656 nm. */
const yesterdayNm = (u: number) => 400 + 0.1 * u + 1e-5 * u * u;
/** Yesterday's pixel of a wavelength (the quadratic solved). */
const yesterdayPx = (nm: number) => (-0.1 + Math.sqrt(0.01 + 4e-5 * (nm - 400))) / 2e-5;

function previousOf(nmAt: (u: number) => number): CalibrationModel {
  const pairs = Array.from({ length: 21 }, (_, i) => ({
    x: (2047 * i) / 20,
    wavelengthNm: nmAt((2047 * i) / 20),
  }));
  return fitCalibration(pairs, { model: "polynomial", degree: 3, domain, rejectOutliers: false })
    .model;
}

/** Peaks of `lines` where `todayPx` puts them (some missing), among unlisted peaks. */
function lampPeaks(
  lines: LampLine[],
  todayPx: (nm: number) => number,
  seed: number,
  unlisted = 60,
): LampPeak[] {
  const random = makeRandom(seed).uniform;
  const peaks: LampPeak[] = [];
  for (const line of lines) {
    const x = todayPx(line.wavelengthNm);
    if (!(x >= 0 && x <= 2047) || random() < 0.2) continue;
    peaks.push({
      x: x + 0.03 * gaussian(random),
      xUncertainty: 0.03,
      height: line.intensity,
      fwhm: 4,
    });
  }
  for (let k = 0; k < unlisted; k++) {
    peaks.push({ x: 2047 * random(), xUncertainty: 0.05, height: 50 * random(), fwhm: 4 });
  }
  return peaks;
}

const options = {
  nominalRangeNm: [400, 656] as [number, number],
  dispersion: "grating" as const,
  resolutionNm: 0.5,
  domain,
};

describe("recalibration from the previous calibration", () => {
  it("finds a day's shift and stretch among many unlisted peaks and says it recalibrated", () => {
    const previous = previousOf(yesterdayNm);
    // Today a ray lands at x = 1.0017·u − 11.3 (−0.55 % of the array, a temperature change).
    const todayPx = (nm: number) => 1.0017 * yesterdayPx(nm) - 11.3;
    const peaks = lampPeaks(HG_NE_AR_LINES, todayPx, 3);
    const result = autoPairLampPeaks(peaks, HG_NE_AR_LINES, { ...options, previous });
    expect(result.status).toBe("paired");
    expect(result.message).toMatch(/^recalibrated from the previous calibration/);
    expect(result.pairs.length).toBeGreaterThanOrEqual(10);
    // Every pair is a line's own peak: within 0.2 px of where today's axis puts the line.
    for (const pair of result.pairs)
      expect(Math.abs(pair.x - todayPx(pair.wavelengthNm))).toBeLessThan(0.2);
    const xs = Float64Array.from([50, 500, 1000, 1500, 2000]);
    const calibrated = evaluateCalibration(result.model!.model, xs);
    xs.forEach((x, i) =>
      expect(Math.abs(calibrated[i] - yesterdayNm((x + 11.3) / 1.0017))).toBeLessThan(0.005),
    );
  });

  it("pairs no lamp line with a peak many line widths wide (continuum structure)", () => {
    const previous = previousOf(yesterdayNm);
    const todayPx = (nm: number) => 1.0017 * yesterdayPx(nm) - 11.3;
    const peaks = lampPeaks(HG_NE_AR_LINES, todayPx, 3);
    // Humps 40 px wide (ten line widths) right where some of today's lines fall, their own peaks gone.
    const humped = HG_NE_AR_LINES.filter((_, i) => i % 4 === 0).map((line) =>
      todayPx(line.wavelengthNm),
    );
    const withHumps = peaks
      .filter((p) => !humped.some((x) => Math.abs(p.x - x) < 1))
      .concat(
        humped
          .filter((x) => x > 0 && x < 2047)
          .map((x) => ({ x, xUncertainty: 3, height: 300, fwhm: 40 })),
      );
    const result = autoPairLampPeaks(withHumps, HG_NE_AR_LINES, { ...options, previous });
    expect(result.status).toBe("paired");
    for (const pair of result.pairs)
      expect(humped.some((x) => Math.abs(pair.x - x) < 1e-9)).toBe(false);
  });

  it("claims only the part of the array its lines fix well enough when they stand in part of it", () => {
    const previous = previousOf(yesterdayNm);
    const todayPx = (nm: number) => 0.999 * yesterdayPx(nm) + 2.2;
    // A lamp whose table lines all land in the last 45 % of the array today (neon's red lines).
    const redLines = HG_NE_AR_LINES.filter((line) => todayPx(line.wavelengthNm) > 1120);
    const peaks = lampPeaks(redLines, todayPx, 11);
    const result = autoPairLampPeaks(peaks, redLines, { ...options, previous });
    expect(result.status).toBe("paired");
    const model = result.model!.model;
    // Covered: where the lines are and a little beyond, not the blue end of the array.
    expect(model.coveredX[0]).toBeLessThanOrEqual(Math.min(...result.pairs.map((p) => p.x)));
    expect(model.coveredX[1]).toBeGreaterThanOrEqual(Math.max(...result.pairs.map((p) => p.x)));
    expect(model.coveredX[0]).toBeGreaterThan(500);
    const xs = Float64Array.from(
      { length: 9 },
      (_, i) => model.coveredX[0] + ((model.coveredX[1] - model.coveredX[0]) * i) / 8,
    );
    const calibrated = evaluateCalibration(model, xs);
    // Within a tenth of the 0.5 nm FWHM everywhere it claims.
    xs.forEach((x, i) =>
      expect(Math.abs(calibrated[i] - yesterdayNm((x - 2.2) / 0.999))).toBeLessThan(0.05),
    );
  });

  it("counts a strong line as seen where its top stands off the drift, but not where it has no peak", () => {
    const previous = previousOf(yesterdayNm);
    const todayPx = (nm: number) => 1.0017 * yesterdayPx(nm) - 11.3;
    const onArray = HG_NE_AR_LINES.filter((l) => {
      const x = todayPx(l.wavelengthNm);
      return x >= 0 && x <= 2047;
    });
    const strongest = new Set(
      onArray
        .slice()
        .sort((a, b) => b.intensity - a.intensity)
        .slice(0, 10)
        .map((l) => l.wavelengthNm),
    );
    const peaks = lampPeaks(HG_NE_AR_LINES, todayPx, 3);
    const isStrong = (p: LampPeak) =>
      [...strongest].some((nm) => Math.abs(p.x - todayPx(nm)) < 0.5);
    // Saturated tops 1 px off their lines (a pair must sit within 0.15 tolerance, 0.4 px here; a
    // line counts as seen within 1.5 tolerances): still the lamp's strongest lines.
    const offTops = peaks.map((p) => (isStrong(p) ? { ...p, x: p.x + 1 } : p));
    const judged = (lampPeaksToday: LampPeak[]) =>
      recalibrateFromPrevious(pairingContext(lampPeaksToday, HG_NE_AR_LINES, options), previous)!;
    const seen = judged(offTops);
    expect(seen.checks!.find((c) => c.name === "expected-lines")!.passed).toBe(true);
    expect(seen.status).toBe("paired");
    for (const pair of seen.pairs) expect(strongest.has(pair.wavelengthNm)).toBe(false);
    // Without their peaks the lamp does not show what the calibration puts on the array.
    const unseen = judged(peaks.filter((p) => !isStrong(p)));
    const expected = unseen.checks!.find((c) => c.name === "expected-lines")!;
    expect(expected.passed).toBe(false);
    expect(expected.reason).toMatch(/^only 0 of the 10 strongest lamp lines found a peak/);
  });

  /** A comb: a line every `stepNm` from 405 nm, all equally strong. */
  const comb = (stepNm: number, count: number): LampLine[] =>
    Array.from({ length: count }, (_, i) => ({
      wavelengthNm: 405 + stepNm * i,
      intensity: 100,
      species: "Ne I",
      id: `comb-${i}`,
    }));
  const straight = (u: number) => 400 + 0.1 * u;

  it("does not trust a lamp whose lines repeat so evenly that another day's drift fits as well", () => {
    // A line every 1.2 nm (12 px): the drift one period away is as small as a day's (up to 1 % of the
    // array, 20 px), so nothing tells the two apart.
    const lines = comb(1.2, 100);
    const peaks = lampPeaks(lines, (nm) => 10 * (nm - 400) + 1.5, 5, 0);
    const context = pairingContext(peaks, lines, { ...options, nominalRangeNm: [400, 600] });
    const result = recalibrateFromPrevious(context, previousOf(straight));
    expect(result).not.toBeNull();
    expect(result!.status).toBe("check");
    expect(result!.checks?.find((c) => c.name === "rival-pairing")?.passed).toBe(false);
    expect(result!.rivalSuggestion?.length ?? 0).toBeGreaterThan(10);
  });

  it("trusts a day's drift over one that would take a realignment and puts no more lines on peaks", () => {
    // A line every 5 nm (50 px, inside the searched shift of ±61 px but beyond a day's 20 px): the
    // drift one period away would mean the instrument was realigned since yesterday.
    const lines = comb(5, 40);
    const todayPx = (nm: number) => 10 * (nm - 400) + 1.5;
    const peaks = lampPeaks(lines, todayPx, 5, 0);
    const context = pairingContext(peaks, lines, { ...options, nominalRangeNm: [400, 605] });
    const result = recalibrateFromPrevious(context, previousOf(straight))!;
    expect(result.checks?.find((c) => c.name === "rival-pairing")?.passed).toBe(true);
    expect(result.status).toBe("paired");
    for (const pair of result.pairs)
      expect(Math.abs(pair.x - todayPx(pair.wavelengthNm))).toBeLessThan(0.2);
  });

  it("leaves a drift beyond a day's to check, and trusts it when a blind search finds the same axis", () => {
    const previous = previousOf(yesterdayNm);
    // Realigned: x = 1.009·u − 30, 0.9 % of stretch and 21 px at the middle (a day's is up to 0.5 %
    // and 1 % of the array).
    const todayPx = (nm: number) => 1.009 * yesterdayPx(nm) - 30;
    const peaks = lampPeaks(HG_NE_AR_LINES, todayPx, 5);
    const recalibrated = recalibrateFromPrevious(
      pairingContext(peaks, HG_NE_AR_LINES, options),
      previous,
    )!;
    expect(recalibrated.status).toBe("check");
    const daily = recalibrated.checks!.find((c) => c.name === "daily-drift")!;
    expect(daily.passed).toBe(false);
    expect(daily.reason).toMatch(/more than a day's drift/);
    // Every other check passes: the drift alone is the doubt.
    expect(recalibrated.checks!.filter((c) => !c.passed)).toHaveLength(1);
    const result = autoPairLampPeaks(peaks, HG_NE_AR_LINES, { ...options, previous });
    expect(result.status).toBe("paired");
    expect(result.message).not.toMatch(/^recalibrated/);
    const xs = Float64Array.from([300, 1000, 1700]);
    const calibrated = evaluateCalibration(result.model!.model, xs);
    xs.forEach((x, i) =>
      expect(Math.abs(calibrated[i] - yesterdayNm((x + 30) / 1.009))).toBeLessThan(0.05),
    );
  });

  it("does not take a bent axis (a realigned instrument) for a drift", () => {
    const previous = previousOf(yesterdayNm);
    // Several tolerances of bend across the array: no straight drift holds it.
    const todayPx = (nm: number) => {
      const u = yesterdayPx(nm);
      return u + 6e-6 * (u - 1024) ** 2 - 3;
    };
    const peaks = lampPeaks(HG_NE_AR_LINES, todayPx, 9);
    const result = recalibrateFromPrevious(
      pairingContext(peaks, HG_NE_AR_LINES, options),
      previous,
    );
    expect(result === null || result.status !== "paired").toBe(true);
  });

  it("gives up on a previous calibration of another array", () => {
    const previous = fitCalibration(
      Array.from({ length: 11 }, (_, i) => ({
        x: 409.5 * i,
        wavelengthNm: 400 + 0.05 * 409.5 * i,
      })),
      { model: "polynomial", degree: 2, domain: [0, 4095], rejectOutliers: false },
    ).model;
    const peaks = lampPeaks(HG_NE_AR_LINES, (nm) => yesterdayPx(nm), 4);
    expect(
      recalibrateFromPrevious(pairingContext(peaks, HG_NE_AR_LINES, options), previous),
    ).toBeNull();
  });
});
