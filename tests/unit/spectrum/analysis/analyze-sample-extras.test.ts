// Checks the parts of analyzeSample around the identification: heavily oversampled input is binned
// like a lamp's, the removed continuum comes back on the input axis, a Boltzmann temperature is found
// from a synthetic LTE spectrum whose temperature the generator knows, and an assumed excitation
// temperature sets the expected relative intensities.
import { describe, expect, it } from "vitest";
import { analyzeSample } from "../../../../lib/spectrum/analysis";
import { fitCalibration } from "../../../../lib/spectrum/calibration";
import { synthesizeSpectrum } from "../../../../lib/spectrum/synthetic";
import type { ReferenceLine } from "../../../../lib/spectrum/types";

// CODATA 2018 value of the Boltzmann constant in eV/K.
const K_EV = 8.617333262e-5;

function line(
  id: string,
  species: string,
  airNm: number,
  extra: Partial<ReferenceLine> = {},
): ReferenceLine {
  return {
    id,
    species,
    element: species.split(" ")[0],
    ionStage: 1,
    airNm,
    vacuumNm: airNm * 1.00028,
    uncertaintyNm: 0.001,
    intensities: { flame: 100 },
    flags: {},
    ...extra,
  };
}

const linearCalibration = (pixels: number, wavelengthOfPixel: (px: number) => number) =>
  fitCalibration(
    [0, 0.2, 0.4, 0.6, 0.8, 1].map((u) => ({
      x: u * (pixels - 1),
      wavelengthNm: wavelengthOfPixel(u * (pixels - 1)),
    })),
    { model: "polynomial", degree: 1, domain: [0, pixels - 1] },
  ).model;

describe("analyzeSample on a heavily oversampled array", () => {
  const PIXELS = 1_000_000;
  const wavelengthOfPixel = (px: number) => 400 + (300 * px) / (PIXELS - 1);
  const LINES_NM = [420, 465, 510, 630, 680];
  const table = LINES_NM.map((nm, i) => line(`a${i}`, "A I", nm));
  // A 0.6 nm line spans 2000 samples here, where the smoothing window expects a few.
  const sample = synthesizeSpectrum({
    pixelCount: PIXELS,
    wavelengthOfPixel,
    resolutionNm: 0.6,
    lines: LINES_NM.map((wavelengthNm) => ({ wavelengthNm, amplitude: 2000 })),
    continuum: { shape: "polynomial", coefficients: [450, 150] }, // 300 → 600 counts over the range
    readNoiseCounts: 5,
    darkCounts: 100,
    seed: 5,
  });
  const analysis = analyzeSample(sample.x, sample.y, table, {
    calibration: linearCalibration(PIXELS, wavelengthOfPixel),
    resolutionNm: 0.6,
  });

  it("bins to a few samples per line and still finds every line at its wavelength", () => {
    expect(analysis.binningFactor).toBeGreaterThan(100);
    for (const nm of LINES_NM) {
      const nearest = Math.min(...analysis.peaks.map((p) => Math.abs(p.wavelengthNm - nm)));
      // Well inside a tenth of the 0.6 nm resolution.
      expect(nearest, `${nm} nm`).toBeLessThan(0.06);
    }
    expect(analysis.identification.calls.find((c) => c.species === "A I")?.verdict).toBe("present");
  });

  it("returns the removed continuum on the input axis, one value per sample", () => {
    expect(analysis.continuum).toHaveLength(PIXELS);
    // Away from the lines the continuum follows the dark level plus the drawn linear continuum.
    const px = Math.round((PIXELS - 1) * ((560 - 400) / 300));
    const truth = 100 + 300 + 300 * (px / (PIXELS - 1));
    expect(Math.abs(analysis.continuum[px] - truth)).toBeLessThan(0.05 * truth);
  });
});

