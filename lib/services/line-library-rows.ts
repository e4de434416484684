// The one place that knows the line tables' column names: SQL fragments and the mappers between
// database rows, LineRecord (what pages and the API see) and LineTableRow (the CSV's shape).
// Pure (no I/O and no "server-only"), so the seed and the bench can share the bulk insert.
import { randomUUID } from "node:crypto";
import type { LineFlag, LineTableRow } from "@/lib/lines";
import type { SourceKind } from "@/lib/spectrum/types";
import type { LineInput, LineQuery, LineRecord, ReleaseSummary } from "./line-library-types";

/** A row of `lines` joined with the verifier's name, as the SELECTs below return it. */
export interface LineDbRow {
  id: string;
  release_id: string;
  line_key: string;
  species: string;
  element: string;
  ion_stage: number | null;
  air_nm: number | null;
  vacuum_nm: number;
  uncertainty_nm: number | null;
  intensity_flame: number | null;
  intensity_arc: number | null;
  intensity_spark: number | null;
  intensity_plasma: number | null;
  intensity_lamp: number | null;
  lower_ev: number | null;
  upper_ev: number | null;
  g_upper: number | null;
  a_per_s: number | null;
  flags: LineFlag[];
  band_extent_nm: number | null;
  band_degrades_to: "red" | "violet" | null;
  source: string;
  note: string;
  verified_by_id: string | null;
  verified_by_name: string | null;
  verified_at: Date | null;
  /** What a reference check verified the line against; null for a check against its own source. */
  verified_citation: string | null;
  retired: boolean;
  version: number;
}

export interface ReleaseDbRow {
  id: string;
  team_id: string;
  number: number | null;
  status: "draft" | "published";
  notes: string;
  based_on_release_id: string | null;
  created_by_name: string | null;
  published_by_name: string | null;
  published_at: Date | null;
  created_at: Date;
  version: number;
}

/** A release row with its number of lines, for the summaries the line library shows. */
export interface ReleaseSummaryDbRow extends ReleaseDbRow {
  line_count: string | number;
}

export const INTENSITY_COLUMNS: ReadonlyArray<[SourceKind, string]> = [
  ["flame", "intensity_flame"],
  ["arc", "intensity_arc"],
  ["spark", "intensity_spark"],
  ["plasma", "intensity_plasma"],
  ["lamp", "intensity_lamp"],
];

/** The value columns a line carries (what an edit may change), in insert order. */
export const VALUE_COLUMNS = [
  "species",
  "element",
  "ion_stage",
  "air_nm",
  "vacuum_nm",
  "uncertainty_nm",
  "intensity_flame",
  "intensity_arc",
  "intensity_spark",
  "intensity_plasma",
  "intensity_lamp",
  "lower_ev",
  "upper_ev",
  "g_upper",
  "a_per_s",
  "flags",
  "band_extent_nm",
  "band_degrades_to",
  "source",
  "note",
] as const;

export type ValueColumn = (typeof VALUE_COLUMNS)[number];
export type LineValues = Record<ValueColumn, unknown>;

/** Column types for jsonb_to_recordset, so bulk writes can pass all rows as one JSON parameter. */
export const VALUE_COLUMN_TYPES: Record<ValueColumn, string> = {
  species: "text",
  element: "text",
  ion_stage: "smallint",
  air_nm: "double precision",
  vacuum_nm: "double precision",
  uncertainty_nm: "double precision",
  intensity_flame: "double precision",
  intensity_arc: "double precision",
  intensity_spark: "double precision",
  intensity_plasma: "double precision",
  intensity_lamp: "double precision",
  lower_ev: "double precision",
  upper_ev: "double precision",
  g_upper: "integer",
  a_per_s: "double precision",
  flags: "text[]",
  band_extent_nm: "double precision",
  band_degrades_to: "text",
  source: "text",
  note: "text",
};

/** SELECT list for lines aliased `l`, with the verifier joined as `vu`. */
export const LINE_SELECT = `l.id, l.release_id, l.line_key, ${VALUE_COLUMNS.map((c) => `l.${c}`).join(", ")},
  l.verified_by_id, vu.name AS verified_by_name, l.verified_at, l.verified_citation, l.retired, l.version`;
export const LINE_FROM = `lines l LEFT JOIN users vu ON vu.id = l.verified_by_id`;

const RECORDSET_COLUMNS = VALUE_COLUMNS.map((c) => `${c} ${VALUE_COLUMN_TYPES[c]}`).join(", ");

/**
 * One INSERT of many lines into a release: bind $1 = release id, $2 = JSON array of
 * {line_key, ...values}. One statement, so the frozen-release trigger checks once.
 */
export const BULK_INSERT_LINES_SQL = `INSERT INTO lines (release_id, line_key, ${VALUE_COLUMNS.join(", ")})
  SELECT $1, v.line_key, ${VALUE_COLUMNS.map((c) => `v.${c}`).join(", ")}
    FROM jsonb_to_recordset($2::jsonb) AS v(line_key uuid, ${RECORDSET_COLUMNS})`;

