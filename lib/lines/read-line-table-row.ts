// Checks one row of the line table, given as its cells' text by column name: the one rule set for a
// row of an imported file, a line typed into the draft's form and a line sent to the API.

import { unguardFormulaCell } from "../reports/formula-guard";

import type { SourceKind } from "../spectrum/types";
import { assertPositiveFinite } from "../spectrum/units/assert-positive-finite";
import {
  AIR_FORMULA_MIN_AIR_NM,
  AIR_FORMULA_MIN_VACUUM_NM,
  airToVacuumNm,
  HC_EV_NM,
  vacuumToAirNm,
} from "../spectrum/units";
import { formatSpecies } from "./format-species";
import { parseSpecies } from "./parse-species";
import { LINE_FLAGS } from "./types";
import type { LineFlag, LineTableError, LineTableRow } from "./types";

export interface ReadLineTableRowOptions {
  /**
   * Shortest wavelength (air or vacuum) a row may have, in nm.
   * @default 100
   */
  minWavelengthNm?: number;
  /**
   * Longest wavelength (air or vacuum) a row may have, in nm.
   * @default 20000
   */
  maxWavelengthNm?: number;
  /**
   * Largest allowed difference, in nm, between a row's air_nm and its vacuum_nm converted to air.
   * A row's own uncertainty_nm widens it when larger. Published tables round to 0.001 nm and
   * differ by up to 0.002 nm between conventions (common practice).
   * @default 0.002
   */
  airVacuumToleranceNm?: number;
  /**
   * Largest allowed difference, in eV, between upper_ev − lower_ev and the photon energy hc/λ_vac.
   * @default 0.01
   */
  energyToleranceEv?: number;
}

/** What readLineTableRow returns: the row when it passed every check, and every problem found. */
export interface LineTableRowResult {
  /** The validated row, or null when any check failed. */
  row: LineTableRow | null;
  /** Each problem with the column it belongs to, in the order the checks run. */
  errors: Pick<LineTableError, "field" | "message">[];
}

/**
 * Air wavelengths are tabulated only from 200 nm (vacuum) up, as NIST ASD and others do, and the
 * Morton (2000) formula is meant for that range; 199.936 nm is the air wavelength of 200 nm vacuum.
 */
const AIR_MIN_NM = AIR_FORMULA_MIN_AIR_NM;

const INTENSITY_COLUMNS: ReadonlyArray<[string, SourceKind]> = [
  ["intensity_flame", "flame"],
  ["intensity_arc", "arc"],
  ["intensity_spark", "spark"],
  ["intensity_plasma", "plasma"],
  ["intensity_lamp", "lamp"],
];

const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** The options with their defaults filled in; throws a RangeError for a limit that makes no sense. */
export function resolveLineTableRowOptions(
  options: ReadLineTableRowOptions = {},
): Required<ReadLineTableRowOptions> {
  const resolved: Required<ReadLineTableRowOptions> = {
    minWavelengthNm: options.minWavelengthNm ?? 100,
    maxWavelengthNm: options.maxWavelengthNm ?? 20000,
    airVacuumToleranceNm: options.airVacuumToleranceNm ?? 0.002,
    energyToleranceEv: options.energyToleranceEv ?? 0.01,
  };
  assertPositiveFinite(resolved.minWavelengthNm, "minWavelengthNm");
  assertPositiveFinite(resolved.maxWavelengthNm, "maxWavelengthNm");
  assertPositiveFinite(resolved.airVacuumToleranceNm, "airVacuumToleranceNm");
  assertPositiveFinite(resolved.energyToleranceEv, "energyToleranceEv");
  if (resolved.maxWavelengthNm <= resolved.minWavelengthNm) {
    throw new RangeError("maxWavelengthNm must be greater than minWavelengthNm");
  }
  return resolved;
}

