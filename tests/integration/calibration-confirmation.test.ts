// A doubtful calibration becomes the instrument's default only with a stated reason: through HTTP against
// the real PostgreSQL, a calibration left with five pairs (fewer than 7) is refused with 422 and a field
// error on confirmReason that lists its doubts, writing nothing; with a reason it is saved, the reason and
// the doubts are in the stored row and in the audit event; every calibration carries its label. The preview
// shows the same doubts and says why the lamp peaks it left unpaired are unpaired. The lamp is the
// synthetic Hg–Ar file of a curved grating (lib/spectrum/synthetic/synthetic-grating.ts).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { ApiClient, ErrorBody } from "./support/http-client";
import { DEMO, FLAME_SCREENING, signInDemo, teamIdOf } from "./support/accounts";
import {
  auditEventsSince,
  auditMark,
  closeDb,
  db,
  userIdByEmail,
  calibrationCountOf,
} from "./support/database";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import { lampFile } from "./support/synthetic-files";
import { createSyntheticInstrument, uploadSpectrumFile } from "./support/bench";

interface Preview {
  result: {
    model: string;
    pairs: { pixel: number; wavelengthNm: number; state: "used" | "rejected" | "excluded" }[];
    doubts: string[];
  };
  peaks: {
    pixel: number;
    pairedWith: unknown;
    unpaired: { code: string; reason: string; lines: { wavelengthNm: number }[] } | null;
  }[];
  lines: { wavelengthNm: number; paired: boolean }[];
  expectedWithoutPeak: { wavelengthNm: number; species: string; reason: string }[];
}
interface Saved {
  id: string;
  label: string;
  lamps: string[];
  model: string;
  rmsNm: number;
  coveredRangeNm: [number, number];
  createdAt: string;
  pairing: { confirmation?: { reason: string; doubts: string[]; by: string } };
}

const suffix = Date.now().toString(36);
const grating = syntheticGrating();
/** Its own noise seed: the same bytes as another test file's lamp would be flagged as a duplicate upload. */
const CONFIRMATION_SEED = 11;
const REASON =
  "Only the middle of the array is used for sodium D today; checked against the Hg 546 nm line by eye.";
let chemist: ApiClient;
let chemistId: string;
let instrumentId: string;
let base: { instrumentId: string; spectrumId: string; lamps: string[] };
let auto: Preview;
/** Pairs to leave out so that five used pairs remain. */
let excluded: { pixel: number; wavelengthNm: number }[];

beforeAll(async () => {
  const lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  chemistId = await userIdByEmail(DEMO.chemist.email);
  const teamId = await teamIdOf(lead, FLAME_SCREENING);
  instrumentId = await createSyntheticInstrument(
    lead,
    teamId,
    `confirmation grating ${suffix}`,
    grating,
  );
  const spectrumId = await uploadSpectrumFile(
    chemist,
    instrumentId,
    "lamp",
    lampFile(grating, CONFIRMATION_SEED),
    "confirmation-lamp.csv",
  );
  base = { instrumentId, spectrumId, lamps: ["Hg", "Ar"] };
  const reply = await chemist.post<Preview>("/api/calibrations/preview", base);
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  auto = reply.body;
  const used = auto.result.pairs.filter((p) => p.state === "used");
  expect(used.length).toBeGreaterThanOrEqual(8);
  // Leave out all but five pairs spread over the array: too few for trust, still enough to fit.
  const keep = new Set([0, 2, 4, 6, used.length - 1].map((i) => Math.min(i, used.length - 1)));
  excluded = used
    .filter((_, i) => !keep.has(i))
    .map((p) => ({ pixel: p.pixel, wavelengthNm: p.wavelengthNm }));
});

afterAll(async () => {
  await closeDb();
});

