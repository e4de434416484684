// Checks how a peak claimed by several species is shared: a species contradicted by its own missing
// lines must not take a flame element's peak, and a lone coincidence must not make a lamp gas present.
import { describe, it, expect } from "vitest";
import { identifyElements, type ElementIdentification } from "../../../../lib/spectrum/matching";
import type { CalibratedPeak, ReferenceLine, SourceKind } from "../../../../lib/spectrum/types";

// Wavelengths: NIST Atomic Spectra Database, observed air wavelengths (from memory; the checks below
// do not depend on them closer than 0.01 nm). Intensities follow the project's starter table: K I has
// flame values, the lamp gases lamp values only, so a flame borrows theirs.
const ROWS: { species: string; airNm: number; intensities: Partial<Record<SourceKind, number>> }[] =
  [
    { species: "K I", airNm: 766.49, intensities: { flame: 1000, lamp: 1000 } },
    { species: "K I", airNm: 769.896, intensities: { flame: 600, lamp: 600 } },
    { species: "Ar I", airNm: 750.387, intensities: { lamp: 200 } },
    { species: "Ar I", airNm: 751.465, intensities: { lamp: 150 } },
    { species: "Ar I", airNm: 763.511, intensities: { lamp: 250 } },
    { species: "Ar I", airNm: 772.376, intensities: { lamp: 150 } },
    { species: "Kr I", airNm: 557.029, intensities: { lamp: 200 } },
    { species: "Kr I", airNm: 587.092, intensities: { lamp: 250 } },
    { species: "Kr I", airNm: 758.741, intensities: { lamp: 200 } },
    { species: "Kr I", airNm: 760.155, intensities: { lamp: 300 } },
    { species: "Kr I", airNm: 768.525, intensities: { lamp: 100 } },
    { species: "Kr I", airNm: 769.454, intensities: { lamp: 100 } },
  ];

/** The lamp-gas lines that no peak falls on: they contradict the gases. */
const FAR_FROM_PEAKS_NM = [557.029, 587.092, 772.376];

function table(rows = ROWS): ReferenceLine[] {
  return rows.map((row, i) => ({
    id: `s${i}`,
    species: row.species,
    element: row.species.split(" ")[0],
    ionStage: 1,
    airNm: row.airNm,
    vacuumNm: row.airNm * 1.00028,
    uncertaintyNm: 0.001,
    intensities: row.intensities,
    flags: {},
  }));
}

function peak(wavelengthNm: number, snr: number, fwhmNm: number): CalibratedPeak {
  return {
    index: 0,
    x: wavelengthNm,
    xUncertainty: 0.01,
    height: 10 * snr,
    fwhm: fwhmNm,
    area: 10 * snr * fwhmNm,
    snr,
    saturated: false,
    blended: true,
    wavelengthNm,
    wavelengthUncertaintyNm: 0.05,
    fwhmNm,
  };
}

/**
 * A prism's red end: the K I doublet (3.4 nm apart) merged into one 5.8 nm wide peak, which Ar I
 * 763.51 and Kr I 768.52/769.45 also reach, and two weak broad bumps on Kr I 758.74/760.15 and
 * Ar I 750.39/751.47 that give the gases some support of their own.
 */
const PEAKS = [peak(751.0, 8, 5), peak(759.5, 8, 5), peak(766.6, 270, 5.8)];

function identify(lines: ReferenceLine[], peaks = PEAKS): ElementIdentification {
  // Each peak's own width stands in for the resolution, as on a prism.
  return identifyElements(peaks, lines, { source: "flame", rangeNm: [540, 800] });
}

const callOf = (result: ElementIdentification, species: string) =>
  result.calls.find((call) => call.species === species)!;

