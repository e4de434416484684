// Checks that a Boltzmann plot recovers the temperature of LTE intensities built from Fe I atomic data.
import { describe, it, expect } from "vitest";
import {
  BOLTZMANN_CONSTANT_EV_PER_K,
  boltzmannPlot,
  predictLteIntensities,
  type BoltzmannLine,
} from "../../../../lib/spectrum/temperature";
import { makeRandom } from "../../../../lib/spectrum/statistics";

// Fe I lines with air wavelength (nm), upper-level g, A (s⁻¹) and upper-level energy (eV), from the
// NIST Atomic Spectra Database (from memory, rounded); the test only needs them to be realistic,
// since intensities are generated from the same numbers.
const FE_I = [
  { wavelengthNm: 371.9935, g: 11, a: 1.62e7, upperEv: 3.332 },
  { wavelengthNm: 373.4864, g: 11, a: 9.02e7, upperEv: 4.178 },
  { wavelengthNm: 374.5561, g: 7, a: 1.15e7, upperEv: 3.396 },
  { wavelengthNm: 382.0425, g: 9, a: 6.67e7, upperEv: 4.103 },
  { wavelengthNm: 385.9911, g: 9, a: 9.69e6, upperEv: 3.211 },
  { wavelengthNm: 404.5812, g: 9, a: 8.62e7, upperEv: 4.549 },
  { wavelengthNm: 406.3594, g: 7, a: 6.65e7, upperEv: 4.61 },
  { wavelengthNm: 438.3545, g: 11, a: 5.0e7, upperEv: 4.312 },
  { wavelengthNm: 440.475, g: 9, a: 2.75e7, upperEv: 4.371 },
  { wavelengthNm: 495.7597, g: 11, a: 4.2e7, upperEv: 5.309 },
  { wavelengthNm: 532.8039, g: 9, a: 1.15e6, upperEv: 3.241 },
  { wavelengthNm: 537.1489, g: 7, a: 1.05e6, upperEv: 3.266 },
];

/** Intensities gA/λ·exp(−E/kT) scaled to 1e5 counts, each times exp(relativeNoise·N(0,1)). */
function observed(temperatureK: number, relativeNoise: number, seed: number): BoltzmannLine[] {
  const random = makeRandom(seed);
  const kT = BOLTZMANN_CONSTANT_EV_PER_K * temperatureK;
  return FE_I.map((line) => ({
    ...line,
    intensity:
      1e5 *
      ((line.g * line.a) / line.wavelengthNm) *
      Math.exp(-line.upperEv / kT) *
      Math.exp(relativeNoise * random.normal()),
  }));
}

describe("boltzmannPlot", () => {
  it("recovers the temperature exactly from noiseless LTE intensities", () => {
    const result = boltzmannPlot(observed(4500, 0, 1));
    if (!result.ok) throw new Error(result.message);
    expect(result.temperatureK).toBeCloseTo(4500, 6);
    expect(result.rSquared).toBeCloseTo(1, 12);
    expect(result.degreesOfFreedom).toBe(10);
    expect(result.points[0].y).toBeCloseTo(
      Math.log((observed(4500, 0, 1)[0].intensity * 371.9935) / (11 * 1.62e7)),
      12,
    );
  });

  it("recovers 4500 K within 3 % from intensities with 3 % scatter, and its uncertainty is honest", () => {
    const temperatures: number[] = [];
    const reported: number[] = [];
    for (let seed = 1; seed <= 200; seed++) {
      const result = boltzmannPlot(observed(4500, 0.03, seed));
      if (!result.ok) throw new Error(result.message);
      temperatures.push(result.temperatureK);
      reported.push(result.temperatureUncertaintyK);
      expect(Math.abs(result.temperatureK - 4500)).toBeLessThan(0.03 * 4500);
    }
    const mean = temperatures.reduce((s, t) => s + t, 0) / temperatures.length;
    const spread = Math.sqrt(
      temperatures.reduce((s, t) => s + (t - mean) ** 2, 0) / (temperatures.length - 1),
    );
    const typicalReported = reported.reduce((s, u) => s + u, 0) / reported.length;
    // The regression's standard error should describe the scatter over repeats to within ±30 %.
    expect(typicalReported / spread).toBeGreaterThan(0.7);
    expect(typicalReported / spread).toBeLessThan(1.3);
    expect(Math.abs(mean - 4500)).toBeLessThan(3 * (spread / Math.sqrt(temperatures.length)) + 5);
  });

  it("refuses fewer than three lines", () => {
    const result = boltzmannPlot(observed(4500, 0, 1).slice(0, 2));
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toBe("too-few-lines");
  });

  it("refuses upper energies that span less than 0.5 eV (common practice)", () => {
    // 385.99, 532.80 and 537.15 nm span 3.211–3.266 eV.
    const lines = observed(4500, 0, 1).filter((l) => l.upperEv < 3.3);
    expect(lines).toHaveLength(3);
    const result = boltzmannPlot(lines);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toBe("energy-spread-too-small");
  });

  it("refuses a rising plot, which has no temperature", () => {
    const lines = observed(4500, 0, 1).map((l) => ({
      ...l,
      intensity: (l.g * l.a * Math.exp(l.upperEv)) / l.wavelengthNm,
    }));
    const result = boltzmannPlot(lines);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.reason).toBe("non-physical-slope");
  });

  it("throws a RangeError on a non-positive intensity", () => {
    const lines = observed(4500, 0, 1);
    lines[3] = { ...lines[3], intensity: 0 };
    expect(() => boltzmannPlot(lines)).toThrow(/line 3: intensity/);
  });
});

describe("predictLteIntensities", () => {
  it("follows gA/λ·exp(−E/kT), normalised to the strongest line", () => {
    const predicted = predictLteIntensities(FE_I, { temperatureK: 3000 });
    const kT = BOLTZMANN_CONSTANT_EV_PER_K * 3000;
    const raw = FE_I.map((l) => ((l.g * l.a) / l.wavelengthNm) * Math.exp(-l.upperEv / kT));
    const strongest = Math.max(...raw);
    FE_I.forEach((_, i) => expect(predicted[i]).toBeCloseTo(raw[i] / strongest, 12));
    expect(Math.max(...predicted)).toBe(1);
  });

  it("shifts intensity towards high upper levels as the temperature rises", () => {
    const cool = predictLteIntensities(FE_I, { temperatureK: 2500 });
    const hot = predictLteIntensities(FE_I, { temperatureK: 6000 });
    // 495.76 nm (5.31 eV) against 385.99 nm (3.21 eV).
    expect(hot[9] / hot[4]).toBeGreaterThan(cool[9] / cool[4]);
  });

  it("round-trips through a Boltzmann plot", () => {
    const predicted = predictLteIntensities(FE_I, { temperatureK: 5200 });
    const result = boltzmannPlot(FE_I.map((l, i) => ({ ...l, intensity: predicted[i] })));
    if (!result.ok) throw new Error(result.message);
    expect(result.temperatureK).toBeCloseTo(5200, 6);
  });

  it("stays finite at a very low temperature", () => {
    const predicted = predictLteIntensities(FE_I, { temperatureK: 50 });
    expect(predicted.every((v) => Number.isFinite(v))).toBe(true);
    expect(Math.max(...predicted)).toBe(1);
  });
});

// The constant itself, CODATA 2018 (exact in the 2019 SI).
it("uses k = 8.617333262e-5 eV/K", () => {
  expect(BOLTZMANN_CONSTANT_EV_PER_K).toBe(8.617333262e-5);
});