describe("a doubtful calibration", () => {
  it("is shown with its doubts in the preview", async () => {
    const reply = await chemist.post<Preview>("/api/calibrations/preview", { ...base, excluded });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body.result.pairs.filter((p) => p.state === "used")).toHaveLength(5);
    expect(reply.body.result.doubts).toContain(
      "Only 5 pairs are used in the fit; at least 6 are wanted before a calibration is trusted.",
    );
  });

  it("is refused without a reason (422, a field error listing the doubts) and nothing is written", async () => {
    const before = await calibrationCountOf(instrumentId);
    const mark = await auditMark();
    const reply = await chemist.post<ErrorBody>("/api/calibrations", { ...base, excluded });
    expect(reply.status, JSON.stringify(reply.body)).toBe(422);
    const fieldError = reply.body.error.fieldErrors?.confirmReason?.join(" ") ?? "";
    expect(fieldError).toMatch(/Only 5 pairs are used/);
    expect(reply.body.error.message).toMatch(/doubtful/);
    expect(await calibrationCountOf(instrumentId)).toBe(before);
    expect(await auditEventsSince(mark)).toEqual([]);
  });

  it("is refused with a reason under 10 characters (400), writing nothing", async () => {
    const before = await calibrationCountOf(instrumentId);
    const reply = await chemist.post<ErrorBody>("/api/calibrations", {
      ...base,
      excluded,
      confirmReason: "   ok    ",
    });
    expect(reply.status).toBe(400);
    expect(reply.body.error.fieldErrors?.confirmReason).toBeDefined();
    expect(await calibrationCountOf(instrumentId)).toBe(before);
  });

  it("is saved with a reason, which is kept with the doubts in the row and in the audit event", async () => {
    const mark = await auditMark();
    const reply = await chemist.post<Saved>("/api/calibrations", {
      ...base,
      excluded,
      confirmReason: `  ${REASON}  `,
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    const doubts = reply.body.pairing.confirmation?.doubts ?? [];
    expect(doubts).toContain(
      "Only 5 pairs are used in the fit; at least 6 are wanted before a calibration is trusted.",
    );
    expect(reply.body.pairing.confirmation).toEqual({ reason: REASON, doubts, by: chemistId });

    const { rows } = await db().query<{ pairing: Saved["pairing"] }>(
      "SELECT pairing FROM calibrations WHERE id = $1",
      [reply.body.id],
    );
    expect(rows[0].pairing.confirmation).toEqual({ reason: REASON, doubts, by: chemistId });

    const events = await auditEventsSince(mark, { action: "calibration.create" });
    expect(events.map((e) => e.entity_id)).toEqual([reply.body.id]);
    expect(events[0].actor_id).toBe(chemistId);
    expect(events[0].reason).toBe(REASON);
    expect(events[0].after).toMatchObject({
      doubts,
      confirmation: { reason: REASON, doubts },
      label: reply.body.label,
    });

    // It is now the instrument's default: the newest of its calibrations.
    const list = await chemist.get<Saved[]>(`/api/calibrations?instrumentId=${instrumentId}`);
    expect(list.body[0].id).toBe(reply.body.id);
  });
});

describe("a calibration without doubts", () => {
  it("needs no reason, and stores no confirmation even when one is sent", async () => {
    const all = await chemist.post<Preview>("/api/calibrations/preview", base);
    expect(all.status, JSON.stringify(all.body)).toBe(200);
    // The synthetic lamp's full pairing: enough pairs over most of the array, confidently found.
    expect(all.body.result.doubts).toEqual([]);
    const reply = await chemist.post<Saved>("/api/calibrations", {
      ...base,
      confirmReason: "A reason that nobody asked for.",
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    expect(reply.body.pairing.confirmation).toBeUndefined();
  });
});

describe("labels and unpaired peaks", () => {
  it("labels every calibration with gases, time, model, RMS and covered range", async () => {
    const list = await chemist.get<Saved[]>(`/api/calibrations?instrumentId=${instrumentId}`);
    expect(list.body.length).toBeGreaterThanOrEqual(2);
    for (const c of list.body) {
      const time = c.createdAt.slice(11, 16);
      const range = `${Math.round(c.coveredRangeNm[0])}–${Math.round(c.coveredRangeNm[1])} nm`;
      expect(c.label).toBe(
        `Hg+Ar · ${time} · ${c.model} · RMS ${c.rmsNm.toFixed(3)} nm · ${range}`,
      );
    }
    const one = await chemist.get<Saved>(`/api/calibrations/${list.body[0].id}`);
    expect(one.body.label).toBe(list.body[0].label);
  });

  it("gives every unpaired peak of the preview a reason, and lists expected lines with no peak", async () => {
    const unpaired = auto.peaks.filter((p) => !p.pairedWith);
    expect(unpaired.length).toBeGreaterThan(0);
    for (const p of unpaired)
      expect([
        "too broad for one lamp line",
        "blend",
        "not in the table",
        "line paired with another peak",
        "left unpaired",
        "no wavelength",
      ]).toContain(p.unpaired?.reason);
    for (const p of auto.peaks.filter((q) => q.pairedWith)) expect(p.unpaired).toBeNull();
    for (const l of auto.expectedWithoutPeak) {
      expect(l.reason).toBe("below threshold");
      expect(auto.lines.find((k) => k.wavelengthNm === l.wavelengthNm)?.paired).toBe(false);
    }
  });
});
