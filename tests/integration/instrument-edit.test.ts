// Editing an instrument through PATCH /api/instruments/:id against the real PostgreSQL: lab leads only
// (chemists and supervisors 403, another team 404), optimistic locking on the version, the create form's
// validation, one name per team, the geometry (dispersion, pixel count) fixed once calibrations exist,
// an audit event with before/after of the changed fields only, and a refused edit changing nothing.
// The tests run in order and build on each other.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, type ApiClient, type ApiReply, type ErrorBody } from "./support/http-client";
import { FLAME_SCREENING, signInDemo, signedIn, teamIdOf } from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { lampFile } from "./support/synthetic-files";

interface Instrument {
  id: string;
  name: string;
  dispersion: "prism" | "grating";
  pixels: number;
  nominalMinNm: number;
  nominalMaxNm: number;
  resolutionNm: number;
  detectorMax: number | null;
  glass: string | null;
  apexDeg: number | null;
  version: number;
  latestCalibrationId: string | null;
}

const SESSION_COOKIE = "emberline_session";
const suffix = `${Date.now().toString(36)}-${process.pid}`;
const grating = syntheticGrating();

let lead: ApiClient;
let chemist: ApiClient;
let supervisor: ApiClient;
let outsider: ApiClient;
let teamId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  supervisor = await signInDemo("supervisor");
  await ensureOutsider();
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  teamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(async () => {
  await closeDb();
});

/** The editable fields of an instrument, as the edit form sends them back. */
function fieldsOf(i: Instrument) {
  return {
    name: i.name,
    dispersion: i.dispersion,
    pixels: i.pixels,
    nominalMinNm: i.nominalMinNm,
    nominalMaxNm: i.nominalMaxNm,
    resolutionNm: i.resolutionNm,
    detectorMax: i.detectorMax,
    glass: i.glass,
    apexDeg: i.apexDeg,
    version: i.version,
  };
}

