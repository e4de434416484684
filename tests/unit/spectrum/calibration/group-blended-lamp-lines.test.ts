// Lamp lines grouped as a spectrometer of a given resolution sees them: the mercury 365 nm group
// merged where its peak has its top, partly resolved neighbours left out, a tight blend of two gases
// refused.
import { describe, expect, it } from "vitest";
import { groupBlendedLampLines } from "@/lib/spectrum/calibration/group-blended-lamp-lines";
import type { LampLine } from "@/lib/spectrum/calibration";

const line = (wavelengthNm: number, intensity: number, species: string): LampLine => ({
  wavelengthNm,
  intensity,
  species,
  id: `${species}-${wavelengthNm}`,
});

describe("groupBlendedLampLines", () => {
  it("pairs the mercury 365 nm group as one line where its peak has its top", () => {
    // Hg I 365.015 and 365.483 nm (NIST ASD air wavelengths, from memory) with the starter table's
    // lamp intensities 400 and 80; Hg I 404.656 nm stands alone.
    const lines = [
      line(365.015, 400, "Hg I"),
      line(365.483, 80, "Hg I"),
      line(404.656, 300, "Hg I"),
    ];
    const groups = groupBlendedLampLines(lines, [0, 1, 2], () => 1.0);
    expect(groups).toHaveLength(2);
    const blend = groups[0];
    expect(blend.members).toEqual([0, 1]);
    // The summed profile's maximum at 1 nm FWHM, as SciPy's minimize_scalar finds it
    // (tests/reference/calibration-reference.json): 365.0669 nm, between the strong line and the
    // intensity-weighted centroid (400 × 365.015 + 80 × 365.483) / 480 = 365.093 nm.
    expect(blend.wavelengthNm).toBeCloseTo(365.0669, 4);
    expect(blend.intensity).toBe(480);
    expect(blend.wavelengthSigmaNm).toBeGreaterThan(0);
    expect(blend.wavelengthSigmaNm).toBeLessThan(0.08);
    expect(groups[1]).toMatchObject({ wavelengthNm: 404.656, members: [2], wavelengthSigmaNm: 0 });
  });

  it("moves a blend's top to its centroid as the resolution coarsens, and its σ with it", () => {
    // Far wider than their separation, the lines make one Gaussian-like peak at their centroid
    // (365.093 nm); at 0.6 nm FWHM the weak line only leans on the strong one's top.
    const lines = [line(365.015, 400, "Hg I"), line(365.483, 80, "Hg I")];
    const at = (fwhm: number) => groupBlendedLampLines(lines, [0, 1], () => fwhm)[0];
    expect(at(10).wavelengthNm).toBeCloseTo(365.093, 2);
    expect(at(0.6).wavelengthNm).toBeLessThan(365.04);
    expect(at(0.6).wavelengthNm).toBeGreaterThan(365.015);
    // The σ of a coarse blend's top is its centroid's: half the weak line's share times its distance.
    expect(at(10).wavelengthSigmaNm).toBeGreaterThan(0.5 * 0.5 * (80 / 480) * 0.39);
    expect(at(10).wavelengthSigmaNm).toBeLessThan(2 * 0.5 * (80 / 480) * 0.39 * Math.SQRT2);
  });

  it("keeps the group's lines apart when the resolution separates them", () => {
    const lines = [line(365.015, 400, "Hg I"), line(365.483, 80, "Hg I")];
    const groups = groupBlendedLampLines(lines, [0, 1], () => 0.1);
    expect(groups.map((g) => g.members)).toEqual([[0], [1]]);
  });

  it("leaves out a line whose neighbour is partly resolved (its centre is pulled)", () => {
    // 1.2 FWHM apart: neither merged nor clean.
    const lines = [line(500, 100, "Ne I"), line(501.2, 100, "Ne I"), line(520, 100, "Ne I")];
    const groups = groupBlendedLampLines(lines, [0, 1, 2], () => 1);
    expect(groups.map((g) => g.wavelengthNm)).toEqual([520]);
  });

  it("ignores a far weaker neighbour of the same gas", () => {
    const lines = [line(500, 100, "Ne I"), line(500.5, 1, "Ne I")];
    const groups = groupBlendedLampLines(lines, [0, 1], () => 1);
    expect(groups).toHaveLength(1);
    expect(groups[0]).toMatchObject({ wavelengthNm: 500, members: [0] });
  });

  it("refuses a blend of two gases whose shares the table cannot give", () => {
    const lines = [line(500, 100, "Ne I"), line(500.4, 100, "Ar I")];
    expect(groupBlendedLampLines(lines, [0, 1], () => 1)).toHaveLength(0);
  });

  it("merges two gases only when they are far closer than the resolution", () => {
    const lines = [line(500, 100, "Ne I"), line(500.05, 100, "Ar I")];
    const groups = groupBlendedLampLines(lines, [0, 1], () => 1);
    expect(groups).toHaveLength(1);
    expect(groups[0].wavelengthNm).toBeCloseTo(500.025, 6);
  });
});
