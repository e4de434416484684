// Reads a reference file — wavelengths exported from an authoritative line database — into located
// lines (species, wavelength in a stated medium, its uncertainty, the citation) for checking a draft.
import { unguardFormulaCell } from "../reports/formula-guard";
import type { WavelengthMedium } from "../spectrum/types";
import { AIR_FORMULA_MIN_AIR_NM } from "../spectrum/units";
import { formatSpecies } from "./format-species";
import { parseSpecies } from "./parse-species";
import { readCsvRecords } from "./read-csv-records";
import type { LineTableError } from "./types";

/** One line of a reference file. */
export interface ReferenceFileLine {
  /** Species in the trade's notation, normalised ("Na I"). */
  species: string;
  /** The reference wavelength in `medium`, nm. */
  wavelengthNm: number;
  medium: WavelengthMedium;
  /** One-sigma uncertainty the reference states, nm (always > 0). */
  uncertaintyNm: number;
  /** Where the value comes from (database, version, and whatever else the file says). */
  citation: string;
  /** 1-based file line of the row. */
  line: number;
}

export interface ParseReferenceCsvOptions {
  /**
   * Medium of every row that has no `medium` cell; rows without either are refused.
   * @default undefined
   */
  medium?: WavelengthMedium;
  /**
   * Shortest accepted wavelength, nm.
   * @default 100
   */
  minWavelengthNm?: number;
  /**
   * Longest accepted wavelength, nm.
   * @default 20000
   */
  maxWavelengthNm?: number;
  /**
   * Longest citation, in characters.
   * @default 500
   */
  maxCitationLength?: number;
}

export interface ReferenceCsvParseResult {
  /** Rows that passed every check, in file order. */
  lines: ReferenceFileLine[];
  /** Every problem, in file order; a file with any should not be used. */
  errors: LineTableError[];
}

/** The columns a reference file has; other columns (an export's extras) are ignored. */
export const REFERENCE_COLUMNS = [
  "species",
  "wavelength_nm",
  "uncertainty_nm",
  "citation",
  "medium",
] as const;
const REQUIRED = ["species", "wavelength_nm", "uncertainty_nm", "citation"] as const;
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parses a reference CSV: "#" lines are comments, the first other line is the header with
 * species, wavelength_nm, uncertainty_nm, citation and optionally medium ("air" or "vacuum"),
 * in any order. Each row's medium comes from its cell, else from `options.medium`.
 */