async function create(name: string): Promise<Instrument> {
  const reply = await lead.post<Instrument>("/api/instruments", {
    teamId,
    name,
    dispersion: "grating",
    pixels: SYNTHETIC_PIXELS,
    nominalMinNm: grating.nominalRangeNm[0],
    nominalMaxNm: grating.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
    detectorMax: 60000,
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  expect(reply.body.version).toBe(0);
  return reply.body;
}

function patch<T = Instrument>(client: ApiClient, id: string, json: unknown): Promise<ApiReply<T>> {
  return client.request<T>("PATCH", `/api/instruments/${id}`, { json });
}

/** The stored row, straight from the database. */
async function stored(id: string) {
  const { rows } = await db().query(
    `SELECT name, dispersion, pixels, nominal_min_nm, nominal_max_nm, resolution_nm, detector_max, glass, apex_deg,
            version, updated_at
       FROM instruments WHERE id = $1`,
    [id],
  );
  return rows[0];
}

/** Runs `attempt` and checks that it left the row and the audit trail exactly as they were. */
async function changesNothing(id: string, attempt: () => Promise<void>): Promise<void> {
  const before = await stored(id);
  const mark = await auditMark();
  await attempt();
  expect(await stored(id)).toEqual(before);
  expect(await auditEventsSince(mark, { action: "instrument.update" })).toEqual([]);
}

let bench: Instrument;

describe("editing an instrument", () => {
  it("lets the lab lead change the name and resolution, bumps the version and audits only the changed fields", async () => {
    bench = await create(`edit bench ${suffix}`);
    const mark = await auditMark();
    const reply = await patch(lead, bench.id, {
      ...fieldsOf(bench),
      name: `edit bench renamed ${suffix}`,
      resolutionNm: 0.5,
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body).toMatchObject({
      id: bench.id,
      name: `edit bench renamed ${suffix}`,
      resolutionNm: 0.5,
      version: 1,
    });
    // Fields the edit did not touch keep their values.
    expect(reply.body).toMatchObject({
      dispersion: "grating",
      pixels: SYNTHETIC_PIXELS,
      detectorMax: 60000,
    });

    const events = await auditEventsSince(mark, { action: "instrument.update" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      entity: "instrument",
      entity_id: bench.id,
      team_id: teamId,
      before: { name: `edit bench ${suffix}`, resolutionNm: SYNTHETIC_RESOLUTION_NM },
      after: { name: `edit bench renamed ${suffix}`, resolutionNm: 0.5 },
    });
    expect(Object.keys(events[0].before as object).sort()).toEqual(["name", "resolutionNm"]);
    expect(Object.keys(events[0].after as object).sort()).toEqual(["name", "resolutionNm"]);

    const read = await chemist.get<Instrument>(`/api/instruments/${bench.id}`);
    expect(read.status).toBe(200);
    expect(read.body).toMatchObject({
      name: `edit bench renamed ${suffix}`,
      resolutionNm: 0.5,
      version: 1,
    });
    bench = reply.body;
  });

  it("refuses an edit made on a stale version with 409 and keeps the other edit", async () => {
    await changesNothing(bench.id, async () => {
      const reply = await patch<ErrorBody>(lead, bench.id, {
        ...fieldsOf(bench),
        version: 0,
        resolutionNm: 2,
      });
      expect(reply.status).toBe(409);
      expect(reply.body.error.message).toMatch(/changed this instrument since you opened it/);
    });
    expect((await stored(bench.id)).resolution_nm).toBe(0.5);
  });

  it("is for lab leads only: a chemist and a supervisor get 403, a member of another team 404", async () => {
    const body = { ...fieldsOf(bench), resolutionNm: 3 };
    await changesNothing(bench.id, async () => {
      const asChemist = await patch<ErrorBody>(chemist, bench.id, body);
      expect(asChemist.status).toBe(403);
      expect(asChemist.body.error.code).toBe("forbidden");
      const asSupervisor = await patch<ErrorBody>(supervisor, bench.id, body);
      expect(asSupervisor.status).toBe(403);
      const asOutsider = await patch<ErrorBody>(outsider, bench.id, body);
      expect(asOutsider.status).toBe(404);
      expect(asOutsider.body.error.code).toBe("not_found");
      const unknown = await patch<ErrorBody>(lead, "00000000-0000-4000-8000-000000000000", body);
      expect(unknown.status).toBe(404);
    });
  });

  it("answers bad values with 400 and a message on the field, and stores nothing", async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ nominalMaxNm: bench.nominalMinNm - 10 }, "nominalMaxNm"],
      [{ resolutionNm: -1 }, "resolutionNm"],
      [{ pixels: 2048.5 }, "pixels"],
      [{ name: "   " }, "name"],
      [{ glass: "F2" }, "glass"],
      [{ dispersion: "mirror" }, "dispersion"],
      [{ apexDeg: 95, dispersion: "prism" }, "apexDeg"],
      [{ version: undefined }, "version"],
    ];
    await changesNothing(bench.id, async () => {
      for (const [change, field] of cases) {
        const reply = await patch<ErrorBody>(lead, bench.id, { ...fieldsOf(bench), ...change });
        expect(reply.status, JSON.stringify(change)).toBe(400);
        expect(reply.body.error.fieldErrors?.[field]?.[0], JSON.stringify(reply.body)).toEqual(
          expect.any(String),
        );
      }
    });
  });

  it("refuses a name another instrument of the team has with 409 on the name field", async () => {
    const other = await create(`edit other ${suffix}`);
    await changesNothing(bench.id, async () => {
      const reply = await patch<ErrorBody>(lead, bench.id, {
        ...fieldsOf(bench),
        name: other.name,
        resolutionNm: 0.7,
      });
      expect(reply.status).toBe(409);
      expect(reply.body.error.fieldErrors?.name?.[0]).toMatch(
        /already has an instrument of that name/,
      );
    });
  });

  it("may turn an uncalibrated grating into a prism with glass and apex, and back (which clears them)", async () => {
    const toPrism = await patch(lead, bench.id, {
      ...fieldsOf(bench),
      dispersion: "prism",
      glass: "F2",
      apexDeg: 60,
    });
    expect(toPrism.status, JSON.stringify(toPrism.body)).toBe(200);
    expect(toPrism.body).toMatchObject({
      dispersion: "prism",
      glass: "F2",
      apexDeg: 60,
      version: 2,
    });
    const { glass: _glass, apexDeg: _apex, ...withoutPrismFields } = fieldsOf(toPrism.body);
    const back = await patch(lead, bench.id, { ...withoutPrismFields, dispersion: "grating" });
    expect(back.status, JSON.stringify(back.body)).toBe(200);
    expect(back.body).toMatchObject({
      dispersion: "grating",
      glass: null,
      apexDeg: null,
      version: 3,
    });
    bench = back.body;
  });

  it("saves nothing and audits nothing when nothing changed", async () => {
    await changesNothing(bench.id, async () => {
      const reply = await patch(lead, bench.id, fieldsOf(bench));
      expect(reply.status).toBe(200);
      expect(reply.body.version).toBe(bench.version);
    });
  });
});

