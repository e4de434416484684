// The run page's workbench through HTTP against the real PostgreSQL: overriding a call with a reason
// (author only, only while editable, withdrawn with null), notes with optimistic locking, the
// Boltzmann temperature of a synthetic LTE flame whose temperature the generator knows, the stored
// continuum, and a re-run after a lab lead publishes a newer line-table release, with what changed.
// Every mutation writes an audit event. The tests run in order and build on each other.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, ApiClient, type ErrorBody } from "./support/http-client";
import { createSyntheticInstrument, uploadSpectrumFile } from "./support/bench";
import { DEMO, FLAME_SCREENING, signInDemo, signedIn, teamIdOf } from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { LTE_FLAME_TEMPERATURE_K as TRUE_T, lteCalciumFlame } from "./support/lte-flame";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import { SYNTHETIC_PIXELS } from "@/lib/spectrum/synthetic/synthetic-instrument";
import { lampFile } from "./support/synthetic-files";

type Verdict = "present" | "possible" | "absent";
interface Override {
  species: string;
  computedVerdict: Verdict;
  verdict: Verdict | null;
  reason: string;
  byName: string | null;
  at: string;
}
interface Run {
  id: string;
  status: string;
  notebookId: string;
  spectrumId: string;
  calibrationId: string | null;
  lineReleaseId: string;
  lineReleaseNumber: number;
  rerunOfId: string | null;
  settings: Record<string, number>;
  notes: string;
  lockVersion: number;
  calls: {
    species: string;
    verdict: Verdict;
    computedVerdict: Verdict;
    score: number;
    override: Override | null;
  }[];
  verdicts: Record<string, Verdict>;
  overrides: Override[];
  unexplained: { wavelengthNm: number }[];
  temperature:
    | {
        ok: true;
        species: string;
        temperatureK: number;
        temperatureUncertaintyK: number;
        lineCount: number;
        rSquared: number;
      }
    | { ok: false; message: string }
    | null;
}

const SESSION_COOKIE = "emberline_session";
const grating = syntheticGrating();

let lead: ApiClient;
let chemist: ApiClient;
let outsider: ApiClient;
let teamId: string;
let chemistId: string;
let first: Run;
let rerun: Run;
const suffix = Date.now().toString(36);

function cookieHeaders(client: ApiClient): Record<string, string> {
  return {
    cookie: `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE)}`,
    "x-forwarded-for": client.address,
  };
}

const upload = (instrumentId: string, kind: "lamp" | "sample", content: string, fileName: string) =>
  uploadSpectrumFile(chemist, instrumentId, kind, content, fileName);

const override = (client: ApiClient, runId: string, json: unknown) =>
  client.post<Run>(`/api/runs/${runId}/overrides`, json);
const patchNotes = (client: ApiClient, runId: string, json: unknown) =>
  client.request<Run>("PATCH", `/api/runs/${runId}`, { json });
const message = (body: unknown) => (body as ErrorBody).error.message;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  await ensureOutsider();
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  teamId = await teamIdOf(lead, FLAME_SCREENING);
  chemistId = (await chemist.get<{ id: string }>("/api/me")).body.id;

  const instrumentId = await createSyntheticInstrument(
    lead,
    teamId,
    `workbench grating ${suffix}`,
    grating,
  );
  const lampId = await upload(
    instrumentId,
    "lamp",
    lampFile(grating),
    `workbench-lamp-${suffix}.csv`,
  );
  const calibration = await chemist.post("/api/calibrations", {
    instrumentId,
    spectrumId: lampId,
    lamps: ["Hg", "Ar"],
  });
  expect(calibration.status, JSON.stringify(calibration.body)).toBe(201);
  const sampleId = await upload(
    instrumentId,
    "sample",
    lteCalciumFlame(grating),
    `workbench-calcium-${suffix}.csv`,
  );
  const notebook = await chemist.post<{ id: string }>("/api/notebooks", {
    teamId,
    title: `Workbench ${suffix}`,
  });
  expect(notebook.status).toBe(201);
  const created = await chemist.post<Run>("/api/runs", {
    notebookId: notebook.body.id,
    spectrumId: sampleId,
    source: "flame",
    settings: { temperatureK: TRUE_T },
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  first = created.body;
});

