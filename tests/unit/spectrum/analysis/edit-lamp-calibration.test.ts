// The workbench's computation on a synthetic lamp (a curved grating with Hg and Ar lines from the
// starter table): without edits it shows the automatic calibration; a pair left out, a pair made by hand
// and a model asked for change the fit as a chemist expects; bad edits fail with a typed error naming
// the field; and the drift between two calibrations is what was put in.
import { describe, expect, it } from "vitest";
import { calibrateLamp, type LampCalibration } from "@/lib/spectrum/analysis/calibrate-lamp";
import { editLampCalibration } from "@/lib/spectrum/analysis/edit-lamp-calibration";
import type {
  EditLampCalibrationOptions,
  LampCalibrationEdits,
} from "@/lib/spectrum/analysis/edit-lamp-calibration-types";
import { HAND_LINE_MATCH_NM } from "@/lib/spectrum/analysis/hand-line-match-nm";
import {
  CALIBRATION_MODELS,
  CalibrationError,
  calibrationDrift,
  evaluateCalibration,
  fitCalibration,
  UNPAIRED_REACH_FWHM,
} from "@/lib/spectrum/calibration";
import { realisticLamp } from "../../../support/realistic-lamp";

const lamp = realisticLamp(3, {
  clean: true,
  dispersion: "grating-curved",
  gases: ["Hg", "Ar"],
  pixels: 2048,
});
const options: EditLampCalibrationOptions = {
  nominalRangeNm: lamp.statedRangeNm,
  dispersion: "grating",
  resolutionNm: lamp.resolutionNm,
  domain: [0, 2047],
};
const automatic: LampCalibration = calibrateLamp(lamp.x, lamp.y, lamp.lines, options);
const edit = (edits: LampCalibrationEdits, from: LampCalibration = automatic) =>
  editLampCalibration(from, lamp.lines, edits, options);

/** What the edit threw, as a CalibrationError (fails the test when it returned or threw something else). */
function refusal(edits: LampCalibrationEdits, from: LampCalibration = automatic): CalibrationError {
  try {
    edit(edits, from);
  } catch (error) {
    expect(error).toBeInstanceOf(CalibrationError);
    return error as CalibrationError;
  }
  throw new Error("the edit was accepted");
}

/** Largest error against the generator's truth at the pixels of the paired peaks, nm. */
function worstErrorNm(model: Parameters<typeof evaluateCalibration>[0]): number {
  const pixels = Float64Array.from(automatic.peaks.map((p) => p.x));
  const fitted = evaluateCalibration(model, pixels);
  return Math.max(...Array.from(pixels, (px, i) => Math.abs(fitted[i] - lamp.wavelengthAt(px))));
}

