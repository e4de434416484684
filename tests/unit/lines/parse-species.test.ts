// Tests of the species notation: "Ca II" ⇄ { element: "Ca", ionStage: 2 }, molecules, and what is rejected.
import { describe, expect, it } from "vitest";

import { ELEMENT_SYMBOLS, formatSpecies, parseSpecies } from "@/lib/lines";

describe("parseSpecies", () => {
  it("reads element and Roman ion stage", () => {
    expect(parseSpecies("Ca II")).toEqual({ element: "Ca", ionStage: 2 });
    expect(parseSpecies("Na I")).toEqual({ element: "Na", ionStage: 1 });
    expect(parseSpecies("H I")).toEqual({ element: "H", ionStage: 1 });
    expect(parseSpecies("Fe X")).toEqual({ element: "Fe", ionStage: 10 });
    expect(parseSpecies("  Sr   II ")).toEqual({ element: "Sr", ionStage: 2 });
  });

  it("reads every numeral from I to X", () => {
    const numerals = ["I", "II", "III", "IV", "V", "VI", "VII", "VIII", "IX", "X"];
    numerals.forEach((numeral, index) => {
      expect(parseSpecies(`Fe ${numeral}`).ionStage).toBe(index + 1);
    });
  });

  it("reads molecules as formulas with ionStage null and normalises subscripts", () => {
    expect(parseSpecies("CaOH")).toEqual({ element: "CaOH", ionStage: null });
    expect(parseSpecies("BO2")).toEqual({ element: "BO2", ionStage: null });
    expect(parseSpecies("BO₂")).toEqual({ element: "BO2", ionStage: null });
    expect(parseSpecies("C2")).toEqual({ element: "C2", ionStage: null });
    expect(parseSpecies("C₂")).toEqual({ element: "C2", ionStage: null });
    expect(parseSpecies("CuCl")).toEqual({ element: "CuCl", ionStage: null });
  });

  it("rejects unknown element symbols, bad numerals and bare atoms", () => {
    expect(() => parseSpecies("Xx I")).toThrow(RangeError);
    expect(() => parseSpecies("Na XI")).toThrow(/ion stage/);
    expect(() => parseSpecies("Na IIII")).toThrow(RangeError);
    expect(() => parseSpecies("Na ii")).toThrow(/upper case/);
    expect(() => parseSpecies("NA I")).toThrow(/element symbol/);
    expect(() => parseSpecies("Na")).toThrow(/needs an ion stage/);
    expect(() => parseSpecies("C1")).toThrow(/needs an ion stage/);
    expect(() => parseSpecies("CaQ")).toThrow(/not an element symbol/);
    expect(() => parseSpecies("Ca OH")).toThrow(RangeError);
    expect(() => parseSpecies("")).toThrow(/empty/);
    expect(() => parseSpecies("C0")).toThrow(RangeError);
  });

  it("refuses molecules when asked to", () => {
    expect(() => parseSpecies("CaOH", { allowMolecules: false })).toThrow(/molecule/);
    expect(parseSpecies("Ca I", { allowMolecules: false })).toEqual({ element: "Ca", ionStage: 1 });
  });
});

describe("ELEMENT_SYMBOLS", () => {
  it("holds the 118 distinct symbols in order of atomic number", () => {
    expect(ELEMENT_SYMBOLS).toHaveLength(118);
    expect(new Set(ELEMENT_SYMBOLS).size).toBe(118);
    // Atomic numbers of Na (11), Fe (26), Hg (80), Og (118): periodic table (common knowledge).
    expect(ELEMENT_SYMBOLS.indexOf("Na") + 1).toBe(11);
    expect(ELEMENT_SYMBOLS.indexOf("Fe") + 1).toBe(26);
    expect(ELEMENT_SYMBOLS.indexOf("Hg") + 1).toBe(80);
    expect(ELEMENT_SYMBOLS.indexOf("Og") + 1).toBe(118);
  });
});

describe("formatSpecies", () => {
  it("writes the trade notation and round-trips through parseSpecies", () => {
    expect(formatSpecies({ element: "Ca", ionStage: 2 })).toBe("Ca II");
    expect(formatSpecies({ element: "BO2", ionStage: null })).toBe("BO2");
    for (const text of ["Na I", "Mg II", "Fe IX", "Ba II", "SrOH", "C2"]) {
      expect(formatSpecies(parseSpecies(text))).toBe(text);
    }
  });

  it("rejects ion stages outside I…X", () => {
    expect(() => formatSpecies({ element: "Fe", ionStage: 0 })).toThrow(RangeError);
    expect(() => formatSpecies({ element: "Fe", ionStage: 11 })).toThrow(RangeError);
    expect(() => formatSpecies({ element: "Fe", ionStage: 1.5 })).toThrow(RangeError);
  });
});