describe("analyzeSample's Boltzmann temperature and assumed LTE intensities", () => {
  const PIXELS = 2048;
  const wavelengthOfPixel = (px: number) => 400 + (300 * px) / (PIXELS - 1);
  const calibration = linearCalibration(PIXELS, wavelengthOfPixel);
  // An invented species with the atomic data a Boltzmann plot needs, upper energies over 2.3 eV.
  const atomic = [
    { nm: 420, g: 3, a: 2e7, upperEv: 2.9 },
    { nm: 455, g: 5, a: 5e7, upperEv: 3.6 },
    { nm: 500, g: 7, a: 8e7, upperEv: 4.4 },
    { nm: 560, g: 3, a: 3e7, upperEv: 2.2 },
    { nm: 610, g: 5, a: 6e7, upperEv: 3.2 },
    { nm: 660, g: 9, a: 9e7, upperEv: 4.0 },
  ];
  const TRUE_T = 4000;
  // I ∝ g·A/λ·exp(−E/kT) (Boltzmann population of the upper level, photon energy ∝ 1/λ); the heights
  // stand for the areas here, since every line is drawn with the same width on a linear axis.
  const strength = (l: (typeof atomic)[number]) =>
    ((l.g * l.a) / l.nm) * Math.exp(-l.upperEv / (K_EV * TRUE_T));
  const strongest = Math.max(...atomic.map(strength));
  const table = atomic.map((l, i) =>
    line(`t${i}`, "T I", l.nm, { g: l.g, a: l.a, upperEv: l.upperEv, intensities: { flame: 100 } }),
  );
  const sample = synthesizeSpectrum({
    pixelCount: PIXELS,
    wavelengthOfPixel,
    resolutionNm: 0.6,
    lines: atomic.map((l) => ({
      wavelengthNm: l.nm,
      amplitude: (20000 * strength(l)) / strongest,
    })),
    readNoiseCounts: 3,
    darkCounts: 100,
    seed: 9,
  });
  const analysis = analyzeSample(sample.x, sample.y, table, { calibration, resolutionNm: 0.6 });

  it("finds the generator's temperature within 5 %", () => {
    expect(analysis.temperature.ok, JSON.stringify(analysis.temperature)).toBe(true);
    if (!analysis.temperature.ok) return;
    expect(analysis.temperature.species).toBe("T I");
    expect(analysis.temperature.lineCount).toBe(atomic.length);
    expect(Math.abs(analysis.temperature.temperatureK / TRUE_T - 1)).toBeLessThan(0.05);
    expect(analysis.temperature.rSquared).toBeGreaterThan(0.98);
  });

  it("says why when no species has the atomic data", () => {
    const bare = table.map((l) => ({ ...l, g: undefined, a: undefined, upperEv: undefined }));
    const plain = analyzeSample(sample.x, sample.y, bare, { calibration, resolutionNm: 0.6 });
    expect(plain.temperature).toMatchObject({ ok: false });
    if (!plain.temperature.ok) expect(plain.temperature.message).toMatch(/transition probability/);
  });

  it("expects weak high-energy lines at a cool assumed temperature and strong ones from the table", () => {
    // Two lines of an invented species with equal table intensities; only the low-energy one is drawn.
    const pair = [
      line("u0", "U I", 520, { g: 4, a: 5e7, upperEv: 2.4 }),
      line("u1", "U I", 600, { g: 4, a: 5e7, upperEv: 6.4 }),
    ];
    const one = synthesizeSpectrum({
      pixelCount: PIXELS,
      wavelengthOfPixel,
      resolutionNm: 0.6,
      lines: [{ wavelengthNm: 520, amplitude: 5000 }],
      readNoiseCounts: 3,
      darkCounts: 100,
      seed: 2,
    });
    const call = (lteTemperatureK?: number) =>
      analyzeSample(one.x, one.y, pair, {
        calibration,
        resolutionNm: 0.6,
        lteTemperatureK,
      }).identification.calls.find((c) => c.species === "U I")!;
    // Table values: the 600 nm line is as strong as the seen one, so its absence counts against U I.
    expect(call().missingStrongCount).toBe(1);
    // At 2500 K, exp(−4 eV / kT) ≈ 1e-8: the 600 nm line is not expected to show.
    expect(call(2500).missingStrongCount).toBe(0);
    expect(() => call(-5)).toThrow(RangeError);
  });
});
