// Counts read as English: one row, two rows, no rows; irregular plurals given; thousands separated.
import { describe, expect, it } from "vitest";
import { countOf } from "@/lib/text/count-of";

describe("countOf", () => {
  it("takes the singular for exactly one and the plural otherwise", () => {
    expect(countOf(1, "row")).toBe("1 row");
    expect(countOf(0, "row")).toBe("0 rows");
    expect(countOf(2, "row")).toBe("2 rows");
    expect(countOf(1.5, "line")).toBe("1.5 lines");
  });

  it("takes an irregular plural and separates thousands", () => {
    expect(countOf(1, "spectrum", "spectra")).toBe("1 spectrum");
    expect(countOf(3, "spectrum", "spectra")).toBe("3 spectra");
    expect(countOf(300000, "line")).toBe("300,000 lines");
  });
});
