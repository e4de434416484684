// Maps a line-table row onto the core's ReferenceLine, the only shape lib/spectrum matches against.

import type { ReferenceLine } from "../spectrum/types";
import { assertPositiveFinite } from "../spectrum/units/assert-positive-finite";
import type { LineTableRow } from "./types";

export interface ToReferenceLineOptions {
  /**
   * Wavelength uncertainty in nm for rows that state none; published tables round to 0.001 nm
   * and conventions differ by up to 0.002 nm (common practice).
   * @default 0.002
   */
  defaultUncertaintyNm?: number;
}

/**
 * Builds the ReferenceLine of `row` under the identifier `id`. Rows below 200 nm carry no air
 * wavelength (air is opaque there and tables give vacuum), so their airNm is set to the vacuum value.
 */
export function toReferenceLine(
  row: LineTableRow,
  id: string,
  options: ToReferenceLineOptions = {},
): ReferenceLine {
  const { defaultUncertaintyNm = 0.002 } = options;
  if (typeof id !== "string" || id === "") throw new RangeError("id must be a non-empty string");
  assertPositiveFinite(defaultUncertaintyNm, "defaultUncertaintyNm");
  if (!Number.isFinite(row.vacuumNm) || row.vacuumNm <= 0) {
    throw new RangeError(`row ${row.species} has no valid vacuum wavelength`);
  }

  const flags: ReferenceLine["flags"] = {};
  if (row.flags.includes("persistent")) flags.persistent = true;
  if (row.flags.includes("lamp")) flags.lamp = true;
  if (row.flags.includes("band-head")) flags.bandHead = true;

  const line: ReferenceLine = {
    id,
    species: row.species,
    element: row.element,
    ionStage: row.ionStage,
    airNm: row.airNm ?? row.vacuumNm,
    vacuumNm: row.vacuumNm,
    uncertaintyNm: row.uncertaintyNm ?? defaultUncertaintyNm,
    intensities: { ...row.intensities },
    flags,
  };
  if (row.upperEv !== null) line.upperEv = row.upperEv;
  if (row.lowerEv !== null) line.lowerEv = row.lowerEv;
  if (row.gUpper !== null) line.g = row.gUpper;
  if (row.aPerS !== null) line.a = row.aPerS;
  if (row.band) line.band = { ...row.band };
  return line;
}
