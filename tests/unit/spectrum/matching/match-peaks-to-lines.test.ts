// Checks the k·σ window of line matching, band-head matching and the sorted line index.
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  matchPeaksToLines,
  prepareLineIndex,
  wavelengthForMatchingNm,
} from "../../../../lib/spectrum/matching";
import type { CalibratedPeak, ReferenceLine } from "../../../../lib/spectrum/types";

function line(
  id: string,
  species: string,
  airNm: number,
  extra: Partial<ReferenceLine> = {},
): ReferenceLine {
  return {
    id,
    species,
    element: species.split(" ")[0],
    ionStage: species.includes(" ") ? 1 : null,
    airNm,
    vacuumNm: airNm * 1.00028,
    uncertaintyNm: 0.001,
    intensities: { flame: 100 },
    flags: {},
    ...extra,
  };
}

function peak(wavelengthNm: number, wavelengthUncertaintyNm = 0.03, fwhmNm = 1): CalibratedPeak {
  return {
    index: 0,
    x: 0,
    xUncertainty: 0.1,
    height: 100,
    fwhm: 5,
    area: 500,
    snr: 50,
    saturated: false,
    blended: false,
    wavelengthNm,
    wavelengthUncertaintyNm,
    fwhmNm,
  };
}

describe("prepareLineIndex", () => {
  it("sorts atomic lines by wavelength, keeps bands apart and leaves the input alone", () => {
    const lines = [
      line("a", "K I", 766.4899),
      line("b", "Na I", 588.995),
      line("c", "CaOH", 554, {
        flags: { bandHead: true },
        band: { extentNm: 8, degradesTo: "red" },
      }),
      line("d", "Li I", 670.776),
    ];
    const before = JSON.stringify(lines);
    const index = prepareLineIndex(lines);
    expect(Array.from(index.lineWavelengthNm)).toEqual([588.995, 670.776, 766.4899]);
    expect(Array.from(index.lineOrder)).toEqual([1, 3, 0]);
    expect(Array.from(index.bandHeadNm)).toEqual([554]);
    expect(index.maxBandExtentNm).toBe(8);
    expect(JSON.stringify(lines)).toBe(before);
  });

  it("uses vacuum wavelengths below 200 nm under the air convention, and throughout for vacuum", () => {
    const uv = line("uv", "C I", 193.0, { vacuumNm: 193.091 });
    const visible = line("vis", "Na I", 588.995, { vacuumNm: 589.158 });
    expect(wavelengthForMatchingNm(uv, "air")).toBe(193.091);
    expect(wavelengthForMatchingNm(visible, "air")).toBe(588.995);
    expect(wavelengthForMatchingNm(visible, "vacuum")).toBe(589.158);
  });
});

