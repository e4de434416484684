// The chemist's workflow through HTTP against the real PostgreSQL: instruments (lab leads only),
// spectrum uploads (raw bytes and hash kept, duplicates flagged, bad files refused with the core's
// located message and nothing stored), lamp calibrations checked against the synthetic generator's
// truth, notebooks, identification runs with their calls, another team's records answering 404, and
// an audit event for every mutation. The tests run in order and build on each other.
import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import packageJson from "@/package.json";
import { APP_URL, ApiClient, type ErrorBody } from "./support/http-client";
import { FLAME_SCREENING, signInDemo, signedIn, teamIdOf } from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { syntheticDarkFile } from "@/lib/spectrum/synthetic/synthetic-dark-file";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
  type SyntheticInstrument,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { syntheticPrism } from "@/lib/spectrum/synthetic/synthetic-prism";
import { flameFile, flameFileOnWavelengthAxis, lampFile } from "./support/synthetic-files";

interface Instrument {
  id: string;
  name: string;
  dispersion: string;
  latestCalibrationId: string | null;
}
interface Spectrum {
  id: string;
  points: number;
  sha256: string;
  xUnit: string;
  duplicateOf: { id: string } | null;
}
interface Pair {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
}
interface Calibration {
  id: string;
  model: string;
  rmsNm: number;
  pairs: Pair[];
  rejected: Pair[];
  coveredRangeNm: [number, number];
  lineReleaseId: string;
  softwareVersion: string;
  drift: {
    previousCalibrationId: string;
    pixels: number[];
    deltaNm: number[];
    maxAbsNm: number;
  } | null;
}
interface Run {
  id: string;
  status: string;
  calibrationId: string | null;
  lineReleaseId: string;
  lampChecked: boolean;
  peaks: {
    wavelengthNm: number;
    uncertaintyNm: number;
    fwhmNm: number;
    height: number;
    snr: number;
  }[];
  calls: {
    species: string;
    element: string;
    verdict: string;
    score: number;
    lines: { lineNm: number; peakNm: number; deltaNm: number }[];
  }[];
  unexplained: unknown[];
}

const SESSION_COOKIE = "emberline_session";
/** Elements of the flame file, and elements whose lines it does not contain at all. */
const PRESENT = ["K I", "Li I", "Sr I", "Ca I"];
const ABSENT = ["Ba I", "Tl I", "In I", "Cu I"];
/** 0.1 nm inside the lamp lines' range: a tenth of the 1 nm resolution; a good lamp calibration of such an
 * instrument reaches an RMS of a few hundredths to ~0.1 nm (common practice). */
const TOLERANCE_NM = 0.1;

let lead: ApiClient;
let chemist: ApiClient;
let outsider: ApiClient;
let teamId: string;
let outsiderTeamId: string;
const suffix = Date.now().toString(36);

/** Multipart upload with the client's session cookie (the JSON client sends no forms). */
async function upload(
  client: ApiClient,
  fields: { instrumentId: string; kind?: string; label?: string; xUnit?: string },
  content: string | Uint8Array,
  fileName = "spectrum.csv",
): Promise<{ status: number; body: unknown }> {
  const form = new FormData();
  form.set("file", new Blob([content as BlobPart]), fileName);
  for (const [name, value] of Object.entries(fields))
    if (value !== undefined) form.set(name, value);
  const response = await fetch(`${APP_URL}/api/spectra`, {
    method: "POST",
    headers: {
      cookie: `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE)}`,
      "x-forwarded-for": client.address,
    },
    body: form,
  });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null };
}

