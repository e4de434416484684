// Notebooks and the lists around them, through HTTP against the real PostgreSQL: renaming with the
// version it was made from (a stale one gets 409 and changes nothing) and its audit event; a notebook's
// runs filtered by status, by a species that stands as present (the run record's standing verdicts,
// overrides included), by instrument and by free text; the team's spectra list, newest first, without
// bytes or points; 400 for bad filters and 404 for another team's records; and a second seed that adds
// nothing. The tests run in order and build on each other.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, ApiClient, type ErrorBody } from "./support/http-client";
import {
  ARC_AND_SPARK,
  DEMO,
  FLAME_SCREENING,
  signInDemo,
  signedIn,
  teamIdOf,
} from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { syntheticGrating } from "@/lib/spectrum/synthetic/synthetic-grating";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
} from "@/lib/spectrum/synthetic/synthetic-instrument";
import { flameFile, flameFileOnWavelengthAxis, lampFile } from "./support/synthetic-files";

interface Instrument {
  id: string;
  name: string;
  latestCalibrationId: string | null;
}
interface RunSummary {
  id: string;
  status: string;
  versionNumber: number;
  spectrumId: string;
  spectrumLabel: string;
  spectrumFileName: string;
  instrumentId: string;
  instrumentName: string;
  source: string;
  present: string[];
  authorName: string | null;
  createdAt: string;
}
interface Notebook {
  id: string;
  title: string;
  version: number;
  runCount: number;
  statusCounts: Record<string, number>;
  lastActivityAt: string;
}
interface SpectrumSummary {
  id: string;
  teamId: string;
  instrumentId: string;
  kind: string;
  label: string;
  uploadedAt: string;
  xRange: [number, number];
  points: number;
}

const SESSION_COOKIE = "emberline_session";
const suffix = Date.now().toString(36);
const grating = syntheticGrating();

let chemist: ApiClient;
let lead: ApiClient;
let outsider: ApiClient;
let teamId: string;
let arcTeamId: string;
let outsiderTeamId: string;
let demoInstrument: Instrument;
let ownAxisInstrument: Instrument;
let notebookId: string;
const runs: Record<
  "flame" | "lampCheck" | "ownAxis",
  { id: string; spectrumId: string; label: string }
> = {} as never;

async function upload(
  client: ApiClient,
  instrumentId: string,
  content: string,
  label: string,
): Promise<string> {
  const form = new FormData();
  form.set("file", new Blob([content]), `${label}.csv`);
  form.set("instrumentId", instrumentId);
  form.set("kind", "sample");
  form.set("label", label);
  const response = await fetch(`${APP_URL}/api/spectra`, {
    method: "POST",
    headers: {
      cookie: `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE)}`,
      "x-forwarded-for": client.address,
    },
    body: form,
  });
  const body = await response.json();
  expect(response.status, JSON.stringify(body)).toBe(201);
  return body.id;
}

