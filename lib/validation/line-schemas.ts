// Schemas of the line library's use cases: the line query, a typed line, edits with version and reason,
// imports, publishing and release comparison. The API routes parse with them, the pages' forms
// (line-forms.ts) derive theirs from them, and the services check a reason and release notes with the
// same rules; the values are checked in full by the service (the CSV rules).
import { z } from "zod";
import { text } from "./text";
import { LINE_FLAGS, type LineFlag } from "@/lib/lines";
import { AppError } from "@/lib/errors";
import { bodyText } from "@/lib/http/read-body";
import { parseFields } from "./field-errors";
import { SOURCE_KINDS, WAVELENGTH_MEDIA, type SourceKind } from "@/lib/spectrum/types";

const SOURCE_KIND_ENUM = z.enum(SOURCE_KINDS as [SourceKind, ...SourceKind[]]);
const optionalNumber = z.number().finite().nullable().optional();

/** Why a draft line is added, corrected, retired, restored or verified: 3–500 characters. */
const lineReasonSchema = text({ error: "Say why." })
  .trim()
  .min(3, "Say why, in a few words.")
  .max(500, "Use at most 500 characters.");

/** The reason of an import or a reference check: blank for the default one, else a line reason. */
const optionalReason = z.preprocess(
  (value) =>
    value === null || (typeof value === "string" && value.trim() === "") ? undefined : value,
  lineReasonSchema.optional(),
);

/** The notes of a published release: what changed, 3–4,000 characters (its mail and audit reason). */
const releaseNotesSchema = text({ error: "Write what changed in this release." })
  .trim()
  .min(3, "Write what changed in this release.")
  .max(4000, "Use at most 4,000 characters.");

const MiB = 1024 * 1024;

/** The largest line-table CSV one import takes, from the page or the API: 20,000 exported rows fit. */
export const MAX_IMPORT_BYTES = 5 * MiB;
export const MAX_IMPORT_LABEL = `${MAX_IMPORT_BYTES / MiB} MB`;
export const IMPORT_TOO_LARGE_MESSAGE = `The file is larger than ${MAX_IMPORT_LABEL}; split it into smaller files.`;

/**
 * A reference file's largest size, from the page or the API: a whole-table export of a few thousand
 * lines is well under it.
 */
export const MAX_REFERENCE_BYTES = 2 * MiB;
export const MAX_REFERENCE_LABEL = `${MAX_REFERENCE_BYTES / MiB} MB`;
export const REFERENCE_TOO_LARGE_MESSAGE = `The file is larger than ${MAX_REFERENCE_LABEL}; split it by element.`;

const version = z.number({ error: "Send the version you edited." }).int().min(0);

/** Query-string numbers: blank means absent. */
const queryNumber = z.preprocess(
  (v) => (v === "" || v === null ? undefined : v),
  z.coerce.number().finite().optional(),
);

export const lineQuerySchema = z
  .object({
    teamId: z.uuid("Choose a team.").optional(),
    release: z.union([z.literal("draft"), z.uuid(), z.coerce.number().int().positive()]).optional(),
    minNm: queryNumber,
    maxNm: queryNumber,
    vacuum: z
      .enum(["true", "false"])
      .transform((v) => v === "true")
      .optional(),
    species: text().trim().min(1).max(40).optional(),
    element: text().trim().min(1).max(20).optional(),
    source: SOURCE_KIND_ENUM.optional(),
    flag: z.enum(LINE_FLAGS as unknown as [LineFlag, ...LineFlag[]]).optional(),
    verified: z
      .enum(["true", "false"])
      .transform((v) => v === "true")
      .optional(),
    sort: z.enum(["wavelength", "species", "intensity"]).optional(),
    direction: z.enum(["asc", "desc"]).optional(),
    page: z.coerce.number().int().min(1).optional(),
    pageSize: z.coerce.number().int().min(1).max(500, "At most 500 lines per page.").optional(),
  })
  .refine((q) => q.minNm === undefined || q.maxNm === undefined || q.minNm <= q.maxNm, {
    path: ["maxNm"],
    message: "The maxNm must not be below minNm.",
  });

export const lineInputSchema = z.object({
  species: text({ error: "Enter the species." }).trim().min(1, "Enter the species.").max(40),
  airNm: optionalNumber,
  vacuumNm: optionalNumber,
  uncertaintyNm: optionalNumber,
  intensities: z.partialRecord(SOURCE_KIND_ENUM, z.number().finite()).optional(),
  lowerEv: optionalNumber,
  upperEv: optionalNumber,
  gUpper: optionalNumber,
  aPerS: optionalNumber,
  flags: z.array(z.enum(LINE_FLAGS as unknown as [LineFlag, ...LineFlag[]])).optional(),
  band: z
    .object({ extentNm: z.number().finite(), degradesTo: z.enum(["red", "violet"]) })
    .nullable()
    .optional(),
  source: text({ error: "Name the source." })
    .trim()
    .min(1, 'Name the source ("from memory" if so).')
    .max(500),
  note: text().max(2000).optional(),
});