async function createInstrument(
  dispersion: "grating" | "prism",
  synthetic: SyntheticInstrument,
): Promise<Instrument> {
  const reply = await lead.post<Instrument>("/api/instruments", {
    teamId,
    name: `${dispersion} bench ${suffix}`,
    dispersion,
    pixels: SYNTHETIC_PIXELS,
    nominalMinNm: synthetic.nominalRangeNm[0],
    nominalMaxNm: synthetic.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body;
}

async function uploadOk(
  instrumentId: string,
  kind: "lamp" | "sample",
  content: string,
  fileName: string,
): Promise<Spectrum> {
  const reply = await upload(chemist, { instrumentId, kind, label: fileName }, content, fileName);
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body as Spectrum;
}

async function calibrate(
  instrumentId: string,
  spectrumId: string,
  model?: string,
): Promise<Calibration> {
  const reply = await chemist.post<Calibration>("/api/calibrations", {
    instrumentId,
    spectrumId,
    lamps: ["Hg", "Ar"],
    model,
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body;
}

/** Calibrated minus true wavelength at 41 pixels across the array, for those inside the covered range. */
async function errorsInsideCoveredRange(calibration: Calibration, synthetic: SyntheticInstrument) {
  const pixels = Array.from({ length: 41 }, (_, i) => i * ((SYNTHETIC_PIXELS - 1) / 40));
  const reply = await chemist.post<{ wavelengthsNm: number[]; uncertaintiesNm: number[] }>(
    `/api/calibrations/${calibration.id}/evaluate`,
    { pixels },
  );
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  expect(reply.body.wavelengthsNm).toHaveLength(pixels.length);
  expect(reply.body.uncertaintiesNm.every((s) => s >= 0)).toBe(true);
  const [lowNm, highNm] = calibration.coveredRangeNm;
  return pixels
    .map((pixel, i) => ({
      pixel,
      truthNm: synthetic.wavelengthOfPixel(pixel),
      errorNm: reply.body.wavelengthsNm[i] - synthetic.wavelengthOfPixel(pixel),
    }))
    .filter((p) => p.truthNm >= lowNm && p.truthNm <= highNm);
}

async function notebook(title: string): Promise<string> {
  const reply = await chemist.post<{ id: string }>("/api/notebooks", { teamId, title });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body.id;
}

async function run(notebookId: string, spectrumId: string, calibrationId?: string): Promise<Run> {
  const reply = await chemist.post<Run>("/api/runs", {
    notebookId,
    spectrumId,
    calibrationId,
    source: "flame",
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body;
}

const verdictOf = (r: Run, species: string) =>
  r.calls.find((c) => c.species === species)?.verdict ?? "absent";

async function rowCounts() {
  const { rows } = await db().query<Record<string, string>>(
    `SELECT (SELECT count(*) FROM spectrum_files) AS spectra, (SELECT count(*) FROM calibrations) AS calibrations,
            (SELECT count(*) FROM runs) AS runs`,
  );
  return rows[0];
}

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  outsiderTeamId = (await ensureOutsider()).teamId;
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  teamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(async () => {
  await closeDb();
});

const grating = syntheticGrating();
const prism = syntheticPrism();
let gratingInstrument: Instrument;
let lampSpectrum: Spectrum;
let flameSpectrum: Spectrum;
let gratingCalibration: Calibration;
let notebookId: string;
let gratingRun: Run;

describe("instruments", () => {
  it("are created by lab leads only (a chemist gets 403, an outsider 404), with an audit event", async () => {
    const body = {
      teamId,
      name: `chemist's bench ${suffix}`,
      dispersion: "grating",
      pixels: SYNTHETIC_PIXELS,
      nominalMinNm: 350,
      nominalMaxNm: 900,
      resolutionNm: 1,
    };
    expect((await chemist.post("/api/instruments", body)).status).toBe(403);
    expect((await outsider.post("/api/instruments", body)).status).toBe(404);
    const invalid = await lead.post<ErrorBody>("/api/instruments", { ...body, nominalMaxNm: 300 });
    expect(invalid.status).toBe(400);
    expect(invalid.body.error.fieldErrors?.nominalMaxNm).toBeDefined();

    const mark = await auditMark();
    gratingInstrument = await createInstrument("grating", grating);
    const events = await auditEventsSince(mark, { action: "instrument.create" });
    expect(events.map((e) => e.entity_id)).toEqual([gratingInstrument.id]);

    const listed = await chemist.get<Instrument[]>(`/api/instruments?teamId=${teamId}`);
    expect(listed.status).toBe(200);
    expect(listed.body.map((i) => i.id)).toContain(gratingInstrument.id);
  });
});

describe("uploads", () => {
  it("refuse bad files with the core's located message (400), oversized ones with 413, and store nothing", async () => {
    const before = await rowCounts();
    const mark = await auditMark();
    const rows = Array.from({ length: 30 }, (_, i) => (i === 12 ? `${i},12O` : `${i},${100 + i}`));
    const bad = await upload(
      chemist,
      { instrumentId: gratingInstrument.id, kind: "lamp" },
      `pixel,counts\n${rows.join("\n")}\n`,
    );
    expect(bad.status).toBe(400);
    // The header is line 1, so data row 12 (0-based) is line 14; its counts are the second column.
    expect((bad.body as ErrorBody).error.message).toMatch(/^Line 14, column 2: /);

    const binary = await upload(
      chemist,
      { instrumentId: gratingInstrument.id, kind: "lamp" },
      Uint8Array.of(0x50, 0, 1, 2, 3),
    );
    expect(binary.status).toBe(400);
    expect((binary.body as ErrorBody).error.message).toMatch(/binary/);

    const noKind = await upload(chemist, { instrumentId: gratingInstrument.id }, lampFile(grating));
    expect(noKind.status).toBe(400);
    expect((noKind.body as ErrorBody).error.fieldErrors?.kind).toBeDefined();

    const huge = await upload(
      chemist,
      { instrumentId: gratingInstrument.id, kind: "lamp" },
      new Uint8Array(16 * 1024 * 1024 + 1).fill(0x31),
    );
    expect(huge.status).toBe(413);

    expect(await rowCounts()).toEqual(before);
    expect(await auditEventsSince(mark, { action: "spectrum.upload" })).toEqual([]);
  });

  it("keep the raw bytes and their SHA-256, and flag a second upload of the same file", async () => {
    const content = lampFile(grating);
    const mark = await auditMark();
    lampSpectrum = await uploadOk(gratingInstrument.id, "lamp", content, "hg-ar-lamp.csv");
    const sha256 = createHash("sha256").update(content).digest("hex");
    expect(lampSpectrum).toMatchObject({
      points: SYNTHETIC_PIXELS,
      sha256,
      xUnit: "pixel",
      duplicateOf: null,
    });
    const { rows } = await db().query<{
      raw_bytes: Buffer;
      file_name: string;
      point_count: number;
    }>("SELECT raw_bytes, file_name, point_count FROM spectrum_files WHERE id = $1", [
      lampSpectrum.id,
    ]);
    expect(rows[0].raw_bytes.equals(Buffer.from(content))).toBe(true);
    expect(rows[0]).toMatchObject({ file_name: "hg-ar-lamp.csv", point_count: SYNTHETIC_PIXELS });
    const events = await auditEventsSince(mark, { action: "spectrum.upload" });
    expect(events.map((e) => e.entity_id)).toEqual([lampSpectrum.id]);

    const again = await uploadOk(gratingInstrument.id, "lamp", content, "hg-ar-lamp (copy).csv");
    expect(again.duplicateOf?.id).toBe(lampSpectrum.id);
  });
});

describe("the grating chain: lamp → calibration → flame run", () => {
  it("calibrates within 0.1 nm of the generator's truth inside the covered range, and records where it came from", async () => {
    const mark = await auditMark();
    gratingCalibration = await calibrate(gratingInstrument.id, lampSpectrum.id);
    expect(gratingCalibration.pairs.length).toBeGreaterThanOrEqual(8);
    expect(
      gratingCalibration.pairs.every((p) => p.species === "Hg I" || p.species === "Ar I"),
    ).toBe(true);
    expect(gratingCalibration.rmsNm).toBeLessThan(TOLERANCE_NM);
    expect(gratingCalibration.drift).toBeNull();
    expect(gratingCalibration.softwareVersion).toBe(packageJson.version);
    const inside = await errorsInsideCoveredRange(gratingCalibration, grating);
    expect(inside.length).toBeGreaterThan(30);
    for (const p of inside)
      expect(Math.abs(p.errorNm), `pixel ${p.pixel}`).toBeLessThan(TOLERANCE_NM);
    const events = await auditEventsSince(mark, { action: "calibration.create" });
    expect(events.map((e) => e.entity_id)).toEqual([gratingCalibration.id]);
    const { rows } = await db().query(
      "SELECT line_release_id, model FROM calibrations WHERE id = $1",
      [gratingCalibration.id],
    );
    expect(rows[0].line_release_id).toBe(gratingCalibration.lineReleaseId);
    expect(rows[0].model.kind).toBeDefined();
    const instrument = await chemist.get<Instrument>(`/api/instruments/${gratingInstrument.id}`);
    expect(instrument.body.latestCalibrationId).toBe(gratingCalibration.id);
  });

  it("refuses a sample as the lamp (400) and a lamp file without lines (422, asks for manual pairs)", async () => {
    flameSpectrum = await uploadOk(
      gratingInstrument.id,
      "sample",
      flameFile(grating),
      "flame-k-li-sr-ca.csv",
    );
    const sample = await chemist.post<ErrorBody>("/api/calibrations", {
      instrumentId: gratingInstrument.id,
      spectrumId: flameSpectrum.id,
      lamps: ["Hg"],
    });
    expect(sample.status).toBe(400);
    const dark = await uploadOk(gratingInstrument.id, "lamp", syntheticDarkFile(), "dark.csv");
    const before = await rowCounts();
    const failed = await chemist.post<ErrorBody>("/api/calibrations", {
      instrumentId: gratingInstrument.id,
      spectrumId: dark.id,
      lamps: ["Hg", "Ar"],
    });
    expect(failed.status, JSON.stringify(failed.body)).toBe(422);
    expect(failed.body.error.message).toMatch(/by hand/);
    expect(await rowCounts()).toEqual(before);
  });

  it("identifies K, Li, Sr and Ca as present and no absent element as present, and stores the run", async () => {
    const mark = await auditMark();
    notebookId = await notebook(`Grating flame tests ${suffix}`);
    const listed = await chemist.get<{ id: string }[]>(`/api/notebooks?teamId=${teamId}`);
    expect(listed.body.map((n) => n.id)).toContain(notebookId);

    gratingRun = await run(notebookId, flameSpectrum.id, gratingCalibration.id);
    expect(gratingRun.status).toBe("draft");
    expect(gratingRun.lampChecked).toBe(true);
    expect(gratingRun.peaks.length).toBeGreaterThan(5);
    for (const species of PRESENT) expect(verdictOf(gratingRun, species), species).toBe("present");
    for (const species of ABSENT)
      expect(verdictOf(gratingRun, species), species).not.toBe("present");
    // The evidence: potassium's resonance doublet seen within the tolerance of its table wavelengths.
    const potassium = gratingRun.calls.find((c) => c.species === "K I")!;
    expect(
      potassium.lines.some(
        (l) => Math.abs(l.lineNm - 766.49) < 0.01 && Math.abs(l.deltaNm) < TOLERANCE_NM,
      ),
    ).toBe(true);

    const fetched = await chemist.get<Run>(`/api/runs/${gratingRun.id}`);
    expect(fetched.status).toBe(200);
    expect(fetched.body).toEqual(gratingRun);
    const { rows } = await db().query(
      "SELECT calibration_id, line_release_id, software_version, settings, jsonb_array_length(matches) AS matches FROM runs WHERE id = $1",
      [gratingRun.id],
    );
    expect(rows[0]).toMatchObject({
      calibration_id: gratingCalibration.id,
      line_release_id: gratingCalibration.lineReleaseId,
      software_version: packageJson.version,
      matches: gratingRun.peaks.length,
    });
    const actions = (await auditEventsSince(mark)).map((e) => e.action);
    expect(actions).toEqual(["notebook.create", "run.create"]);
  });

  it("records the drift from the previous calibration and uses the newest one by default", async () => {
    // The same lamp file again: the recalibration starts from the first calibration and fits a drift of
    // next to nothing (the pairs' own scatter about yesterday's cubic moves it by a few thousandths of a
    // nm at the array's ends), so the recorded drift is nil to well within the lamp lines' centring (a
    // few hundredths of a nm).
    const again = await calibrate(gratingInstrument.id, lampSpectrum.id);
    expect(again.drift?.previousCalibrationId).toBe(gratingCalibration.id);
    expect(again.drift!.deltaNm).toHaveLength(5);
    for (const d of again.drift!.deltaNm) expect(Math.abs(d)).toBeLessThan(0.005);
    const byDefault = await run(notebookId, flameSpectrum.id);
    expect(byDefault.calibrationId).toBe(again.id);
  });
});

describe("other ways through", () => {
  it("extends two or three hand-picked pairs to a calibration within the same tolerance", async () => {
    const seeds = [
      0,
      Math.floor(gratingCalibration.pairs.length / 2),
      gratingCalibration.pairs.length - 1,
    ]
      .map((i) => gratingCalibration.pairs[i])
      .map((p) => ({ pixel: Math.round(p.pixel), wavelengthNm: p.wavelengthNm }));
    const reply = await chemist.post<Calibration & { pairing: { manualSeeds: number } }>(
      "/api/calibrations",
      {
        instrumentId: gratingInstrument.id,
        spectrumId: lampSpectrum.id,
        lamps: ["Hg", "Ar"],
        model: "polynomial-3",
        pairs: seeds,
      },
    );
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    expect(reply.body.pairing.manualSeeds).toBe(3);
    expect(reply.body.model).toBe("polynomial-3");
    for (const p of await errorsInsideCoveredRange(reply.body, grating)) {
      expect(Math.abs(p.errorNm), `pixel ${p.pixel}`).toBeLessThan(TOLERANCE_NM);
    }
    const noLine = await chemist.post<ErrorBody>("/api/calibrations", {
      instrumentId: gratingInstrument.id,
      spectrumId: lampSpectrum.id,
      lamps: ["Hg", "Ar"],
      pairs: [seeds[0], { pixel: seeds[1].pixel, wavelengthNm: 123.456 }],
    });
    expect(noLine.status).toBe(400);
    expect(noLine.body.error.fieldErrors?.["pairs.1.wavelengthNm"]).toBeDefined();
  });

  it("runs a file with its own wavelength axis without a calibration, marked as not lamp-checked", async () => {
    const sample = await uploadOk(
      gratingInstrument.id,
      "sample",
      flameFileOnWavelengthAxis(grating),
      "flame-nm.csv",
    );
    expect(sample.xUnit).toBe("nm");
    const onItsAxis = await run(notebookId, sample.id);
    expect(onItsAxis.calibrationId).toBeNull();
    expect(onItsAxis.lampChecked).toBe(false);
    for (const species of PRESENT) expect(verdictOf(onItsAxis, species), species).toBe("present");
    for (const species of ABSENT)
      expect(verdictOf(onItsAxis, species), species).not.toBe("present");
    // A pixel-axis calibration does not apply to a wavelength axis.
    const mismatched = await chemist.post<ErrorBody>("/api/runs", {
      notebookId,
      spectrumId: sample.id,
      calibrationId: gratingCalibration.id,
      source: "flame",
    });
    expect(mismatched.status).toBe(400);
  });
});

describe("the prism chain", () => {
  let prismCalibration: Calibration;
  let prismRun: Run;

  it("calibrates within 0.1 nm of the truth inside the covered range and calls no absent element present", async () => {
    const instrument = await createInstrument("prism", prism);
    const lamp = await uploadOk(instrument.id, "lamp", lampFile(prism), "prism-lamp.csv");
    prismCalibration = await calibrate(instrument.id, lamp.id);
    expect(["prism", "hartmann"]).toContain(prismCalibration.model);
    const inside = await errorsInsideCoveredRange(prismCalibration, prism);
    expect(inside.length).toBeGreaterThan(30);
    for (const p of inside)
      expect(Math.abs(p.errorNm), `pixel ${p.pixel}`).toBeLessThan(TOLERANCE_NM);

    const flame = await uploadOk(instrument.id, "sample", flameFile(prism), "prism-flame.csv");
    prismRun = await run(notebookId, flame.id);
    expect(prismRun.calibrationId).toBe(prismCalibration.id);
    for (const species of ABSENT) expect(verdictOf(prismRun, species), species).not.toBe("present");
  });

  it("calls the prism flame's elements present", () => {
    for (const species of PRESENT) expect(verdictOf(prismRun, species), species).toBe("present");
  });
});

describe("another team's records", () => {
  it("answer 404 to an outsider, whatever the route", async () => {
    const ids = {
      instrument: gratingInstrument.id,
      spectrum: lampSpectrum.id,
      calibration: gratingCalibration.id,
      notebook: notebookId,
      run: gratingRun.id,
    };
    const statuses = {
      instruments: (await outsider.get(`/api/instruments?teamId=${teamId}`)).status,
      instrument: (await outsider.get(`/api/instruments/${ids.instrument}`)).status,
      upload: (
        await upload(outsider, { instrumentId: ids.instrument, kind: "lamp" }, lampFile(grating))
      ).status,
      spectrum: (await outsider.get(`/api/spectra/${ids.spectrum}`)).status,
      calibrate: (
        await outsider.post("/api/calibrations", {
          instrumentId: ids.instrument,
          spectrumId: ids.spectrum,
          lamps: ["Hg"],
        })
      ).status,
      calibration: (await outsider.get(`/api/calibrations/${ids.calibration}`)).status,
      evaluate: (
        await outsider.post(`/api/calibrations/${ids.calibration}/evaluate`, { pixels: [1, 2] })
      ).status,
      notebooks: (await outsider.get(`/api/notebooks?teamId=${teamId}`)).status,
      notebook: (await outsider.get(`/api/notebooks/${ids.notebook}`)).status,
      runInTheirNotebook: (
        await outsider.post("/api/runs", {
          notebookId: ids.notebook,
          spectrumId: ids.spectrum,
          source: "flame",
        })
      ).status,
      run: (await outsider.get(`/api/runs/${ids.run}`)).status,
    };
    expect(statuses).toEqual(Object.fromEntries(Object.keys(statuses).map((k) => [k, 404])));

    // Their own notebook with our spectrum or calibration: still not found.
    const own = await outsider.post<{ id: string }>("/api/notebooks", {
      teamId: outsiderTeamId,
      title: `Outside ${suffix}`,
    });
    expect(own.status).toBe(201);
    const borrowed = await outsider.post("/api/runs", {
      notebookId: own.body.id,
      spectrumId: ids.spectrum,
      source: "flame",
    });
    expect(borrowed.status).toBe(404);
  });
});
