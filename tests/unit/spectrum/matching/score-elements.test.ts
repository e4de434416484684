// Checks element calls on synthetic flame spectra whose elements are known.
import { describe, it, expect } from "vitest";
import {
  identifyElements,
  prepareLineIndex,
  scoreElements,
  matchPeaksToLines,
  speciesRelativeIntensities,
  type ElementIdentification,
} from "../../../../lib/spectrum/matching";
import type { ReferenceLine } from "../../../../lib/spectrum/types";
import { synthesizeSpectrum } from "../../../../lib/spectrum/synthetic";
import { detectTestPeaks } from "./detect-test-peaks";
import { flameEmission, flameLineTable } from "./flame-line-table";
import { flameRun, gratingAxis, FLAME_RANGE_NM, FLAME_RESOLUTION_NM } from "./flame-fixture";

const MIXTURE = {
  "Na I": 20000,
  "K I": 8000,
  "Li I": 6000,
  "Ca I": 5000,
  "Ca II": 150,
  "Sr I": 4000,
  "Sr II": 400,
  CaOH: 1500,
};

function identify(
  peaks: ReturnType<typeof flameRun>["peaks"],
  table: ReferenceLine[],
): ElementIdentification {
  return identifyElements(peaks, table, {
    source: "flame",
    rangeNm: FLAME_RANGE_NM,
    resolutionNm: FLAME_RESOLUTION_NM,
  });
}

function verdictOf(result: ElementIdentification, species: string): string {
  return result.calls.find((call) => call.species === species)?.verdict ?? "not reported";
}

/** A flame spectrum from the table's species plus extra lines that no table species explains. */
function customRun(
  countsBySpecies: Record<string, number>,
  extraLines: { wavelengthNm: number; amplitude: number }[],
  dropLinesNm: number[] = [],
) {
  const table = flameLineTable();
  const emission = flameEmission(table, countsBySpecies);
  const lines = emission.lines
    .filter((l) => !dropLinesNm.some((nm) => Math.abs(nm - l.wavelengthNm) < 1e-6))
    .concat(extraLines);
  const spectrum = synthesizeSpectrum({
    pixelCount: 2048,
    wavelengthOfPixel: gratingAxis,
    resolutionNm: FLAME_RESOLUTION_NM,
    lines,
    bands: emission.bands,
    continuum: { shape: "planck", temperatureK: 2200, peakCounts: 800 },
    shotNoise: true,
    readNoiseCounts: 10,
    darkCounts: 500,
    seed: 21,
  });
  const peaks = detectTestPeaks(spectrum.y, {
    wavelengthNmAtPixel: spectrum.truth.wavelengthNmAtPixel,
  });
  return { table, peaks };
}

