// Checks that the capped seen-line listing changes no verdict or score: a call lists its strongest
// seen lines, counts all of them, and says in its rationale how many it left out.
import { describe, it, expect } from "vitest";
import {
  matchPeaksToLines,
  prepareLineIndex,
  scoreElements,
} from "../../../../lib/spectrum/matching";
import type { CalibratedPeak, ReferenceLine } from "../../../../lib/spectrum/types";
import { makeRandom } from "../../../../lib/spectrum/statistics";

const RANGE_NM: [number, number] = [400, 700];

/** A dense species (thousands of lines, a few unrated) among two sparse ones. */
function table(): ReferenceLine[] {
  const random = makeRandom(41);
  const rows: ReferenceLine[] = [];
  const add = (species: string, count: number, rate: () => number | undefined) => {
    for (let i = 0; i < count; i++) {
      const airNm = 395 + 310 * random.uniform();
      const value = rate();
      rows.push({
        id: `${species}-${i}`,
        species,
        element: species.split(" ")[0],
        ionStage: 1,
        airNm,
        vacuumNm: airNm * 1.00028,
        uncertaintyNm: 0.001,
        intensities: value === undefined ? {} : { arc: value },
        flags: {},
      });
    }
  };
  // Integer intensities so that ties in strength occur and their order is exercised.
  add("Dd I", 6000, () =>
    random.uniform() < 0.05 ? undefined : 1 + Math.floor(20 * random.uniform()),
  );
  add("Ee I", 30, () => 10 + Math.floor(990 * random.uniform()));
  add("Ff II", 300, () => 1 + Math.floor(999 * random.uniform()));
  return rows;
}

function peaks(): CalibratedPeak[] {
  const random = makeRandom(42);
  return Array.from({ length: 30 }, () => {
    const wavelengthNm = RANGE_NM[0] + 300 * random.uniform();
    const snr = 10 + 300 * random.uniform();
    return {
      index: 0,
      x: wavelengthNm,
      xUncertainty: 0.01,
      height: 10 * snr,
      fwhm: 1,
      area: 10 * snr,
      snr,
      saturated: false,
      blended: false,
      wavelengthNm,
      wavelengthUncertaintyNm: 0.02,
      fwhmNm: 1,
    };
  }).sort((a, b) => a.wavelengthNm - b.wavelengthNm);
}

describe("scoreElements with a capped list of seen lines", () => {
  const index = prepareLineIndex(table());
  const matches = matchPeaksToLines(peaks(), index, { resolutionNm: 1 });
  // Absent calls are trimmed further by their own cap, tested on its own below.
  const options = { source: "flame" as const, rangeNm: RANGE_NM, maxListedWhenAbsent: 100_000 };
  const full = scoreElements(matches, index, { ...options, maxSeenListed: 100_000 });

  it("has a call with far more seen lines than the default cap lists", () => {
    const dense = full.calls.find((call) => call.species === "Dd I")!;
    expect(dense.seen.length).toBeGreaterThan(100);
    expect(dense.seen.some((s) => s.relativeIntensity === null)).toBe(true);
  });

  for (const maxSeenListed of [25, 3, 0]) {
    it(`keeps verdicts, scores and counts, and lists the ${maxSeenListed} strongest`, () => {
      const capped = scoreElements(matches, index, { ...options, maxSeenListed });
      expect(capped.calls.map((c) => c.species)).toEqual(full.calls.map((c) => c.species));
      capped.calls.forEach((call, i) => {
        const all = full.calls[i].seen;
        expect(call.verdict, call.species).toBe(full.calls[i].verdict);
        expect(call.score, call.species).toBe(full.calls[i].score);
        expect(call.seenCount, call.species).toBe(all.length);
        expect(full.calls[i].seenCount, call.species).toBe(all.length);
        // The reference choice: strongest first (unrated last), ties to the earlier line, then
        // shown in the uncapped list's order.
        const strength = (k: number) => all[k].relativeIntensity ?? -1;
        const chosen = all
          .map((_, k) => k)
          .sort((a, b) => strength(b) - strength(a) || a - b)
          .slice(0, maxSeenListed)
          .sort((a, b) => a - b);
        expect(call.seen, call.species).toEqual(chosen.map((k) => all[k]));
        const left = all.length - call.seen.length;
        if (left > 0) {
          // Counted over every seen line, with the peaks they stand on (several lines may share one).
          const peaks = new Set(all.map((s) => s.peakIndex)).size;
          expect(call.seenPeaks, call.species).toBe(peaks);
          expect(call.rationale).toContain(
            peaks < all.length
              ? `${all.length} lines seen at ${peaks} peak${peaks === 1 ? "" : "s"} (`
              : `${all.length} lines seen (`,
          );
          expect(call.rationale).toContain(`, and ${left} more; within`);
        } else {
          expect(call.rationale).toBe(full.calls[i].rationale);
        }
      });
    });
  }

  it("refuses a cap that is not a whole number", () => {
    expect(() => scoreElements(matches, index, { ...options, maxSeenListed: -1 })).toThrow(
      RangeError,
    );
    expect(() => scoreElements(matches, index, { ...options, maxSeenListed: 2.5 })).toThrow(
      RangeError,
    );
  });
});

describe("scoreElements on absent calls", () => {
  const index = prepareLineIndex(table());
  const matches = matchPeaksToLines(peaks(), index, { resolutionNm: 1 });
  const options = { source: "flame" as const, rangeNm: RANGE_NM };
  const full = scoreElements(matches, index, { ...options, maxListedWhenAbsent: 100_000 });
  const trimmed = scoreElements(matches, index, options);

  it("lists an absent call's 5 strongest seen lines and 5 first missing ones, counts unchanged", () => {
    const absent = trimmed.calls.filter((call) => call.verdict === "absent");
    expect(
      absent.some((call) => full.calls.find((c) => c.species === call.species)!.seen.length > 5),
    ).toBe(true);
    trimmed.calls.forEach((call, i) => {
      const whole = full.calls[i];
      expect(call.species).toBe(whole.species);
      expect([call.verdict, call.score, call.seenCount, call.missingCount, call.rationale]).toEqual(
        [whole.verdict, whole.score, whole.seenCount, whole.missingCount, whole.rationale],
      );
      if (call.verdict !== "absent") {
        expect(call.seen).toEqual(whole.seen);
        expect(call.missing).toEqual(whole.missing);
        return;
      }
      const strength = (k: number) => whole.seen[k].relativeIntensity ?? -1;
      const chosen = whole.seen
        .map((_, k) => k)
        .sort((a, b) => strength(b) - strength(a) || a - b)
        .slice(0, 5)
        .sort((a, b) => a - b);
      expect(call.seen, call.species).toEqual(chosen.map((k) => whole.seen[k]));
      expect(call.missing, call.species).toEqual(whole.missing.slice(0, 5));
    });
  });

  it("refuses a cap that is not a whole number ≥ 0", () => {
    expect(() => scoreElements(matches, index, { ...options, maxListedWhenAbsent: -1 })).toThrow(
      RangeError,
    );
    expect(() => scoreElements(matches, index, { ...options, maxListedWhenAbsent: 1.5 })).toThrow(
      RangeError,
    );
  });
});
