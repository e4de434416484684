// An absent call carries a detection limit: the least height its strongest line in range needed to be
// found, checked against a hand calculation from the noise the spectrum was made with.
import fc from "fast-check";
import { describe, it, expect } from "vitest";
import { analyzeSample } from "../../../../lib/spectrum/analysis";
import { detectionLimits } from "../../../../lib/spectrum/analysis/detection-limits";
import type { ElementCall } from "../../../../lib/spectrum/matching/score-elements-types";
import { prepareLineIndex } from "../../../../lib/spectrum/matching/prepare-line-index";
import { makeRandom } from "../../../../lib/spectrum/statistics/make-random";
import "../../../support/fast-check-seed";
import { inventedLine } from "../../../support/invented-line";

// An invented table: Xa is in the sample; Yb (principal 600 nm) and Zc (principal 800 nm, outside
// the range, and a weaker line at 650 nm) are not.
const line = (species: string, airNm: number, flame: number) =>
  inventedLine(species, airNm, { flame });
const table = [
  line("Xa I", 500, 1000),
  line("Yb I", 600, 1000),
  line("Yb I", 550, 200),
  line("Zc I", 800, 1000),
  line("Zc I", 650, 300),
];

const NOISE_COUNTS = 8;
const LINE_HEIGHT = 2000;
const n = 3001;
const random = makeRandom(5);
const x = Float64Array.from({ length: n }, (_, i) => 400 + (300 * i) / (n - 1));
const sigmaNm = 0.5 / (2 * Math.sqrt(2 * Math.LN2));
const y = Float64Array.from(
  x,
  (nm) =>
    300 +
    LINE_HEIGHT * Math.exp(-0.5 * ((nm - 500) / sigmaNm) ** 2) +
    NOISE_COUNTS * random.normal(),
);

describe("detection limits of absent calls", () => {
  const analysis = analyzeSample(x, y, table, { source: "flame", resolutionNm: 0.5, minSnr: 5 });
  const verdict = (species: string) =>
    analysis.identification.calls.find((c) => c.species === species)?.verdict;

  it("gives an absent species' principal line minSnr × the noise there, and its share of the strongest peak", () => {
    expect(verdict("Xa I")).toBe("present");
    expect(verdict("Yb I")).toBe("absent");
    const limit = analysis.detectionLimits["Yb I"];
    // By hand: a peak needs 5 σ to be found; σ = 8 counts, so 40 counts, 2 % of the 2000-count line.
    // (The analysis estimates σ from the data: within 10 % of the 8 counts the noise was drawn with.)
    expect(limit.lineNm).toBe(600);
    expect(limit.principal).toBe(true);
    expect(limit.counts / (5 * NOISE_COUNTS)).toBeGreaterThan(0.9);
    expect(limit.counts / (5 * NOISE_COUNTS)).toBeLessThan(1.1);
    expect(limit.counts).toBeCloseTo(5 * limit.noiseCounts, 12);
    expect(limit.relativeToStrongest! / ((5 * NOISE_COUNTS) / LINE_HEIGHT)).toBeGreaterThan(0.88);
    expect(limit.relativeToStrongest! / ((5 * NOISE_COUNTS) / LINE_HEIGHT)).toBeLessThan(1.12);
  });

  it("falls back to the strongest line in range when the principal lies outside, and says so", () => {
    expect(verdict("Zc I")).toBe("absent");
    const limit = analysis.detectionLimits["Zc I"];
    expect(limit.lineNm).toBe(650);
    expect(limit.principal).toBe(false);
  });

  it("gives none for a species that is not absent", () => {
    expect(analysis.detectionLimits["Xa I"]).toBeUndefined();
  });
});

describe("the line a detection limit is given for", () => {
  // The rule read straight off the rows: the strongest rated line of the species in range, an atomic
  // line before a band head of the same strength, then the shorter wavelength.
  const byScan = (rows: ReturnType<typeof inventedLine>[], range: [number, number]) => {
    const strongest = Math.max(...rows.map((l) => l.intensities.flame ?? 0));
    const rated = rows
      .filter((l) => l.airNm >= range[0] && l.airNm <= range[1] && (l.intensities.flame ?? 0) > 0)
      .sort(
        (a, b) =>
          b.intensities.flame! - a.intensities.flame! ||
          Number(Boolean(a.flags.bandHead)) - Number(Boolean(b.flags.bandHead)) ||
          a.airNm - b.airNm,
      );
    return rated.length === 0
      ? undefined
      : { lineNm: rated[0].airNm, principal: rated[0].intensities.flame === strongest };
  };
  const row = fc.record({
    species: fc.constantFrom("Xa I", "Yb I", "Zc I"),
    // Few distinct places and strengths, so ties of both are common.
    airNm: fc.integer({ min: 0, max: 40 }).map((i) => 400 + 5 * i),
    flame: fc.option(
      fc.integer({ min: 1, max: 4 }).map((i) => 250 * i),
      { nil: undefined },
    ),
    band: fc.boolean(),
  });

  it("is the one a scan of the rows picks, found without visiting every line", () => {
    fc.assert(
      fc.property(
        fc.array(row, { minLength: 1, maxLength: 40 }),
        fc.tuple(fc.integer({ min: 380, max: 620 }), fc.integer({ min: 0, max: 250 })),
        (rows, [low, span]) => {
          const lines = rows.map((r, i) =>
            inventedLine(r.species, r.airNm, r.flame === undefined ? {} : { flame: r.flame }, {
              id: `row-${i}`,
              ...(r.band
                ? { band: { extentNm: 2, degradesTo: "red" as const }, flags: { bandHead: true } }
                : {}),
            }),
          );
          const range: [number, number] = [low, low + span];
          const species = [...new Set(lines.map((l) => l.species))];
          const calls = species.map((name) => ({ species: name, verdict: "absent" }));
          const limits = detectionLimits(calls as ElementCall[], {
            index: prepareLineIndex(lines),
            source: "flame",
            rangeNm: range,
            noiseAtNm: () => 2,
            minSnr: 5,
            tallestHeight: 100,
          });
          for (const name of species) {
            const expected = byScan(
              lines.filter((l) => l.species === name),
              range,
            );
            const limit = limits.get(name);
            expect(limit && { lineNm: limit.lineNm, principal: limit.principal }).toEqual(expected);
          }
        },
      ),
    );
  });
});
