// An absent call carries a detection limit: the least height its strongest line in range needed to be
// found, checked against a hand calculation from the noise the spectrum was made with.
import { describe, it, expect } from "vitest";
import { analyzeSample } from "../../../../lib/spectrum/analysis";
import { makeRandom } from "../../../../lib/spectrum/synthetic/make-random";
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
