// Parses species in the trade's notation ("Na I", "Ca II", "CaOH", "BO₂") into element and ion stage.

import { isElementSymbol } from "./element-symbols";
import type { ParsedSpecies } from "./types";

export interface ParseSpeciesOptions {
  /**
   * Accept molecular formulas ("CaOH", "C2"); when false only atoms with an ion stage pass.
   * @default true
   */
  allowMolecules?: boolean;
}

const ROMAN_STAGES: Readonly<Record<string, number>> = {
  I: 1,
  II: 2,
  III: 3,
  IV: 4,
  V: 5,
  VI: 6,
  VII: 7,
  VIII: 8,
  IX: 9,
  X: 10,
};

const SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉";

/** Replaces Unicode subscript digits by ASCII ones, so "BO₂" and "BO2" are one species. */
function normaliseDigits(text: string): string {
  return text.replace(/[₀-₉]/g, (d) => String(SUBSCRIPT_DIGITS.indexOf(d)));
}

/** Counts the atoms of a formula made of element symbols and counts; null if it is not one. */
function countFormulaAtoms(formula: string): number | null {
  const parts = formula.match(/[A-Z][a-z]?\d*/g);
  if (!parts || parts.join("") !== formula) return null;
  let atoms = 0;
  for (const part of parts) {
    const [, symbol, digits] = /^([A-Z][a-z]?)(\d*)$/.exec(part)!;
    if (!isElementSymbol(symbol)) return null;
    const count = digits === "" ? 1 : Number(digits);
    if (count < 1) return null;
    atoms += count;
  }
  return atoms;
}

/**
 * Parses "Ca II" → { element: "Ca", ionStage: 2 } and "BO₂" → { element: "BO2", ionStage: null }.
 * Throws a RangeError naming the problem for anything else (unknown symbol, bad numeral, bare atom).
 */
export function parseSpecies(text: string, options: ParseSpeciesOptions = {}): ParsedSpecies {
  const { allowMolecules = true } = options;
  if (typeof text !== "string") throw new RangeError("species must be a string");
  const trimmed = normaliseDigits(text.trim()).replace(/\s+/g, " ");
  if (trimmed === "") throw new RangeError("species is empty");

  const atom = /^([A-Za-z]{1,2}) ([IVXivx]+)$/.exec(trimmed);
  if (atom) {
    const [, symbol, numeral] = atom;
    if (!isElementSymbol(symbol)) {
      throw new RangeError(`"${symbol}" is not an element symbol (species "${text}")`);
    }
    const ionStage = ROMAN_STAGES[numeral];
    if (ionStage === undefined) {
      throw new RangeError(
        `"${numeral}" is not an ion stage I…X in upper case (species "${text}")`,
      );
    }
    return { element: symbol, ionStage };
  }

  if (trimmed.includes(" ")) {
    throw new RangeError(
      `species "${text}" is neither "Element Stage" (e.g. "Ca II") nor a formula`,
    );
  }
  const atoms = countFormulaAtoms(trimmed);
  if (atoms === null) {
    throw new RangeError(`species "${text}" contains something that is not an element symbol`);
  }
  if (atoms === 1) {
    // A bare "Na" hides whether the line is Na I or Na II; the table must say.
    throw new RangeError(`species "${text}" needs an ion stage, e.g. "${trimmed} I"`);
  }
  if (!allowMolecules)
    throw new RangeError(`species "${text}" is a molecule; molecules are not allowed here`);
  return { element: trimmed, ionStage: null };
}
