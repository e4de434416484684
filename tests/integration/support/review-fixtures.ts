// Runs to review, made through the real API: the demo lab lead adds a grating instrument, the author
// uploads a synthetic Hg–Ar lamp file, calibrates, uploads a synthetic flame file and analyses it into
// a fresh draft run. The instrument, calibration and sample are made once per test file. The files use
// their own noise seeds, so they never pass for a duplicate of another test's upload of the same team.
import { expect } from "vitest";
import { APP_URL, type ApiClient } from "./http-client";
import { FLAME_SCREENING, teamIdOf } from "./accounts";
import { PIXELS, RESOLUTION_NM, flameFile, lampFile, syntheticGrating } from "./synthetic-files";

const SESSION_COOKIE = "emberline_session";
const REVIEW_LAMP_SEED = 31;
const REVIEW_FLAME_SEED = 37;

export interface DraftRun {
  id: string;
  status: string;
  notebookId: string;
  spectrumId: string;
  calibrationId: string | null;
  calls: { species: string; verdict: string; lines: { lineNm: number }[] }[];
}

async function upload(client: ApiClient, instrumentId: string, kind: "lamp" | "sample", content: string, fileName: string): Promise<string> {
  const form = new FormData();
  form.set("file", new Blob([content]), fileName);
  form.set("instrumentId", instrumentId);
  form.set("kind", kind);
  form.set("label", fileName);
  const response = await fetch(`${APP_URL}/api/spectra`, {
    method: "POST",
    headers: { cookie: `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE)}`, "x-forwarded-for": client.address },
    body: form,
  });
  const body = (await response.json()) as { id: string };
  expect(response.status, JSON.stringify(body)).toBe(201);
  return body.id;
}

let bench: Promise<{ teamId: string; instrumentId: string; calibrationId: string; sampleId: string; notebookId: string }> | undefined;

/** The shared instrument, calibration, sample and notebook of this test file (made on first use). */
export function reviewBench(lead: ApiClient, author: ApiClient, title: string) {
  bench ??= (async () => {
    const grating = syntheticGrating();
    const teamId = await teamIdOf(lead, FLAME_SCREENING);
    const suffix = `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 6)}`;
    const instrument = await lead.post<{ id: string }>("/api/instruments", {
      teamId,
      name: `review bench ${suffix}`,
      dispersion: "grating",
      pixels: PIXELS,
      nominalMinNm: grating.nominalRangeNm[0],
      nominalMaxNm: grating.nominalRangeNm[1],
      resolutionNm: RESOLUTION_NM,
    });
    expect(instrument.status, JSON.stringify(instrument.body)).toBe(201);
    const lampId = await upload(author, instrument.body.id, "lamp", lampFile(grating, REVIEW_LAMP_SEED), `lamp-${suffix}.csv`);
    const calibration = await author.post<{ id: string }>("/api/calibrations", { instrumentId: instrument.body.id, spectrumId: lampId, lamps: ["Hg", "Ar"] });
    expect(calibration.status, JSON.stringify(calibration.body)).toBe(201);
    const sampleId = await upload(author, instrument.body.id, "sample", flameFile(grating, REVIEW_FLAME_SEED), `flame-${suffix}.csv`);
    const notebook = await author.post<{ id: string }>("/api/notebooks", { teamId, title: `${title} ${suffix}` });
    expect(notebook.status, JSON.stringify(notebook.body)).toBe(201);
    return { teamId, instrumentId: instrument.body.id, calibrationId: calibration.body.id, sampleId, notebookId: notebook.body.id };
  })();
  return bench;
}

/** A new draft run by `author` (any member of Flame Screening) in the shared notebook. */
export async function draftRun(lead: ApiClient, author: ApiClient, chemist: ApiClient, title = "Review"): Promise<DraftRun> {
  const { notebookId, sampleId, calibrationId } = await reviewBench(lead, chemist, title);
  const reply = await author.post<DraftRun>("/api/runs", { notebookId, spectrumId: sampleId, calibrationId, source: "flame" });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body;
}