describe("editLampCalibration", () => {
  it("starts from a trusted automatic pairing of the lamp", () => {
    expect(automatic.pairing.status).toBe("paired");
    expect(automatic.fit!.pairs.length).toBeGreaterThanOrEqual(12);
  });

  it("without edits shows the automatic fit, every model compared, and the tolerances it applies", () => {
    const shown = edit({});
    expect(shown.fit.rmsNm).toBe(automatic.fit!.rmsNm);
    expect(shown.result.pairs.every((p) => p.origin === "auto" && p.state !== "excluded")).toBe(
      true,
    );
    expect(shown.result.pairs.map((p) => p.pixel)).toEqual(
      [...shown.result.pairs.map((p) => p.pixel)].sort((a, b) => a - b),
    );
    // One comparison row per model of the selector, the straight line worse than the curve it misses.
    expect(shown.comparison.candidates.map((c) => c.model)).toEqual(
      CALIBRATION_MODELS.filter((m) => m !== "auto"),
    );
    const rms = (model: string) =>
      shown.comparison.candidates.find((c) => c.model === model)!.rmsNm!;
    expect(rms("polynomial-1")).toBeGreaterThan(5 * rms("polynomial-3"));
    expect(shown.comparison.recommended).not.toBeNull();
    expect(shown.tolerances).toEqual({
      lineMatchNm: HAND_LINE_MATCH_NM,
      expectedPeakReachFwhm: UNPAIRED_REACH_FWHM,
    });
    // Every paired peak is predicted where its line is, to well inside a grating's 0.05 nm.
    for (const peak of shown.peaks.filter((p) => p.pairedWith)) {
      expect(Math.abs(peak.predictedNm! - lamp.wavelengthAt(peak.pixel))).toBeLessThan(0.05);
    }
    expect(worstErrorNm(shown.fit.model)).toBeLessThan(0.05);
    expect(shown.result.pairing).toMatchObject({
      status: "paired",
      manualSeeds: 0,
      excludedByHand: 0,
      addedByHand: 0,
      handPairs: [],
    });
  });

  it("leaves a pair out of the fit, keeps it on the chart as excluded, with its residual under the new fit", () => {
    const used = edit({}).result.pairs.filter((p) => p.state === "used");
    const left = used[used.length >> 1];
    const shown = edit({
      excluded: [{ pixel: left.pixel + 0.4, wavelengthNm: left.wavelengthNm + 0.01 }],
    });
    const excluded = shown.result.pairs.filter((p) => p.state === "excluded");
    expect(excluded).toHaveLength(1);
    expect(excluded[0].pixel).toBe(left.pixel);
    const at = evaluateCalibration(shown.fit.model, Float64Array.of(left.pixel))[0];
    expect(excluded[0].residualNm).toBeCloseTo(left.wavelengthNm - at, 9);
    expect(shown.fit.pairs).toHaveLength(used.length - 1);
    expect(shown.result.pairing.excludedByHand).toBe(1);
    expect(shown.result.pairing.handPairs).toEqual([
      {
        change: "excluded",
        pixel: left.pixel,
        wavelengthNm: left.wavelengthNm,
        species: left.species,
      },
    ]);
    // The excluded peak stays paired on the chart; its line is no longer paired.
    expect(shown.peaks.find((p) => p.pixel === left.pixel)!.pairedWith).not.toBeNull();
    expect(shown.lines.find((l) => l.wavelengthNm === left.wavelengthNm)!.paired).toBe(false);
  });

  it("lets a pair made by hand override the peak and the line it takes, and the fit then shows it wrong", () => {
    const used = edit({}).result.pairs.filter((p) => p.state === "used");
    const [a, b] = [used[4], used[5]];
    // Peak a given the line of peak b: both automatic pairs go, the wrong one made by hand stays.
    const shown = edit({ added: [{ pixel: a.pixel, wavelengthNm: b.wavelengthNm }] });
    const added = shown.result.pairs.filter((p) => p.origin === "added");
    expect(added).toHaveLength(1);
    expect(added[0]).toMatchObject({ pixel: a.pixel, wavelengthNm: b.wavelengthNm });
    expect(shown.result.pairs.filter((p) => p.origin === "auto")).toHaveLength(used.length - 2);
    // A wrong line is far off the curve the others hold (the fit rejects it or carries a large residual).
    expect(
      added[0].state === "rejected" || Math.abs(added[0].residualNm) > 10 * shown.fit.rmsNm,
    ).toBe(true);
    expect(shown.result.pairing.addedByHand).toBe(1);
  });

  it("fits the model asked for, and refuses one that needs more pairs than remain", () => {
    const straight = edit({ model: "polynomial-1" });
    expect(straight.result.model).toBe("polynomial-1");
    expect(straight.fit.rmsNm).toBeGreaterThan(edit({}).fit.rmsNm);
    const used = edit({}).result.pairs.filter((p) => p.state === "used");
    const allButFive = used.slice(5).map((p) => ({ pixel: p.pixel, wavelengthNm: p.wavelengthNm }));
    const error = refusal({ excluded: allButFive, model: "polynomial-5" });
    // Five pairs cannot carry a quintic's six parameters.
    expect(error.code).toBe("too-few-pairs-left");
    expect(error.details.field).toBe("model");
  });

  it("refuses edits that leave fewer than three pairs", () => {
    const used = edit({}).result.pairs.filter((p) => p.state === "used");
    const error = refusal({
      excluded: used.slice(2).map((p) => ({ pixel: p.pixel, wavelengthNm: p.wavelengthNm })),
    });
    expect(error.code).toBe("too-few-pairs-left");
    expect(error.message).toMatch(/Too few pairs left: 2 remain/);
  });

  it.each([
    ["a pixel with no peak", { added: [{ pixel: -500, wavelengthNm: 404.656 }] }, "added.0.pixel"],
    [
      "a pixel that is not a number",
      { added: [{ pixel: NaN, wavelengthNm: 404.656 }] },
      "added.0.pixel",
    ],
    [
      "a pair left out that does not exist",
      { excluded: [{ pixel: 1, wavelengthNm: 123.456 }] },
      "excluded.0.pixel",
    ],
    [
      "a seed on no peak",
      {
        seeds: [
          { pixel: -500, wavelengthNm: 404.656 },
          { pixel: -400, wavelengthNm: 435.833 },
        ],
      },
      "pairs.0.pixel",
    ],
  ])("refuses %s as an invalid edit naming the field", (_, edits, field) => {
    const error = refusal(edits);
    expect(error.code).toBe("invalid-edit");
    expect(error.details.field).toBe(field);
    expect(error.details.fieldMessage).toEqual(expect.any(String));
  });

  it("refuses a line off the table by its wavelength field, and the same peak added twice", () => {
    const peak = automatic.peaks[0];
    const noLine = refusal({ added: [{ pixel: peak.x, wavelengthNm: 123.456 }] });
    expect(noLine.details.field).toBe("added.0.wavelengthNm");
    expect(noLine.message).toMatch(/at 123\.456 nm/);
    const pair = edit({}).result.pairs[0];
    const twice = refusal({
      added: [pair, pair].map((p) => ({ pixel: p.pixel, wavelengthNm: p.wavelengthNm })),
    });
    expect(twice.details.field).toBe("added.1.pixel");
  });

  it("says there is nothing to start from when the automatic pairing found nothing and no seeds were given", () => {
    const flat = calibrateLamp(
      lamp.x,
      new Float64Array(lamp.x.length).fill(300),
      lamp.lines,
      options,
    );
    expect(flat.pairing.status).toBe("needs-manual");
    expect(refusal({}, flat).code).toBe("not-paired");
  });

  it("extends two seeds picked by hand to a full pairing, counted as manual", () => {
    const used = edit({}).result.pairs.filter((p) => p.state === "used");
    const seeds = [used[1], used[used.length - 2]].map((p) => ({
      pixel: p.pixel,
      wavelengthNm: p.wavelengthNm,
    }));
    const shown = edit({ seeds });
    expect(shown.result.pairing.manualSeeds).toBe(2);
    expect(shown.fit.pairs.length).toBeGreaterThanOrEqual(used.length - 2);
    expect(worstErrorNm(shown.fit.model)).toBeLessThan(0.05);
  });
});

describe("calibrationDrift", () => {
  it("measures a constant shift as that shift at every pixel", () => {
    const pairs = [0, 500, 1000, 1500, 2000].map((x) => ({
      x,
      wavelengthNm: 400 + 0.15 * x,
      xUncertainty: 0.05,
    }));
    const before = fitCalibration(pairs, {
      model: "polynomial",
      degree: 1,
      domain: [0, 2047],
    }).model;
    const after = fitCalibration(
      pairs.map((p) => ({ ...p, wavelengthNm: p.wavelengthNm + 0.12 })),
      { model: "polynomial", degree: 1, domain: [0, 2047] },
    ).model;
    const drift = calibrationDrift(after, before, [0, 2047]);
    expect(drift.pixels).toEqual([0, 511.75, 1023.5, 1535.25, 2047]);
    for (const delta of drift.deltaNm) expect(delta).toBeCloseTo(0.12, 9);
    expect(drift.maxAbsNm).toBeCloseTo(0.12, 9);
    expect(() => calibrationDrift(after, before, [5, 5])).toThrow(RangeError);
  });
});