export function parseReferenceCsv(
  text: string,
  options: ParseReferenceCsvOptions = {},
): ReferenceCsvParseResult {
  if (typeof text !== "string") throw new RangeError("text must be a string");
  const {
    medium: defaultMedium,
    minWavelengthNm = 100,
    maxWavelengthNm = 20000,
    maxCitationLength = 500,
  } = options;
  if (defaultMedium !== undefined && defaultMedium !== "air" && defaultMedium !== "vacuum") {
    throw new RangeError(`medium must be "air" or "vacuum", got ${String(defaultMedium)}`);
  }
  if (!(minWavelengthNm > 0) || !(maxWavelengthNm > minWavelengthNm)) {
    throw new RangeError("need 0 < minWavelengthNm < maxWavelengthNm");
  }
  const errors: LineTableError[] = [];
  const lines: ReferenceFileLine[] = [];
  const records = readCsvRecords(text.startsWith("\uFEFF") ? text.slice(1) : text);
  if (records.length === 0) {
    errors.push({ line: 1, field: "header", message: "the file has no header row" });
    return { lines, errors };
  }
  const [header, ...rows] = records;
  const columns = new Map<string, number>();
  header.cells.forEach((cell, index) => {
    const name = cell.trim().toLowerCase();
    if (!(REFERENCE_COLUMNS as readonly string[]).includes(name)) return;
    if (columns.has(name)) {
      errors.push({
        line: header.line,
        column: index + 1,
        field: "header",
        message: `column "${name}" appears twice`,
      });
    } else columns.set(name, index);
  });
  for (const name of REQUIRED) {
    if (!columns.has(name)) {
      errors.push({
        line: header.line,
        field: "header",
        message: `required column "${name}" is missing; a reference file has the columns ${REQUIRED.join(", ")} and optionally medium`,
      });
    }
  }
  if (errors.length > 0) return { lines, errors };

  for (const record of rows) {
    const before = errors.length;
    const { line, cells } = record;
    const fail = (field: string, message: string) => {
      const index = columns.get(field);
      errors.push(
        index === undefined
          ? { line, field, message }
          : { line, column: index + 1, field, message },
      );
    };
    const cell = (field: string) => {
      const index = columns.get(field);
      return index === undefined ? "" : unguardFormulaCell((cells[index] ?? "").trim());
    };
    for (const message of record.parseErrors) errors.push({ line, field: "row", message });
    if (cells.length < header.cells.length) {
      errors.push({
        line,
        field: "row",
        message: `expected ${header.cells.length} fields as in the header, found ${cells.length}`,
      });
      continue;
    }

    let species: string | null = null;
    try {
      species = formatSpecies(parseSpecies(cell("species")));
    } catch (error) {
      fail("species", (error as RangeError).message);
    }

    const number = (field: string): number | null => {
      const text = cell(field);
      if (text === "") {
        fail(field, `${field} is required`);
        return null;
      }
      if (!NUMBER_PATTERN.test(text) || !Number.isFinite(Number(text))) {
        fail(field, `"${text}" is not a number (use a point for decimals)`);
        return null;
      }
      return Number(text);
    };
    const wavelengthNm = number("wavelength_nm");
    const uncertaintyNm = number("uncertainty_nm");
    if (uncertaintyNm !== null && !(uncertaintyNm > 0)) {
      fail("uncertainty_nm", `must be greater than 0, got ${uncertaintyNm}`);
    }

    const mediumText = cell("medium").toLowerCase();
    let medium: WavelengthMedium | null = null;
    if (mediumText === "air" || mediumText === "vacuum") {
      medium = mediumText;
    } else if (mediumText !== "") {
      fail("medium", `"${cell("medium")}" is neither "air" nor "vacuum"`);
    } else if (defaultMedium) {
      medium = defaultMedium;
    } else {
      fail(
        "medium",
        "the row does not say whether its wavelength is in air or in vacuum: add a medium column or choose the medium for the whole file",
      );
    }

    if (wavelengthNm !== null) {
      if (wavelengthNm < minWavelengthNm || wavelengthNm > maxWavelengthNm) {
        fail(
          "wavelength_nm",
          `${wavelengthNm} nm is outside the accepted range ${minWavelengthNm}–${maxWavelengthNm} nm`,
        );
      } else if (medium === "air" && wavelengthNm < AIR_FORMULA_MIN_AIR_NM) {
        fail(
          "wavelength_nm",
          `air wavelengths are tabulated only above ${AIR_FORMULA_MIN_AIR_NM.toFixed(3)} nm (200 nm in vacuum); give this line in vacuum`,
        );
      }
    }

    const citation = cell("citation");
    if (citation === "")
      fail("citation", "every row needs a citation of where its value comes from");
    else if (citation.length > maxCitationLength) {
      fail("citation", `the citation is longer than ${maxCitationLength} characters`);
    }

    if (
      errors.length > before ||
      species === null ||
      wavelengthNm === null ||
      uncertaintyNm === null ||
      medium === null
    ) {
      continue;
    }
    lines.push({ species, wavelengthNm, medium, uncertaintyNm, citation, line });
  }
  if (rows.length === 0 && errors.length === 0) {
    errors.push({
      line: header.line,
      field: "row",
      message: "the file has no lines under its header",
    });
  }
  return { lines, errors };
}
