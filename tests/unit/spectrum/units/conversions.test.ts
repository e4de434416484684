// Checks nm ⇄ Å ⇄ cm⁻¹ ⇄ eV conversions and the axis helpers against CODATA 2018 values.
import { describe, it, expect } from "vitest";
import {
  HC_EV_NM,
  airToVacuumNm,
  energyEvToVacuumNm,
  spectrumToNanometres,
  toNanometres,
  vacuumNmToEnergyEv,
  vacuumNmToWavenumber,
  vacuumToAirNm,
  wavenumberToVacuumNm,
} from "../../../../lib/spectrum/units";
import type { Spectrum } from "../../../../lib/spectrum/types";

describe("photon energy and wavenumber", () => {
  it("uses hc = 1239.841984 eV nm", () => {
    // CODATA 2018: hc = 1.239 841 984… × 10⁻⁶ eV m (exact)
    expect(HC_EV_NM).toBeCloseTo(1239.841984, 6);
  });

  it("turns 500 nm into 20 000 cm⁻¹ and back", () => {
    // Definition of the wavenumber: σ[cm⁻¹] = 10⁷ / λ_vac[nm] (common practice)
    expect(vacuumNmToWavenumber(500)).toBeCloseTo(20000, 9);
    expect(wavenumberToVacuumNm(20000)).toBeCloseTo(500, 12);
  });

  it("gives 2.1 eV for the sodium D2 vacuum wavelength", () => {
    // NIST Atomic Spectra Database: the Na I 3p ²P₃/₂ level lies at 2.104 eV (from memory)
    expect(vacuumNmToEnergyEv(589.158)).toBeCloseTo(2.1044, 3);
    expect(energyEvToVacuumNm(vacuumNmToEnergyEv(589.158))).toBeCloseTo(589.158, 10);
  });

  it("refuses zero and negative quantities", () => {
    expect(() => vacuumNmToWavenumber(0)).toThrow(RangeError);
    expect(() => wavenumberToVacuumNm(-1)).toThrow(RangeError);
    expect(() => vacuumNmToEnergyEv(NaN)).toThrow(RangeError);
    expect(() => energyEvToVacuumNm(Infinity)).toThrow(RangeError);
  });
});

describe("toNanometres", () => {
  it("scales ångströms and keeps the medium unless asked", () => {
    const xNm = toNanometres(Float64Array.from([5889.95, 5895.92]), { unit: "angstrom" });
    expect(xNm[0]).toBeCloseTo(588.995, 12);
    expect(xNm[1]).toBeCloseTo(589.592, 12);
  });

  it("turns wavenumbers into vacuum nm, then air when asked", () => {
    const sigma = Float64Array.from([20000, 16973.37]);
    const vacuum = toNanometres(sigma, { unit: "wavenumber" });
    expect(vacuum[0]).toBeCloseTo(500, 12);
    const air = toNanometres(sigma, { unit: "wavenumber", medium: "air" });
    expect(air[0]).toBeCloseTo(vacuumToAirNm(500), 12);
  });

  it("converts between media only when the input medium is known", () => {
    const x = Float64Array.from([588.995]);
    expect(toNanometres(x, { unit: "nm", inputMedium: "air", medium: "vacuum" })[0]).toBeCloseTo(
      airToVacuumNm(588.995),
      12,
    );
    expect(() => toNanometres(x, { unit: "nm", medium: "vacuum" })).toThrow(/inputMedium/);
    expect(() => toNanometres(x, { unit: "pixel" })).toThrow(/calibrat/);
  });

  it("puts a wavenumber spectrum on an increasing nm axis", () => {
    const spectrum: Spectrum = {
      x: Float64Array.from([16000, 17000, 18000]),
      y: Float64Array.from([1, 2, 3]),
      xUnit: "wavenumber",
      meta: { TITLE: "t" },
    };
    const inNm = spectrumToNanometres(spectrum);
    expect(inNm.xUnit).toBe("nm");
    expect(inNm.medium).toBe("vacuum");
    expect(Array.from(inNm.x)).toEqual([1e7 / 18000, 1e7 / 17000, 1e7 / 16000]);
    expect(Array.from(inNm.y)).toEqual([3, 2, 1]);
    expect(Array.from(spectrum.y)).toEqual([1, 2, 3]);
  });
});
