// Reads a line-table CSV (starter table, draft import) into validated rows and located errors.
// Every row is checked in full so a preview can show all of a file's problems at once.

import { LINE_KEY_COLUMN, LINE_TABLE_COLUMNS, LINE_TABLE_COLUMN_NAMES } from "./line-table-columns";
import {
  readLineTableRow,
  resolveLineTableRowOptions,
  type ReadLineTableRowOptions,
} from "./read-line-table-row";
import type { LineTableError, LineTableParseResult, LineTableRow } from "./types";
import { readCsvRecords, type CsvRecord as RawRecord } from "./read-csv-records";

/** The row checks' limits (readLineTableRow), and whether the file may carry line keys. */
export interface ParseLineTableCsvOptions extends ReadLineTableRowOptions {
  /**
   * Accept a line_key column (exports write one) and return each row's key in `lineKeys`; the key's
   * meaning (a line of which draft) is the caller's to check. Without it, line_key is an unknown column.
   * @default false
   */
  readLineKeys?: boolean;
}

/** Checks the header row; returns column indexes by name, or null after reporting errors. */
function readHeader(
  record: RawRecord,
  readLineKeys: boolean,
  errors: LineTableError[],
): Map<string, number> | null {
  const columns = new Map<string, number>();
  const known = new Set(
    readLineKeys ? [LINE_KEY_COLUMN, ...LINE_TABLE_COLUMN_NAMES] : LINE_TABLE_COLUMN_NAMES,
  );
  let ok = true;
  record.cells.forEach((cell, index) => {
    const name = cell.trim();
    if (!known.has(name)) {
      errors.push({
        line: record.line,
        column: index + 1,
        field: "header",
        message: `unknown column "${name}"; known columns: ${LINE_TABLE_COLUMN_NAMES.join(", ")}`,
      });
      ok = false;
    } else if (columns.has(name)) {
      errors.push({
        line: record.line,
        column: index + 1,
        field: "header",
        message: `column "${name}" appears twice`,
      });
      ok = false;
    } else {
      columns.set(name, index);
    }
  });
  for (const { name: required } of LINE_TABLE_COLUMNS.filter((column) => column.required)) {
    if (!columns.has(required)) {
      errors.push({
        line: record.line,
        field: "header",
        message: `required column "${required}" is missing`,
      });
      ok = false;
    }
  }
  if (!columns.has("air_nm") && !columns.has("vacuum_nm")) {
    errors.push({
      line: record.line,
      field: "header",
      message: 'the header needs "air_nm" or "vacuum_nm" (or both)',
    });
    ok = false;
  }
  return ok ? columns : null;
}

/** Validates one data record; returns the row, or null after reporting its errors located in the file. */
function readRow(
  record: RawRecord,
  columns: Map<string, number>,
  options: ReadLineTableRowOptions,
  errors: LineTableError[],
): LineTableRow | null {
  const { line, cells } = record;
  for (const message of record.parseErrors) errors.push({ line, field: "row", message });
  if (cells.length !== columns.size) {
    errors.push({
      line,
      field: "row",
      message: `expected ${columns.size} fields as in the header, found ${cells.length}`,
    });
    return null;
  }
  const byName = new Map<string, string>();
  for (const [name, index] of columns) byName.set(name, cells[index]);
  const checked = readLineTableRow(byName, options);
  for (const { field, message } of checked.errors) {
    const index = columns.get(field);
    errors.push(
      index === undefined ? { line, field, message } : { line, column: index + 1, field, message },
    );
  }
  return record.parseErrors.length > 0 ? null : checked.row;
}

/**
 * Parses a line-table CSV: "#" lines are comments, the first other line is the header
 * (column names from LINE_TABLE_COLUMNS, any order, optional columns may be left out; line_key too
 * with `readLineKeys`).
 * Rows that fail any check are left out of `rows` and every failure is listed in `errors`.
 */
export function parseLineTableCsv(
  text: string,
  options: ParseLineTableCsvOptions = {},
): LineTableParseResult {
  if (typeof text !== "string") throw new RangeError("text must be a string");
  const resolved = resolveLineTableRowOptions(options);
  const records = readCsvRecords(text.startsWith("\uFEFF") ? text.slice(1) : text);
  const errors: LineTableError[] = [];
  const result: LineTableParseResult = {
    rows: [],
    rowLines: [],
    lineKeys: [],
    lineKeyColumn: null,
    errors,
  };
  if (records.length === 0) {
    errors.push({ line: 1, field: "header", message: "the file has no header row" });
    return result;
  }
  const [headerRecord, ...dataRecords] = records;
  const columns = readHeader(headerRecord, options.readLineKeys ?? false, errors);
  if (!columns) return result;
  const keyIndex = columns.get(LINE_KEY_COLUMN);
  if (keyIndex !== undefined) result.lineKeyColumn = keyIndex + 1;
  for (const record of dataRecords) {
    const row = readRow(record, columns, resolved, errors);
    if (row) {
      const key = keyIndex === undefined ? "" : record.cells[keyIndex].trim();
      result.rows.push(row);
      result.rowLines.push(record.line);
      result.lineKeys.push(key === "" ? null : key);
    }
  }
  return result;
}
