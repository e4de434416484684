// Recalibration through HTTP against the real PostgreSQL: once an instrument has a calibration, the next
// lamp's automatic pairing starts from it (the message says so), and an automatic pairing that is not
// trusted is shown on the workbench with its reasons and the competing pairing, and is saved only with a
// reason. The instrument is the synthetic curved grating (lib/spectrum/synthetic/synthetic-grating.ts);
// the second lamp is recorded after the array moved by 8 px and its image shrank by 0.4 %.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ApiClient, ErrorBody } from "./support/http-client";
import { FLAME_SCREENING, signInDemo, teamIdOf } from "./support/accounts";
import { auditEventsSince, auditMark, calibrationCountOf, closeDb } from "./support/database";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import { SYNTHETIC_PIXELS } from "@/lib/spectrum/synthetic/synthetic-instrument";
import { lampFile } from "./support/synthetic-files";
import { UNPAIRED_REACH_FWHM } from "@/lib/spectrum/calibration";
import { createSyntheticInstrument, uploadSpectrumFile } from "./support/bench";

interface Preview {
  tolerances: { lineMatchNm: number; expectedPeakReachFwhm: number };
  result: {
    pairs: { pixel: number; wavelengthNm: number; state: string; origin: string }[];
    pairing: { status: string; message: string };
    doubts: string[];
    rival: { pixel: number; wavelengthNm: number; species: string }[];
  };
}

const suffix = Date.now().toString(36);
const grating = syntheticGrating();
const middle = (SYNTHETIC_PIXELS - 1) / 2;
/** The same grating a day later: today's pixel x saw what yesterday's pixel middle + (x − middle)·0.996 − 8 saw. */
const moved = {
  ...grating,
  wavelengthOfPixel: (px: number) => grating.wavelengthOfPixel(middle + (px - middle) * 0.996 - 8),
};
let chemist: ApiClient;
let instrumentId: string;
let todayId: string;

beforeAll(async () => {
  const lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  const teamId = await teamIdOf(lead, FLAME_SCREENING);
  instrumentId = await createSyntheticInstrument(
    lead,
    teamId,
    `recalibration grating ${suffix}`,
    grating,
  );
  // Its own noise seeds: the same bytes as another test file's lamp would be refused as a duplicate upload.
  const firstId = await uploadSpectrumFile(
    chemist,
    instrumentId,
    "lamp",
    lampFile(grating, 41),
    "first-lamp.csv",
  );
  const first = await chemist.post("/api/calibrations", {
    instrumentId,
    spectrumId: firstId,
    lamps: ["Hg", "Ar"],
  });
  expect(first.status, JSON.stringify(first.body)).toBe(201);
  todayId = await uploadSpectrumFile(
    chemist,
    instrumentId,
    "lamp",
    lampFile(moved, 42),
    "today-lamp.csv",
  );
});

afterAll(async () => {
  await closeDb();
});

describe("recalibration", () => {
  it("starts from the instrument's last calibration and finds the day's drift", async () => {
    const reply = await chemist.post<Preview>("/api/calibrations/preview", {
      instrumentId,
      spectrumId: todayId,
      lamps: ["Hg", "Ar"],
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body.result.pairing.status).toBe("paired");
    // x = middle + (u − middle)/0.996 + 8/0.996: the middle moves by +8.03 px, the scale by +0.402 %.
    const stated =
      /^recalibrated from the previous calibration \(moved by \+([0-9.]+) x units at the middle, stretched by \+([0-9.]+) %\)/.exec(
        reply.body.result.pairing.message,
      );
    expect(stated, reply.body.result.pairing.message).not.toBeNull();
    expect(Math.abs(Number(stated![1]) - 8.032)).toBeLessThan(0.05);
    expect(Math.abs(Number(stated![2]) - 0.402)).toBeLessThan(0.01);
    expect(reply.body.result.doubts).toEqual([]);
    expect(reply.body.result.rival).toEqual([]);
    // The tolerances the workbench states come with the preview, as the service and the core apply them.
    expect(reply.body.tolerances).toEqual({
      lineMatchNm: 0.05,
      expectedPeakReachFwhm: UNPAIRED_REACH_FWHM,
    });
    // Every pair is a line's own peak on today's axis.
    for (const p of reply.body.result.pairs.filter((q) => q.state === "used")) {
      expect(Math.abs(moved.wavelengthOfPixel(p.pixel) - p.wavelengthNm)).toBeLessThan(0.05);
    }
  });

  it("shows a pairing it does not trust, with the reasons and the competing pairing", async () => {
    // The lamp holds no neon: pairing its peaks with neon lines can only be a coincidence.
    const reply = await chemist.post<Preview>("/api/calibrations/preview", {
      instrumentId,
      spectrumId: todayId,
      lamps: ["Ne"],
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body.result.pairing.status).toBe("check");
    expect(reply.body.result.doubts[0]).toMatch(
      /^The automatic pairing is not trusted: .*another drift of the previous calibration/,
    );
    expect(reply.body.result.rival.length).toBeGreaterThan(0);
    for (const r of reply.body.result.rival) expect(r.species).toBe("Ne I");
  });

  it("refuses to save the untrusted pairing without a reason, writing nothing", async () => {
    const before = await calibrationCountOf(instrumentId);
    const mark = await auditMark();
    const reply = await chemist.post<ErrorBody>("/api/calibrations", {
      instrumentId,
      spectrumId: todayId,
      lamps: ["Ne"],
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(422);
    expect(reply.body.error.fieldErrors?.confirmReason?.join(" ")).toMatch(
      /The automatic pairing is not trusted/,
    );
    expect(await calibrationCountOf(instrumentId)).toBe(before);
    expect(await auditEventsSince(mark)).toEqual([]);
  });

  it("previews the competing pairing when the chemist tries it", async () => {
    const check = await chemist.post<Preview>("/api/calibrations/preview", {
      instrumentId,
      spectrumId: todayId,
      lamps: ["Ne"],
    });
    const excluded = check.body.result.pairs
      .filter((p) => p.origin === "auto")
      .map((p) => ({ pixel: p.pixel, wavelengthNm: p.wavelengthNm }));
    const added = check.body.result.rival.map((r) => ({
      pixel: r.pixel,
      wavelengthNm: r.wavelengthNm,
    }));
    const reply = await chemist.post<Preview>("/api/calibrations/preview", {
      instrumentId,
      spectrumId: todayId,
      lamps: ["Ne"],
      excluded,
      added,
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    const used = reply.body.result.pairs.filter(
      (p) => p.state === "used" || p.state === "rejected",
    );
    expect(used.every((p) => p.origin === "added")).toBe(true);
    expect(used.length).toBe(added.length);
  });
});