export const addLineSchema = z.object({ line: lineInputSchema, reason: lineReasonSchema });
export const updateLineSchema = z.object({
  version,
  line: lineInputSchema.partial(),
  reason: lineReasonSchema,
});
export const lineStateSchema = z.object({ version, reason: lineReasonSchema });
export const openDraftSchema = z.object({ teamId: z.uuid("Choose a team.") });
export const importPreviewSchema = z.object({
  csv: text({ error: "Choose a CSV file or paste its text." })
    .max(MAX_IMPORT_BYTES, IMPORT_TOO_LARGE_MESSAGE)
    .refine((csv) => csv.trim().length > 0, "Choose a CSV file or paste its text."),
});
export const importApplySchema = importPreviewSchema.extend({
  fingerprint: text().min(16, "Preview the file first.").max(200),
  skipRejected: z.boolean().optional(),
  reason: optionalReason,
});
const medium = z.enum(WAVELENGTH_MEDIA, {
  error: 'Say whether the reference wavelengths are in "air" or in "vacuum".',
});
/** A reference check's preview: the reference CSV and, for rows without a medium column, their medium. */
export const referenceCheckPreviewSchema = z.object({
  csv: text({ error: "Choose a reference CSV file." })
    .max(MAX_REFERENCE_BYTES, REFERENCE_TOO_LARGE_MESSAGE)
    .refine((csv) => csv.trim().length > 0, "Choose a reference CSV file."),
  medium: medium.optional(),
});
export const referenceCheckApplySchema = referenceCheckPreviewSchema.extend({
  fingerprint: text().min(16, "Check the file first: apply what a preview showed.").max(200),
  decisions: z
    .array(
      z.object({
        lineId: z.uuid("Name a draft line by its id."),
        decision: z.enum(["take", "keep"], {
          error: 'A decision is "take" (the reference value) or "keep" (ours).',
        }),
      }),
    )
    .max(20_000)
    .optional(),
  reason: optionalReason,
});
/** The cap of a reference check's body (the file, with room for JSON's escapes and the decisions). */
export const REFERENCE_CHECK_ROUTE_OPTIONS = {
  maxBodyBytes: MAX_REFERENCE_BYTES + 2 * MiB,
  tooLargeMessage: `The reference file is larger than the ${MAX_REFERENCE_LABEL} a reference check accepts.`,
};
export const publishSchema = z.object({ notes: releaseNotesSchema });
export const diffQuerySchema = z.object({
  teamId: z.uuid().optional(),
  from: z.uuid(),
  to: z.uuid(),
});

type ParsedLine = z.infer<typeof lineInputSchema>;

/** A full typed line for the service, blanks as null. */
export function toLineInput(line: ParsedLine) {
  return {
    species: line.species,
    airNm: line.airNm ?? null,
    vacuumNm: (line.vacuumNm ?? null) as number,
    uncertaintyNm: line.uncertaintyNm ?? null,
    intensities: line.intensities ?? {},
    lowerEv: line.lowerEv ?? null,
    upperEv: line.upperEv ?? null,
    gUpper: line.gUpper ?? null,
    aPerS: line.aPerS ?? null,
    flags: (line.flags ?? []) as LineFlag[],
    band: line.band ?? null,
    source: line.source,
    note: line.note ?? "",
  };
}

/** Only the fields an edit sent (absent stays absent, so the service keeps the current value). */
export function toLineChanges(line: Partial<ParsedLine>) {
  const changes: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(line)) {
    if (value === undefined) continue;
    changes[key] = value;
  }
  return changes as Partial<ReturnType<typeof toLineInput>>;
}

/** The cap of an import body (the file, with room for JSON's escapes when sent as {csv}). */
export const IMPORT_ROUTE_OPTIONS = {
  maxBodyBytes: MAX_IMPORT_BYTES + MiB,
  tooLargeMessage: `The line-table file is larger than the ${MAX_IMPORT_LABEL} an import accepts.`,
};

/**
 * A service's own check of a value with a use case's schema: its value, or 400 naming the field (the
 * value is checked as that field of an object, so its messages sit under the field's name).
 */
function checked<T extends z.ZodType>(
  schema: T,
  field: string,
  value: unknown,
  message: string,
): z.infer<T> {
  return parseFields(z.object({ [field]: schema }), { [field]: value }, message)[
    field
  ] as z.infer<T>;
}

/** A draft edit's reason as the services take it (trimmed), by the rule the forms and the API use. */
export const checkedLineReason = (reason: unknown): string =>
  checked(lineReasonSchema, "reason", reason, "Say why.");

/** A release's notes as publishing takes them (trimmed), by the rule the form and the API use. */
export const checkedReleaseNotes = (notes: unknown): string =>
  checked(releaseNotesSchema, "notes", notes, "Say what changed.");

/**
 * An import body: JSON checked by `schema`, or the file itself as text/csv (then fingerprint,
 * skipRejected and reason come from the query string). apiRoute has read it within IMPORT_ROUTE_OPTIONS.
 */
export async function readImportBody<T extends z.ZodType<{ csv: string }>>(
  request: Request,
  schema: T = importPreviewSchema as unknown as T,
): Promise<z.infer<T>> {
  const type = request.headers.get("content-type") ?? "";
  const text = await bodyText(request);
  let body: unknown;
  if (type.startsWith("text/csv") || type.startsWith("text/plain")) {
    const query = new URL(request.url).searchParams;
    body = {
      csv: text,
      ...(query.has("fingerprint") ? { fingerprint: query.get("fingerprint") } : {}),
      ...(query.has("skipRejected") ? { skipRejected: query.get("skipRejected") === "true" } : {}),
      ...(query.has("reason") ? { reason: query.get("reason") } : {}),
      ...(query.has("medium") ? { medium: query.get("medium") } : {}),
    };
  } else {
    try {
      body = JSON.parse(text);
    } catch {
      throw new AppError("validation", "Send the file as text/csv, or JSON {csv}.");
    }
  }
  return parseFields(schema, body);
}
