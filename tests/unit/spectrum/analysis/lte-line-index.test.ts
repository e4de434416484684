// The LTE index is built once per base index, source and temperature, and is what building it anew gives.
// The species and its atomic data are invented (a test table, not the trade's data).
import { describe, expect, it } from "vitest";
import { lteLineIndex } from "@/lib/spectrum/analysis/lte-line-index";
import { lteReferenceLines } from "@/lib/spectrum/analysis/lte-reference-lines";
import { prepareLineIndex } from "@/lib/spectrum/matching";
import { inventedLine } from "../../../support/invented-line";

const table = [
  inventedLine("Xa I", 500, { arc: 100 }, { g: 5, a: 1e7, upperEv: 3.0 }),
  inventedLine("Xa I", 520, { arc: 300 }, { g: 3, a: 5e7, upperEv: 4.2 }),
  inventedLine("Xa I", 540, { arc: 50 }, { g: 7, a: 2e6, upperEv: 2.5 }),
];

describe("lteLineIndex", () => {
  it("returns the index building it anew would, once per source and temperature", () => {
    const base = prepareLineIndex(table);
    const at5000 = lteLineIndex(base, "arc", 5000);
    expect(lteLineIndex(base, "arc", 5000)).toBe(at5000);
    const fresh = prepareLineIndex(lteReferenceLines(table, "arc", 5000));
    expect(Array.from(at5000.species[0].bySource.arc.relative)).toEqual(
      Array.from(fresh.species[0].bySource.arc.relative),
    );
    // The prediction differs from the table's own values, and with the temperature.
    expect(Array.from(at5000.species[0].bySource.arc.relative)).not.toEqual(
      Array.from(base.species[0].bySource.arc.relative),
    );
    expect(lteLineIndex(base, "arc", 8000)).not.toBe(at5000);
  });

  it("keeps two temperatures per base index and builds a third anew", () => {
    const base = prepareLineIndex(table);
    const first = lteLineIndex(base, "arc", 4000);
    lteLineIndex(base, "arc", 6000);
    lteLineIndex(base, "arc", 9000);
    expect(lteLineIndex(base, "arc", 4000)).not.toBe(first);
    // Another base index never shares them.
    expect(lteLineIndex(prepareLineIndex(table), "arc", 9000)).not.toBe(
      lteLineIndex(base, "arc", 9000),
    );
  });
});
