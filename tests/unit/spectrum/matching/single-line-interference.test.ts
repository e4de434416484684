// One peak is no proof when another credible species has a line there too: two species whose only
// evidence is the same peak are both "possible", with the interference named; a faint line of a species
// seen strongly elsewhere does not stand in the way of a strong peak's own species.
// The species and wavelengths are invented (a test table, not the trade's data).
import { describe, expect, it } from "vitest";
import { identifyElements } from "@/lib/spectrum/matching";
import type { CalibratedPeak, ReferenceLine } from "@/lib/spectrum/types";
import { calibratedPeak } from "../../../support/calibrated-peak";
import { inventedLine } from "../../../support/invented-line";

function line(species: string, airNm: number, flame: number | null): ReferenceLine {
  return inventedLine(species, airNm, flame === null ? {} : { flame }, {
    ionStage: 1,
    uncertaintyNm: 0.002,
  });
}

function peak(wavelengthNm: number, snr: number): CalibratedPeak {
  return calibratedPeak(wavelengthNm, snr, {
    fwhmNm: 0.3,
    uncertaintyNm: 0.003,
    resolutionNm: 0.3,
  });
}

const options = {
  source: "flame" as const,
  rangeNm: [400, 700] as [number, number],
  resolutionNm: 0.3,
};
const verdict = (result: ReturnType<typeof identifyElements>, species: string) =>
  result.calls.find((c) => c.species === species)?.verdict;

