// Schemas of the line library's pages: the browse and compare search parameters, and the lab lead's
// draft forms (a line's values, a change with its reason, an import, a publish), each derived from the
// API's schema of the same use case (line-schemas.ts) with the form's own fields added.
import { z } from "zod";
import { text } from "./text";
import {
  LINE_FLAGS,
  LINE_TABLE_COLUMNS,
  LINE_TABLE_COLUMN_NAMES,
  readLineTableRow,
  type LineFlag,
} from "@/lib/lines";
import type {
  ImportPreview,
  LineInput,
  LineQuery,
  LineSortKey,
  ReferenceCheckPreview,
  ReferenceCheckResult,
} from "@/lib/services/line-library-types";
import type { FormState } from "./form-state";
import {
  SOURCE_KINDS,
  WAVELENGTH_MEDIA,
  type SourceKind,
  type WavelengthMedium,
} from "@/lib/spectrum/types";
import type { FieldErrors } from "@/lib/errors";
import {
  importApplySchema,
  importPreviewSchema,
  lineStateSchema,
  publishSchema,
  referenceCheckApplySchema,
  referenceCheckPreviewSchema,
} from "./line-schemas";

/** Rows per page of the browse and draft tables. */
export const LINE_PAGE_SIZE = 100;

const SORT_KEYS = ["wavelength", "species", "intensity"] as const satisfies readonly LineSortKey[];

// A bad or empty search parameter is dropped rather than failing the page, so that a hand-edited
// link still shows the table.
const optionalText = text()
  .trim()
  .max(40)
  .transform((s) => s || undefined)
  .optional()
  .catch(undefined);
const optionalNm = z.coerce.number().positive().max(100000).optional().catch(undefined);
const first = (value: unknown) =>
  Array.isArray(value) ? value[0] : value === "" ? undefined : value;

/** The browse table's search parameters, as they appear in the URL. */
export const lineSearchSchema = z.object({
  release: z.preprocess(first, z.uuid().optional().catch(undefined)),
  species: z.preprocess(first, optionalText),
  element: z.preprocess(first, optionalText),
  minNm: z.preprocess(first, optionalNm),
  maxNm: z.preprocess(first, optionalNm),
  source: z.preprocess(
    first,
    z
      .enum(SOURCE_KINDS as [SourceKind, ...SourceKind[]])
      .optional()
      .catch(undefined),
  ),
  flag: z.preprocess(
    first,
    z
      .enum(LINE_FLAGS as [LineFlag, ...LineFlag[]])
      .optional()
      .catch(undefined),
  ),
  verified: z.preprocess(first, z.enum(["yes", "no"]).optional().catch(undefined)),
  sort: z.preprocess(first, z.enum(SORT_KEYS).optional().catch(undefined)),
  dir: z.preprocess(first, z.enum(["asc", "desc"]).optional().catch(undefined)),
  page: z.preprocess(first, z.coerce.number().int().min(1).max(100000).optional().catch(undefined)),
});

export type LineSearch = z.infer<typeof lineSearchSchema>;

/** The search parameters of a page, parsed; never throws. */
export function parseLineSearch(params: Record<string, string | string[] | undefined>): LineSearch {
  return lineSearchSchema.parse(params);
}

/** Service field names (LineInput's) → the form's input names (the CSV columns). */
const INPUT_OF_FIELD = new Map(LINE_TABLE_COLUMNS.map((column) => [column.field, column.name]));

/** Field errors from the service, renamed to the inputs of the line form. */
export function toLineFormFieldErrors(
  fieldErrors: FieldErrors | undefined,
): FieldErrors | undefined {
  if (!fieldErrors) return undefined;
  const renamed: FieldErrors = {};
  for (const [field, messages] of Object.entries(fieldErrors)) {
    (renamed[INPUT_OF_FIELD.get(field) ?? field] ??= []).push(...messages);
  }
  return renamed;
}

/** The service query for a parsed search, in one team. */
export function toLineQuery(
  teamId: string,
  search: LineSearch,
  releaseId = search.release,
): LineQuery {
  return {
    teamId,
    releaseId,
    species: search.species,
    element: search.element,
    minNm: search.minNm,
    maxNm: search.maxNm,
    source: search.source,
    flag: search.flag,
    verified: search.verified === undefined ? undefined : search.verified === "yes",
    sort: search.sort ?? "wavelength",
    direction: search.dir ?? (search.sort === "intensity" ? "desc" : "asc"),
    page: search.page ?? 1,
    pageSize: LINE_PAGE_SIZE,
  };
}

/** The same search as a query string, with some parameters changed (undefined removes one). */
export function lineSearchHref(
  path: string,
  search: LineSearch,
  changes: Partial<Record<keyof LineSearch | "correct", string | number | undefined>> = {},
): string {
  const params = new URLSearchParams();
  const merged: Record<string, unknown> = { ...search, ...changes };
  for (const [key, value] of Object.entries(merged)) {
    if (value !== undefined && value !== "") params.set(key, String(value));
  }
  const query = params.toString();
  return query ? `${path}?${query}` : path;
}

/** The two releases of /lines/compare. */
export const compareSearchSchema = z.object({
  from: z.preprocess(first, z.uuid().optional().catch(undefined)),
  to: z.preprocess(first, z.uuid().optional().catch(undefined)),
});

/** A form's version field: the number it was read at, sent back as text. */
const formVersion = z.coerce.number().int().min(0);

/** The reason and lock of a correction; the values come from parseLineInputForm. */
export const lineCorrectionSchema = lineStateSchema.extend({
  lineId: z.uuid(),
  version: formVersion,
});

