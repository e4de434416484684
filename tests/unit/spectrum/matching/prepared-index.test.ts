// Checks that the per-species structures of a prepared index change no call, and that scoring does
// not depend on lines far from every peak and outside the range.
import { describe, it, expect } from "vitest";
import { identifyElements, prepareLineIndex } from "../../../../lib/spectrum/matching";
import { buildMaxTree } from "../../../../lib/spectrum/matching/build-max-tree";
import { collectAtLeast } from "../../../../lib/spectrum/matching/collect-at-least";
import { matchPeaksToLines } from "../../../../lib/spectrum/matching/match-peaks-to-lines";
import { scoreElements } from "../../../../lib/spectrum/matching/score-elements";
import type { ReferenceLine } from "../../../../lib/spectrum/types";
import { makeRandom } from "../../../../lib/spectrum/statistics";
import { flameRun, FLAME_RANGE_NM, FLAME_RESOLUTION_NM } from "./flame-fixture";

const OPTIONS = {
  source: "flame" as const,
  rangeNm: FLAME_RANGE_NM,
  resolutionNm: FLAME_RESOLUTION_NM,
};
const run = flameRun({ "Na I": 20000, "K I": 8000, "Li I": 6000, "Sr I": 4000, CaOH: 1500 });

describe("a prepared line index", () => {
  it("gives the same identification as the raw lines", () => {
    const raw = identifyElements(run.peaks, run.table, OPTIONS);
    const prepared = identifyElements(run.peaks, prepareLineIndex(run.table), OPTIONS);
    expect(JSON.stringify(prepared)).toBe(JSON.stringify(raw));
  });

  it("refuses to score matches made against another table", () => {
    const index = prepareLineIndex(run.table);
    const matches = matchPeaksToLines(run.peaks, index, OPTIONS);
    // The same lines in reverse order: every candidate's table position now names another line.
    const reversed = prepareLineIndex(run.table.slice().reverse());
    expect(() => scoreElements(matches, reversed, OPTIONS)).toThrow(
      /was matched against a different line table than the one scored/,
    );
    expect(() => scoreElements(matches, index, OPTIONS)).not.toThrow();
  });

  it("leaves the calls unchanged when 100,000 lines of an unrelated species lie far from every peak", () => {
    const random = makeRandom(5);
    const far: ReferenceLine[] = Array.from({ length: 100_000 }, (_, i) => {
      // 900–1000 nm: outside the 380–780 nm range and far beyond every peak's k·σ window.
      const airNm = 900 + 100 * random.uniform();
      return {
        id: `far-${i}`,
        species: "Zz I",
        element: "Zz",
        ionStage: 1,
        airNm,
        vacuumNm: airNm * 1.00028,
        uncertaintyNm: 0.001,
        intensities: { flame: 1 + 999 * random.uniform() },
        flags: {},
      };
    });
    const before = identifyElements(run.peaks, prepareLineIndex(run.table), OPTIONS);
    const after = identifyElements(run.peaks, prepareLineIndex(run.table.concat(far)), OPTIONS);
    expect(after.calls.map((c) => c.species)).not.toContain("Zz I");
    expect(JSON.stringify(after.calls)).toBe(JSON.stringify(before.calls));
    expect(JSON.stringify(after.overlaps)).toBe(JSON.stringify(before.overlaps));
    expect(after.unexplainedPeaks.map((u) => u.peakIndex)).toEqual(
      before.unexplainedPeaks.map((u) => u.peakIndex),
    );
  });
});

describe("collectAtLeast on a buildMaxTree", () => {
  it("lists exactly the positions in range at or above the threshold, in order", () => {
    const random = makeRandom(9);
    for (let trial = 0; trial < 200; trial++) {
      const n = 1 + Math.floor(random.uniform() * 70);
      const values = Float64Array.from({ length: n }, () =>
        random.uniform() < 0.2 ? NaN : random.uniform(),
      );
      const tree = buildMaxTree(values);
      const from = Math.floor(random.uniform() * (n + 1));
      const to = from + Math.floor(random.uniform() * (n + 1 - from));
      const threshold = random.uniform();
      const expected: number[] = [];
      for (let p = from; p < to; p++) if (values[p] >= threshold) expected.push(p);
      expect(collectAtLeast(tree, from, to, threshold, [])).toEqual(expected);
    }
  });
});
