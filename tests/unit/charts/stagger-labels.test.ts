// Chart labels never overlap: each lane's labels clear each other by the gap at the assumed plot
// width, lanes fill lowest first, and a label that fits nowhere is left to hover.
import { describe, expect, it } from "vitest";
import { staggerLabels, staggeredLabelAnnotations } from "@/lib/charts/stagger-labels";

const OPTIONS = { plotWidthPx: 500, charWidthPx: 6, gapPx: 4, maxLanes: 3 };

/** Each placed label's extent in px, by lane. */
function extents(xs: number[], texts: string[], range: [number, number], lanes: (number | null)[]) {
  const px = OPTIONS.plotWidthPx / (range[1] - range[0]);
  return lanes.flatMap((lane, i) =>
    lane === null
      ? []
      : [
          {
            lane,
            from: (xs[i] - range[0]) * px - (texts[i].length * OPTIONS.charWidthPx) / 2,
            to: (xs[i] - range[0]) * px + (texts[i].length * OPTIONS.charWidthPx) / 2,
          },
        ],
  );
}

describe("staggerLabels", () => {
  it("keeps well spaced labels in the first lane", () => {
    const xs = [100, 600, 1100, 1600];
    const texts = xs.map(() => "Hg I 546.07");
    expect(staggerLabels(xs, texts, [0, 2048], OPTIONS)).toEqual([0, 0, 0, 0]);
  });

  it("staggers close labels into higher lanes and leaves a dense group to hover", () => {
    // Five labels of 66 px within 40 px of each other: three lanes, then no room.
    const xs = [1000, 1010, 1020, 1030, 1040];
    const texts = xs.map(() => "Ar I 763.51");
    const lanes = staggerLabels(xs, texts, [0, 2048], OPTIONS);
    expect(lanes).toEqual([0, 1, 2, null, null]);
  });

  it("never lets two labels of a lane overlap, whatever the order of the input (fixed seed)", () => {
    let seed = 7;
    const random = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    for (let trial = 0; trial < 50; trial++) {
      const xs = Array.from({ length: 40 }, () => random() * 2048);
      const texts = xs.map((x) => `Ne I ${(500 + x / 10).toFixed(2)}`);
      const lanes = staggerLabels(xs, texts, [0, 2048], OPTIONS);
      const placed = extents(xs, texts, [0, 2048], lanes);
      for (const a of placed)
        for (const b of placed)
          if (a !== b && a.lane === b.lane)
            expect(a.to + OPTIONS.gapPx <= b.from || b.to + OPTIONS.gapPx <= a.from).toBe(true);
      // A label left to hover found every lane occupied at its place.
      expect(lanes.filter((l) => l !== null).length).toBeGreaterThan(0);
    }
  });

  it("refuses texts and positions of different lengths", () => {
    expect(() => staggerLabels([1, 2], ["a"], [0, 10])).toThrow(RangeError);
  });

  it("puts the labels in a band above the plot, lifted by lane, whatever their marks' heights", () => {
    const annotations = staggeredLabelAnnotations(
      [1000, 1010, 1020, 1030].map((x) => ({ x, text: "Ar I 763.51" })),
      [0, 2048],
      OPTIONS,
    );
    expect(annotations.map((a) => [a.x, a.yref, a.y, a.yshift])).toEqual([
      [1000, "paper", 1, 2],
      [1010, "paper", 1, 15],
      [1020, "paper", 1, 28],
    ]);
  });
});
