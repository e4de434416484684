// Runs to review, made through the real API: the demo lab lead adds a grating instrument, the author
// uploads a synthetic Hg–Ar lamp file, calibrates, uploads a synthetic flame file and analyses it into
// a fresh draft run. The instrument, calibration and sample are made once per test file. The files use
// their own noise seeds, so they never pass for a duplicate of another test's upload of the same team.
import { expect } from "vitest";
import type { ApiClient } from "./http-client";
import { createSyntheticInstrument, uploadSpectrumFile } from "./bench";
import { FLAME_SCREENING, teamIdOf } from "./accounts";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import { flameFile, lampFile } from "./synthetic-files";

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

let bench:
  | Promise<{
      teamId: string;
      instrumentId: string;
      calibrationId: string;
      sampleId: string;
      notebookId: string;
    }>
  | undefined;

/** The shared instrument, calibration, sample and notebook of this test file (made on first use). */
export function reviewBench(lead: ApiClient, author: ApiClient, title: string) {
  bench ??= (async () => {
    const grating = syntheticGrating();
    const teamId = await teamIdOf(lead, FLAME_SCREENING);
    const suffix = `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 6)}`;
    const instrumentId = await createSyntheticInstrument(
      lead,
      teamId,
      `review bench ${suffix}`,
      grating,
    );
    const lampId = await uploadSpectrumFile(
      author,
      instrumentId,
      "lamp",
      lampFile(grating, REVIEW_LAMP_SEED),
      `lamp-${suffix}.csv`,
    );
    const calibration = await author.post<{ id: string }>("/api/calibrations", {
      instrumentId,
      spectrumId: lampId,
      lamps: ["Hg", "Ar"],
    });
    expect(calibration.status, JSON.stringify(calibration.body)).toBe(201);
    const sampleId = await uploadSpectrumFile(
      author,
      instrumentId,
      "sample",
      flameFile(grating, REVIEW_FLAME_SEED),
      `flame-${suffix}.csv`,
    );
    const notebook = await author.post<{ id: string }>("/api/notebooks", {
      teamId,
      title: `${title} ${suffix}`,
    });
    expect(notebook.status, JSON.stringify(notebook.body)).toBe(201);
    return {
      teamId,
      instrumentId,
      calibrationId: calibration.body.id,
      sampleId,
      notebookId: notebook.body.id,
    };
  })();
  return bench;
}

/** A new draft run by `author` (any member of Flame Screening) in the shared notebook. */
export async function draftRun(
  lead: ApiClient,
  author: ApiClient,
  chemist: ApiClient,
  title = "Review",
): Promise<DraftRun> {
  const { notebookId, sampleId, calibrationId } = await reviewBench(lead, chemist, title);
  const reply = await author.post<DraftRun>("/api/runs", {
    notebookId,
    spectrumId: sampleId,
    calibrationId,
    source: "flame",
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body;
}