describe("an instrument with calibrations", () => {
  let calibrated: Instrument;

  it("gets a calibration from a synthetic lamp through the API", async () => {
    calibrated = await create(`edit calibrated ${suffix}`);
    const form = new FormData();
    form.set("file", new Blob([lampFile(grating)]), "hg-ar-lamp.csv");
    form.set("instrumentId", calibrated.id);
    form.set("kind", "lamp");
    const uploaded = await fetch(`${APP_URL}/api/spectra`, {
      method: "POST",
      headers: {
        cookie: `${SESSION_COOKIE}=${chemist.cookie(SESSION_COOKIE)}`,
        "x-forwarded-for": chemist.address,
      },
      body: form,
    });
    const spectrum = (await uploaded.json()) as { id: string };
    expect(uploaded.status, JSON.stringify(spectrum)).toBe(201);
    const calibration = await chemist.post<{ id: string }>("/api/calibrations", {
      instrumentId: calibrated.id,
      spectrumId: spectrum.id,
      lamps: ["Hg", "Ar"],
    });
    expect(calibration.status, JSON.stringify(calibration.body)).toBe(201);
    const read = await lead.get<Instrument>(`/api/instruments/${calibrated.id}`);
    expect(read.body.latestCalibrationId).toBe(calibration.body.id);
    calibrated = read.body;
  });

  it("refuses a new dispersion or pixel count with 409, saying to add a new instrument", async () => {
    await changesNothing(calibrated.id, async () => {
      const prism = await patch<ErrorBody>(lead, calibrated.id, {
        ...fieldsOf(calibrated),
        dispersion: "prism",
        resolutionNm: 2,
      });
      expect(prism.status).toBe(409);
      expect(prism.body.error.message).toMatch(/Add a new instrument/);
      expect(prism.body.error.fieldErrors?.dispersion).toBeDefined();

      const pixels = await patch<ErrorBody>(lead, calibrated.id, {
        ...fieldsOf(calibrated),
        pixels: 1024,
      });
      expect(pixels.status).toBe(409);
      expect(pixels.body.error.fieldErrors?.pixels).toBeDefined();
    });
  });

  it("still lets the lab lead change the name, resolution, detector maximum and nominal range", async () => {
    const mark = await auditMark();
    const reply = await patch(lead, calibrated.id, {
      ...fieldsOf(calibrated),
      name: `edit calibrated renamed ${suffix}`,
      resolutionNm: 1.2,
      detectorMax: null,
      nominalMinNm: calibrated.nominalMinNm - 10,
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body).toMatchObject({
      resolutionNm: 1.2,
      detectorMax: null,
      nominalMinNm: calibrated.nominalMinNm - 10,
    });
    const [event] = await auditEventsSince(mark, { action: "instrument.update" });
    expect(event.before).toEqual({
      name: calibrated.name,
      nominalMinNm: calibrated.nominalMinNm,
      resolutionNm: calibrated.resolutionNm,
      detectorMax: 60000,
    });
    expect(event.after).toEqual({
      name: `edit calibrated renamed ${suffix}`,
      nominalMinNm: calibrated.nominalMinNm - 10,
      resolutionNm: 1.2,
      detectorMax: null,
    });
  });
});