async function startRun(
  spectrumId: string,
  source: string,
  calibrationId: string | null,
): Promise<string> {
  const reply = await chemist.post<{ id: string }>("/api/runs", {
    notebookId,
    spectrumId,
    calibrationId,
    source,
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body.id;
}

async function listRuns(query: string): Promise<RunSummary[]> {
  const reply = await chemist.get<RunSummary[]>(`/api/notebooks/${notebookId}/runs${query}`);
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  return reply.body;
}

const ids = (list: { id: string }[]) => list.map((r) => r.id).sort();

/** The runs whose stored record (GET /api/runs/:id, standing verdicts) calls `species` present. */
async function runsStandingPresent(species: string): Promise<string[]> {
  const present: string[] = [];
  for (const run of Object.values(runs)) {
    const record = await chemist.get<{ verdicts: Record<string, string> }>(`/api/runs/${run.id}`);
    expect(record.status).toBe(200);
    if (record.body.verdicts[species] === "present") present.push(run.id);
  }
  return present.sort();
}

beforeAll(async () => {
  chemist = await signInDemo("chemist");
  lead = await signInDemo("labLead");
  outsiderTeamId = (await ensureOutsider()).teamId;
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  teamId = await teamIdOf(lead, FLAME_SCREENING);
  arcTeamId = await teamIdOf(lead, ARC_AND_SPARK);

  // The seeded demo grating (already calibrated) and a new instrument whose samples carry their own axis.
  const instruments = await chemist.get<Instrument[]>(`/api/instruments?teamId=${teamId}`);
  demoInstrument = instruments.body.find((i) => i.name === "Bench grating")!;
  expect(demoInstrument?.latestCalibrationId).toBeTruthy();
  const created = await lead.post<Instrument>("/api/instruments", {
    teamId,
    name: `Own-axis grating ${suffix}`,
    dispersion: "grating",
    pixels: SYNTHETIC_PIXELS,
    nominalMinNm: grating.nominalRangeNm[0],
    nominalMaxNm: grating.nominalRangeNm[1],
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  ownAxisInstrument = created.body;

  const notebook = await chemist.post<{ id: string }>("/api/notebooks", {
    teamId,
    title: `Filter bench ${suffix}`,
  });
  expect(notebook.status).toBe(201);
  notebookId = notebook.body.id;

  const labels = {
    flame: `flame ${suffix}`,
    lampCheck: `lamp check ${suffix}`,
    ownAxis: `own axis ${suffix}`,
  };
  const flameId = await upload(chemist, demoInstrument.id, flameFile(grating, 21), labels.flame);
  runs.flame = {
    id: await startRun(flameId, "flame", demoInstrument.latestCalibrationId),
    spectrumId: flameId,
    label: labels.flame,
  };
  const lampId = await upload(chemist, demoInstrument.id, lampFile(grating, 22), labels.lampCheck);
  runs.lampCheck = {
    id: await startRun(lampId, "lamp", demoInstrument.latestCalibrationId),
    spectrumId: lampId,
    label: labels.lampCheck,
  };
  const ownAxisId = await upload(
    chemist,
    ownAxisInstrument.id,
    flameFileOnWavelengthAxis(grating, 23),
    labels.ownAxis,
  );
  runs.ownAxis = {
    id: await startRun(ownAxisId, "flame", null),
    spectrumId: ownAxisId,
    label: labels.ownAxis,
  };

  const submitted = await chemist.post(`/api/runs/${runs.lampCheck.id}/submit`, {});
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
}, 180_000);

afterAll(async () => {
  await closeDb();
});

describe("a notebook's runs", () => {
  it("are listed newest first with status, species standing as present, instrument, sample, author and version", async () => {
    const all = await listRuns("");
    expect(all.map((r) => r.id)).toEqual([runs.ownAxis.id, runs.lampCheck.id, runs.flame.id]);
    const flame = all.find((r) => r.id === runs.flame.id)!;
    expect(flame).toMatchObject({
      status: "draft",
      versionNumber: 1,
      spectrumId: runs.flame.spectrumId,
      spectrumLabel: runs.flame.label,
      instrumentId: demoInstrument.id,
      instrumentName: "Bench grating",
      source: "flame",
      authorName: DEMO.chemist.name,
    });
    for (const run of all) {
      const record = await chemist.get<{ verdicts: Record<string, string> }>(`/api/runs/${run.id}`);
      const standing = Object.entries(record.body.verdicts)
        .filter(([, v]) => v === "present")
        .map(([s]) => s);
      expect([...run.present].sort(), run.id).toEqual(standing.sort());
    }
    expect(all.find((r) => r.id === runs.lampCheck.id)!.status).toBe("submitted");
  });

  it("filter by status and by instrument", async () => {
    expect(ids(await listRuns("?status=submitted"))).toEqual([runs.lampCheck.id]);
    expect(ids(await listRuns("?status=draft"))).toEqual(ids([runs.flame, runs.ownAxis]));
    expect(await listRuns("?status=signed")).toEqual([]);
    expect(ids(await listRuns(`?instrumentId=${ownAxisInstrument.id}`))).toEqual([runs.ownAxis.id]);
    expect(ids(await listRuns(`?instrumentId=${demoInstrument.id}&status=draft`))).toEqual([
      runs.flame.id,
    ]);
  });

  it("filter by a species standing as present: by its name in any case, or by the element for all its stages", async () => {
    const potassium = await runsStandingPresent("K I");
    expect(potassium).toContain(runs.flame.id);
    expect(potassium).not.toContain(runs.lampCheck.id);
    expect(ids(await listRuns("?species=K%20I"))).toEqual(potassium);
    expect(ids(await listRuns("?species=k"))).toEqual(potassium);
    const mercury = await runsStandingPresent("Hg I");
    expect(mercury).toEqual([runs.lampCheck.id]);
    expect(ids(await listRuns("?species=hg%20i"))).toEqual(mercury);
    expect(await listRuns("?species=Xx")).toEqual([]);
  });

  it("follow an override: a species overridden to absent no longer matches", async () => {
    // Overrides are appended by the review step; a row as it would write it.
    await db().query(
      `INSERT INTO run_overrides (run_id, species, computed_verdict, verdict, reason)
       VALUES ($1, 'K I', 'present', 'absent', 'Test: the loop was contaminated with potassium')`,
      [runs.flame.id],
    );
    const expected = await runsStandingPresent("K I");
    expect(expected).not.toContain(runs.flame.id);
    expect(ids(await listRuns("?species=K%20I"))).toEqual(expected);
    const flame = (await listRuns("")).find((r) => r.id === runs.flame.id)!;
    expect(flame.present).not.toContain("K I");
  });

  it("search the sample label, file name, instrument and author", async () => {
    expect(ids(await listRuns(`?q=${encodeURIComponent(runs.lampCheck.label)}`))).toEqual([
      runs.lampCheck.id,
    ]);
    expect(ids(await listRuns(`?q=${encodeURIComponent(`own axis ${suffix}.csv`)}`))).toEqual([
      runs.ownAxis.id,
    ]);
    expect(ids(await listRuns(`?q=own-axis%20grating`))).toEqual([runs.ownAxis.id]);
    expect(
      ids(await listRuns(`?q=${encodeURIComponent(DEMO.chemist.name.toUpperCase())}`)),
    ).toEqual(ids(Object.values(runs)));
    // A % typed into the box is a character, not a wildcard.
    expect(await listRuns("?q=%25")).toEqual([]);
  });

  it("refuse bad filters with 400 and field messages; another team's notebook is not found", async () => {
    const cases: [string, string][] = [
      ["?status=approved", "status"],
      ["?instrumentId=not-a-uuid", "instrumentId"],
      [`?species=${"x".repeat(41)}`, "species"],
      [`?q=${"x".repeat(201)}`, "q"],
    ];
    for (const [query, field] of cases) {
      const reply = await chemist.get<ErrorBody>(`/api/notebooks/${notebookId}/runs${query}`);
      expect(reply.status, query).toBe(400);
      expect(reply.body.error.fieldErrors?.[field], query).toBeDefined();
    }
    expect((await outsider.get(`/api/notebooks/${notebookId}/runs`)).status).toBe(404);
    expect((await chemist.get(`/api/notebooks/not-a-notebook/runs`)).status).toBe(404);
  });
});

describe("renaming a notebook", () => {
  it("takes the version it was made from, answers 409 to a stale one and audits the change with before and after", async () => {
    const before = await chemist.get<Notebook & { runs: RunSummary[] }>(
      `/api/notebooks/${notebookId}`,
    );
    expect(before.status).toBe(200);
    expect(before.body.runs).toHaveLength(3);
    const version = before.body.version;

    const mark = await auditMark();
    const title = `Filter bench, renamed ${suffix}`;
    const renamed = await chemist.request<Notebook>("PATCH", `/api/notebooks/${notebookId}`, {
      json: { title: `  ${title} `, version },
    });
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200);
    expect(renamed.body.title).toBe(title);
    expect(renamed.body.version).toBe(version + 1);
    const events = await auditEventsSince(mark, { action: "notebook.rename" });
    expect(events).toHaveLength(1);
    expect(events[0].entity_id).toBe(notebookId);
    expect(events[0].before).toMatchObject({ title: `Filter bench ${suffix}` });
    expect(events[0].after).toMatchObject({ title });

    const staleMark = await auditMark();
    const stale = await chemist.request<ErrorBody>("PATCH", `/api/notebooks/${notebookId}`, {
      json: { title: "Someone else's title", version },
    });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fieldErrors?.title?.join(" ")).toContain(title);
    const after = await chemist.get<Notebook>(`/api/notebooks/${notebookId}`);
    expect(after.body.title).toBe(title);
    expect(await auditEventsSince(staleMark, { action: "notebook.rename" })).toEqual([]);
  });

  it("refuses a blank or overlong title and a missing version with 400; outsiders get 404", async () => {
    const current = (await chemist.get<Notebook>(`/api/notebooks/${notebookId}`)).body;
    const blank = await chemist.request<ErrorBody>("PATCH", `/api/notebooks/${notebookId}`, {
      json: { title: "   ", version: current.version },
    });
    expect(blank.status).toBe(400);
    expect(blank.body.error.fieldErrors?.title).toEqual(["Give the notebook a title."]);
    const long = await chemist.request<ErrorBody>("PATCH", `/api/notebooks/${notebookId}`, {
      json: { title: "x".repeat(201), version: current.version },
    });
    expect(long.status).toBe(400);
    expect(long.body.error.fieldErrors?.title).toBeDefined();
    const noVersion = await chemist.request<ErrorBody>("PATCH", `/api/notebooks/${notebookId}`, {
      json: { title: "No version" },
    });
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.error.fieldErrors?.version).toBeDefined();
    const foreign = await outsider.request("PATCH", `/api/notebooks/${notebookId}`, {
      json: { title: "Mine now", version: current.version },
    });
    expect(foreign.status).toBe(404);
    expect((await chemist.get<Notebook>(`/api/notebooks/${notebookId}`)).body.title).toBe(
      current.title,
    );
  });

  it("is found by the title search, with its run counts by status", async () => {
    const found = await chemist.get<Notebook[]>(
      `/api/notebooks?teamId=${teamId}&q=${encodeURIComponent(`renamed ${suffix}`.toUpperCase())}`,
    );
    expect(found.status).toBe(200);
    expect(found.body.map((n) => n.id)).toEqual([notebookId]);
    expect(found.body[0]).toMatchObject({
      runCount: 3,
      statusCounts: { draft: 2, submitted: 1, returned: 0, signed: 0 },
    });
    const old = await chemist.get<Notebook[]>(
      `/api/notebooks?teamId=${teamId}&q=${encodeURIComponent(`Filter bench ${suffix}`)}`,
    );
    expect(old.body).toEqual([]);
    const tooLong = await chemist.get<ErrorBody>(
      `/api/notebooks?teamId=${teamId}&q=${"x".repeat(201)}`,
    );
    expect(tooLong.status).toBe(400);
    expect((await outsider.get(`/api/notebooks?teamId=${teamId}&q=renamed`)).status).toBe(404);
  });
});

describe("the spectra list", () => {
  it("lists the team's spectra of one instrument and kind, newest first, without bytes or points", async () => {
    const reply = await chemist.get<SpectrumSummary[]>(
      `/api/spectra?teamId=${teamId}&instrumentId=${demoInstrument.id}&kind=sample`,
    );
    expect(reply.status).toBe(200);
    const list = reply.body;
    expect(list.length).toBeGreaterThanOrEqual(2);
    expect(
      list.every(
        (s) => s.kind === "sample" && s.instrumentId === demoInstrument.id && s.teamId === teamId,
      ),
    ).toBe(true);
    expect(list.slice(0, 2).map((s) => s.id)).toEqual([
      runs.lampCheck.spectrumId,
      runs.flame.spectrumId,
    ]);
    const times = list.map((s) => s.uploadedAt);
    expect(times).toEqual([...times].sort().reverse());
    for (const key of ["rawBytes", "xValues", "yValues", "x", "y"])
      expect(list[0]).not.toHaveProperty(key);
    expect(list[0].points).toBe(SYNTHETIC_PIXELS);
    expect(list[0].xRange).toEqual([0, SYNTHETIC_PIXELS - 1]);

    const lamps = await chemist.get<SpectrumSummary[]>(`/api/spectra?teamId=${teamId}&kind=lamp`);
    expect(lamps.body.length).toBeGreaterThan(0);
    expect(lamps.body.every((s) => s.kind === "lamp")).toBe(true);
    const own = await chemist.get<SpectrumSummary[]>(
      `/api/spectra?teamId=${teamId}&instrumentId=${ownAxisInstrument.id}`,
    );
    expect(own.body.map((s) => s.id)).toEqual([runs.ownAxis.spectrumId]);
  });

  it("keeps other teams out (404) and refuses bad parameters (400)", async () => {
    expect((await outsider.get(`/api/spectra?teamId=${teamId}`)).status).toBe(404);
    expect((await chemist.get(`/api/spectra?teamId=${outsiderTeamId}`)).status).toBe(404);
    expect((await chemist.get(`/api/spectra?teamId=${arcTeamId}`)).status).toBe(404);
    // The lab lead sees the Arc and Spark Bench instrument; the chemist may not list it under her own team.
    const arcInstruments = await lead.get<Instrument[]>(`/api/instruments?teamId=${arcTeamId}`);
    expect(arcInstruments.body.length).toBeGreaterThan(0);
    expect(
      (await chemist.get(`/api/spectra?teamId=${teamId}&instrumentId=${arcInstruments.body[0].id}`))
        .status,
    ).toBe(404);
    expect(
      (await lead.get(`/api/spectra?teamId=${teamId}&instrumentId=${arcInstruments.body[0].id}`))
        .status,
    ).toBe(404);

    const badKind = await chemist.get<ErrorBody>(`/api/spectra?teamId=${teamId}&kind=dark`);
    expect(badKind.status).toBe(400);
    expect(badKind.body.error.fieldErrors?.kind).toBeDefined();
    const badInstrument = await chemist.get<ErrorBody>(
      `/api/spectra?teamId=${teamId}&instrumentId=42`,
    );
    expect(badInstrument.status).toBe(400);
    expect(badInstrument.body.error.fieldErrors?.instrumentId).toBeDefined();
  });
});

describe("the demo seed", () => {
  it("adds nothing when it runs again", async () => {
    const counts = async () =>
      (
        await db().query<Record<string, string>>(
          `SELECT (SELECT count(*) FROM users) AS users, (SELECT count(*) FROM memberships) AS memberships,
                  (SELECT count(*) FROM instruments) AS instruments, (SELECT count(*) FROM spectrum_files) AS spectra,
                  (SELECT count(*) FROM calibrations) AS calibrations, (SELECT count(*) FROM notebooks) AS notebooks,
                  (SELECT count(*) FROM runs) AS runs, (SELECT count(*) FROM line_releases) AS releases,
                  (SELECT count(*) FROM audit_events) AS audit`,
        )
      ).rows[0];
    // The demo benches are there from the first seed (npm test seeds before the tests run).
    const demo = await db().query<{ n: string }>(
      `SELECT count(*) AS n FROM runs r JOIN notebooks n ON n.id = r.notebook_id
        WHERE n.title IN ('Chloride salts, week 48', 'Lamp read-back checks', 'Prism commissioning')`,
    );
    expect(Number(demo.rows[0].n)).toBe(4);
    const before = await counts();
    const { seedDemo } = await import("@/db/seed");
    const { sequelize } = await import("@/models");
    try {
      await seedDemo();
    } finally {
      await sequelize.close();
    }
    expect(await counts()).toEqual(before);
  }, 120_000);
});
