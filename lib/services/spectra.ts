// Uploaded spectra: the raw bytes are kept unchanged with their SHA-256 beside the parsed points;
// a file the core cannot read is refused with its located message and nothing is stored. A preview
// runs the same check (checkUpload) and returns the facts and a thinned series without storing.
// What the first column holds comes from the file, the upload's xUnit, the instrument's export
// profile or a column of exactly the detector's indices (lib/spectrum/io/read-instrument-file.ts);
// when nothing says, the refusal names xUnit. Storing a file that said it, on an instrument with no
// profile, sets the profile (audited).
import "server-only";
import type { StoredAxisFacts } from "@/lib/spectrum/io/stored-pixel-numbering";
import { createHash } from "node:crypto";
import { Op, QueryTypes, type Transaction } from "sequelize";
import { thinSeries } from "@/lib/charts/thin-series";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import {
  SpectrumParseError,
  decodeSpectrumBytes,
  readInstrumentFile,
  type FirstColumnSource,
  type InstrumentFileReading,
} from "@/lib/spectrum/io";
import type { ExportProfile, FirstColumnKind, WavelengthMedium } from "@/lib/spectrum/types";
import {
  MAX_UPLOAD_BYTES,
  MAX_UPLOAD_POINTS,
  UPLOAD_X_UNITS,
} from "@/lib/validation/upload-schemas";
import { Instrument, SpectrumFile, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { bytesToFloat64, float64ToBytes } from "./float64-bytes";
import { exportProfileOf, loadInstrument } from "./instruments";
import type { SpectraQuery } from "@/lib/validation/notebook-schemas";
import type { SpectrumRecord } from "./spectrum-types";

/** A spectrum as lists show it: the record without the duplicate check (no bytes or points either). */
export type SpectrumSummary = Omit<SpectrumRecord, "duplicateOf">;

function toSpectrumRecord(
  row: SpectrumFile,
  duplicateOf: SpectrumRecord["duplicateOf"],
  xRange: [number, number],
): SpectrumRecord {
  return {
    id: row.id,
    teamId: row.teamId,
    instrumentId: row.instrumentId,
    kind: row.kind,
    label: row.label,
    fileName: row.fileName,
    byteSize: row.byteSize,
    sha256: row.sha256,
    points: row.pointCount,
    xUnit: row.xUnit,
    medium: row.medium,
    xRange,
    uploadedAt: row.createdAt.toISOString(),
    uploadedById: row.uploadedById,
    duplicateOf,
  };
}

async function earlierUpload(
  row: { teamId: string; sha256: string; id?: string },
  transaction?: Transaction,
) {
  const earlier = await SpectrumFile.findOne({
    where: {
      teamId: row.teamId,
      sha256: row.sha256,
      ...(row.id ? { id: { [Op.ne]: row.id } } : {}),
    },
    attributes: ["id", "fileName", "createdAt"],
    order: [["createdAt", "ASC"]],
    transaction,
  });
  return earlier
    ? { id: earlier.id, fileName: earlier.fileName, uploadedAt: earlier.createdAt.toISOString() }
    : null;
}

/** A stored spectrum the actor may act on; another team's is not found. */
export async function loadSpectrum(
  actor: Actor,
  spectrumId: string,
  action: TeamAction = "instrument.view",
): Promise<SpectrumFile> {
  const row = await SpectrumFile.findByPk(spectrumId);
  if (!row) throw notFound("No such spectrum.");
  authorize(actor, action, { teamId: row.teamId });
  return row;
}

/** What tells how a stored axis counts its pixels (see stored-pixel-numbering). */
export function storedAxisFacts(
  row: Pick<SpectrumFile, "xUnit" | "meta" | "xValues" | "pointCount">,
): StoredAxisFacts {
  const x = row.xValues;
  const minX = Math.min(x.readDoubleLE(0), x.readDoubleLE(8 * (row.pointCount - 1)));
  const meta = (row.meta ?? {}) as { firstColumn?: string };
  return { xUnit: row.xUnit, firstColumn: meta.firstColumn ?? null, minX };
}

export function spectrumPoints(row: SpectrumFile): { x: Float64Array; y: Float64Array } {
  return { x: bytesToFloat64(row.xValues), y: bytesToFloat64(row.yValues) };
}

export async function fetchSpectrum(actor: Actor, spectrumId: string): Promise<SpectrumRecord> {
  const row = await loadSpectrum(actor, spectrumId);
  const { x } = spectrumPoints(row);
  const earlier = await earlierUpload(row);
  const duplicateOf = earlier && earlier.uploadedAt < row.createdAt.toISOString() ? earlier : null;
  return toSpectrumRecord(row, duplicateOf, [x[0], x[x.length - 1]]);
}

/**
 * The team's spectra, newest first, optionally of one instrument and one kind. An instrument of
 * another team is not found. Only the first and last x values are read, never the bytes or points.
 */
export async function fetchSpectra(
  actor: Actor,
  teamId: string,
  query: SpectraQuery = {},
): Promise<SpectrumSummary[]> {
  authorize(actor, "instrument.view", { teamId });
  if (query.instrumentId) {
    const instrument = await loadInstrument(actor, query.instrumentId);
    if (instrument.teamId !== teamId) throw notFound("No such instrument.");
  }
  const rows = await sequelize.query<{
    id: string;
    team_id: string;
    instrument_id: string;
    kind: "lamp" | "sample";
    label: string;
    file_name: string;
    byte_size: number;
    sha256: string;
    point_count: number;
    x_unit: SpectrumRecord["xUnit"];
    medium: SpectrumRecord["medium"];
    created_at: Date;
    uploaded_by_id: string | null;
    x_first: Buffer;
    x_last: Buffer;
  }>(
    `SELECT id, team_id, instrument_id, kind, label, file_name, byte_size, sha256, point_count, x_unit, medium,
            created_at, uploaded_by_id,
            substring(x_values FROM 1 FOR 8) AS x_first,
            substring(x_values FROM octet_length(x_values) - 7 FOR 8) AS x_last
       FROM spectrum_files
      WHERE team_id = $1 AND ($2::uuid IS NULL OR instrument_id = $2) AND ($3::text IS NULL OR kind = $3)
      ORDER BY created_at DESC, id`,
    { bind: [teamId, query.instrumentId ?? null, query.kind ?? null], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id,
    teamId: r.team_id,
    instrumentId: r.instrument_id,
    kind: r.kind,
    label: r.label,
    fileName: r.file_name,
    byteSize: Number(r.byte_size),
    sha256: r.sha256,
    points: Number(r.point_count),
    xUnit: r.x_unit,
    medium: r.medium,
    xRange: [r.x_first.readDoubleLE(0), r.x_last.readDoubleLE(0)],
    uploadedAt: new Date(r.created_at).toISOString(),
    uploadedById: r.uploaded_by_id,
  }));
}