describe("scoreElements on a flame of Na, K, Li, Ca, Sr with CaOH bands", () => {
  const run = flameRun(MIXTURE);
  const result = identify(run.peaks, run.table);

  it("calls every element that was put in present", () => {
    for (const species of ["Na I", "K I", "Li I", "Ca I", "Sr I", "CaOH"]) {
      expect(verdictOf(result, species), species).toBe("present");
    }
  });

  it("does not call elements whose lines were not put in", () => {
    for (const species of ["Ba II", "In I", "Tl I", "Cu I"]) {
      expect(verdictOf(result, species), species).not.toBe("present");
      expect(verdictOf(result, species), species).not.toBe("possible");
    }
    // Ba I 553.55 nm lies 1.1 nm from the centre of the CaOH band's 2.9-nm-wide peak at 1 nm
    // resolution: a line there could hide in it, so Ba I may be possible, never present, and its
    // call names the band it shares the peak with.
    expect(verdictOf(result, "Ba I")).not.toBe("present");
    const barium = result.calls.find((call) => call.species === "Ba I");
    if (barium && barium.verdict === "possible") {
      expect(barium.overlaps.flatMap((o) => o.otherSpecies)).toContain("CaOH");
    }
    // Cu I has its strong flame lines below the range, so it is not even listed.
    expect(verdictOf(result, "Cu I")).toBe("not reported");
  });

  it("lists the strongest lines as seen, within the window, for a present element", () => {
    const potassium = result.calls.find((call) => call.species === "K I")!;
    // NIST ASD air wavelengths of the K I resonance doublet (from memory); 0.002 nm tolerance
    // (common practice), as the table rows carry those values.
    const seenNm = potassium.seen.map((s) => s.referenceNm).sort();
    expect(seenNm[0]).toBeCloseTo(766.4899, 2);
    expect(seenNm[1]).toBeCloseTo(769.8965, 2);
    for (const seen of potassium.seen) expect(Math.abs(seen.deltaSigma)).toBeLessThanOrEqual(3);
    expect(potassium.missing.filter((m) => m.hiddenByPeakIndex === null)).toHaveLength(0);
  });

  it("does not see Li I 460.29 nm in the clean Sr I 460.73 nm peak 0.45 nm away at 1 nm resolution", () => {
    // The Sr peak is as wide as one line and placed to a few hundredths of a nm: a Li line 0.45 nm
    // off would have widened it. (Li's 460.29 line is weak in a flame; the mixture's Li shows at 670.8.)
    const peak = run.peaks.find((p) => Math.abs(p.wavelengthNm - 460.73) < 0.2)!;
    expect(peak.fwhmNm).toBeLessThan(1.1 * FLAME_RESOLUTION_NM);
    const strontium = result.calls.find((call) => call.species === "Sr I")!;
    expect(strontium.verdict).toBe("present");
    expect(strontium.overlaps.flatMap((o) => o.otherSpecies)).not.toContain("Li I");
    const lithium = result.calls.find((call) => call.species === "Li I")!;
    expect(lithium.seen.map((s) => s.referenceNm)).not.toContain(460.286);
  });

  it("gives sodium its note even when it is intense", () => {
    const sodium = result.calls.find((call) => call.species === "Na I")!;
    expect(sodium.notes).toContain(
      "Ubiquitous in flames: trace contamination likely; judge by intensity.",
    );
  });

  it("explains every peak and sorts calls by score", () => {
    expect(result.unexplainedPeaks).toHaveLength(0);
    for (let i = 1; i < result.calls.length; i++) {
      expect(result.calls[i - 1].score).toBeGreaterThanOrEqual(result.calls[i].score);
    }
  });

  it("is deterministic", () => {
    const again = identify(run.peaks, run.table);
    expect(JSON.stringify(again.calls)).toBe(JSON.stringify(result.calls));
  });
});