describe("scoreElements on a peak shared with lamp-gas lines", () => {
  it("sees the K I doublet and the gases' lines on the same broad peak", () => {
    const result = identify(table());
    const potassium = callOf(result, "K I");
    expect(potassium.seen.map((s) => s.peakIndex)).toEqual([2, 2]);
    expect(potassium.overlaps[0].otherSpecies).toEqual(["Ar I", "Kr I"]);
    for (const species of ["Ar I", "Kr I"]) {
      expect(
        callOf(result, species).seen.some((s) => s.peakIndex === 2),
        species,
      ).toBe(true);
    }
  });

  it("scales each gas from its own bump, not from the peak it shares with K I", () => {
    // Anchored on the shared peak (SNR 270), Ar I 772.38 nm would be expected at SNR ≈ 160 and Kr I
    // 587.09 nm at ≈ 225; from their own bumps at SNR 8 both stay below the detection limit.
    const result = identify(table());
    for (const species of ["Ar I", "Kr I"]) {
      const call = callOf(result, species);
      // A far line is listed only when its own scale puts it above the detection limit, and then
      // near it (Kr I 587.09 nm: 8 × 0.83 ≈ 6.7), never at the shared peak's scale.
      for (const line of call.missing.filter((m) => FAR_FROM_PEAKS_NM.includes(m.referenceNm))) {
        expect(line.predictedSnr!, species).toBeLessThan(10);
      }
      // Their lines on K I's peak are no evidence of their own: a sliver of it at most.
      expect(call.verdict, species).not.toBe("present");
    }
    // Ar I holds its bump alone, and its principal line (763.51 nm) stands only on K I's peak.
    const argon = callOf(result, "Ar I");
    expect(argon.verdict).toBe("possible");
    expect(argon.notes.some((n) => n.startsWith("Only one peak is its own (751.00 nm"))).toBe(true);
  });

  it("calls K I present with nearly its unshared score when the gases are contradicted", () => {
    const result = identify(table());
    const alone = identify(table(ROWS.filter((row) => row.species === "K I")));
    const potassium = callOf(result, "K I");
    expect(potassium.verdict).toBe("present");
    // Each gas may claim at most what its strongest missing line allows (predicted SNR 6 at most
    // for that line, so a few SNR of a peak of 270): a few per cent of the peak.
    expect(callOf(alone, "K I").score - potassium.score).toBeLessThan(0.05);
    for (const species of ["Ar I", "Kr I"]) {
      expect(callOf(result, species).verdict, species).not.toBe("present");
    }
  });

  it("leaves K I its peak when the gases' own bumps say they are faint, contradicted or not", () => {
    // Without their far lines nothing contradicts the gases; their bumps at SNR 8 still say their
    // lines on K I's peak stand near SNR 8 too, a few per cent of a peak of 270.
    const rows = ROWS.filter((row) => !FAR_FROM_PEAKS_NM.includes(row.airNm));
    const result = identify(table(rows));
    const alone = identify(table(rows.filter((row) => row.species === "K I")));
    const potassium = callOf(result, "K I");
    expect(potassium.verdict).toBe("present");
    expect(callOf(alone, "K I").score - potassium.score).toBeLessThan(0.05);
  });

  it("does not call a lamp gas present from a lone coincidence with its strongest line", () => {
    // A peak on Kr I 760.15 nm alone: its other strong lines should then stand at SNR ≈ 170–210.
    const result = identify(table(), [peak(760.16, 250, 1)]);
    const krypton = callOf(result, "Kr I");
    expect(krypton.seen.map((s) => s.referenceNm)).toEqual([760.155]);
    expect(krypton.verdict).not.toBe("present");
    expect(krypton.missingStrongCount).toBe(5);
    expect(krypton.missing.map((m) => m.referenceNm).slice(0, 3)).toEqual([
      587.092, 557.029, 758.741,
    ]);
  });
});

describe("the rationale of a call against a dense table", () => {
  it("names a few sharing species per peak and counts the rest, whatever the table's density", () => {
    // 120 invented species, each with a line on every one of 8 peaks: every call shares every peak
    // with 119 others. The sentence must stay short; the counts say what it leaves out.
    const peaks = Array.from({ length: 8 }, (_, k) => peak(500 + 20 * k, 50, 0.5));
    const rows = Array.from({ length: 120 }, (_, s) =>
      peaks.map((p, k) => ({
        species: `X${s} I`,
        airNm: p.wavelengthNm + 0.001 * ((s + k) % 5),
        intensities: { flame: 100 + ((s * 7 + k) % 50) },
      })),
    ).flat();
    const result = identifyElements(peaks, table(rows), {
      source: "flame",
      rangeNm: [480, 660],
      resolutionNm: 0.5,
    });
    expect(result.calls.length).toBeGreaterThan(100);
    for (const call of result.calls) {
      expect(call.rationale.length).toBeLessThan(1_500);
      if (call.rationale.includes("shares ")) {
        expect(call.rationale).toMatch(/with (X\d+ I, ){4}X\d+ I, and \d+ more/);
        expect(call.rationale).toMatch(/and 4 more peaks/);
      }
    }
    expect(result.calls.some((call) => call.rationale.includes("shares "))).toBe(true);
  });
});