export interface SpectrumUpload {
  instrumentId: string;
  kind: "lamp" | "sample";
  label: string;
  fileName: string;
  bytes: Uint8Array;
  /** What the first column holds, when the file does not say (the API's `xUnit`). */
  xUnit?: FirstColumnKind | "pixel";
  /** Air or vacuum, for a wavelength column whose file does not say (the API's `medium`). */
  medium?: WavelengthMedium;
}

/** An export profile as the API names it: the instrument's own fields. */
export interface ExportProfileFields {
  exportXUnit: FirstColumnKind;
  exportMedium: WavelengthMedium | null;
}

/** What decided the first column, in the API's words: the file, the upload's `xUnit`, the
 * instrument's export profile, or the column being exactly the detector's pixel indices. */
export type FirstColumnFrom = "file" | "xUnit" | "exportProfile" | "pixelCount";

const FROM_API: Record<FirstColumnSource, FirstColumnFrom> = {
  file: "file",
  stated: "xUnit",
  profile: "exportProfile",
  "pixel-count": "pixelCount",
};

const toProfileFields = (profile: ExportProfile): ExportProfileFields => ({
  exportXUnit: profile.firstColumn,
  exportMedium: profile.medium,
});

/** How an upload's first column was read (the preview and the stored record alike). */
export interface FirstColumnReading {
  /** What the first column held; null for pixels whose counting nothing told (stored as numbered). */
  firstColumn: FirstColumnKind | null;
  firstColumnFrom: FirstColumnFrom;
}

/** A stored upload: the record, how its first column was read, and the profile it set, if it did. */
export interface StoredUpload extends SpectrumRecord, FirstColumnReading {
  /** The export profile this upload gave its instrument (which had none), or null. */
  exportProfileSet: ExportProfileFields | null;
}

/** What the chemist sees before committing an upload: the parsed facts and the points thinned for a chart. */
export interface SpectrumPreview
  extends
    FirstColumnReading,
    Pick<
      SpectrumRecord,
      | "instrumentId"
      | "kind"
      | "label"
      | "fileName"
      | "byteSize"
      | "sha256"
      | "points"
      | "xUnit"
      | "medium"
      | "xRange"
      | "duplicateOf"
    > {
  /** Lowest and highest y value. */
  yRange: [number, number];
  /** What to check before storing, in sentences (a range mostly outside the instrument's). */
  warnings: string[];
  /** The export profile storing this file would give the instrument (it has none yet), or null. */
  exportProfileProposal: ExportProfileFields | null;
  /** The points for a chart, thinned beyond MAX_CHART_POINTS keeping each bucket's extremes. */
  series: { x: number[]; y: number[] };
}

