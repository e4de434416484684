// The sample generator behind the identification sweep keeps its promises: reproducible from its
// seed, lines only at the starter table's air wavelengths inside the range, each drawn where its truth
// says, and the interference cases built as named.
import { describe, expect, it } from "vitest";
import { STARTER_TABLE } from "../../../support/realistic-lamp";
import {
  INTERFERENCE_CASES,
  principalLine,
  realisticSample,
} from "../../../support/realistic-sample";

describe("realisticSample", () => {
  it("gives the same sample for the same seed and another for another seed", () => {
    const a = realisticSample(7);
    const b = realisticSample(7);
    const c = realisticSample(8);
    expect(Array.from(a.y)).toEqual(Array.from(b.y));
    expect(a.truth).toEqual(b.truth);
    expect(Array.from(c.y)).not.toEqual(Array.from(a.y));
  });

  it("draws table lines at the table's air wavelengths, inside the range, peaking where drawn", () => {
    const byId = new Map(STARTER_TABLE.map((l) => [l.id, l]));
    let checked = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const sample = realisticSample(seed, { axis: "wavelength" });
      const [low, high] = sample.truth.rangeNm;
      for (const line of sample.truth.lines) {
        expect(line.wavelengthNm).toBeGreaterThanOrEqual(low);
        expect(line.wavelengthNm).toBeLessThanOrEqual(high);
        if (line.lineId !== null) expect(line.wavelengthNm).toBe(byId.get(line.lineId)!.airNm);
      }
      // The strongest atomic line stands above its local floor (the lowest count within ±10 FWHM) by
      // at least half its drawn height at its own pixel.
      const atomic = sample.truth.lines.filter(
        (l) => l.lineId !== null && !/OH|Cl|BO2/.test(l.species),
      );
      if (atomic.length === 0) continue;
      const strongest = atomic.reduce((a, b) => (b.amplitudeCounts > a.amplitudeCounts ? b : a));
      if (strongest.amplitudeCounts < 500) continue;
      let at = 0;
      for (let i = 1; i < sample.x.length; i++) {
        if (
          Math.abs(sample.x[i] - strongest.wavelengthNm) <
          Math.abs(sample.x[at] - strongest.wavelengthNm)
        )
          at = i;
      }
      let floor = Infinity;
      for (let i = 0; i < sample.x.length; i++) {
        if (Math.abs(sample.x[i] - strongest.wavelengthNm) <= 10 * strongest.fwhmNm)
          floor = Math.min(floor, sample.y[i]);
      }
      checked++;
      expect(sample.y[at] - floor, `seed ${seed}`).toBeGreaterThan(0.5 * strongest.amplitudeCounts);
    }
    expect(checked).toBeGreaterThan(10);
  });

  it("builds each interference case with its element present and its interferer absent", () => {
    const seen = new Set<string>();
    for (let seed = 1; seed <= 120; seed++) {
      const sample = realisticSample(seed, { interferenceShare: 1 });
      const kase = INTERFERENCE_CASES.find((c) => c.name === sample.truth.interference)!;
      seen.add(kase.name);
      expect(sample.truth.elements).toContain(kase.element);
      if (kase.interferer) expect(sample.truth.elements).not.toContain(kase.interferer);
      expect(sample.source).toBe(kase.source);
      if (kase.name === "Na D at low resolution") {
        expect(sample.instrument).toBe("grating");
        // 0.8 nm or more: the D lines (0.6 nm apart) are then one peak (common practice).
        expect(sample.resolution.resolutionNm).toBeGreaterThanOrEqual(0.8);
      }
    }
    expect(seen.size).toBe(INTERFERENCE_CASES.length);
  });

  it("names the table's strongest flame line as sodium's principal line", () => {
    // NIST Atomic Spectra Database (as typed into the starter table): Na I 588.995 nm is the D2 line.
    expect(principalLine("Na", "flame")?.airNm).toBe(588.995);
  });
});
