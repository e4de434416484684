// Uploads as instruments export them, against the real server and PostgreSQL: a file without a header
// is read through its instrument's export profile (every separator, decimal commas, the profile's
// medium stored); without a profile, a column of exactly the detector's pixel indices is pixels;
// otherwise the upload is refused on `xUnit` (never an internal option name) and stores nothing; an
// upload whose xUnit (or header) says what the first column holds sets the profile of an instrument
// that has none, audited, while a preview sets nothing; a bad profile value is refused on create and
// edit with the field named. Pixel files counted from 1 are stored counted from 0.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { FLAME_SCREENING, signInDemo, teamIdOf } from "./support/accounts";
import { auditEventsSince, auditMark, closeDb, db, userIdByEmail } from "./support/database";
import type { ApiClient, ApiReply, ErrorBody } from "./support/http-client";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { DEMO } from "./support/accounts";

interface Instrument {
  id: string;
  name: string;
  dispersion: "prism" | "grating";
  pixels: number;
  nominalMinNm: number;
  nominalMaxNm: number;
  resolutionNm: number;
  exportXUnit: string | null;
  exportMedium: string | null;
  version: number;
}

interface Upload {
  id?: string;
  points: number;
  xUnit: string;
  medium: string | null;
  xRange: [number, number];
  firstColumn: string | null;
  firstColumnFrom: string;
  warnings?: string[];
  exportProfileProposal?: { exportXUnit: string; exportMedium: string | null } | null;
  exportProfileSet?: { exportXUnit: string; exportMedium: string | null } | null;
}

const suffix = `${Date.now().toString(36)}-${process.pid}`;
const grating = syntheticGrating();
let lead: ApiClient;
let chemist: ApiClient;
let chemistId: string;
let teamId: string;
let serial = 0;

