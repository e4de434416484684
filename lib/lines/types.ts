// Shapes of Emberline's line table as it is kept in CSV (import, export, the starter table).
// The core's ReferenceLine is derived from these rows by toReferenceLine.

import type { BandInfo, SourceKind } from "../spectrum/types";

/** Flags a line-table row may carry; the CSV writes them separated by ";". */
export type LineFlag = "persistent" | "lamp" | "band-head" | "resonance" | "blend";

/** Every flag the CSV accepts, in the order the formatter writes them. */
export const LINE_FLAGS: readonly LineFlag[] = [
  "persistent",
  "lamp",
  "band-head",
  "resonance",
  "blend",
];

/** A species split into element (or molecular formula) and ion stage. */
export interface ParsedSpecies {
  /** Element symbol ("Ca") or, for a molecule, its formula with ASCII digits ("BO2"). */
  element: string;
  /** 1 for I (neutral), 2 for II, … 10 for X; null for molecules. */
  ionStage: number | null;
}

/** One validated row of the line table. Optional values are null where the table leaves them blank. */
export interface LineTableRow {
  /** Species in the trade's notation, normalised ("Ca II", "BO2"). */
  species: string;
  /** Element symbol or molecular formula. */
  element: string;
  /** Ion stage (1 = I), or null for molecules. */
  ionStage: number | null;
  /** Air wavelength in nm; null below 200 nm, where tables give vacuum only. */
  airNm: number | null;
  /** Vacuum wavelength in nm (given, or computed from airNm). */
  vacuumNm: number;
  /** One-sigma uncertainty of the tabulated wavelength in nm, where stated. */
  uncertaintyNm: number | null;
  /** Relative intensity per kind of source; a kind is absent where unknown. */
  intensities: Partial<Record<SourceKind, number>>;
  /** Lower-level energy in eV. */
  lowerEv: number | null;
  /** Upper-level energy in eV. */
  upperEv: number | null;
  /** Statistical weight of the upper level. */
  gUpper: number | null;
  /** Transition probability in s⁻¹. */
  aPerS: number | null;
  /** Flags, without repeats, in the order of LINE_FLAGS. */
  flags: LineFlag[];
  /** Band extent and direction of degradation; present exactly when flags include "band-head". */
  band: BandInfo | null;
  /** Citation of where the values come from (required). */
  source: string;
  /** True once a lab lead has checked the row against its source. */
  verified: boolean;
  /** Free text (blends, conventions); "" when none. */
  note: string;
}

/** A problem found while reading a line-table CSV, located in the file. */
export interface LineTableError {
  /** 1-based line of the file where the row (or the problem) starts. */
  line: number;
  /** 1-based CSV column of the offending field, when the problem belongs to one field. */
  column?: number;
  /** Column name of the offending field ("air_nm"), or "row" / "header" for whole-row problems. */
  field: string;
  /** What is wrong, in words a lab lead can act on. */
  message: string;
}

/** What parseLineTableCsv returns: the rows that passed every check, and everything that did not. */
export interface LineTableParseResult {
  /** Valid rows, in file order. Rows with any error are left out. */
  rows: LineTableRow[];
  /** 1-based file line of each row in `rows` (same order), for previews that point back into the file. */
  rowLines: number[];
  /**
   * Each row's line_key (same order as `rows`); null where the cell is blank, the file has no
   * line_key column or keys were not asked for (`readLineKeys`).
   */
  lineKeys: (string | null)[];
  /** 1-based CSV column of line_key in the file, or null when it has none (or keys were not asked for). */
  lineKeyColumn: number | null;
  /** Every problem found, in file order. */
  errors: LineTableError[];
}