/** The list of first-column kinds an API user may send as xUnit, for the messages. */
const X_UNIT_CHOICES = UPLOAD_X_UNITS.filter((unit) => unit !== "pixel")
  .map((unit) => `"${unit}"`)
  .join(", ");

/** A core message as a sentence of its own: capital first, full stop last. */
function asSentence(message: string): string {
  const text = message.charAt(0).toUpperCase() + message.slice(1);
  return /[.!?]$/.test(text) ? text : `${text}.`;
}

/**
 * A file the core could not read, as the API's 400: a unit nothing decides (or one the upload's xUnit
 * or medium contradicts) on the field that would fix it, anything else on `file`. The message says
 * what to send; the field's own message says only what is wrong, which the upload page shows beside
 * its question.
 */
function readRefusal(error: SpectrumParseError): AppError {
  const reason = asSentence(error.message);
  if (error.code === "unit-unknown") {
    const message = `${reason} Say what it holds with xUnit: ${X_UNIT_CHOICES}.`;
    return new AppError("validation", message, { fieldErrors: { xUnit: [reason] } });
  }
  if (error.code === "unit-conflict" && error.stated) {
    const field = error.stated;
    const message = `${reason} The file says this itself: leave ${field} out, or send what the file says.`;
    return new AppError("validation", message, { fieldErrors: { [field]: [reason] } });
  }
  return new AppError("validation", error.message, { fieldErrors: { file: [error.message] } });
}

/**
 * The one check an upload goes through, for the preview and for storing alike: the actor may upload
 * onto the instrument (another team's is not found), the file is within the limits, the core reads
 * it as this instrument's file and it fits the detector (else 413, or 400 with the located message on
 * the field to fix). Reads nothing but the instrument; writes nothing.
 */
async function checkUpload(actor: Actor, upload: SpectrumUpload) {
  const instrument = await loadInstrument(actor, upload.instrumentId, "spectrum.upload");
  if (upload.bytes.length > MAX_UPLOAD_BYTES) {
    throw new AppError(
      "too_large",
      `The file is ${upload.bytes.length} bytes; the limit is ${MAX_UPLOAD_BYTES} bytes (16 MiB).`,
    );
  }
  let reading: InstrumentFileReading;
  try {
    const text = decodeSpectrumBytes(upload.bytes, { maxBytes: MAX_UPLOAD_BYTES });
    reading = readInstrumentFile(
      text,
      {
        name: instrument.name,
        pixels: instrument.pixels,
        nominalRangeNm: [instrument.nominalMinNm, instrument.nominalMaxNm],
        exportProfile: exportProfileOf(instrument),
      },
      {
        firstColumn: upload.xUnit,
        medium: upload.medium,
        maxBytes: MAX_UPLOAD_BYTES,
        maxPoints: MAX_UPLOAD_POINTS,
      },
    );
  } catch (error) {
    if (error instanceof SpectrumParseError) throw readRefusal(error);
    if (error instanceof RangeError)
      throw new AppError("validation", error.message, { fieldErrors: { file: [error.message] } });
    throw error;
  }
  // A file that cannot have come from this instrument's detector is refused; one mostly outside its
  // nominal range is said on the preview. A counting the values contradict is refused on xUnit, with
  // the counting that fits.
  const { refusal } = reading;
  if (refusal) {
    if (refusal.otherCounting) {
      const message = `${refusal.message} If the file counts that way, send xUnit "${refusal.otherCounting}".`;
      throw new AppError("validation", message, { fieldErrors: { xUnit: [refusal.message] } });
    }
    throw new AppError("validation", refusal.message, {
      fieldErrors: { file: [refusal.message] },
    });
  }
  const raw = Buffer.from(upload.bytes.buffer, upload.bytes.byteOffset, upload.bytes.byteLength);
  const sha256 = createHash("sha256").update(raw).digest("hex");
  const firstColumn: FirstColumnReading = {
    firstColumn: reading.firstColumn,
    firstColumnFrom: FROM_API[reading.firstColumnFrom],
  };
  return { instrument, reading, spectrum: reading.spectrum, raw, sha256, firstColumn };
}

/** The facts of a checked upload that its preview shows and its audit entry records, in that order. */
function uploadFacts(
  upload: SpectrumUpload,
  checked: Pick<
    Awaited<ReturnType<typeof checkUpload>>,
    "instrument" | "spectrum" | "raw" | "sha256"
  >,
) {
  const { instrument, spectrum, raw, sha256 } = checked;
  return {
    instrumentId: instrument.id,
    kind: upload.kind,
    label: upload.label,
    fileName: upload.fileName,
    byteSize: raw.length,
    sha256,
    points: spectrum.x.length,
    xUnit: spectrum.xUnit,
  };
}

