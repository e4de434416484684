// Matching a line-table CSV against a draft's rows: pure (no database, no server-only), so it runs in
// the worker pool (lib/workers) with the rows the service loaded, and the preview and the apply plan alike.
import { createHash } from "node:crypto";
import { parseLineTableCsv, type LineTableError, type LineTableRow } from "@/lib/lines";
import { differingFields, toLineTableRow, type LineDbRow } from "./line-library-rows";
import type { ImportChange, ImportPreview } from "./line-library-types";

/** Rows of one species closer than this in vacuum wavelength are taken as the same line (common practice). */
export const MATCH_TOLERANCE_NM = 0.002;
const UUID_PATTERN = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * Items of each species in cells one tolerance wide, so the nearest within the tolerance is found by
 * looking at a few cells instead of the whole species (a 100,000-row file made that quadratic).
 * Ties go to the item added first, as a scan in order would.
 */
class WavelengthGrid<T> {
  private readonly cells = new Map<string, { vacuumNm: number; order: number; item: T }[]>();
  private added = 0;

  private static key(species: string, cell: number): string {
    return `${species}\u0000${cell}`;
  }

  add(species: string, vacuumNm: number, item: T): void {
    const key = WavelengthGrid.key(species, Math.floor(vacuumNm / MATCH_TOLERANCE_NM));
    const list = this.cells.get(key) ?? [];
    list.push({ vacuumNm, order: this.added++, item });
    this.cells.set(key, list);
  }

  nearest(species: string, vacuumNm: number): T | null {
    const cell = Math.floor(vacuumNm / MATCH_TOLERANCE_NM);
    let best: { distance: number; order: number; item: T } | null = null;
    // Two cells either side: rounding can put a neighbour exactly at the tolerance one cell further.
    for (let c = cell - 2; c <= cell + 2; c++) {
      for (const entry of this.cells.get(WavelengthGrid.key(species, c)) ?? []) {
        const distance = Math.abs(entry.vacuumNm - vacuumNm);
        if (distance > MATCH_TOLERANCE_NM) continue;
        if (
          !best ||
          distance < best.distance ||
          (distance === best.distance && entry.order < best.order)
        ) {
          best = { distance, order: entry.order, item: entry.item };
        }
      }
    }
    return best ? best.item : null;
  }
}

/** The draft's state in one hash: any edit (a new row, a bumped version) changes it. */
function draftStateHash(rows: readonly LineDbRow[]): string {
  const hash = createHash("sha256");
  for (const row of [...rows].sort((a, b) => (a.id < b.id ? -1 : 1)))
    hash.update(`${row.id}:${row.version};`);
  return hash.digest("hex");
}

export interface PlannedImport {
  preview: ImportPreview;
  addRows: LineTableRow[];
  changeRows: { row: LineDbRow; next: LineTableRow; fields: string[] }[];
}

/** Matches a file against the draft's rows. Pure apart from the rows it is given. */
export function planImport(
  releaseId: string,
  csvText: string,
  draftRows: LineDbRow[],
): PlannedImport {
  // One line-break convention: a file re-sent by a form (CRLF) keeps its preview's fingerprint.
  csvText = csvText.replace(/\r\n?/g, "\n");
  const parsed = parseLineTableCsv(csvText, { readLineKeys: true });
  const errors: LineTableError[] = [...parsed.errors];
  const keyColumn = parsed.lineKeyColumn;
  const reject = (line: number, field: string, message: string) =>
    errors.push(
      field === "line_key" && keyColumn !== null
        ? { line, column: keyColumn, field, message }
        : { line, field, message },
    );

  const byKey = new Map(draftRows.map((row) => [row.line_key, row]));
  const draftGrid = new WavelengthGrid<LineDbRow>();
  for (const row of draftRows) draftGrid.add(row.species, row.vacuum_nm, row);

  const matchedBy = new Map<string, number>();
  const adds: ImportPreview["adds"] = [];
  const addRows: LineTableRow[] = [];
  const addsGrid = new WavelengthGrid<{ csvLine: number }>();
  const changes: ImportChange[] = [];
  const changeRows: PlannedImport["changeRows"] = [];
  let unchangedCount = 0;

  parsed.rows.forEach((row, index) => {
    const csvLine = parsed.rowLines[index];
    const key = parsed.lineKeys[index];
    let match: LineDbRow | undefined;
    if (key !== null) {
      if (!UUID_PATTERN.test(key)) return reject(csvLine, "line_key", `"${key}" is not a line key`);
      match = byKey.get(key.toLowerCase());
      if (!match) {
        return reject(
          csvLine,
          "line_key",
          `line_key ${key} is not a line of this draft; leave the cell blank to add the row as a new line`,
        );
      }
    } else {
      match = draftGrid.nearest(row.species, row.vacuumNm) ?? undefined;
    }
    if (match) {
      const earlier = matchedBy.get(match.id);
      if (earlier !== undefined) {
        return reject(
          csvLine,
          "row",
          `duplicate inside the file: line ${earlier} already describes ${match.species} ${match.air_nm ?? match.vacuum_nm} nm`,
        );
      }
      matchedBy.set(match.id, csvLine);
      const before = toLineTableRow(match);
      const fields = differingFields(before, row);
      if (fields.length === 0) unchangedCount += 1;
      else {
        changes.push({
          lineId: match.id,
          lineKey: match.line_key,
          csvLine,
          before,
          after: row,
          fields,
        });
        changeRows.push({ row: match, next: row, fields });
      }
      return;
    }
    const twin = addsGrid.nearest(row.species, row.vacuumNm);
    if (twin !== null) {
      return reject(
        csvLine,
        "row",
        `duplicate inside the file: line ${twin.csvLine} already adds ${row.species} within ${MATCH_TOLERANCE_NM} nm`,
      );
    }
    addsGrid.add(row.species, row.vacuumNm, { csvLine });
    adds.push({ csvLine, row });
    addRows.push(row);
  });

  errors.sort((a, b) => a.line - b.line || (a.column ?? 0) - (b.column ?? 0));
  const fingerprint = createHash("sha256")
    .update(`${releaseId}\n${draftStateHash(draftRows)}\n`)
    .update(csvText)
    .digest("hex");
  return {
    preview: { releaseId, adds, changes, unchangedCount, errors, fingerprint },
    addRows,
    changeRows,
  };
}
