// Uploaded spectra: the raw bytes are kept unchanged with their SHA-256 beside the parsed points;
// a file the core cannot read is refused with its located message and nothing is stored. A preview
// runs the same check (checkUpload) and returns the facts and a thinned series without storing.
import "server-only";
import { createHash } from "node:crypto";
import { Op, QueryTypes, type Transaction } from "sequelize";
import { thinSeries } from "@/lib/charts/thin-series";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import {
  SpectrumParseError,
  decodeSpectrumBytes,
  parseSpectrumFile,
  spectrumFitToInstrument,
} from "@/lib/spectrum/io";
import type { AxisUnit } from "@/lib/spectrum/types";
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_POINTS } from "@/lib/validation/workflow-schemas";
import { SpectrumFile, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { loadInstrument } from "./instruments";
import type { SpectraQuery } from "@/lib/validation/notebook-schemas";
import type { SpectrumRecord } from "./workflow-types";

/** A spectrum as lists show it: the record without the duplicate check (no bytes or points either). */
export type SpectrumSummary = Omit<SpectrumRecord, "duplicateOf">;

/** Points as little-endian float64 bytes, whatever the machine's byte order. */
export function float64ToBytes(values: Float64Array): Buffer {
  const buffer = Buffer.allocUnsafe(values.length * 8);
  for (let i = 0; i < values.length; i++) buffer.writeDoubleLE(values[i], i * 8);
  return buffer;
}

export function bytesToFloat64(bytes: Buffer): Float64Array {
  const values = new Float64Array(bytes.length / 8);
  for (let i = 0; i < values.length; i++) values[i] = bytes.readDoubleLE(i * 8);
  return values;
}

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
  /** Unit of the first column when the file does not say. */
  xUnit?: AxisUnit;
}

/** What the chemist sees before committing an upload: the parsed facts and the points thinned for a chart. */
export interface SpectrumPreview {
  instrumentId: string;
  kind: "lamp" | "sample";
  label: string;
  fileName: string;
  byteSize: number;
  sha256: string;
  points: number;
  xUnit: AxisUnit;
  medium: SpectrumRecord["medium"];
  /** First and last x value, in the file's order. */
  xRange: [number, number];
  /** Lowest and highest y value. */
  yRange: [number, number];
  /** An earlier upload of the same bytes in the team (the oldest), when there is one. */
  duplicateOf: SpectrumRecord["duplicateOf"];
  /** What to check before storing, in sentences (a range mostly outside the instrument's). */
  warnings: string[];
  /** The points for a chart, thinned beyond MAX_CHART_POINTS keeping each bucket's extremes. */
  series: { x: number[]; y: number[] };
}

/**
 * The one check an upload goes through, for the preview and for storing alike: the actor may upload
 * onto the instrument (another team's is not found), the file is within the limits and the core reads
 * it (else 413, or 400 with its located message). Reads nothing but the instrument; writes nothing.
 */
async function checkUpload(actor: Actor, upload: SpectrumUpload) {
  const instrument = await loadInstrument(actor, upload.instrumentId, "spectrum.upload");
  if (upload.bytes.length > MAX_UPLOAD_BYTES) {
    throw new AppError(
      "too_large",
      `The file is ${upload.bytes.length} bytes; the limit is ${MAX_UPLOAD_BYTES} bytes (16 MiB).`,
    );
  }
  let spectrum;
  try {
    const text = decodeSpectrumBytes(upload.bytes, { maxBytes: MAX_UPLOAD_BYTES });
    spectrum = parseSpectrumFile(text, {
      xUnit: upload.xUnit,
      maxBytes: MAX_UPLOAD_BYTES,
      maxPoints: MAX_UPLOAD_POINTS,
    });
  } catch (error) {
    if (error instanceof SpectrumParseError) {
      throw new AppError("validation", error.message, { fieldErrors: { file: [error.message] } });
    }
    if (error instanceof RangeError)
      throw new AppError("validation", error.message, { fieldErrors: { file: [error.message] } });
    throw error;
  }
  // A file that cannot have come from this instrument's detector is refused; one mostly outside its
  // nominal range is said on the preview.
  const fit = spectrumFitToInstrument(spectrum.x, spectrum.xUnit, {
    name: instrument.name,
    pixels: instrument.pixels,
    nominalRangeNm: [instrument.nominalMinNm, instrument.nominalMaxNm],
  });
  if (fit.refusal)
    throw new AppError("validation", fit.refusal, { fieldErrors: { file: [fit.refusal] } });
  const raw = Buffer.from(upload.bytes.buffer, upload.bytes.byteOffset, upload.bytes.byteLength);
  const sha256 = createHash("sha256").update(raw).digest("hex");
  return { instrument, spectrum, raw, sha256, warnings: fit.warnings };
}

/** Parses and checks an upload exactly as uploadSpectrum does, and returns what it would store; stores nothing. */
export async function previewSpectrumUpload(
  actor: Actor,
  upload: SpectrumUpload,
): Promise<SpectrumPreview> {
  const { instrument, spectrum, raw, sha256, warnings } = await checkUpload(actor, upload);
  let yMin = Infinity;
  let yMax = -Infinity;
  for (const value of spectrum.y) {
    if (value < yMin) yMin = value;
    if (value > yMax) yMax = value;
  }
  const thin = thinSeries(spectrum.x, spectrum.y);
  return {
    instrumentId: instrument.id,
    kind: upload.kind,
    label: upload.label,
    fileName: upload.fileName,
    byteSize: raw.length,
    sha256,
    points: spectrum.x.length,
    xUnit: spectrum.xUnit,
    medium: spectrum.medium ?? null,
    xRange: [spectrum.x[0], spectrum.x[spectrum.x.length - 1]],
    yRange: [yMin, yMax],
    duplicateOf: await earlierUpload({ teamId: instrument.teamId, sha256 }),
    warnings,
    series: { x: thin.x, y: thin.y },
  };
}

export async function uploadSpectrum(
  actor: Actor,
  upload: SpectrumUpload,
): Promise<SpectrumRecord> {
  const { instrument, spectrum, raw, sha256 } = await checkUpload(actor, upload);
  return sequelize.transaction(async (transaction) => {
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
          instrumentId: instrument.id,
          kind: upload.kind,
          label: upload.label,
          fileName: upload.fileName,
          byteSize: raw.length,
          sha256,
          points: spectrum.x.length,
          xUnit: spectrum.xUnit,
          duplicateOf: duplicateOf?.id ?? null,
        },
      },
      transaction,
    );
    return record;
  });
}