afterAll(async () => {
  await closeDb();
});

describe("what the analysis stores", () => {
  it("finds the flame's excitation temperature from its Ca I lines within 5 %", () => {
    const t = first.temperature;
    expect(t?.ok, JSON.stringify(t)).toBe(true);
    if (!t?.ok) return;
    expect(t.species).toBe("Ca I");
    expect(t.lineCount).toBeGreaterThanOrEqual(5);
    // 5 %: the lines' areas carry read and shot noise and the fit is unweighted; σ is reported beside it.
    expect(Math.abs(t.temperatureK / TRUE_T - 1)).toBeLessThan(0.05);
    expect(t.temperatureUncertaintyK).toBeGreaterThan(0);
    expect(t.rSquared).toBeGreaterThan(0.99);
  });

  it("stores the continuum as one float64 per analysed point and the calls with their computed verdict", async () => {
    const { rows } = await db().query(
      "SELECT octet_length(continuum) AS bytes FROM runs WHERE id = $1",
      [first.id],
    );
    expect(rows[0].bytes).toBe(8 * SYNTHETIC_PIXELS);
    const calcium = first.calls.find((c) => c.species === "Ca I")!;
    expect(calcium).toMatchObject({
      verdict: "present",
      computedVerdict: "present",
      override: null,
    });
    expect(first.settings).toEqual({ temperatureK: TRUE_T });
    expect(first.lockVersion).toBe(0);
  });
});

