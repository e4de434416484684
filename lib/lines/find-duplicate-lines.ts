// Finds rows that describe the same line twice (same species, wavelength within a tolerance), for import previews.

import type { LineTableRow } from "./types";
import { assertNonNegativeFinite } from "../spectrum/units/assert-non-negative-finite";

export interface FindDuplicateLinesOptions {
  /**
   * Two rows of one species closer than this in vacuum wavelength count as one line, in nm.
   * @default 0.001
   */
  toleranceNm?: number;
}

/** Index pairs [i, j] (i < j) of rows of the same species whose vacuum wavelengths lie within toleranceNm. */
export function findDuplicateLines(
  rows: readonly Pick<LineTableRow, "species" | "vacuumNm">[],
  options: FindDuplicateLinesOptions = {},
): Array<[number, number]> {
  const { toleranceNm = 0.001 } = options;
  assertNonNegativeFinite(toleranceNm, "toleranceNm");
  // Sorting by species then wavelength makes each row's possible twins its next neighbours.
  const order = rows
    .map((_, index) => index)
    .sort(
      (a, b) =>
        rows[a].species.localeCompare(rows[b].species) || rows[a].vacuumNm - rows[b].vacuumNm,
    );
  const pairs: Array<[number, number]> = [];
  for (let k = 0; k < order.length; k++) {
    const first = rows[order[k]];
    for (let m = k + 1; m < order.length; m++) {
      const second = rows[order[m]];
      if (second.species !== first.species || second.vacuumNm - first.vacuumNm > toleranceNm) break;
      const [i, j] = [order[k], order[m]].sort((a, b) => a - b);
      pairs.push([i, j]);
    }
  }
  return pairs.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
}
