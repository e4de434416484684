// Writes a species back in the trade's notation: { element: "Ca", ionStage: 2 } → "Ca II".

import type { ParsedSpecies } from "./types";

const NUMERALS = ["I", "II", "III", "IV", "V", "VI", "VII", "VIII", "IX", "X"];

/** "Ca II" for an ion, the formula itself ("CaOH") for a molecule (ionStage null). */
export function formatSpecies(species: ParsedSpecies): string {
  const { element, ionStage } = species;
  if (typeof element !== "string" || element === "")
    throw new RangeError("element must be a non-empty string");
  if (ionStage === null) return element;
  if (!Number.isInteger(ionStage) || ionStage < 1 || ionStage > NUMERALS.length) {
    throw new RangeError(
      `ionStage must be an integer 1…${NUMERALS.length} or null, got ${ionStage}`,
    );
  }
  return `${element} ${NUMERALS[ionStage - 1]}`;
}