describe("a present call on one peak that another species explains", () => {
  it("makes a species whose lines all sit in one peak possible when another species explains it", () => {
    // Xa's two lines blend into the one peak (which alone would score it present); Yb's line is there too.
    const table = [
      line("Xa I", 520.0, 1000),
      line("Xa I", 520.02, 800),
      line("Yb I", 520.03, 1000),
    ];
    const result = identifyElements([peak(520.015, 400)], table, options);
    expect(verdict(result, "Xa I")).toBe("possible");
    expect(verdict(result, "Yb I")).toBe("possible");
    const xa = result.calls.find((c) => c.species === "Xa I")!;
    expect(xa.notes).toContain(
      "Interference: Yb I also explains the only peak seen, at 520.01 nm; another line of Xa I would decide.",
    );
    expect(xa.rationale).toMatch(/^Possible:.*Yb I has a line there too\.$/);
  });

  it("leaves the call present when a second peak of its own backs it", () => {
    const table = [
      line("Xa I", 520.0, 1000),
      line("Xa I", 520.02, 800),
      line("Xa I", 590.0, 500),
      line("Yb I", 520.03, 1000),
    ];
    const result = identifyElements([peak(520.015, 400), peak(590.0, 200)], table, options);
    expect(verdict(result, "Xa I")).toBe("present");
  });

  it("keeps a strong peak's species present when the other's line there is one of its faintest", () => {
    // Zc is seen strongly at 610 nm; its line at 520.03 nm is a thousandth of that, so it cannot make
    // a peak of SNR 400: Xa's principal line is the only explanation.
    const table = [line("Xa I", 520.0, 1000), line("Zc I", 610.0, 1000), line("Zc I", 520.03, 1)];
    const result = identifyElements([peak(520.015, 400), peak(610.0, 500)], table, options);
    expect(verdict(result, "Xa I")).toBe("present");
    expect(verdict(result, "Zc I")).toBe("present");
  });

  it("judges a line the table gives no intensity by the species' faintest rated line seen", () => {
    const table = [
      line("Xa I", 520.0, 1000),
      line("Zc I", 610.0, 1000),
      line("Zc I", 640.0, 2),
      line("Zc I", 520.03, null),
    ];
    const result = identifyElements(
      [peak(520.015, 400), peak(610.0, 500), peak(640.0, 20)],
      table,
      options,
    );
    expect(verdict(result, "Xa I")).toBe("present");
  });

  it("makes one peak without the species' principal line possible", () => {
    // Xa's strongest line (380 nm) lies outside the range; its second line alone is no proof.
    const table = [line("Xa I", 380.0, 1000), line("Xa I", 520.0, 500)];
    const result = identifyElements([peak(520.0, 400)], table, options);
    const xa = result.calls.find((c) => c.species === "Xa I")!;
    expect(xa.verdict).toBe("possible");
    expect(xa.notes).toContain(
      "Only one peak is seen (520.00 nm) and it holds none of the principal line of Xa I; its strongest line would decide.",
    );
  });

  it("asks of a species seen nowhere else whether its other lines would have shown", () => {
    // Yb's line at the peak is a tenth of its 600-nm line: had Yb made even 30 % of an SNR-400 peak,
    // that line would stand at SNR 1200, and there is no peak there. Wb's other line is a hundredth:
    // it would stand at SNR 1.2, below detection, so Wb could have made the peak.
    const peaks = [peak(520.0, 400)];
    const yb = [line("Xa I", 520.0, 1000), line("Yb I", 520.03, 100), line("Yb I", 600.0, 1000)];
    expect(verdict(identifyElements(peaks, yb, options), "Xa I")).toBe("present");
    const wb = [line("Xa I", 520.0, 1000), line("Wb I", 520.03, 1000), line("Wb I", 600.0, 10)];
    const result = identifyElements(peaks, wb, options);
    expect(verdict(result, "Xa I")).toBe("possible");
    // The note names the line that would tell them apart: Wb's other line (Xa has none in range).
    expect(result.calls.find((c) => c.species === "Xa I")!.notes).toContain(
      "Interference: Wb I also explains the only peak seen, at 520.00 nm; a peak at Wb I 600.00 nm would decide.",
    );
  });

  it("weighs a species the table rates only for another source as a rival", () => {
    // Vd has no flame intensity, only an arc one: the table still holds it, and a flame can show it.
    const table = [
      line("Xa I", 520.0, 1000),
      inventedLine("Vd I", 520.03, { arc: 500 }, { ionStage: 1, uncertaintyNm: 0.002 }),
    ];
    const result = identifyElements([peak(520.0, 400)], table, options);
    expect(verdict(result, "Xa I")).toBe("possible");
    expect(result.calls.find((c) => c.species === "Xa I")!.notes.join(" ")).toMatch(
      /Vd I also explains/,
    );
  });

  it("weighs a rival line within half the instrument's width even when it is too far off to be matched", () => {
    // The peak is placed to ±0.003 nm, so Ub's line 0.12 nm off is no match for it; at 0.3 nm
    // resolution it still lies inside the peak and could make part of it.
    const table = [line("Xa I", 520.0, 1000), line("Ub I", 520.12, 1000)];
    const result = identifyElements([peak(520.0, 400)], table, options);
    const ub = result.calls.find((c) => c.species === "Ub I");
    expect(ub?.seen ?? []).toEqual([]);
    expect(verdict(result, "Xa I")).toBe("possible");
    // Beyond half the width it is no rival.
    const far = [line("Xa I", 520.0, 1000), line("Ub I", 520.2, 1000)];
    expect(verdict(identifyElements([peak(520.0, 400)], far, options), "Xa I")).toBe("present");
  });

  it("does not count another ion of the same element as an interference", () => {
    const table = [line("Xa I", 520.0, 1000), { ...line("Xa II", 520.03, 1000), ionStage: 2 }];
    const result = identifyElements([peak(520.0, 400)], table, options);
    expect(verdict(result, "Xa I")).toBe("present");
  });

  it("makes one faint peak possible even when it holds the principal line and nothing else explains it", () => {
    const table = [line("Xa I", 520.0, 1000), line("Xa I", 600.0, 100)];
    expect(verdict(identifyElements([peak(520.0, 6)], table, options), "Xa I")).toBe("possible");
    const faint = identifyElements([peak(520.0, 6)], table, options).calls.find(
      (c) => c.species === "Xa I",
    )!;
    expect(faint.notes[0]).toMatch(
      /^Only one peak is seen \(520\.00 nm\), at SNR 6\.0: too faint alone/,
    );
    expect(verdict(identifyElements([peak(520.0, 40)], table, options), "Xa I")).toBe("present");
  });
});