/** A lab lead's new 2048-pixel grating, with the profile fields given (none: no profile). */
async function createInstrument(profile: Record<string, unknown> = {}): Promise<Instrument> {
  const reply = await lead.post<Instrument>("/api/instruments", {
    teamId,
    name: `Profile bench ${suffix} ${++serial}`,
    dispersion: "grating",
    pixels: SYNTHETIC_PIXELS,
    nominalMinNm: grating.nominalRangeNm[0],
    nominalMaxNm: grating.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
    ...profile,
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body;
}

function send(
  route: "/api/spectra" | "/api/spectra/preview",
  instrumentId: string,
  content: string,
  fields: Record<string, string> = {},
): Promise<ApiReply<Upload & ErrorBody>> {
  const form = new FormData();
  form.set("file", new Blob([content]), `file-${++serial}.txt`);
  form.set("instrumentId", instrumentId);
  form.set("kind", "sample");
  for (const [name, value] of Object.entries(fields)) form.set(name, value);
  return chemist.request<Upload & ErrorBody>("POST", route, { form });
}

/** Rows of x and counts: each x written with `decimal`, the columns joined by `separator`. */
function rows(xs: number[], separator: string, decimal: "." | "," = "."): string {
  const cell = (value: number) =>
    decimal === "," ? String(value).replace(".", ",") : String(value);
  // The counts vary with a seed of their own, so no two files of the test share their bytes.
  const seed = ++serial;
  return (
    xs
      .map((x, i) => `${cell(x)}${separator}${cell(150 + ((i * 31 + seed) % 97) + 0.25)}`)
      .join("\n") + "\n"
  );
}

const range = (from: number, count: number, step = 1) =>
  Array.from({ length: count }, (_, i) => Number((from + i * step).toFixed(4)));
/** 400 wavelengths inside the grating's nominal range, in nm. */
const wavelengthsNm = range(grating.nominalRangeNm[0] + 20, 400, 1.125);

async function instrumentRow(id: string) {
  const { rows: found } = await db().query<{
    export_x_unit: string | null;
    export_medium: string | null;
    version: number;
  }>("SELECT export_x_unit, export_medium, version FROM instruments WHERE id = $1", [id]);
  return found[0];
}

async function spectraOf(instrumentId: string): Promise<number> {
  const { rows: found } = await db().query<{ n: string }>(
    "SELECT count(*) AS n FROM spectrum_files WHERE instrument_id = $1",
    [instrumentId],
  );
  return Number(found[0].n);
}

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  chemistId = await userIdByEmail(DEMO.chemist.email);
  teamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(async () => {
  await closeDb();
});

describe("a file without a header", () => {
  it("is read through the instrument's profile in every layout, with the profile's medium", async () => {
    const bench = await createInstrument({ exportXUnit: "nm", exportMedium: "air" });
    expect(bench).toMatchObject({ exportXUnit: "nm", exportMedium: "air" });
    const layouts: [string, "." | ","][] = [
      [",", "."],
      ["\t", "."],
      [";", ","],
      ["  ", "."],
      ["\t", ","],
    ];
    for (const [separator, decimal] of layouts) {
      const what = JSON.stringify([separator, decimal]);
      const reply = await send("/api/spectra", bench.id, rows(wavelengthsNm, separator, decimal));
      expect(reply.status, `${what} ${JSON.stringify(reply.body)}`).toBe(201);
      expect(reply.body, what).toMatchObject({
        points: wavelengthsNm.length,
        xUnit: "nm",
        medium: "air",
        xRange: [wavelengthsNm[0], wavelengthsNm[wavelengthsNm.length - 1]],
        firstColumn: "nm",
        firstColumnFrom: "exportProfile",
        exportProfileSet: null,
      });
      const { rows: stored } = await db().query(
        "SELECT x_unit, medium FROM spectrum_files WHERE id = $1",
        [reply.body.id],
      );
      expect(stored[0], what).toEqual({ x_unit: "nm", medium: "air" });
    }
  });

  it("is read with the profile's pixel counting and stored counted from 0", async () => {
    const bench = await createInstrument({ exportXUnit: "pixel-from-1" });
    // A cropped export, pixels 101 to 1100 counted from 1: the count alone would not say pixels.
    const reply = await send("/api/spectra", bench.id, rows(range(101, 1000), ";"));
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    expect(reply.body).toMatchObject({
      xUnit: "pixel",
      xRange: [100, 1099],
      firstColumn: "pixel-from-1",
      firstColumnFrom: "exportProfile",
    });
  });

  it("without a profile, is pixels when it has one row per detector pixel, and proposes nothing", async () => {
    const bench = await createInstrument();
    expect(bench).toMatchObject({ exportXUnit: null, exportMedium: null });
    const mark = await auditMark();
    const reply = await send("/api/spectra", bench.id, rows(range(1, SYNTHETIC_PIXELS), " "));
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    expect(reply.body).toMatchObject({
      points: SYNTHETIC_PIXELS,
      xUnit: "pixel",
      xRange: [0, SYNTHETIC_PIXELS - 1],
      firstColumn: "pixel-from-1",
      firstColumnFrom: "pixelCount",
      exportProfileSet: null,
    });
    expect(await instrumentRow(bench.id)).toMatchObject({ export_x_unit: null, version: 0 });
    expect(await auditEventsSince(mark, { action: "instrument.export_profile" })).toEqual([]);
  });

  it("without a profile and not the pixel index, is refused on xUnit and nothing is stored", async () => {
    const bench = await createInstrument();
    const mark = await auditMark();
    for (const route of ["/api/spectra/preview", "/api/spectra"] as const) {
      const reply = await send(route, bench.id, rows(wavelengthsNm, ";", ","));
      expect(reply.status, route).toBe(400);
      expect(reply.body.error.message).toBe(
        'The file does not say what its first column holds. Say what it holds with xUnit: "pixel-from-0", ' +
          '"pixel-from-1", "nm", "angstrom", "wavenumber".',
      );
      expect(reply.body.error.fieldErrors).toEqual({
        xUnit: ["The file does not say what its first column holds."],
      });
    }
    // One row short of the detector is not its pixel index: refused too, with what the values look like.
    const short = await send(
      "/api/spectra/preview",
      bench.id,
      rows(range(0, SYNTHETIC_PIXELS - 1), ","),
    );
    expect(short.status).toBe(400);
    expect(short.body.error.fieldErrors?.xUnit?.[0]).toBe(
      `The file does not say what its first column holds; the values are the integers 0 to ${SYNTHETIC_PIXELS - 2} in steps of 1, as pixel indices would be.`,
    );
    // No message names an option of the code rather than a field of the API.
    expect(short.body.error.message).not.toMatch(/options\.|suggestXUnit|fallback/);
    expect(await spectraOf(bench.id)).toBe(0);
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);
  });
});

describe("the profile from an upload", () => {
  it("is proposed by the preview, set (audited) when the file is stored with xUnit, and used next time", async () => {
    const bench = await createInstrument();
    const content = rows(wavelengthsNm, "\t", ",");
    const mark = await auditMark();

    const preview = await send("/api/spectra/preview", bench.id, content, {
      xUnit: "nm",
      medium: "vacuum",
    });
    expect(preview.status, JSON.stringify(preview.body)).toBe(200);
    expect(preview.body).toMatchObject({
      xUnit: "nm",
      medium: "vacuum",
      firstColumn: "nm",
      firstColumnFrom: "xUnit",
      exportProfileProposal: { exportXUnit: "nm", exportMedium: "vacuum" },
    });
    // A preview writes nothing, the profile included.
    expect(await instrumentRow(bench.id)).toMatchObject({ export_x_unit: null, version: 0 });
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);

    const stored = await send("/api/spectra", bench.id, content, { xUnit: "nm", medium: "vacuum" });
    expect(stored.status, JSON.stringify(stored.body)).toBe(201);
    expect(stored.body.exportProfileSet).toEqual({ exportXUnit: "nm", exportMedium: "vacuum" });
    expect(await instrumentRow(bench.id)).toEqual({
      export_x_unit: "nm",
      export_medium: "vacuum",
      version: 1,
    });
    const [event] = await auditEventsSince(mark, { action: "instrument.export_profile" });
    expect(event).toMatchObject({
      actor_id: chemistId,
      team_id: teamId,
      entity: "instrument",
      entity_id: bench.id,
      before: { exportXUnit: null, exportMedium: null },
      after: { exportXUnit: "nm", exportMedium: "vacuum" },
    });
    expect(event.reason).toMatch(/had no export profile and its uploader said \(xUnit\)/);
    const read = await chemist.get<Instrument>(`/api/instruments/${bench.id}`);
    expect(read.body).toMatchObject({ exportXUnit: "nm", exportMedium: "vacuum", version: 1 });

    // The next file without a header needs no xUnit: the remembered answer reads it.
    const next = await send("/api/spectra", bench.id, rows(wavelengthsNm, ","));
    expect(next.status, JSON.stringify(next.body)).toBe(201);
    expect(next.body).toMatchObject({
      xUnit: "nm",
      medium: "vacuum",
      firstColumnFrom: "exportProfile",
      exportProfileSet: null,
    });
    // An answer on an instrument that has a profile is used for its file only.
    const other = await send("/api/spectra", bench.id, rows(range(4000, 300, 10), ","), {
      xUnit: "angstrom",
    });
    expect(other.status, JSON.stringify(other.body)).toBe(201);
    expect(other.body).toMatchObject({ xUnit: "angstrom", exportProfileSet: null });
    expect(await instrumentRow(bench.id)).toMatchObject({ export_x_unit: "nm", version: 1 });
    expect(await auditEventsSince(mark, { action: "instrument.export_profile" })).toHaveLength(1);
  });

  it("is proposed by a header too, with the counting its values show", async () => {
    const bench = await createInstrument();
    const reply = await send(
      "/api/spectra",
      bench.id,
      `pixel;counts\n${rows(range(0, SYNTHETIC_PIXELS), ";")}`,
    );
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    expect(reply.body).toMatchObject({
      firstColumn: "pixel-from-0",
      firstColumnFrom: "file",
      exportProfileSet: { exportXUnit: "pixel-from-0", exportMedium: null },
    });
    expect(await instrumentRow(bench.id)).toMatchObject({ export_x_unit: "pixel-from-0" });
  });

  it("is never set from a refused upload", async () => {
    const bench = await createInstrument();
    const mark = await auditMark();
    // Stated to count from 1, but the values are 0 to 2047: they fit only counted from 0.
    const counted = await send("/api/spectra", bench.id, rows(range(0, SYNTHETIC_PIXELS), ","), {
      xUnit: "pixel-from-1",
    });
    expect(counted.status).toBe(400);
    expect(counted.body.error.message).toMatch(
      /counted from 0 it fits\. If the file counts that way, send xUnit "pixel-from-0"\.$/,
    );
    expect(counted.body.error.fieldErrors?.xUnit?.[0]).toMatch(
      /^This file's first column runs over pixels 0 to 2047\./,
    );
    // A header the xUnit contradicts is refused on xUnit.
    const contradicted = await send(
      "/api/spectra",
      bench.id,
      `wavelength (nm),counts\n${rows(wavelengthsNm, ",")}`,
      { xUnit: "pixel-from-0" },
    );
    expect(contradicted.status).toBe(400);
    expect(contradicted.body.error.fieldErrors?.xUnit?.[0]).toMatch(
      /^Line 1, column 1: the file gives x in nm but pixel was stated for it\.$/,
    );
    expect(contradicted.body.error.message).toMatch(/leave xUnit out/);
    // An xUnit the API does not know is refused by the schema, on the field.
    const unknown = await send("/api/spectra", bench.id, rows(wavelengthsNm, ","), {
      xUnit: "micron",
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fieldErrors?.xUnit?.[0]).toMatch(
      /^The xUnit, what the file's first column holds, is one of/,
    );
    expect(await instrumentRow(bench.id)).toMatchObject({ export_x_unit: null, version: 0 });
    expect(await spectraOf(bench.id)).toBe(0);
    expect(await auditEventsSince(mark, { actorId: chemistId })).toEqual([]);
  });
});

describe("the profile on the instrument", () => {
  it("refuses a bad value on create with the field named, and creates nothing", async () => {
    const { rows: before } = await db().query("SELECT count(*) AS n FROM instruments");
    const base = {
      teamId,
      dispersion: "grating",
      pixels: SYNTHETIC_PIXELS,
      nominalMinNm: 400,
      nominalMaxNm: 800,
      resolutionNm: 1,
    };
    const badUnit = await lead.post<ErrorBody>("/api/instruments", {
      ...base,
      name: `Bad profile ${suffix}`,
      exportXUnit: "pixels",
    });
    expect(badUnit.status).toBe(400);
    expect(badUnit.body.error.fieldErrors?.exportXUnit?.[0]).toBe(
      "The exportXUnit, the first column of this instrument's files, is one of pixel-from-0, pixel-from-1, nm, angstrom, wavenumber, or null when not known.",
    );
    const badMedium = await lead.post<ErrorBody>("/api/instruments", {
      ...base,
      name: `Bad medium ${suffix}`,
      exportXUnit: "nm",
      exportMedium: "water",
    });
    expect(badMedium.status).toBe(400);
    expect(badMedium.body.error.fieldErrors?.exportMedium).toBeDefined();
    const mediumOfPixels = await lead.post<ErrorBody>("/api/instruments", {
      ...base,
      name: `Pixel medium ${suffix}`,
      exportXUnit: "pixel-from-0",
      exportMedium: "air",
    });
    expect(mediumOfPixels.status).toBe(400);
    expect(mediumOfPixels.body.error.fieldErrors?.exportMedium?.[0]).toMatch(
      /leave exportMedium out/,
    );
    const { rows: after } = await db().query("SELECT count(*) AS n FROM instruments");
    expect(after[0].n).toBe(before[0].n);
  });

  it("lets the lab lead change it, refuses a bad value with the field named, and keeps it from a chemist", async () => {
    const bench = await createInstrument({ exportXUnit: "pixel-from-1" });
    const edit = (client: ApiClient, json: Record<string, unknown>) =>
      client.request<Instrument & ErrorBody>("PATCH", `/api/instruments/${bench.id}`, {
        json: {
          name: bench.name,
          dispersion: bench.dispersion,
          pixels: bench.pixels,
          nominalMinNm: bench.nominalMinNm,
          nominalMaxNm: bench.nominalMaxNm,
          resolutionNm: bench.resolutionNm,
          version: bench.version,
          ...json,
        },
      });
    const mark = await auditMark();
    const bad = await edit(lead, { exportXUnit: "cm-1" });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors?.exportXUnit).toBeDefined();
    // A medium for the stored pixel profile, its unit left out.
    const medium = await edit(lead, { exportMedium: "air" });
    expect(medium.status).toBe(400);
    expect(medium.body.error.fieldErrors?.exportMedium?.[0]).toMatch(/leave exportMedium out/);
    expect(
      (
        await chemist.request<ErrorBody>("PATCH", `/api/instruments/${bench.id}`, {
          json: { ...bench, exportXUnit: "nm" },
        })
      ).status,
    ).toBe(403);
    expect(await instrumentRow(bench.id)).toMatchObject({
      export_x_unit: "pixel-from-1",
      export_medium: null,
      version: 0,
    });
    expect(await auditEventsSince(mark, { action: "instrument.update" })).toEqual([]);

    const changed = await edit(lead, { exportXUnit: "angstrom", exportMedium: "air" });
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    expect(changed.body).toMatchObject({
      exportXUnit: "angstrom",
      exportMedium: "air",
      version: 1,
    });
    const [event] = await auditEventsSince(mark, { action: "instrument.update" });
    expect(event.before).toEqual({ exportXUnit: "pixel-from-1", exportMedium: null });
    expect(event.after).toEqual({ exportXUnit: "angstrom", exportMedium: "air" });

    // Left out, the profile keeps its value; null clears it (and a medium goes with its unit).
    const kept = await chemist.get<Instrument>(`/api/instruments/${bench.id}`);
    const cleared = await lead.request<Instrument>("PATCH", `/api/instruments/${bench.id}`, {
      json: {
        name: bench.name,
        dispersion: bench.dispersion,
        pixels: bench.pixels,
        nominalMinNm: bench.nominalMinNm,
        nominalMaxNm: bench.nominalMaxNm,
        resolutionNm: 0.9,
        version: kept.body.version,
      },
    });
    expect(cleared.body).toMatchObject({ exportXUnit: "angstrom", exportMedium: "air" });
    const none = await lead.request<Instrument>("PATCH", `/api/instruments/${bench.id}`, {
      json: {
        name: bench.name,
        dispersion: bench.dispersion,
        pixels: bench.pixels,
        nominalMinNm: bench.nominalMinNm,
        nominalMaxNm: bench.nominalMaxNm,
        resolutionNm: 0.9,
        version: cleared.body.version,
        exportXUnit: null,
      },
    });
    expect(none.status, JSON.stringify(none.body)).toBe(200);
    expect(none.body).toMatchObject({ exportXUnit: null, exportMedium: null });
  });
});