/**
 * Validates one row from its cells' text, keyed by column name (a column the row does not have is
 * absent from `cells`). Cells are trimmed and lose a formula guard's apostrophe (formatLineTableCsv),
 * so a cell reads the same whether it comes from a file, a form or lineTableCells.
 */
export function readLineTableRow(
  cells: ReadonlyMap<string, string>,
  options: ReadLineTableRowOptions = {},
): LineTableRowResult {
  const limits = resolveLineTableRowOptions(options);
  const errors: LineTableRowResult["errors"] = [];
  const fail = (field: string, message: string) => {
    errors.push({ field, message });
  };
  const cell = (field: string): string =>
    // Exports guard formula-like text with a leading apostrophe (formatLineTableCsv): drop it again.
    unguardFormulaCell((cells.get(field) ?? "").trim());
  /** A number cell: null when blank, undefined (after reporting) when invalid. */
  const number = (
    field: string,
    check?: (value: number) => string | null,
  ): number | null | undefined => {
    const text = cell(field);
    if (text === "") return null;
    if (!NUMBER_PATTERN.test(text) || !Number.isFinite(Number(text))) {
      fail(field, `"${text}" is not a number (use a point for decimals)`);
      return undefined;
    }
    const value = Number(text);
    const problem = check?.(value) ?? null;
    if (problem) {
      fail(field, problem);
      return undefined;
    }
    return value;
  };

  let species: ReturnType<typeof parseSpecies> | null = null;
  try {
    species = parseSpecies(cell("species"));
  } catch (error) {
    fail("species", (error as RangeError).message);
  }

  const { minWavelengthNm: minNm, maxWavelengthNm: maxNm } = limits;
  const inRange = (value: number) =>
    value >= minNm && value <= maxNm
      ? null
      : `${value} nm is outside the accepted range ${minNm}–${maxNm} nm`;
  const givenAir = number(
    "air_nm",
    (value) =>
      inRange(value) ??
      (value < AIR_MIN_NM
        ? `air wavelengths are tabulated only above ${AIR_MIN_NM.toFixed(3)} nm (200 nm in vacuum); give vacuum_nm instead`
        : null),
  );
  const givenVacuum = number("vacuum_nm", inRange);
  const positive = (value: number) => (value > 0 ? null : `must be greater than 0, got ${value}`);
  const nonNegative = (value: number) => (value >= 0 ? null : `must not be negative, got ${value}`);
  const uncertaintyNm = number("uncertainty_nm", positive);

  let airNm: number | null = null;
  let vacuumNm: number | null = null;
  if (givenAir === null && givenVacuum === null) {
    fail(cells.has("air_nm") ? "air_nm" : "vacuum_nm", "air_nm or vacuum_nm is required");
  } else if (givenAir !== undefined && givenVacuum !== undefined) {
    if (givenAir !== null && givenVacuum !== null) {
      // Below 200 nm vacuum the air formula does not apply; "unchanged" makes such a pair disagree.
      const expectedAir = vacuumToAirNm(givenVacuum, { belowRange: "unchanged" });
      const tolerance = Math.max(limits.airVacuumToleranceNm, uncertaintyNm ?? 0);
      if (Math.abs(expectedAir - givenAir) > tolerance) {
        fail(
          "air_nm",
          `air ${givenAir} nm and vacuum ${givenVacuum} nm disagree: vacuum ${givenVacuum} nm is ${expectedAir.toFixed(4)} nm in air (Morton 2000), ${Math.abs(expectedAir - givenAir).toFixed(4)} nm apart, more than ${tolerance} nm`,
        );
      } else {
        airNm = givenAir;
        vacuumNm = givenVacuum;
      }
    } else if (givenAir !== null) {
      airNm = givenAir;
      vacuumNm = airToVacuumNm(givenAir);
    } else if (givenVacuum !== null) {
      vacuumNm = givenVacuum;
      airNm = givenVacuum >= AIR_FORMULA_MIN_VACUUM_NM ? vacuumToAirNm(givenVacuum) : null;
    }
  }

  const intensities: LineTableRow["intensities"] = {};
  for (const [field, kind] of INTENSITY_COLUMNS) {
    const value = number(field, nonNegative);
    if (typeof value === "number") intensities[kind] = value;
  }

  const lowerEv = number("lower_ev", nonNegative);
  const upperEv = number("upper_ev", nonNegative);
  if (typeof lowerEv === "number" && typeof upperEv === "number") {
    if (upperEv <= lowerEv) {
      fail("upper_ev", `upper level ${upperEv} eV must lie above lower level ${lowerEv} eV`);
    } else if (vacuumNm !== null) {
      const photonEv = HC_EV_NM / vacuumNm;
      if (Math.abs(upperEv - lowerEv - photonEv) > limits.energyToleranceEv) {
        fail(
          "upper_ev",
          `upper − lower = ${(upperEv - lowerEv).toFixed(4)} eV but the line's photon energy is ${photonEv.toFixed(4)} eV`,
        );
      }
    }
  }
  const gUpper = number("g_upper", (value) =>
    Number.isInteger(value) && value > 0 ? null : `must be a positive integer, got ${value}`,
  );
  const aPerS = number("a_per_s", positive);

  const flags: LineFlag[] = [];
  const flagText = cell("flags");
  if (flagText !== "") {
    const given = flagText
      .split(";")
      .map((flag) => flag.trim())
      .filter((flag) => flag !== "");
    for (const flag of given) {
      if (!(LINE_FLAGS as readonly string[]).includes(flag)) {
        fail("flags", `unknown flag "${flag}"; known flags: ${LINE_FLAGS.join(", ")}`);
      }
    }
    for (const flag of LINE_FLAGS) if (given.includes(flag)) flags.push(flag);
  }

  const extentNm = number("band_extent_nm", positive);
  const degradesText = cell("band_degrades_to");
  let band: LineTableRow["band"] = null;
  if (flags.includes("band-head")) {
    if (species && species.ionStage !== null)
      fail("flags", "band-head is for molecules, not atoms or ions");
    if (extentNm === null) fail("band_extent_nm", "a band head needs band_extent_nm");
    if (degradesText === "")
      fail("band_degrades_to", 'a band head needs band_degrades_to ("red" or "violet")');
    else if (degradesText !== "red" && degradesText !== "violet") {
      fail("band_degrades_to", `"${degradesText}" is neither "red" nor "violet"`);
    }
    if (typeof extentNm === "number" && (degradesText === "red" || degradesText === "violet")) {
      band = { extentNm, degradesTo: degradesText };
    }
  } else {
    if (extentNm !== null)
      fail("band_extent_nm", 'band fields are only for rows flagged "band-head"');
    if (degradesText !== "")
      fail("band_degrades_to", 'band fields are only for rows flagged "band-head"');
  }

  const source = cell("source");
  if (source === "")
    fail("source", 'every row needs a source (write "from memory" if that is what it is)');

  const verifiedText = cell("verified").toLowerCase();
  if (verifiedText !== "" && verifiedText !== "true" && verifiedText !== "false") {
    fail("verified", `"${cell("verified")}" is neither "true" nor "false"`);
  }

  if (errors.length > 0 || species === null || vacuumNm === null) return { row: null, errors };
  const row: LineTableRow = {
    species: formatSpecies(species),
    element: species.element,
    ionStage: species.ionStage,
    airNm,
    vacuumNm,
    uncertaintyNm: uncertaintyNm ?? null,
    intensities,
    lowerEv: lowerEv ?? null,
    upperEv: upperEv ?? null,
    gUpper: gUpper ?? null,
    aPerS: aPerS ?? null,
    flags,
    band,
    source,
    verified: verifiedText === "true",
    note: cell("note"),
  };
  return { row, errors };
}
