// Which lamp lines share one peak with a neighbour: the pairing leaves those out, because the peak's
// centre lies between the lines; near-coincident lines and well-separated ones are kept.
import { describe, it, expect } from "vitest";
import type { LampLine } from "@/lib/spectrum/calibration";
import { lampLineBlended } from "@/lib/spectrum/calibration/lamp-line-blended";
import { HG_NE_AR_LINES as LINES } from "./lamp-lines";

/** An axis of 1 nm per pixel (a prism's red end) and a 2.5 px slit image. */
const xOf = (wavelengthNm: number) => wavelengthNm;
const FWHM_X = 2.5;
const indexOf = (lines: LampLine[], wavelengthNm: number) =>
  lines.findIndex((l) => l.wavelengthNm === wavelengthNm);

describe("lampLineBlended", () => {
  const candidates = LINES.map((_, i) => i);

  it("flags Ar I 800.616 nm, 0.86 px from the stronger 801.479 nm, and that one too", () => {
    expect(lampLineBlended(LINES, candidates, indexOf(LINES, 800.616), xOf, FWHM_X)).toBe(true);
    expect(lampLineBlended(LINES, candidates, indexOf(LINES, 801.479), xOf, FWHM_X)).toBe(true);
  });

  it("keeps a line whose neighbours lie beyond reach, or are too weak to pull its centre", () => {
    // Ar I 763.511 nm: the nearest listed lines are 9 nm and more away.
    expect(lampLineBlended(LINES, candidates, indexOf(LINES, 763.511), xOf, FWHM_X)).toBe(false);
    const pair: LampLine[] = [
      { wavelengthNm: 700, intensity: 1000, species: "X", id: "a" },
      { wavelengthNm: 701, intensity: 10, species: "X", id: "b" },
    ];
    // 1 % as strong: below the 5 % that counts.
    expect(lampLineBlended(pair, [0, 1], 0, xOf, FWHM_X)).toBe(false);
  });

  it("keeps near-coincident lines whose centroid lies within a twentieth of the FWHM of either", () => {
    const close: LampLine[] = [
      { wavelengthNm: 772.376, intensity: 150, species: "Ar I", id: "a" },
      { wavelengthNm: 772.421, intensity: 100, species: "Ar I", id: "b" },
    ];
    expect(lampLineBlended(close, [0, 1], 0, xOf, FWHM_X)).toBe(false);
    expect(lampLineBlended(close, [0, 1], 0, xOf, 0.5)).toBe(false);
    // The same pair imaged ten times narrower and ten times more dispersed is resolved.
    expect(lampLineBlended(close, [0, 1], 0, (l) => 10 * l, 0.25)).toBe(false);
  });

  it("refuses a non-positive FWHM", () => {
    expect(() => lampLineBlended(LINES, candidates, 0, xOf, 0)).toThrow(RangeError);
  });
});