/** One UPDATE of many lines' values (bind $1 = JSON array of {id, ...values}); edited values are unverified. */
export const BULK_UPDATE_LINES_SQL = `UPDATE lines l SET ${VALUE_COLUMNS.map((c) => `${c} = v.${c}`).join(", ")},
    verified_by_id = NULL, verified_at = NULL, verified_citation = NULL, version = l.version + 1,
    updated_at = now()
  FROM jsonb_to_recordset($1::jsonb) AS v(id uuid, ${RECORDSET_COLUMNS})
  WHERE l.id = v.id`;

/** The JSON parameter of BULK_INSERT_LINES_SQL; new keys are made here so callers know them. */
export function bulkInsertPayload(
  rows: readonly LineTableRow[],
  keys: readonly (string | undefined)[] = [],
) {
  return JSON.stringify(
    rows.map((row, i) => ({ line_key: keys[i] ?? randomUUID(), ...valuesOf(row) })),
  );
}

export const RELEASE_SELECT = `r.id, r.team_id, r.number, r.status, r.notes, r.based_on_release_id, r.version,
  r.published_at, r.created_at, cu.name AS created_by_name, pu.name AS published_by_name`;
/**
 * The release's number of lines: a count over the whole release (300,000 index entries in a large
 * table, ~20 ms), so only summaries ask for it, never a read that only resolves or checks a release.
 */
export const RELEASE_LINE_COUNT = `(SELECT count(*) FROM lines c WHERE c.release_id = r.id) AS line_count`;
export const RELEASE_FROM = `line_releases r
  LEFT JOIN users cu ON cu.id = r.created_by_id
  LEFT JOIN users pu ON pu.id = r.published_by_id`;

export function toReleaseSummary(row: ReleaseSummaryDbRow): ReleaseSummary {
  return {
    id: row.id,
    teamId: row.team_id,
    number: row.number,
    status: row.status,
    notes: row.notes,
    basedOnReleaseId: row.based_on_release_id,
    lineCount: Number(row.line_count),
    createdByName: row.created_by_name,
    publishedByName: row.published_by_name,
    publishedAt: row.published_at ? new Date(row.published_at).toISOString() : null,
    createdAt: new Date(row.created_at).toISOString(),
  };
}

function intensitiesOf(row: LineDbRow): Partial<Record<SourceKind, number>> {
  const intensities: Partial<Record<SourceKind, number>> = {};
  for (const [kind, column] of INTENSITY_COLUMNS) {
    const value = row[column as keyof LineDbRow] as number | null;
    if (value !== null) intensities[kind] = value;
  }
  return intensities;
}

function bandOf(row: LineDbRow): LineRecord["band"] {
  return row.band_extent_nm !== null && row.band_degrades_to !== null
    ? { extentNm: row.band_extent_nm, degradesTo: row.band_degrades_to }
    : null;
}

export function toLineRecord(row: LineDbRow): LineRecord {
  // Taken apart only to keep the API's order of keys (g and a sit after the energies).
  const { lowerEv, upperEv, gUpper, aPerS, flags, band, source, verified, note, ...identity } =
    toLineTableRow(row);
  return {
    id: row.id,
    lineKey: row.line_key,
    releaseId: row.release_id,
    ...identity,
    upperEv,
    lowerEv,
    g: gUpper,
    a: aPerS,
    flags,
    band,
    source,
    note,
    verified,
    verifiedByName: row.verified_by_name,
    verifiedAt: row.verified_at ? new Date(row.verified_at).toISOString() : null,
    verifiedCitation: row.verified_citation,
    retired: row.retired,
    version: row.version,
  };
}

export function toLineTableRow(row: LineDbRow): LineTableRow {
  return {
    species: row.species,
    element: row.element,
    ionStage: row.ion_stage,
    airNm: row.air_nm,
    vacuumNm: row.vacuum_nm,
    uncertaintyNm: row.uncertainty_nm,
    intensities: intensitiesOf(row),
    lowerEv: row.lower_ev,
    upperEv: row.upper_ev,
    gUpper: row.g_upper,
    aPerS: row.a_per_s,
    flags: row.flags ?? [],
    band: bandOf(row),
    source: row.source,
    verified: row.verified_at !== null,
    note: row.note,
  };
}

/** A LineRecord's values in the CSV's shape (for validating edits the same way as imports). */
export function recordToInput(record: LineRecord): LineInput {
  return {
    species: record.species,
    airNm: record.airNm,
    vacuumNm: record.vacuumNm,
    uncertaintyNm: record.uncertaintyNm,
    intensities: record.intensities,
    lowerEv: record.lowerEv,
    upperEv: record.upperEv,
    gUpper: record.g,
    aPerS: record.a,
    flags: record.flags,
    band: record.band,
    source: record.source,
    note: record.note,
  };
}

