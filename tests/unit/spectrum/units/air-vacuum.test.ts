// Checks the Morton (2000) air ⇄ vacuum conversion against NIST ASD wavelengths, worked pairs and its own inverse.
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import reference from "../../../reference/air_vacuum_reference.json";
import {
  AIR_FORMULA_MIN_AIR_NM,
  airToVacuumNm,
  conventionalWavelengthNm,
  refractiveIndexOfAir,
  vacuumToAirNm,
  xAirToVacuumNm,
  xVacuumToAirNm,
} from "../../../../lib/spectrum/units";

/** Published lamp wavelengths differ by up to 0.002 nm between conventions (common practice). */
const PUBLISHED_TOLERANCE_NM = 0.002;

describe("air and vacuum wavelengths of well-known lines", () => {
  const lines = [
    // NIST Atomic Spectra Database, Na I D2 588.995 nm air / 589.158 nm vacuum (from memory)
    { name: "Na I D2", airNm: 588.995, vacuumNm: 589.158 },
    // NIST Atomic Spectra Database, Na I D1 589.592 nm air / 589.756 nm vacuum (from memory)
    { name: "Na I D1", airNm: 589.592, vacuumNm: 589.756 },
    // NIST Atomic Spectra Database, Hg I 546.074 nm air / 546.227 nm vacuum (from memory)
    { name: "Hg I 546", airNm: 546.074, vacuumNm: 546.227 },
    // NIST Atomic Spectra Database, Hg I 435.833 nm air / 435.956 nm vacuum (from memory)
    { name: "Hg I 435", airNm: 435.833, vacuumNm: 435.956 },
    // NIST Atomic Spectra Database, H I Hα blend 656.28 nm air / 656.46 nm vacuum (from memory; rounded to 0.01 nm)
    { name: "H I Hα", airNm: 656.28, vacuumNm: 656.46 },
  ];
  for (const line of lines) {
    it(`${line.name}: vacuum → air and air → vacuum agree with the table within its rounding`, () => {
      // Hα is tabulated to 0.01 nm only, so its tolerance is half of that; the others use the lamp tolerance.
      const tolerance = line.name === "H I Hα" ? 0.005 : PUBLISHED_TOLERANCE_NM;
      expect(Math.abs(vacuumToAirNm(line.vacuumNm) - line.airNm)).toBeLessThan(tolerance);
      expect(Math.abs(airToVacuumNm(line.airNm) - line.vacuumNm)).toBeLessThan(tolerance);
    });
  }
});

describe("worked pairs from the Morton (2000) formula", () => {
  it("vacuum → air matches the pairs computed by make_air_vacuum_reference.py", () => {
    for (const pair of reference.vacuumToAir) {
      // Morton (2000, ApJS 130, 403) eq. 3, evaluated by tests/reference/make_air_vacuum_reference.py
      expect(refractiveIndexOfAir(pair.vacuumNm)).toBeCloseTo(pair.n, 14);
      // Morton (2000, ApJS 130, 403) eq. 3, evaluated by tests/reference/make_air_vacuum_reference.py
      expect(Math.abs(vacuumToAirNm(pair.vacuumNm) - pair.airNm)).toBeLessThan(1e-10);
    }
  });

  it("air → vacuum matches the SciPy brentq inverse within 1e-10 nm", () => {
    for (const pair of reference.airToVacuum) {
      // Morton (2000) inverted with SciPy brentq by tests/reference/make_air_vacuum_reference.py
      expect(Math.abs(airToVacuumNm(pair.airNm) - pair.vacuumNm)).toBeLessThan(1e-10);
    }
  });

  it("air is shorter than vacuum by about 0.16 nm at 589 nm (n − 1 ≈ 2.77e-4)", () => {
    // Edlén (1966) / Morton (2000): n − 1 of standard air in the yellow is about 2.77e-4 (from memory)
    expect(refractiveIndexOfAir(589.158) - 1).toBeCloseTo(2.77e-4, 5);
  });
});

describe("range and options", () => {
  it("refuses wavelengths below 200 nm unless told to keep them", () => {
    expect(() => vacuumToAirNm(150)).toThrow(RangeError);
    expect(() => airToVacuumNm(199.9)).toThrow(RangeError);
    expect(vacuumToAirNm(150, { belowRange: "unchanged" })).toBe(150);
    expect(airToVacuumNm(121.567, { belowRange: "unchanged" })).toBe(121.567);
  });

  it("covers exactly the air image of 200 nm vacuum", () => {
    expect(AIR_FORMULA_MIN_AIR_NM).toBeCloseTo(vacuumToAirNm(200), 12);
    expect(airToVacuumNm(AIR_FORMULA_MIN_AIR_NM)).toBeCloseTo(200, 9);
  });

  it("refuses non-finite and non-positive input", () => {
    for (const bad of [0, -500, NaN, Infinity]) {
      expect(() => vacuumToAirNm(bad)).toThrow(RangeError);
      expect(() => airToVacuumNm(bad)).toThrow(RangeError);
    }
  });

  it("converts arrays point by point without touching the input", () => {
    const vacuum = Float64Array.from([250, 589.158, 1000]);
    const copy = Float64Array.from(vacuum);
    const air = xVacuumToAirNm(vacuum);
    expect(vacuum).toEqual(copy);
    for (let i = 0; i < vacuum.length; i++) expect(air[i]).toBe(vacuumToAirNm(vacuum[i]));
    const back = xAirToVacuumNm(air);
    for (let i = 0; i < vacuum.length; i++)
      expect(Math.abs(back[i] - vacuum[i])).toBeLessThan(1e-9);
    expect(xVacuumToAirNm(Float64Array.from([121.567, 300]), { belowRange: "unchanged" })[0]).toBe(
      121.567,
    );
  });
});

describe("conventional wavelengths", () => {
  it("gives air above 200 nm and vacuum below, and says which", () => {
    // Tables give H I Lyman α at 121.567 nm in vacuum (from memory)
    expect(conventionalWavelengthNm(121.567)).toEqual({ wavelengthNm: 121.567, medium: "vacuum" });
    const na = conventionalWavelengthNm(589.158);
    expect(na.medium).toBe("air");
    // NIST Atomic Spectra Database, Na I D2 588.995 nm air (from memory)
    expect(Math.abs(na.wavelengthNm - 588.995)).toBeLessThan(PUBLISHED_TOLERANCE_NM);
  });

  it("can return to vacuum above a stated limit", () => {
    expect(conventionalWavelengthNm(2500, { maxAirNm: 2000 }).medium).toBe("vacuum");
    expect(conventionalWavelengthNm(1500, { maxAirNm: 2000 }).medium).toBe("air");
    expect(() => conventionalWavelengthNm(500, { maxAirNm: 100 })).toThrow(RangeError);
  });
});

describe("properties", () => {
  it("air → vacuum → air returns the input within 1e-9 nm over 200–2000 nm", () => {
    fc.assert(
      fc.property(fc.double({ min: 200, max: 2000, noNaN: true }), (airNm) => {
        expect(Math.abs(vacuumToAirNm(airToVacuumNm(airNm)) - airNm)).toBeLessThan(1e-9);
      }),
      { numRuns: 200 },
    );
  });

  it("vacuum → air → vacuum returns the input within 1e-9 nm over 200–2000 nm", () => {
    fc.assert(
      fc.property(fc.double({ min: 200, max: 2000, noNaN: true }), (vacuumNm) => {
        expect(Math.abs(airToVacuumNm(vacuumToAirNm(vacuumNm)) - vacuumNm)).toBeLessThan(1e-9);
      }),
      { numRuns: 200 },
    );
  });
});