/** Parses and checks an upload exactly as uploadSpectrum does, and returns what it would store; stores nothing. */
export async function previewSpectrumUpload(
  actor: Actor,
  upload: SpectrumUpload,
): Promise<SpectrumPreview> {
  const { instrument, reading, spectrum, raw, sha256, firstColumn } = await checkUpload(
    actor,
    upload,
  );
  let yMin = Infinity;
  let yMax = -Infinity;
  for (const value of spectrum.y) {
    if (value < yMin) yMin = value;
    if (value > yMax) yMax = value;
  }
  const thin = thinSeries(spectrum.x, spectrum.y);
  return {
    ...uploadFacts(upload, { instrument, spectrum, raw, sha256 }),
    medium: spectrum.medium ?? null,
    xRange: [spectrum.x[0], spectrum.x[spectrum.x.length - 1]],
    yRange: [yMin, yMax],
    duplicateOf: await earlierUpload({ teamId: instrument.teamId, sha256 }),
    warnings: reading.warnings,
    exportProfileProposal: reading.proposedProfile
      ? toProfileFields(reading.proposedProfile)
      : null,
    ...firstColumn,
    series: { x: thin.x, y: thin.y },
  };
}

/**
 * Gives an instrument without an export profile the one its upload proposes (the file's header or the
 * uploader's xUnit said what the first column holds), in the upload's transaction and audited. The
 * uploader needs no right to edit the instrument: a profile only fills the gap; changing one that is
 * set is the instrument's editors' (updateInstrument). Returns the profile set, or null when another
 * upload or an editor set one first.
 */
async function setProposedProfile(
  actor: Actor,
  instrumentId: string,
  proposal: ExportProfile,
  upload: SpectrumUpload,
  decidedBy: FirstColumnFrom,
  transaction: Transaction,
): Promise<ExportProfileFields | null> {
  const row = await Instrument.findByPk(instrumentId, {
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  if (!row || row.exportXUnit !== null) return null;
  const fields = toProfileFields(proposal);
  row.set(fields);
  await row.save({ transaction });
  const source = decidedBy === "file" ? "its file said" : "its uploader said (xUnit)";
  await recordAudit(
    {
      actorId: actor.id,
      teamId: row.teamId,
      action: "instrument.export_profile",
      entity: "instrument",
      entityId: row.id,
      before: { exportXUnit: null, exportMedium: null },
      after: { ...fields },
      reason: `Set from the upload of ${upload.fileName}: the instrument had no export profile and ${source} what the first column holds.`,
    },
    transaction,
  );
  return fields;
}

export async function uploadSpectrum(actor: Actor, upload: SpectrumUpload): Promise<StoredUpload> {
  const { instrument, reading, spectrum, raw, sha256, firstColumn } = await checkUpload(
    actor,
    upload,
  );
  return sequelize.transaction(async (transaction) => {
    const exportProfileSet = reading.proposedProfile
      ? await setProposedProfile(
          actor,
          instrument.id,
          reading.proposedProfile,
          upload,
          firstColumn.firstColumnFrom,
          transaction,
        )
      : null;
    const duplicateOf = await earlierUpload({ teamId: instrument.teamId, sha256 }, transaction);
    const row = await SpectrumFile.create(
      {
        teamId: instrument.teamId,
        instrumentId: instrument.id,
        kind: upload.kind,
        label: upload.label,
        fileName: upload.fileName,
        byteSize: raw.length,
        sha256,
        rawBytes: raw,
        xUnit: spectrum.xUnit,
        medium: spectrum.medium ?? null,
        pointCount: spectrum.x.length,
        xValues: float64ToBytes(spectrum.x),
        yValues: float64ToBytes(spectrum.y),
        meta: spectrum.meta,
        uploadedById: actor.id,
      },
      { transaction },
    );
    const record = toSpectrumRecord(row, duplicateOf, [
      spectrum.x[0],
      spectrum.x[spectrum.x.length - 1],
    ]);
    await recordAudit(
      {
        actorId: actor.id,
        teamId: instrument.teamId,
        action: "spectrum.upload",
        entity: "spectrum_file",
        entityId: row.id,
        after: {
          ...uploadFacts(upload, { instrument, spectrum, raw, sha256 }),
          ...firstColumn,
          duplicateOf: duplicateOf?.id ?? null,
        },
      },
      transaction,
    );
    return { ...record, ...firstColumn, exportProfileSet };
  });
}