/** The database values of a validated row. */
export function valuesOf(row: LineTableRow): LineValues {
  return {
    species: row.species,
    element: row.element,
    ion_stage: row.ionStage,
    air_nm: row.airNm,
    vacuum_nm: row.vacuumNm,
    uncertainty_nm: row.uncertaintyNm,
    intensity_flame: row.intensities.flame ?? null,
    intensity_arc: row.intensities.arc ?? null,
    intensity_spark: row.intensities.spark ?? null,
    intensity_plasma: row.intensities.plasma ?? null,
    intensity_lamp: row.intensities.lamp ?? null,
    lower_ev: row.lowerEv,
    upper_ev: row.upperEv,
    g_upper: row.gUpper,
    a_per_s: row.aPerS,
    flags: row.flags,
    band_extent_nm: row.band?.extentNm ?? null,
    band_degrades_to: row.band?.degradesTo ?? null,
    source: row.source,
    note: row.note,
  };
}

/** The fields of LineTableRow an edit can change, compared in previews and diffs. */
const COMPARED_FIELDS = [
  "species",
  "airNm",
  "vacuumNm",
  "uncertaintyNm",
  "intensities",
  "lowerEv",
  "upperEv",
  "gUpper",
  "aPerS",
  "flags",
  "band",
  "source",
  "note",
] as const satisfies readonly (keyof LineTableRow)[];

/** Stable JSON with sorted keys, so {flame, arc} and {arc, flame} compare equal. */
function canonical(value: unknown): string {
  if (value === null || typeof value !== "object") return JSON.stringify(value ?? null);
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => a.localeCompare(b));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(",")}}`;
}

/** Names of the LineTableRow fields whose values differ (verification is not a value). */
export function differingFields(before: LineTableRow, after: LineTableRow): string[] {
  return COMPARED_FIELDS.filter((field) => canonical(before[field]) !== canonical(after[field]));
}

export const TABULATED_NM = "coalesce(l.air_nm, l.vacuum_nm)";

/** WHERE clause and bind values of a line query; the count uses the same clause. */
export function lineFilter(
  releaseId: string,
  query: LineQuery,
): { where: string; bind: unknown[] } {
  const bind: unknown[] = [releaseId];
  const clauses = ["l.release_id = $1"];
  const add = (clause: (n: string) => string, value: unknown) => {
    bind.push(value);
    clauses.push(clause(`$${bind.length}`));
  };
  const wavelength = query.vacuum ? "l.vacuum_nm" : TABULATED_NM;
  if (query.minNm !== undefined) add((p) => `${wavelength} >= ${p}`, query.minNm);
  if (query.maxNm !== undefined) add((p) => `${wavelength} <= ${p}`, query.maxNm);
  if (query.species) add((p) => `l.species = ${p}`, query.species);
  if (query.element) add((p) => `l.element = ${p}`, query.element);
  if (query.source) {
    const column = INTENSITY_COLUMNS.find(([kind]) => kind === query.source)![1];
    clauses.push(`l.${column} IS NOT NULL`);
  }
  if (query.flag) add((p) => `${p} = ANY (l.flags)`, query.flag);
  if (query.verified !== undefined)
    clauses.push(query.verified ? "l.verified_at IS NOT NULL" : "l.verified_at IS NULL");
  return { where: clauses.join(" AND "), bind };
}

export function lineOrder(query: LineQuery): string {
  const direction = query.direction === "desc" ? "DESC" : "ASC";
  const wavelength = query.vacuum ? "l.vacuum_nm" : TABULATED_NM;
  switch (query.sort ?? "wavelength") {
    case "species":
      return `l.species ${direction}, l.vacuum_nm ${direction}, l.id`;
    case "intensity": {
      const column = query.source
        ? `l.${INTENSITY_COLUMNS.find(([kind]) => kind === query.source)![1]}`
        : `greatest(${INTENSITY_COLUMNS.map(([, c]) => `l.${c}`).join(", ")})`;
      // Strongest first reads naturally, so "asc" is the default only for wavelength and species.
      return `${column} ${query.direction === "asc" ? "ASC" : "DESC"} NULLS LAST, l.vacuum_nm, l.id`;
    }
    default:
      return `${wavelength} ${direction}, l.id`;
  }
}

/** The page query and the count query of a line query (same filter, same bind values). */
export function lineQuerySql(
  releaseId: string,
  query: LineQuery,
  page: number,
  pageSize: number,
): { select: string; count: string; bind: unknown[] } {
  const { where, bind } = lineFilter(releaseId, query);
  return {
    select: `SELECT ${LINE_SELECT} FROM ${LINE_FROM} WHERE ${where}
      ORDER BY ${lineOrder(query)} LIMIT ${Math.trunc(pageSize)} OFFSET ${Math.trunc((page - 1) * pageSize)}`,
    count: `SELECT count(*) AS total FROM lines l WHERE ${where}`,
    bind,
  };
}