describe("scoreElements on the evidence that argues against a call", () => {
  it("does not call an element from a lone coincidence with one of its weak lines", () => {
    // An unlisted emitter at 577.76 nm coincides with the weak Ba I line there (NIST ASD, from memory).
    const { table, peaks } = customRun({ "K I": 8000 }, [
      { wavelengthNm: 577.762, amplitude: 600 },
    ]);
    const result = identify(peaks, table);
    const barium = result.calls.find((call) => call.species === "Ba I")!;
    expect(barium.seen.map((s) => s.referenceNm)).toEqual([577.762]);
    expect(barium.verdict).toBe("absent");
    expect(barium.missing[0].referenceNm).toBe(553.5481);
    expect(barium.missing[0].predictedSnr!).toBeGreaterThan(100);
    expect(result.unexplainedPeaks.map((u) => u.reason)).toEqual(["only-absent-species"]);
  });

  it("demotes a call when a strong expected line is missing", () => {
    const complete = customRun({ "K I": 8000 }, []);
    const full = identify(complete.peaks, complete.table);
    expect(verdictOf(full, "K I")).toBe("present");
    const { table, peaks } = customRun({ "K I": 8000 }, [], [769.8965]);
    const result = identify(peaks, table);
    const potassium = result.calls.find((call) => call.species === "K I")!;
    expect(potassium.verdict).not.toBe("present");
    expect(potassium.missing[0].referenceNm).toBe(769.8965);
    expect(potassium.score).toBeLessThan(full.calls.find((c) => c.species === "K I")!.score);
    expect(potassium.rationale).toMatch(/missing/);
  });

  it("does not call a sodium trace present, and says why", () => {
    const { table, peaks } = customRun({ "Na I": 300, "K I": 8000, "Li I": 6000 }, []);
    const result = identify(peaks, table);
    const sodium = result.calls.find((call) => call.species === "Na I")!;
    expect(sodium.seen.length).toBeGreaterThan(0);
    expect(sodium.verdict).toBe("possible");
    expect(sodium.notes[0]).toBe(
      "Ubiquitous in flames: trace contamination likely; judge by intensity.",
    );
    expect(sodium.notes.join(" ")).toMatch(/trace/);
  });

  it("lists a peak that no table line explains", () => {
    const { table, peaks } = customRun({ "K I": 8000 }, [{ wavelengthNm: 720.0, amplitude: 2000 }]);
    const result = identify(peaks, table);
    expect(result.unexplainedPeaks).toHaveLength(1);
    expect(result.unexplainedPeaks[0].reason).toBe("no-candidate");
    expect(result.unexplainedPeaks[0].peak.wavelengthNm).toBeCloseTo(720, 0);
  });
});

describe("speciesRelativeIntensities", () => {
  it("uses the chosen source, falls back to the next one as a whole species, and never mixes scales", () => {
    const base = flameLineTable()[0];
    const lines: ReferenceLine[] = [
      { ...base, id: "a", species: "Q I", intensities: { flame: 50, arc: 1000 } },
      { ...base, id: "b", species: "Q I", intensities: { arc: 400 } },
      { ...base, id: "c", species: "R I", intensities: { arc: 200, spark: 900 } },
      { ...base, id: "d", species: "R I", intensities: { arc: 100 } },
      { ...base, id: "e", species: "S I", intensities: {} },
    ];
    const table = speciesRelativeIntensities(prepareLineIndex(lines), "flame");
    expect(table.get("Q I")!.basis).toBe("flame");
    expect(table.get("Q I")!.relative.get(0)).toBe(1);
    expect(table.get("Q I")!.relative.get(1)).toBeUndefined();
    expect(table.get("R I")!.basis).toBe("arc");
    expect(table.get("R I")!.relative.get(3)).toBe(0.5);
    expect(table.get("S I")!.basis).toBe("none");
  });

  it("notes borrowed intensities in the call", () => {
    const table = flameLineTable().map((l) =>
      l.species === "K I" ? { ...l, intensities: { arc: l.intensities.arc } } : l,
    );
    const { peaks } = customRun({ "K I": 8000 }, []);
    const matches = matchPeaksToLines(peaks, table, { resolutionNm: FLAME_RESOLUTION_NM });
    const result = scoreElements(matches, table, { source: "flame", rangeNm: FLAME_RANGE_NM });
    const potassium = result.calls.find((call) => call.species === "K I")!;
    expect(potassium.intensityBasis).toBe("arc");
    expect(potassium.notes.join(" ")).toMatch(/used arc intensities/);
    // Strong and clean as its lines are, a species the table lists for arcs only is not called
    // present in a flame; with the table's flame intensities it is.
    expect(potassium.verdict).toBe("possible");
    expect(potassium.notes.join(" ")).toMatch(/lists none of its lines for a flame/);
    const flameTable = flameLineTable();
    const withFlame = scoreElements(
      matchPeaksToLines(peaks, flameTable, { resolutionNm: FLAME_RESOLUTION_NM }),
      flameTable,
      { source: "flame", rangeNm: FLAME_RANGE_NM },
    ).calls.find((call) => call.species === "K I")!;
    expect(withFlame.verdict).toBe("present");
  });
});
