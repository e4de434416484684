// Instruments of a team: lab leads create and edit them, every member sees them with their newest calibration.
// An edit may not change the geometry (dispersion, pixel count) once calibrations were made on it. The
// export profile (how files without a header are read) is edited here too; the first upload that says
// what its first column holds sets it on an instrument that has none (lib/services/spectra.ts).
import "server-only";
import type { Transaction } from "sequelize";
import type { ExportProfile } from "@/lib/spectrum/types";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import type {
  InstrumentCreateInput,
  InstrumentUpdateInput,
} from "@/lib/validation/instrument-schemas";
import { Calibration, Instrument, sequelize } from "@/models";
import { recordAudit } from "./audit";
import type { InstrumentRecord } from "./instrument-types";
import { isWavelengthUnit } from "@/lib/spectrum/types";

export function toInstrumentRecord(
  row: Instrument,
  latestCalibrationId: string | null,
): InstrumentRecord {
  return {
    id: row.id,
    teamId: row.teamId,
    name: row.name,
    dispersion: row.dispersion,
    pixels: row.pixels,
    nominalMinNm: row.nominalMinNm,
    nominalMaxNm: row.nominalMaxNm,
    resolutionNm: row.resolutionNm,
    detectorMax: row.detectorMax,
    glass: row.glass,
    apexDeg: row.apexDeg,
    exportXUnit: row.exportXUnit,
    exportMedium: row.exportMedium,
    version: row.version,
    createdAt: row.createdAt.toISOString(),
    latestCalibrationId,
  };
}

/** The instrument's export profile in the core's terms, or null while none is set. */
export function exportProfileOf(
  row: Pick<Instrument, "exportXUnit" | "exportMedium">,
): ExportProfile | null {
  return row.exportXUnit ? { firstColumn: row.exportXUnit, medium: row.exportMedium } : null;
}

/** An instrument the actor may act on; another team's (or a malformed id's) is not found. */
export async function loadInstrument(
  actor: Actor,
  instrumentId: string,
  action: TeamAction = "instrument.view",
  transaction?: Transaction,
): Promise<Instrument> {
  const row = await Instrument.findByPk(instrumentId, { transaction });
  if (!row) throw notFound("No such instrument.");
  authorize(actor, action, { teamId: row.teamId });
  return row;
}

/** The instrument's newest calibration (the default for new runs), or null. */
export async function latestCalibrationOf(
  instrumentId: string,
  transaction?: Transaction,
): Promise<Calibration | null> {
  return Calibration.findOne({
    where: { instrumentId },
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
    transaction,
  });
}

export async function fetchInstruments(actor: Actor, teamId: string): Promise<InstrumentRecord[]> {
  authorize(actor, "instrument.view", { teamId });
  const rows = await Instrument.findAll({ where: { teamId }, order: [["name", "ASC"]] });
  return Promise.all(
    rows.map(async (row) =>
      toInstrumentRecord(row, (await latestCalibrationOf(row.id))?.id ?? null),
    ),
  );
}

export async function fetchInstrument(
  actor: Actor,
  instrumentId: string,
): Promise<InstrumentRecord> {
  const row = await loadInstrument(actor, instrumentId);
  return toInstrumentRecord(row, (await latestCalibrationOf(row.id))?.id ?? null);
}

export async function createInstrument(
  actor: Actor,
  input: InstrumentCreateInput,
): Promise<InstrumentRecord> {
  authorize(actor, "instrument.manage", { teamId: input.teamId });
  try {
    return await sequelize.transaction(async (transaction) => {
      const row = await Instrument.create(
        {
          teamId: input.teamId,
          name: input.name,
          dispersion: input.dispersion,
          pixels: input.pixels,
          nominalMinNm: input.nominalMinNm,
          nominalMaxNm: input.nominalMaxNm,
          resolutionNm: input.resolutionNm,
          detectorMax: input.detectorMax ?? null,
          glass: input.glass ?? null,
          apexDeg: input.apexDeg ?? null,
          exportXUnit: input.exportXUnit ?? null,
          exportMedium: input.exportMedium ?? null,
          createdById: actor.id,
        },
        { transaction },
      );
      const record = toInstrumentRecord(row, null);
      await recordAudit(
        {
          actorId: actor.id,
          teamId: input.teamId,
          action: "instrument.create",
          entity: "instrument",
          entityId: row.id,
          after: record,
        },
        transaction,
      );
      return record;
    });
  } catch (error) {
    throw duplicateNameOr(error);
  }
}

