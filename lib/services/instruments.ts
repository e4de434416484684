// Instruments of a team: lab leads create them, every member sees them with their newest calibration.
import "server-only";
import type { Transaction } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, type TeamAction } from "@/lib/auth/policy";
import type { InstrumentCreateInput } from "@/lib/validation/workflow-schemas";
import { Calibration, Instrument, sequelize } from "@/models";
import { recordAudit } from "./audit";
import type { InstrumentRecord } from "./workflow-types";

export function toInstrumentRecord(row: Instrument, latestCalibrationId: string | null): InstrumentRecord {
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
    createdAt: row.createdAt.toISOString(),
    latestCalibrationId,
  };
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
export async function latestCalibrationOf(instrumentId: string, transaction?: Transaction): Promise<Calibration | null> {
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
  return Promise.all(rows.map(async (row) => toInstrumentRecord(row, (await latestCalibrationOf(row.id))?.id ?? null)));
}

export async function fetchInstrument(actor: Actor, instrumentId: string): Promise<InstrumentRecord> {
  const row = await loadInstrument(actor, instrumentId);
  return toInstrumentRecord(row, (await latestCalibrationOf(row.id))?.id ?? null);
}

export async function createInstrument(actor: Actor, input: InstrumentCreateInput): Promise<InstrumentRecord> {
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
          createdById: actor.id,
        },
        { transaction },
      );
      const record = toInstrumentRecord(row, null);
      await recordAudit(
        { actorId: actor.id, teamId: input.teamId, action: "instrument.create", entity: "instrument", entityId: row.id, after: record },
        transaction,
      );
      return record;
    });
  } catch (error) {
    if (error instanceof Error && error.name === "SequelizeUniqueConstraintError") {
      throw new AppError("conflict", "The team already has an instrument of that name.", {
        fieldErrors: { name: ["The team already has an instrument of that name."] },
      });
    }
    throw error;
  }
}
