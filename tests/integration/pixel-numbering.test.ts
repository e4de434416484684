// A calibration made on a lamp stored before uploads knew how an instrument counts its pixels (its
// file counted from 1, stored as such) is refused for a sample stored from 0, with a sentence on the
// calibration field, instead of analysing every line one pixel off. The older lamp and its
// calibration are made here as an older version of the app stored them: copies of this test's own
// lamp and calibration with the file's numbers kept and no recorded counting.
import { beforeAll, describe, expect, it } from "vitest";
import type { ApiClient } from "./support/http-client";
import { signInDemo } from "./support/accounts";
import { db } from "./support/database";
import { reviewBench } from "./support/review-fixtures";

interface ErrorBody {
  error: { code: string; message: string; fieldErrors?: Record<string, string[]> };
}

let chemist: ApiClient;
let bench: Awaited<ReturnType<typeof reviewBench>>;
let olderCalibrationId: string;

/** Copies one row of `table` with some columns replaced; answers the new row's id. */
async function copyRow(table: string, id: string, replace: Record<string, unknown>) {
  const { rows } = await db().query<{ column_name: string }>(
    `SELECT column_name FROM information_schema.columns
      WHERE table_schema = 'public' AND table_name = $1 AND column_name <> 'id'
      ORDER BY ordinal_position`,
    [table],
  );
  const columns = rows.map((r) => r.column_name);
  const bind: unknown[] = [id];
  const values = columns.map((c) => {
    if (!(c in replace)) return `"${c}"`;
    bind.push(replace[c]);
    return `$${bind.length}`;
  });
  const copied = await db().query<{ id: string }>(
    `INSERT INTO ${table} (${columns.map((c) => `"${c}"`).join(", ")})
     SELECT ${values.join(", ")} FROM ${table} WHERE id = $1 RETURNING id`,
    bind,
  );
  return copied.rows[0].id;
}

beforeAll(async () => {
  const lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  bench = await reviewBench(lead, chemist, "Pixel numbering");
  const calibration = await db().query<{ spectrum_id: string }>(
    "SELECT spectrum_id FROM calibrations WHERE id = $1",
    [bench.calibrationId],
  );
  const lampId = calibration.rows[0].spectrum_id;
  const lamp = await db().query<{ x_values: Buffer; meta: Record<string, unknown> }>(
    "SELECT x_values, meta FROM spectrum_files WHERE id = $1",
    [lampId],
  );
  expect(lamp.rows[0].meta.firstColumn, "this app records the lamp's counting").toBeTruthy();
  // The file's numbers counted from 1, as an older version kept them, and no recorded counting.
  const x = Buffer.from(lamp.rows[0].x_values);
  for (let i = 0; i < x.length; i += 8) x.writeDoubleLE(x.readDoubleLE(i) + 1, i);
  const { firstColumn: _dropped, ...olderMeta } = lamp.rows[0].meta;
  const olderLampId = await copyRow("spectrum_files", lampId, {
    x_values: x,
    meta: JSON.stringify(olderMeta),
  });
  olderCalibrationId = await copyRow("calibrations", bench.calibrationId, {
    spectrum_id: olderLampId,
  });
}, 120_000);

describe("pixel numbering of a calibration and a sample", () => {
  it("refuses an older lamp's calibration counted from 1 for a sample stored from 0", async () => {
    const reply = await chemist.post<ErrorBody>("/api/runs", {
      notebookId: bench.notebookId,
      spectrumId: bench.sampleId,
      calibrationId: olderCalibrationId,
      source: "flame",
    });
    expect(reply.status).toBe(422);
    expect(reply.body.error.message).toMatch(/one pixel off/);
    expect(reply.body.error.fieldErrors?.calibrationId?.[0]).toMatch(/Calibrate again/);
  });

  it("accepts the calibration made on this app's own lamp upload", async () => {
    const reply = await chemist.post<{ id: string }>("/api/runs", {
      notebookId: bench.notebookId,
      spectrumId: bench.sampleId,
      calibrationId: bench.calibrationId,
      source: "flame",
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  });
});