/** Retire, restore or mark verified: which row, its version, and why. */
export const lineChangeSchema = lineCorrectionSchema.extend({
  change: z.enum(["retire", "restore", "verify"]),
});

export const lineAddSchema = lineStateSchema.pick({ reason: true }).extend({ releaseId: z.uuid() });

export const importPreviewFormSchema = importPreviewSchema.extend({ releaseId: z.uuid() });

/** The lead has seen the rejected rows in the preview, so the form never asks about them. */
export const importApplyFormSchema = importApplySchema
  .omit({ skipRejected: true })
  .extend({ releaseId: z.uuid() });

export const publishFormSchema = publishSchema.extend({ releaseId: z.uuid() });

/**
 * A correction form shows both wavelengths. When the lead edits one of them, the other is left blank
 * so that it is recomputed from the edited one (else the stale partner would fail the air/vacuum
 * check); when neither was edited both stay as stored, so no rounding difference shows up as a change.
 */
export function keepEditedWavelength(formData: FormData): void {
  const value = (name: string) => String(formData.get(name) ?? "").trim();
  const airEdited = value("air_nm") !== value("original_air_nm");
  const vacuumEdited = value("vacuum_nm") !== value("original_vacuum_nm");
  if (airEdited && !vacuumEdited) formData.set("vacuum_nm", "");
  else if (vacuumEdited && !airEdited && value("air_nm") !== "") formData.set("air_nm", "");
}

/**
 * Reads a line's values from a form whose inputs are named after the CSV columns, with the checks an
 * imported row gets (readLineTableRow: species notation, air/vacuum agreement, energies, band fields,
 * a required source); field errors are keyed by the inputs' names.
 */
export function parseLineInputForm(
  formData: FormData,
): { input: LineInput; fieldErrors?: undefined } | { input?: undefined; fieldErrors: FieldErrors } {
  const cells = new Map(
    LINE_TABLE_COLUMN_NAMES.map((name) => {
      if (name === "flags") return [name, formData.getAll("flags").map(String).join(";")];
      if (name === "verified") return [name, "false"];
      return [name, String(formData.get(name) ?? "").trim()];
    }),
  );
  const { row, errors } = readLineTableRow(cells);
  if (!row) {
    const fieldErrors: FieldErrors = {};
    for (const error of errors) (fieldErrors[error.field] ??= []).push(error.message);
    return { fieldErrors };
  }
  const { element: _element, ionStage: _ionStage, verified: _verified, ...input } = row;
  return { input };
}

/** How many rows of each group an import preview lists; the counts always cover the whole file. */
export const PREVIEW_LIST_LIMIT = 500;

/** An import preview as the page receives it: each group's first rows and the group's full count. */
export interface ImportPreviewView {
  preview: ImportPreview;
  addCount: number;
  changeCount: number;
  errorCount: number;
}

/** A line form's state; conflict marks the answer to a stale version (someone else saved first). */
export interface LineFormState extends FormState {
  conflict?: boolean;
}

/** What the import form's server actions return: the preview to show and the text to apply. */
export interface ImportFormState extends LineFormState {
  view?: ImportPreviewView;
  /** The CSV the preview was made from, kept in a hidden field until the lead applies it. */
  csv?: string;
  applied?: { added: number; changed: number };
}

/** Cuts the preview's lists so that a 300,000-row file does not travel back whole to the browser. */
export function toImportPreviewView(preview: ImportPreview): ImportPreviewView {
  return {
    preview: {
      ...preview,
      adds: preview.adds.slice(0, PREVIEW_LIST_LIMIT),
      changes: preview.changes.slice(0, PREVIEW_LIST_LIMIT),
      errors: preview.errors.slice(0, PREVIEW_LIST_LIMIT),
    },
    addCount: preview.adds.length,
    changeCount: preview.changes.length,
    errorCount: preview.errors.length,
  };
}

/** The reference check's file form: the draft, the file's text and the medium of rows without a medium cell. */
export const referenceCheckFormSchema = referenceCheckPreviewSchema.extend({
  releaseId: z.uuid(),
  medium: z
    .enum(["", ...WAVELENGTH_MEDIA], { error: "Choose air, vacuum or the file's medium column." })
    .optional()
    .transform((m) => (m ? m : undefined)),
});

/** The decisions come from the form's decision:<line id> fields (referenceDecisionsOf). */
export const referenceApplyFormSchema = referenceCheckApplySchema
  .omit({ decisions: true })
  .extend(referenceCheckFormSchema.pick({ releaseId: true, medium: true }).shape);

/** The decisions of the confirm form: fields named decision:<line id> holding take, keep or leave. */
export function referenceDecisionsOf(
  formData: FormData,
): { lineId: string; decision: "take" | "keep" }[] {
  const decisions: { lineId: string; decision: "take" | "keep" }[] = [];
  for (const [name, value] of formData.entries()) {
    if (!name.startsWith("decision:")) continue;
    const lineId = name.slice("decision:".length);
    if (!z.uuid().safeParse(lineId).success) continue;
    if (value === "take" || value === "keep") decisions.push({ lineId, decision: value });
  }
  return decisions;
}

/** What the reference check's server action returns: the preview, and the text to confirm it with. */
export interface ReferenceCheckFormState extends FormState {
  preview?: ReferenceCheckPreview;
  /** The reference CSV the preview was made from, kept in a hidden field until the lead confirms. */
  csv?: string;
  medium?: WavelengthMedium;
  applied?: ReferenceCheckResult;
}
