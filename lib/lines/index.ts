// Public API of lib/lines: species notation, the line-table CSV format, and the bridge to the core's ReferenceLine.

export { ELEMENT_SYMBOLS, isElementSymbol } from "./element-symbols";
export { parseSpecies } from "./parse-species";
export type { ParseSpeciesOptions } from "./parse-species";
export { formatSpecies } from "./format-species";
export { LINE_TABLE_COLUMNS, LINE_TABLE_COLUMN_NAMES } from "./line-table-columns";
export type { LineTableColumn } from "./line-table-columns";
export { parseLineTableCsv } from "./parse-line-table-csv";
export { readLineTableRow } from "./read-line-table-row";
export { lineTableCells } from "./line-table-cells";
export { lineLocator } from "./line-locator";
export type { ParseLineTableCsvOptions } from "./parse-line-table-csv";
export { formatLineTableCsv } from "./format-line-table-csv";
export type { FormatLineTableCsvOptions } from "./format-line-table-csv";
export { toReferenceLine } from "./to-reference-line";
export type { ToReferenceLineOptions } from "./to-reference-line";
export { findDuplicateLines } from "./find-duplicate-lines";
export type { FindDuplicateLinesOptions } from "./find-duplicate-lines";
export { LINE_FLAGS } from "./types";
export type {
  LineFlag,
  LineTableError,
  LineTableParseResult,
  LineTableRow,
  ParsedSpecies,
} from "./types";
export { parseReferenceCsv, REFERENCE_COLUMNS } from "./parse-reference-csv";
export type {
  ParseReferenceCsvOptions,
  ReferenceCsvParseResult,
  ReferenceFileLine,
} from "./parse-reference-csv";
export type { WavelengthMedium } from "../spectrum/types";
export { compareWithReference } from "./compare-with-reference";
export type {
  CompareWithReferenceOptions,
  DraftLineForCheck,
  ReferenceComparison,
  ReferencePairing,
} from "./compare-with-reference";