describe("overriding a call", () => {
  it("refuses a blank reason, an unknown species and a verdict that is not one (400), writing nothing", async () => {
    const mark = await auditMark();
    const blank = await override(chemist, first.id, {
      species: "Ca I",
      verdict: "possible",
      reason: "  ",
    });
    expect(blank.status).toBe(400);
    expect((blank.body as unknown as ErrorBody).error.fieldErrors?.reason?.[0]).toMatch(/reason/);
    const unknown = await override(chemist, first.id, {
      species: "Zz I",
      verdict: "present",
      reason: "looks like it",
    });
    expect(unknown.status).toBe(400);
    expect(message(unknown.body)).toMatch(/no call for Zz I/);
    expect(
      (await override(chemist, first.id, { species: "Ca I", verdict: "maybe", reason: "x" }))
        .status,
    ).toBe(400);
    expect(
      (
        await override(chemist, first.id, {
          species: "Ca I",
          verdict: null,
          reason: "nothing to withdraw",
        })
      ).status,
    ).toBe(400);
    expect(await auditEventsSince(mark, { action: "run.override" })).toHaveLength(0);
    const { rows } = await db().query(
      "SELECT count(*)::int AS n FROM run_overrides WHERE run_id = $1",
      [first.id],
    );
    expect(rows[0].n).toBe(0);
  });

  it("lets only the author override (403 for another team member, 404 for another team)", async () => {
    const body = { species: "Ca I", verdict: "possible", reason: "the lead disagrees" };
    const byLead = await override(lead, first.id, body);
    expect(byLead.status).toBe(403);
    expect(message(byLead.body)).toMatch(/author/);
    expect((await override(outsider, first.id, body)).status).toBe(404);
  });

  it("records the override with the computed verdict, shows it as the standing verdict and audits it", async () => {
    const mark = await auditMark();
    const reply = await override(chemist, first.id, {
      species: "Ca I",
      verdict: "possible",
      reason: "Calcium salt contamination on the wire",
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    const calcium = reply.body.calls.find((c) => c.species === "Ca I")!;
    expect(calcium.verdict).toBe("possible");
    expect(calcium.computedVerdict).toBe("present");
    expect(calcium.override).toMatchObject({
      verdict: "possible",
      computedVerdict: "present",
      reason: "Calcium salt contamination on the wire",
      byName: DEMO.chemist.name,
    });
    expect(reply.body.verdicts["Ca I"]).toBe("possible");
    const reread = await chemist.get<Run>(`/api/runs/${first.id}`);
    expect(reread.body.calls.find((c) => c.species === "Ca I")!.verdict).toBe("possible");
    const events = await auditEventsSince(mark, { action: "run.override" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      entity: "run",
      entity_id: first.id,
      actor_id: chemistId,
      reason: "Calcium salt contamination on the wire",
    });
    expect(events[0].before).toEqual({ species: "Ca I", verdict: "present" });
    expect(events[0].after).toMatchObject({
      species: "Ca I",
      verdict: "possible",
      computedVerdict: "present",
    });
  });

  it("withdraws the override with verdict null: the computed verdict stands again, the history stays", async () => {
    const mark = await auditMark();
    const reply = await override(chemist, first.id, {
      species: "Ca I",
      verdict: null,
      reason: "Wire cleaned and rerun: the line is real",
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    const calcium = reply.body.calls.find((c) => c.species === "Ca I")!;
    expect(calcium).toMatchObject({
      verdict: "present",
      computedVerdict: "present",
      override: null,
    });
    expect(reply.body.overrides.map((o) => o.verdict)).toEqual(["possible", null]);
    const [event] = await auditEventsSince(mark, { action: "run.override" });
    expect(event.before).toEqual({ species: "Ca I", verdict: "possible" });
    expect(event.after).toMatchObject({ verdict: "present", override: null });
  });
});

describe("notes", () => {
  it("saves the notes with the lockVersion read, audits before and after, and refuses a stale copy (409)", async () => {
    const mark = await auditMark();
    const saved = await patchNotes(chemist, first.id, {
      notes: "Loop cleaned in HCl between samples.",
      lockVersion: 0,
    });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    expect(saved.body).toMatchObject({
      notes: "Loop cleaned in HCl between samples.",
      lockVersion: 1,
    });
    const stale = await patchNotes(chemist, first.id, {
      notes: "An older tab's text",
      lockVersion: 0,
    });
    expect(stale.status).toBe(409);
    expect(message(stale.body)).toMatch(/changed since you opened/);
    expect((await chemist.get<Run>(`/api/runs/${first.id}`)).body.notes).toBe(
      "Loop cleaned in HCl between samples.",
    );
    const events = await auditEventsSince(mark, { action: "run.notes" });
    expect(events).toHaveLength(1);
    expect(events[0].before).toMatchObject({ notes: "" });
    expect(events[0].after).toMatchObject({ notes: "Loop cleaned in HCl between samples." });
  });

  it("refuses a bad body (400), another member (403) and another team (404)", async () => {
    expect((await patchNotes(chemist, first.id, { notes: "x" })).status).toBe(400);
    expect((await patchNotes(chemist, first.id, { notes: 5, lockVersion: 1 })).status).toBe(400);
    expect(
      (await patchNotes(lead, first.id, { notes: "lead's note", lockVersion: 1 })).status,
    ).toBe(403);
    expect((await patchNotes(outsider, first.id, { notes: "x", lockVersion: 1 })).status).toBe(404);
  });

  it("refuses overrides and notes once the run is submitted (409)", async () => {
    await db().query("UPDATE runs SET status = 'submitted' WHERE id = $1", [first.id]);
    try {
      const mark = await auditMark();
      const blocked = await override(chemist, first.id, {
        species: "Ca I",
        verdict: "absent",
        reason: "too late",
      });
      expect(blocked.status).toBe(409);
      expect(message(blocked.body)).toMatch(/waiting for review/);
      expect(
        (await patchNotes(chemist, first.id, { notes: "too late", lockVersion: 1 })).status,
      ).toBe(409);
      expect(await auditEventsSince(mark)).toHaveLength(0);
    } finally {
      await db().query("UPDATE runs SET status = 'draft' WHERE id = $1", [first.id]);
    }
  });
});

describe("running again on a newer release", () => {
  it("refuses a re-run on the release the run already used (422)", async () => {
    const reply = await chemist.post(`/api/runs/${first.id}/rerun`, {});
    expect(reply.status).toBe(422);
    expect(message(reply.body)).toMatch(
      new RegExp(`already used line-table release ${first.lineReleaseNumber}`),
    );
    expect((await outsider.post(`/api/runs/${first.id}/rerun`, {})).status).toBe(404);
  });

  it("makes a new run against the release a lab lead publishes, with the same inputs, audited", async () => {
    const draft = await lead.post<{ id: string }>("/api/releases/draft", { teamId });
    expect(draft.status, JSON.stringify(draft.body)).toBe(200);
    const lines = await lead.get<{
      lines: { id: string; airNm: number | null; version: number }[];
    }>(`/api/lines?teamId=${teamId}&release=${draft.body.id}&species=Ca%20I&pageSize=500`);
    const line657 = lines.body.lines.find(
      (l) => l.airNm !== null && Math.abs(l.airNm - 657.278) < 0.01,
    )!;
    expect(line657, "the draft holds Ca I 657.278 nm").toBeDefined();
    const retired = await lead.post(`/api/lines/${line657.id}/retire`, {
      version: line657.version,
      reason: "workbench test: retire a calcium line",
    });
    expect(retired.status, JSON.stringify(retired.body)).toBe(200);
    const published = await lead.post<{ number: number }>(
      `/api/releases/${draft.body.id}/publish`,
      { notes: "Workbench test release" },
    );
    expect(published.status, JSON.stringify(published.body)).toBe(200);

    const mark = await auditMark();
    const reply = await chemist.post<Run>(`/api/runs/${first.id}/rerun`, {});
    expect(reply.status, JSON.stringify(reply.body)).toBe(201);
    rerun = reply.body;
    expect(rerun).toMatchObject({
      rerunOfId: first.id,
      notebookId: first.notebookId,
      spectrumId: first.spectrumId,
      calibrationId: first.calibrationId,
      settings: first.settings,
      lineReleaseNumber: published.body.number,
      status: "draft",
      notes: "",
    });
    expect(rerun.lineReleaseId).not.toBe(first.lineReleaseId);
    const events = await auditEventsSince(mark, { action: "run.rerun" });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ entity: "run", entity_id: rerun.id, actor_id: chemistId });
    expect(events[0].before).toMatchObject({ runId: first.id, lineReleaseId: first.lineReleaseId });
    // Without its 657.278 nm line calcium's evidence changes and the peak there loses its explanation.
    expect(rerun.unexplained.some((u) => Math.abs(u.wavelengthNm - 657.28) < 0.3)).toBe(true);
    expect(first.unexplained.some((u) => Math.abs(u.wavelengthNm - 657.28) < 0.3)).toBe(false);
    expect((await chemist.post(`/api/runs/${rerun.id}/rerun`, {})).status).toBe(422);
  });

  it("shows on the new run's page what changed against the earlier run", async () => {
    const response = await fetch(`${APP_URL}/runs/${rerun.id}`, {
      headers: cookieHeaders(chemist),
    });
    expect(response.status).toBe(200);
    const html = await response.text();
    const start = html.indexOf('data-testid="run-changes"');
    expect(start, "the page has the changes panel").toBeGreaterThan(0);
    const section = html.slice(start, html.indexOf("</section>", start));
    expect(section).toMatch(/Newly unexplained peaks:.*657\.2\d\d nm/);
    expect(section).toMatch(/release(<!-- -->| )*\d+(<!-- -->| )*→/);
    // The earlier run still offers a run on the newest release, which it did not use.
    const earlier = await (
      await fetch(`${APP_URL}/runs/${first.id}`, { headers: cookieHeaders(chemist) })
    ).text();
    expect(earlier).toContain(`Run again on release ${rerun.lineReleaseNumber}`);
    expect(earlier).not.toContain('data-testid="run-changes"');
  });
});
