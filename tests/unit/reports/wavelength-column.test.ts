// A wavelength column's precision: from the median uncertainty at two significant digits (JCGM 100:2008,
// the GUM, 7.2.6, from memory), one number of decimals for every row, bounded to 0.1–0.00001 nm.
import { describe, expect, it } from "vitest";
import {
  FALLBACK_WAVELENGTH_DECIMALS,
  formatWavelengthColumn,
  wavelengthColumnDecimals,
} from "@/lib/reports/wavelength-column";

describe("wavelengthColumnDecimals", () => {
  it("takes the decimal place of the median uncertainty at two significant digits", () => {
    // 0.012 nm → "0.012": three decimals; 0.0012 nm → four; 0.12 nm → two.
    expect(wavelengthColumnDecimals([0.012])).toBe(3);
    expect(wavelengthColumnDecimals([0.0012])).toBe(4);
    expect(wavelengthColumnDecimals([0.12])).toBe(2);
    // The median of 0.002, 0.015 and 0.4 is 0.015 → three decimals, not the finest or the coarsest.
    expect(wavelengthColumnDecimals([0.4, 0.002, 0.015])).toBe(3);
  });

  it("stays within 1 and 5 decimals and falls back without a usable uncertainty", () => {
    expect(wavelengthColumnDecimals([3])).toBe(1);
    expect(wavelengthColumnDecimals([1e-9])).toBe(5);
    expect(wavelengthColumnDecimals([])).toBe(FALLBACK_WAVELENGTH_DECIMALS);
    expect(wavelengthColumnDecimals([0, Number.NaN, -1])).toBe(FALLBACK_WAVELENGTH_DECIMALS);
  });
});

describe("formatWavelengthColumn", () => {
  it("writes every row of a column at the same decimals, uncertainties included", () => {
    const column = formatWavelengthColumn([
      { wavelengthNm: 589.0, uncertaintyNm: 0.0031 },
      { wavelengthNm: 589.5924, uncertaintyNm: 0.0042 },
      { wavelengthNm: 766.49, uncertaintyNm: 0.05 },
    ]);
    expect(column.decimals).toBe(4);
    expect(column.wavelengths).toEqual(["589.0000", "589.5924", "766.4900"]);
    expect(column.uncertainties).toEqual(["0.0031", "0.0042", "0.0500"]);
    const places = column.wavelengths.map((w) => w.split(".")[1].length);
    expect(new Set(places).size).toBe(1);
  });
});