/** The unique (team, name) constraint as a 409 on the name field; any other error as it is. */
function duplicateNameOr(error: unknown): unknown {
  if (error instanceof Error && error.name === "SequelizeUniqueConstraintError") {
    return new AppError("conflict", "The team already has an instrument of that name.", {
      fieldErrors: { name: ["The team already has an instrument of that name."] },
    });
  }
  return error;
}

/** The fields an edit may change, in the order the audit event lists them. */
const EDITABLE_FIELDS = [
  "name",
  "dispersion",
  "pixels",
  "nominalMinNm",
  "nominalMaxNm",
  "resolutionNm",
  "detectorMax",
  "glass",
  "apexDeg",
  "exportXUnit",
  "exportMedium",
] as const;
type EditableField = (typeof EDITABLE_FIELDS)[number];
type EditableValues = Pick<Instrument, EditableField>;

/** Changing these would invalidate the calibrations (and the runs on them) made on the old geometry. */
const GEOMETRY_FIELDS: readonly EditableField[] = ["dispersion", "pixels"];

/**
 * Edits an instrument the editor saw at `input.version` (lab leads only; another team's is not found).
 * A stale version is a conflict; so is a new dispersion or pixel count once the instrument has
 * calibrations (make a new instrument instead). Left-out optional fields keep their value; a grating
 * has no glass or apex, and a profile that is not a wavelength no medium. The export profile may change
 * whatever the calibrations: it only says how later files are read. Nothing changed saves nothing and
 * writes no audit event.
 */
export async function updateInstrument(
  actor: Actor,
  instrumentId: string,
  input: InstrumentUpdateInput,
): Promise<InstrumentRecord> {
  await loadInstrument(actor, instrumentId, "instrument.manage");
  try {
    return await sequelize.transaction(async (transaction) => {
      const row = await Instrument.findByPk(instrumentId, {
        transaction,
        lock: transaction.LOCK.UPDATE,
      });
      if (!row) throw notFound("No such instrument.");
      if (row.version !== input.version) {
        throw new AppError(
          "conflict",
          "Someone changed this instrument since you opened it. Reload to see its current settings, then make your change again.",
        );
      }
      const prism = input.dispersion === "prism";
      const next: EditableValues = {
        name: input.name,
        dispersion: input.dispersion,
        pixels: input.pixels,
        nominalMinNm: input.nominalMinNm,
        nominalMaxNm: input.nominalMaxNm,
        resolutionNm: input.resolutionNm,
        detectorMax: input.detectorMax === undefined ? row.detectorMax : input.detectorMax,
        glass: !prism ? null : input.glass === undefined ? row.glass : input.glass,
        apexDeg: !prism ? null : input.apexDeg === undefined ? row.apexDeg : input.apexDeg,
        exportXUnit: input.exportXUnit === undefined ? row.exportXUnit : input.exportXUnit,
        exportMedium: null,
      };
      const keptMedium = input.exportMedium === undefined ? row.exportMedium : input.exportMedium;
      if (isWavelengthUnit(next.exportXUnit)) next.exportMedium = keptMedium;
      else if (input.exportMedium != null) {
        // The schema checks this when both come together; here the unit is the stored one.
        const message =
          "Only wavelengths (nm or angstrom) are in air or vacuum: leave exportMedium out.";
        throw new AppError("validation", message, { fieldErrors: { exportMedium: [message] } });
      }
      const changed = EDITABLE_FIELDS.filter((field) => next[field] !== row[field]);
      const latest = await latestCalibrationOf(row.id, transaction);
      if (changed.length === 0) return toInstrumentRecord(row, latest?.id ?? null);

      const geometry = changed.filter((field) => GEOMETRY_FIELDS.includes(field));
      if (geometry.length > 0 && latest) {
        const message =
          "This instrument has calibrations, and they (and the runs on them) were made on its present dispersion and pixel count. Add a new instrument for the new geometry instead.";
        throw new AppError("conflict", message, {
          fieldErrors: Object.fromEntries(
            geometry.map((field) => [field, ["Fixed once the instrument has calibrations."]]),
          ),
        });
      }

      const before = Object.fromEntries(changed.map((field) => [field, row[field]]));
      const after = Object.fromEntries(changed.map((field) => [field, next[field]]));
      row.set(after as Partial<EditableValues>);
      await row.save({ transaction });
      await recordAudit(
        {
          actorId: actor.id,
          teamId: row.teamId,
          action: "instrument.update",
          entity: "instrument",
          entityId: row.id,
          before,
          after,
        },
        transaction,
      );
      return toInstrumentRecord(row, latest?.id ?? null);
    });
  } catch (error) {
    throw duplicateNameOr(error);
  }
}
