// A recalibration whose previous calibration fitted its own lines too loosely to carry today's: the drift
// still finds today's lines (every other check of it passes), so today's pairs get a fit of their own,
// checked as a blind pairing is, instead of ending in "check this recalibration".
import { describe, expect, it } from "vitest";
import { previousCalibrationOf, sweepOne } from "../../../support/calibration-sweep";
import { realisticLamp } from "../../../support/realistic-lamp";

/**
 * Instrument `seed` of the re-recorded sweep, recalibrated from a previous calibration kept to the
 * catalogue's glasses: for a glass the catalogue does not hold, that is a loose one (the sweep's own
 * previous calibration fits the glass's terms and is not).
 */
function fromCatalogueOnlyPrevious(seed: number) {
  const lamp = realisticLamp(seed);
  const previous = previousCalibrationOf(lamp, { fitGlass: false });
  return sweepOne(lamp.rerecord(seed + 100_000), { previous });
}

describe("recalibration from a loose previous calibration", () => {
  // Prisms of the realistic-lamp generator (tests/support/realistic-lamp.ts), re-recorded
  // with a day's shift and stretch. Their glasses are not in the catalogue, so yesterday's best model of
  // the true axis with a catalogue glass misses it by more than the recalibration trusts; before this fallback each ended in
  // "check this recalibration: the previous calibration fitted its own lamp lines to an RMS of …".
  // (Instrument 8600298, once here, is now left to check: one pair of its fresh fit lies 3.9 σ from
  // where the others put it, held-out-miss.ts.)
  it.each([
    [8_600_161, "sapphire"],
    [8_600_050, "sapphire"],
  ])("pairs instrument %i (%s) afresh, right to its tolerance", (seed, glass) => {
    const record = fromCatalogueOnlyPrevious(seed);
    expect(record.glass).toBe(glass);
    expect(record.message).not.toMatch(/^check this recalibration/);
    expect(record.status).toBe("paired");
    // Right at every probe of its covered range (error over tolerance ≤ 1; see probeErrorRatio).
    expect(record.worstErrorRatio).toBeLessThanOrEqual(1);
    expect(record.outcome).toBe("success");
  });

  // A dense flint (N-LASF9) whose fresh fit in yesterday's family fails, and whose fit free to choose
  // its model (a catalogue glass) misses its own pairs by more than their centres' σ allow (the
  // lack-of-fit check): it stays a recalibration to check, for the reason the drift gave. Before that
  // check the free fit was paired, and right (0.14 nm off at its worst probe): the check's price here.
  it("leaves instrument 8700150 (N-LASF9) to check", () => {
    const record = fromCatalogueOnlyPrevious(8_700_150);
    expect(record.glass).toBe("N-LASF9");
    expect(record.status).toBe("check");
    expect(record.message).toMatch(/^check this recalibration/);
    expect(record.message).toMatch(/the previous calibration fitted its own lamp lines/);
    // The candidate shown is yesterday's model moved, as loose as the check said.
    expect(record.candidateRight).toBe(false);
  });

  // The same instrument from a previous calibration that fitted its glass's terms (fitted-glass.ts):
  // yesterday's shape is now tight, and the day's drift of it is trusted, and right.
  it("recalibrates instrument 8700150 (N-LASF9) from a previous calibration with its glass fitted", () => {
    const lamp = realisticLamp(8_700_150);
    expect(lamp.glass).toBe("N-LASF9");
    const previous = previousCalibrationOf(lamp);
    expect(previous.kind === "prism" && previous.glassFitted).toBe(true);
    const record = sweepOne(lamp.rerecord(8_700_150 + 100_000), { previous });
    expect(record.message).toMatch(/^recalibrated from the previous calibration/);
    expect(record.status).toBe("paired");
    expect(record.outcome).toBe("success");
  });
});
