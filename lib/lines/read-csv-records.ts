// Splits a comma-separated file into records with the file line each starts on, for the line-table
// and reference parsers (both point their errors back into the file).
import Papa from "papaparse";
import { lineLocator } from "./line-locator";

/** One CSV record: its cells, the 1-based file line where it starts, and PapaParse's complaints. */
export interface CsvRecord {
  cells: string[];
  line: number;
  parseErrors: string[];
}

/** Splits the CSV into records, skipping "#" comment lines and blank lines. */
export function readCsvRecords(text: string): CsvRecord[] {
  const lineOf = lineLocator(text);
  const records: CsvRecord[] = [];
  Papa.parse<string[]>(text, {
    delimiter: ",",
    comments: "#",
    skipEmptyLines: false,
    step: (result) => {
      const cells = result.data;
      // The cursor sits after the record's line break; back up to its last character, then
      // subtract the line breaks inside quoted cells to reach the line where it starts.
      let end = result.meta.cursor;
      if (text[end - 1] === "\n") end -= 1;
      if (text[end - 1] === "\r") end -= 1;
      const innerBreaks = cells.reduce((sum, cell) => sum + (cell.match(/\n/g)?.length ?? 0), 0);
      const line = lineOf(Math.max(end - 1, 0)) - innerBreaks;
      const parseErrors = result.errors.map((e) => e.message);
      if (cells.every((cell) => cell.trim() === "") && parseErrors.length === 0) return;
      records.push({ cells, line, parseErrors });
    },
  });
  return records;
}