describe("matchPeaksToLines", () => {
  it("combines peak, line and resolution uncertainties in quadrature and keeps lines within k·σ", () => {
    // NIST ASD air wavelengths of the Na D lines (from memory).
    const lines = [
      line("d2", "Na I", 588.995),
      line("d1", "Na I", 589.5924),
      line("far", "X I", 592.0),
    ];
    // The doublet at 1 nm resolution: one peak 15 % wider than a line, not flagged blended. Its
    // width beyond the instrument's, √(1.15² − 1²) nm, bounds where a companion can sit.
    const [match] = matchPeaksToLines([peak(589.2, 0.03, 1.15)], lines, { resolutionNm: 1 });
    const sigmaResNm = (2 / Math.sqrt(12)) * Math.sqrt(1.15 ** 2 - 1);
    const sigmaNm = Math.sqrt(0.03 ** 2 + 0.001 ** 2 + sigmaResNm ** 2);
    expect(match.candidates.map((c) => c.line.id)).toEqual(["d2", "d1"]);
    const [d2, d1] = match.candidates;
    expect(d2.sigmaNm).toBeCloseTo(sigmaNm, 12);
    expect(d2.deltaNm).toBeCloseTo(0.205, 9);
    expect(d2.deltaSigma).toBeCloseTo(0.205 / sigmaNm, 9);
    expect(d1.deltaSigma).toBeCloseTo((589.2 - 589.5924) / sigmaNm, 9);
  });

  it("narrows the window with k and with a finer resolution", () => {
    const lines = [line("d2", "Na I", 588.995), line("d1", "Na I", 589.5924)];
    expect(
      matchPeaksToLines([peak(589.2)], lines, { resolutionNm: 1, k: 0.5 })[0].candidates,
    ).toHaveLength(0);
    const fine = matchPeaksToLines([peak(589.0, 0.005, 0.05)], lines, { resolutionNm: 0.05 })[0];
    expect(fine.candidates.map((c) => c.line.id)).toEqual(["d2"]);
  });

  it("does not reach 0.45 nm from a clean peak placed to ±0.004 nm (Li I 460.29 at Sr I 460.73)", () => {
    // NIST ASD air wavelengths (from memory): Sr I 460.733 nm, Li I 460.286 nm.
    const lines = [line("sr", "Sr I", 460.733), line("li", "Li I", 460.286)];
    // A peak as wide as the instrument's line (1 nm) can hide no companion 0.45 nm away: that
    // would have widened it by a fifth. σ_res is then a tenth of the FWHM.
    const [clean] = matchPeaksToLines([peak(460.733, 0.004, 1)], lines, { resolutionNm: 1 });
    expect(clean.candidates.map((c) => c.line.id)).toEqual(["sr"]);
    expect(clean.candidates[0].sigmaNm).toBeCloseTo(Math.hypot(0.004, 0.001, 0.1), 12);
    // The same peak 30 % wider than a line, or flagged blended, may hold both.
    const [wider] = matchPeaksToLines([peak(460.6, 0.004, 1.3)], lines, { resolutionNm: 1 });
    expect(wider.candidates.map((c) => c.line.id).sort()).toEqual(["li", "sr"]);
    const [blend] = matchPeaksToLines([{ ...peak(460.6, 0.004, 1), blended: true }], lines, {
      resolutionNm: 1,
    });
    expect(blend.candidates.map((c) => c.line.id).sort()).toEqual(["li", "sr"]);
  });

  it("falls back to each peak's own FWHM when no resolution is given", () => {
    const lines = [line("d2", "Na I", 588.995)];
    const [narrow, wide] = matchPeaksToLines([peak(589.4, 0.01, 0.2), peak(589.4, 0.01, 2)], lines);
    expect(narrow.candidates).toHaveLength(0);
    expect(wide.candidates).toHaveLength(1);
  });

  it("matches a band from its head into the side it degrades to, not beyond the head zone", () => {
    const band = line("caoh", "CaOH", 554, {
      uncertaintyNm: 0.1,
      flags: { bandHead: true },
      band: { extentNm: 10, degradesTo: "red" },
    });
    const options = { resolutionNm: 1, bandHeadZoneFraction: 0.3 };
    const sigma = Math.sqrt(0.03 ** 2 + 0.1 ** 2 + 1 / 12);
    // A resolved band's feature is wider than a line: 3 nm at 1 nm resolution.
    const bandPeak = (nm: number) => peak(nm, 0.03, 3);
    const [inside, past, violetSide, farViolet] = matchPeaksToLines(
      [bandPeak(555.5), bandPeak(557 + 3.2 * sigma), bandPeak(554 - 2 * sigma), bandPeak(550)],
      [band],
      options,
    );
    expect(inside.candidates[0].deltaSigma).toBe(0);
    expect(inside.candidates[0].kind).toBe("band");
    expect(past.candidates).toHaveLength(0);
    expect(violetSide.candidates[0].deltaSigma).toBeCloseTo(-2, 9);
    expect(farViolet.candidates).toHaveLength(0);

    const violetBand = { ...band, band: { extentNm: 10, degradesTo: "violet" as const } };
    const [blueOfHead] = matchPeaksToLines([bandPeak(552.5)], [violetBand], options);
    expect(blueOfHead.candidates[0].deltaSigma).toBe(0);
  });

  it("offers a band only at a peak as wide as a band can be", () => {
    const band = line("caoh", "CaOH", 554, {
      uncertaintyNm: 0.1,
      flags: { bandHead: true },
      band: { extentNm: 8, degradesTo: "red" },
    });
    const at = (fwhmNm: number, resolutionNm?: number) =>
      matchPeaksToLines([peak(555, 0.03, fwhmNm)], [band], { resolutionNm })[0].candidates.length;
    // At 1 nm resolution the 8-nm band is resolved: a 1-nm peak is a line, a 3-nm one may be the band,
    // and one wider than its extent plus the blur at both ends (8 + 2 × 1 nm) is something else.
    expect(at(1, 1)).toBe(0);
    expect(at(3, 1)).toBe(1);
    expect(at(10, 1)).toBe(1);
    expect(at(10.5, 1)).toBe(0);
    // At 3 nm resolution the band is no wider than a few lines: a line-wide peak may be it.
    expect(at(3, 3)).toBe(1);
    // Without a resolution only the upper bound holds.
    expect(at(1)).toBe(1);
    expect(at(8.5)).toBe(0);
  });

  it("refuses invalid options and peaks with precise errors", () => {
    expect(() => matchPeaksToLines([peak(500)], [], { k: 0 })).toThrow(RangeError);
    expect(() => matchPeaksToLines([peak(Number.NaN)], [])).toThrow(/peak 0/);
    const index = prepareLineIndex([], { medium: "vacuum" });
    expect(() => matchPeaksToLines([peak(500)], index, { medium: "air" })).toThrow(/disagrees/);
  });

  const lineArb = fc.record({
    airNm: fc.double({ min: 200, max: 1000, noNaN: true }),
    uncertaintyNm: fc.double({ min: 0, max: 0.5, noNaN: true }),
    band: fc.option(
      fc.record({
        extentNm: fc.double({ min: 0.1, max: 20, noNaN: true }),
        degradesTo: fc.constantFrom("red" as const, "violet" as const),
      }),
      { freq: 5 },
    ),
  });
  const peakArb = fc.record({
    wavelengthNm: fc.double({ min: 190, max: 1010, noNaN: true }),
    wavelengthUncertaintyNm: fc.double({ min: 0, max: 1, noNaN: true }),
    fwhmNm: fc.double({ min: 0, max: 5, noNaN: true }),
  });
  const toLines = (
    rows: {
      airNm: number;
      uncertaintyNm: number;
      band: { extentNm: number; degradesTo: "red" | "violet" } | null;
    }[],
  ) =>
    rows.map((row, i) =>
      line(`l${i}`, row.band ? "M" : "X I", row.airNm, {
        uncertaintyNm: row.uncertaintyNm,
        flags: row.band ? { bandHead: true } : {},
        band: row.band ?? undefined,
      }),
    );

  it("never throws on random peaks and lines, and every candidate lies within k·σ", () => {
    fc.assert(
      fc.property(
        fc.array(peakArb, { maxLength: 20 }),
        fc.array(lineArb, { maxLength: 60 }),
        fc.double({ min: 0.5, max: 5, noNaN: true }),
        fc.option(fc.double({ min: 0.01, max: 3, noNaN: true })),
        (peakRows, lineRows, k, resolutionNm) => {
          const peaks = peakRows.map((p) =>
            peak(p.wavelengthNm, p.wavelengthUncertaintyNm, p.fwhmNm),
          );
          const matches = matchPeaksToLines(peaks, toLines(lineRows), {
            k,
            resolutionNm: resolutionNm ?? undefined,
          });
          expect(matches).toHaveLength(peaks.length);
          for (const match of matches) {
            for (const candidate of match.candidates) {
              expect(Math.abs(candidate.deltaSigma)).toBeLessThanOrEqual(k);
              if (candidate.kind === "line") {
                expect(Math.abs(candidate.deltaNm)).toBeLessThanOrEqual(
                  k * candidate.sigmaNm * (1 + 1e-12),
                );
              }
            }
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("finds by binary search exactly the lines a brute-force scan finds", () => {
    fc.assert(
      fc.property(
        fc.array(peakArb, { maxLength: 10 }),
        fc.array(lineArb, { maxLength: 80 }),
        (peakRows, lineRows) => {
          const lines = toLines(lineRows.map((row) => ({ ...row, band: null })));
          const peaks = peakRows.map((p) =>
            peak(p.wavelengthNm, p.wavelengthUncertaintyNm, p.fwhmNm),
          );
          const matches = matchPeaksToLines(peaks, lines, { resolutionNm: 0.5 });
          matches.forEach((match, i) => {
            const expected = lines
              .map((l, lineIndex) => ({ l, lineIndex }))
              .filter(({ l }) => {
                // At 0.5 nm resolution, a peak not flagged blended: a tenth of the FWHM, or
                // what its width beyond the instrument's leaves open, within the peak.
                const excessNm = Math.sqrt(Math.max(0, peaks[i].fwhmNm ** 2 - 0.25));
                const sigmaRes = Math.max(
                  0.05,
                  Math.min(peaks[i].fwhmNm, 2 * excessNm) / Math.sqrt(12),
                );
                const sigma = Math.max(
                  1e-6,
                  Math.hypot(peaks[i].wavelengthUncertaintyNm, l.uncertaintyNm, sigmaRes),
                );
                return Math.abs(peaks[i].wavelengthNm - l.airNm) / sigma <= 3;
              })
              .map(({ lineIndex }) => lineIndex)
              .sort((a, b) => a - b);
            expect(match.candidates.map((c) => c.lineIndex).sort((a, b) => a - b)).toEqual(
              expected,
            );
          });
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("matchPeaksToLines: candidates as columns", () => {
  // A dense table (2,000 lines over 20 nm) gives each wide peak hundreds of candidates: more than the
  // columns first hold, so they grow.
  const dense = Array.from({ length: 2000 }, (_, i) =>
    line(`d${i}`, i % 2 ? "Fe I" : "Ti I", 580 + (i * 20) / 2000 + 0.0001 * (i % 7)),
  );
  const bands = [
    line("b", "CaOH", 590.2, {
      ionStage: null,
      flags: { bandHead: true },
      band: { extentNm: 2, degradesTo: "red" },
    }),
  ];
  const peaks = Array.from({ length: 19 }, (_, i) => peak(581 + i, 0.3, 2));

  it("holds the same candidates as the objects, which come closest first", () => {
    const matches = matchPeaksToLines(peaks, [...dense, ...bands], { resolutionNm: 2 });
    let total = 0;
    for (const match of matches) {
      const { columns, candidates } = match;
      total += columns.count;
      expect(candidates).toHaveLength(columns.count);
      const fromColumns = Array.from({ length: columns.count }, (_, i) => ({
        lineIndex: columns.lineIndex[i],
        kind: columns.band[i] ? "band" : "line",
        deltaSigma: columns.deltaSigma[i],
        sigmaNm: columns.sigmaNm[i],
      }));
      const fromObjects = candidates.map((c) => ({
        lineIndex: c.lineIndex,
        kind: c.kind,
        deltaSigma: c.deltaSigma,
        sigmaNm: c.sigmaNm,
      }));
      const byLine = (a: { lineIndex: number }, b: { lineIndex: number }) =>
        a.lineIndex - b.lineIndex;
      expect([...fromObjects].sort(byLine)).toEqual([...fromColumns].sort(byLine));
      for (let i = 1; i < candidates.length; i++) {
        expect(Math.abs(candidates[i].deltaSigma)).toBeGreaterThanOrEqual(
          Math.abs(candidates[i - 1].deltaSigma),
        );
      }
      // Read once, kept.
      expect(match.candidates).toBe(candidates);
    }
    expect(total).toBeGreaterThan(2048);
    expect(matches[9].candidates.some((c) => c.kind === "band")).toBe(true);
  });

  it("leaves an earlier result alone when it searches again", () => {
    const first = matchPeaksToLines(peaks, dense, { resolutionNm: 2 });
    const kept = first.map((m) => Array.from(m.columns.lineIndex));
    matchPeaksToLines([peak(592.5, 0.3, 2)], dense, { resolutionNm: 2 });
    expect(first.map((m) => Array.from(m.columns.lineIndex))).toEqual(kept);
  });
});
