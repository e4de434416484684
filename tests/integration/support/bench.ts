// A test's own bench made through the API: a synthetic instrument (named uniquely, since the demo
// database is shared by every test file) and spectrum uploads as multipart forms.
import { expect } from "vitest";
import type { ApiClient } from "./http-client";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
  type SyntheticInstrument,
} from "@/lib/spectrum/synthetic/synthetic-instrument";

/** A lab lead adds an instrument matching the synthetic one; returns its id. */
export async function createSyntheticInstrument(
  lead: ApiClient,
  teamId: string,
  name: string,
  instrument: SyntheticInstrument = syntheticGrating(),
): Promise<string> {
  const created = await lead.post<{ id: string }>("/api/instruments", {
    teamId,
    name,
    dispersion: instrument.dispersion,
    pixels: SYNTHETIC_PIXELS,
    nominalMinNm: instrument.nominalRangeNm[0],
    nominalMaxNm: instrument.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  return created.body.id;
}

/** Uploads a spectrum file (201 expected); returns its id. */
export async function uploadSpectrumFile(
  client: ApiClient,
  instrumentId: string,
  kind: "lamp" | "sample",
  content: string,
  fileName: string,
  label = fileName,
): Promise<string> {
  const form = new FormData();
  form.set("file", new Blob([content]), fileName);
  form.set("instrumentId", instrumentId);
  form.set("kind", kind);
  form.set("label", label);
  const reply = await client.request<{ id: string }>("POST", "/api/spectra", { form });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body.id;
}
