// The line library through HTTP against the real PostgreSQL: the seeded release 1, frozen published
// releases (routes and SQL), roles, another team's draft, optimistic locking, CSV import preview and
// apply (all or nothing), publish and its mail, diff, export → re-import, and the audit trail.
// The tests run in order and build on each other: release 1 (seed) → draft → release 2 → draft → 3.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import Papa from "papaparse";
import { APP_URL, ApiClient, type ErrorBody } from "./support/http-client";
import {
  DEMO,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  teamIdOf,
} from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { auditEventsSince, auditMark, closeDb, db } from "./support/database";
import { mailTo, waitForMail } from "./support/mailbox";

interface Line {
  id: string;
  lineKey: string;
  species: string;
  airNm: number | null;
  vacuumNm: number;
  intensities: Record<string, number>;
  note: string;
  source: string;
  verified: boolean;
  retired: boolean;
  version: number;
}
interface LinePage {
  release: { id: string; number: number | null; status: string };
  lines: Line[];
  total: number;
  page: number;
  pageSize: number;
}
interface Release {
  id: string;
  number: number | null;
  status: string;
  lineCount: number;
}
interface Preview {
  adds: { csvLine: number; row: { species: string } }[];
  changes: { lineId: string; csvLine: number; fields: string[] }[];
  unchangedCount: number;
  errors: { line: number; column?: number; field: string; message: string }[];
  fingerprint: string;
}

let lead: ApiClient;
let secondLead: ApiClient;
let chemist: ApiClient;
let outsider: ApiClient;
let teamId: string;
let release1: Release;
let draft: Release;

const patch = (client: ApiClient, path: string, json: unknown) =>
  client.request("PATCH", path, { json });

async function releases(): Promise<Release[]> {
  const reply = await lead.get<Release[]>(`/api/releases?teamId=${teamId}`);
  expect(reply.status).toBe(200);
  return reply.body;
}

async function draftLines(query = ""): Promise<Line[]> {
  const reply = await lead.get<LinePage>(
    `/api/lines?teamId=${teamId}&release=${draft.id}&pageSize=500${query}`,
  );
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  return reply.body.lines;
}

/** Everything about a release's rows in one hash, and the audit trail's newest id. */
async function snapshot(
  releaseId: string,
): Promise<{ rows: string; count: number; audit: number }> {
  const { rows } = await db().query<{ digest: string; count: string }>(
    `SELECT md5(coalesce(string_agg(l::text, '|' ORDER BY l.id), '')) AS digest, count(*) AS count
       FROM lines l WHERE l.release_id = $1`,
    [releaseId],
  );
  return { rows: rows[0].digest, count: Number(rows[0].count), audit: await auditMark() };
}

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  teamId = await teamIdOf(lead, FLAME_SCREENING);
  const second = await createAccountThroughInvitation(lead, {
    label: "second-lead",
    role: "lab_lead",
  });
  secondLead = await signedIn(second.email, second.password);
  await ensureOutsider();
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  release1 = (await releases()).find((r) => r.number === 1)!;
});

afterAll(closeDb);

describe("the seeded release 1", () => {
  it("answers GET /api/lines?minNm=588&maxNm=590 with the sodium D lines", async () => {
    const reply = await chemist.get<LinePage>("/api/lines?minNm=588&maxNm=590");
    expect(reply.status).toBe(200);
    expect(reply.body.release.number).toBe(1);
    const sodium = reply.body.lines.filter((l) => l.species === "Na I").map((l) => l.airNm!);
    // NIST Atomic Spectra Database, Na I D2 588.995 nm and D1 589.592 nm in air (from memory); ≥ 0.002 nm: common practice
    expect(sodium.some((nm) => Math.abs(nm - 588.995) <= 0.002)).toBe(true);
    // NIST Atomic Spectra Database, Na I D1 589.592 nm in air (from memory); ≥ 0.002 nm tolerance: common practice
    expect(sodium.some((nm) => Math.abs(nm - 589.592) <= 0.002)).toBe(true);
    expect(
      reply.body.lines.every(
        (l) => (l.airNm ?? l.vacuumNm) >= 588 && (l.airNm ?? l.vacuumNm) <= 590,
      ),
    ).toBe(true);
    expect(reply.body.total).toBe(reply.body.lines.length);
  });

  it("pages and counts with the same filter, at most 500 a page", async () => {
    const all = await chemist.get<LinePage>("/api/lines?pageSize=500");
    expect(all.body.total).toBe(release1.lineCount);
    const second = await chemist.get<LinePage>("/api/lines?pageSize=10&page=2&species=Ne%20I");
    expect(second.status).toBe(200);
    expect(second.body.lines.every((l) => l.species === "Ne I")).toBe(true);
    expect(second.body.page).toBe(2);
    expect((await chemist.get("/api/lines?pageSize=501")).status).toBe(400);
  });

  it("has its starter audit event", async () => {
    const { rows } = await db().query(
      `SELECT reason FROM audit_events WHERE entity = 'line_release' AND entity_id = $1 AND action = 'line_release.publish'`,
      [release1.id],
    );
    expect(rows.map((r) => r.reason)).toEqual(["Starter table"]);
  });
});

describe("who may change what", () => {
  it("refuses a chemist (403) and another team (404)", async () => {
    expect((await chemist.post("/api/releases/draft", { teamId })).status).toBe(403);
    expect((await outsider.post("/api/releases/draft", { teamId })).status).toBe(404);
    expect((await outsider.get(`/api/lines?teamId=${teamId}`)).status).toBe(404);
    expect((await outsider.get(`/api/releases/${release1.id}/export`)).status).toBe(404);
  });

  it("opens one draft, copying release 1 with its line keys; a second open returns the same", async () => {
    const opened = await lead.post<Release>("/api/releases/draft", { teamId });
    expect(opened.status).toBe(200);
    draft = opened.body;
    expect(draft.status).toBe("draft");
    expect(draft.lineCount).toBe(release1.lineCount);
    expect((await secondLead.post<Release>("/api/releases/draft", { teamId })).body.id).toBe(
      draft.id,
    );
    const { rows } = await db().query(
      `SELECT count(*)::int AS n FROM lines d JOIN lines p ON p.line_key = d.line_key AND p.release_id = $2
        WHERE d.release_id = $1`,
      [draft.id, release1.id],
    );
    expect(rows[0].n).toBe(release1.lineCount);
  });

  it("hides the draft from another team (404) and lets a chemist read but not edit it (403)", async () => {
    const [line] = await draftLines("&species=Na%20I");
    expect((await outsider.get(`/api/releases/${draft.id}`)).status).toBe(404);
    expect((await outsider.get(`/api/lines/${line.id}`)).status).toBe(404);
    expect(
      (
        await patch(outsider, `/api/lines/${line.id}`, {
          version: line.version,
          line: { note: "x" },
          reason: "a test edit",
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await outsider.post(`/api/releases/${draft.id}/import/preview`, {
          csv: "species,air_nm,source\n",
        })
      ).status,
    ).toBe(404);
    expect((await chemist.get(`/api/lines/${line.id}`)).status).toBe(200);
    const edit = await patch(chemist, `/api/lines/${line.id}`, {
      version: line.version,
      line: { note: "x" },
      reason: "a test edit",
    });
    expect(edit.status).toBe(403);
    expect(
      (await chemist.post(`/api/releases/${draft.id}/publish`, { notes: "a test release" })).status,
    ).toBe(403);
  });

  it("refuses every route that would change published release 1 (409)", async () => {
    const page = await lead.get<LinePage>(`/api/lines?teamId=${teamId}&release=1&species=Na%20I`);
    const line = page.body.lines[0];
    const body = { version: line.version, reason: "try" };
    const before = await snapshot(release1.id);
    const replies = await Promise.all([
      patch(lead, `/api/lines/${line.id}`, { ...body, line: { note: "changed" } }),
      lead.post(`/api/lines/${line.id}/retire`, body),
      lead.post(`/api/lines/${line.id}/verify`, body),
      lead.post(`/api/releases/${release1.id}/lines`, {
        line: { species: "Na I", airNm: 700.5, source: "test" },
        reason: "try",
      }),
      lead.post(`/api/releases/${release1.id}/import/preview`, {
        csv: "species,air_nm,source\nNa I,700.5,test\n",
      }),
      lead.post(`/api/releases/${release1.id}/publish`, { notes: "again" }),
    ]);
    for (const reply of replies) {
      expect(reply.status, JSON.stringify(reply.body)).toBe(409);
      expect((reply.body as ErrorBody).error.message).toMatch(/published/);
    }
    expect(await snapshot(release1.id)).toEqual(before);
  });

  it("refuses changes to a published release in SQL too (the trigger)", async () => {
    const attempts = [
      `UPDATE lines SET note = 'sql' WHERE release_id = '${release1.id}'`,
      `DELETE FROM lines WHERE release_id = '${release1.id}'`,
      `INSERT INTO lines (release_id, species, element, vacuum_nm, source) VALUES ('${release1.id}', 'Na I', 'Na', 700.7, 'sql')`,
      `UPDATE lines SET release_id = '${release1.id}', line_key = gen_random_uuid() WHERE id = (SELECT id FROM lines WHERE release_id = '${draft.id}' LIMIT 1)`,
      `UPDATE line_releases SET notes = 'sql' WHERE id = '${release1.id}'`,
      `DELETE FROM line_releases WHERE id = '${release1.id}'`,
    ];
    for (const sql of attempts) await expect(db().query(sql), sql).rejects.toThrow(/published/);
    // The draft's rows stay writable: the trigger looks at the release, not at the table.
    const { rowCount } = await db().query(`UPDATE lines SET note = note WHERE release_id = $1`, [
      draft.id,
    ]);
    expect(rowCount).toBe(draft.lineCount);
  });
});

describe("editing the draft", () => {
  it("gives the second of two leads saving the same line a 409 with a clear message", async () => {
    const [line] = await draftLines("&species=K%20I");
    const first = await patch(lead, `/api/lines/${line.id}`, {
      version: line.version,
      line: { note: "checked by the first lead" },
      reason: "note",
    });
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    const second = await patch(secondLead, `/api/lines/${line.id}`, {
      version: line.version,
      line: { note: "checked by the second lead" },
      reason: "note",
    });
    expect(second.status).toBe(409);
    expect((second.body as ErrorBody).error.message).toMatch(
      /Someone else changed this line first/,
    );
    const reread = await lead.get<Line>(`/api/lines/${line.id}`);
    expect(reread.body.note).toBe("checked by the first lead");
  });

  it("requires a reason and checks values with the CSV's rules", async () => {
    const noReason = await lead.post(`/api/releases/${draft.id}/lines`, {
      line: { species: "Na I", airNm: 701.25, source: "test" },
      reason: "",
    });
    expect(noReason.status).toBe(400);
    const badSpecies = await lead.post<ErrorBody>(`/api/releases/${draft.id}/lines`, {
      line: { species: "Xx I", airNm: 701.25, source: "test" },
      reason: "why",
    });
    expect(badSpecies.status).toBe(400);
    expect(badSpecies.body.error.fieldErrors?.species?.[0]).toMatch(/not an element symbol/);
  });
});

/** The release as exported CSV text (the client's JSON parsing would drop it). */
async function exportText(
  releaseId: string,
): Promise<{ status: number; headers: Headers; text: string }> {
  const response = await fetch(`${APP_URL}/api/releases/${releaseId}/export`, {
    headers: {
      cookie: `emberline_session=${lead.cookie("emberline_session")}`,
      "x-forwarded-for": lead.address,
    },
  });
  return { status: response.status, headers: response.headers, text: await response.text() };
}

/** Rows of an exported file by line key, to build import files from (full rows, so nothing else differs). */
class ExportedTable {
  readonly header: string[];
  private readonly byKey = new Map<string, string[]>();

  constructor(text: string) {
    const [header, ...records] = Papa.parse<string[]>(text, {
      comments: "#",
      skipEmptyLines: true,
    }).data;
    this.header = header.slice(1);
    for (const record of records) this.byKey.set(record[0], record.slice(1));
  }

  /** A row of the file without line_key, with some cells replaced. */
  row(lineKey: string, cells: Record<string, string> = {}): string[] {
    const row = [...this.byKey.get(lineKey)!];
    for (const [column, value] of Object.entries(cells)) row[this.header.indexOf(column)] = value;
    return row;
  }

  /** A row with only the given cells filled. */
  blank(cells: Record<string, string>): string[] {
    return this.header.map((column) => cells[column] ?? "");
  }

  csv(rows: string[][], comment = "# a test import"): string {
    return `${comment}\n${Papa.unparse({ fields: this.header, data: rows }, { newline: "\n" })}\n`;
  }
}

describe("CSV import", () => {
  let csv: string;
  let preview: Preview;
  let changed: Line[];

  it("previews adds, changes, unchanged and every rejected row, writing nothing", async () => {
    const table = new ExportedTable((await exportText(draft.id)).text);
    const [unchanged] = await draftLines("&species=Cs%20I");
    changed = (await draftLines("&species=Rb%20I")).slice(0, 2);
    csv = table.csv([
      table.blank({
        species: "Fe I",
        air_nm: "702.3456",
        source: "test source",
        note: "a new line",
      }), // line 3
      table.row(changed[0].lineKey, { intensity_flame: "777" }), // line 4: change of intensity
      table.row(changed[1].lineKey, { note: "corrected note" }), // line 5: change of note
      table.row(unchanged.lineKey), // line 6: unchanged
      table.blank({ species: "Fe I", air_nm: "58x.1", source: "test source" }), // line 7: bad number
      table.blank({ species: "Xx I", air_nm: "650.1", source: "test source" }), // line 8: unknown species
      table.blank({ species: "Fe I", air_nm: "651.2" }), // line 9: missing source
      table.blank({ species: "Fe I", air_nm: "50000", source: "test source" }), // line 10: out of range
      table.blank({ species: "Fe I", air_nm: "702.3456", source: "test source", note: "again" }), // line 11: duplicate
    ]);
    const before = await snapshot(draft.id);
    const reply = await lead.post<Preview>(`/api/releases/${draft.id}/import/preview`, { csv });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    preview = reply.body;
    expect(preview.adds.map((a) => [a.csvLine, a.row.species])).toEqual([[3, "Fe I"]]);
    expect(preview.changes.map((c) => [c.csvLine, c.lineId, c.fields])).toEqual([
      [4, changed[0].id, ["intensities"]],
      [5, changed[1].id, ["note"]],
    ]);
    expect(preview.unchangedCount).toBe(1);
    const errors = preview.errors.map((e) => [e.line, e.field]);
    expect(errors).toEqual([
      [7, "air_nm"],
      [8, "species"],
      [9, "source"],
      [10, "air_nm"],
      [11, "row"],
    ]);
    expect(preview.errors[0]).toMatchObject({
      column: 2,
      message: expect.stringMatching(/not a number/),
    });
    expect(preview.changes[0]).toMatchObject({
      before: { intensities: { flame: changed[0].intensities.flame } },
    });
    expect(preview.errors[1].message).toMatch(/not an element symbol/);
    expect(preview.errors[2].message).toMatch(/needs a source/);
    expect(preview.errors[3].message).toMatch(/outside the accepted range/);
    expect(preview.errors[4].message).toMatch(/duplicate inside the file: line 3/);
    expect(await snapshot(draft.id)).toEqual(before);
  });

  it("takes the file as text/csv too", async () => {
    const reply = await lead.request<Preview>("POST", `/api/releases/${draft.id}/import/preview`, {
      rawBody: csv,
      headers: { "content-type": "text/csv" },
    });
    expect(reply.status).toBe(200);
    expect(reply.body.fingerprint).toBe(preview.fingerprint);
  });

  it("refuses to apply a file with rejected rows unless told to skip them", async () => {
    const before = await snapshot(draft.id);
    const reply = await lead.post(`/api/releases/${draft.id}/import/apply`, {
      csv,
      fingerprint: preview.fingerprint,
    });
    expect(reply.status).toBe(422);
    expect(await snapshot(draft.id)).toEqual(before);
  });

  it("applies exactly the previewed adds and changes, with their audit events", async () => {
    const before = await snapshot(draft.id);
    const reply = await lead.post<{ added: number; changed: number; rejected: unknown[] }>(
      `/api/releases/${draft.id}/import/apply`,
      { csv, fingerprint: preview.fingerprint, skipRejected: true, reason: "test import" },
    );
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    expect(reply.body).toMatchObject({ added: 1, changed: 2 });
    expect(reply.body.rejected).toHaveLength(5);
    const after = await snapshot(draft.id);
    expect(after.count).toBe(before.count + 1);
    const events = await auditEventsSince(before.audit);
    expect(events.map((e) => e.action).sort()).toEqual([
      "line.add",
      "line.update",
      "line.update",
      "line_release.import",
    ]);
    expect(events.every((e) => e.team_id === teamId && e.reason === "test import")).toBe(true);
    const reread = await Promise.all(changed.map((l) => lead.get<Line>(`/api/lines/${l.id}`)));
    expect(reread[0].body.intensities.flame).toBe(777);
    expect(reread[1].body.note).toBe("corrected note");
    expect(reread[0].body.version).toBe(changed[0].version + 1);
    const added = await draftLines("&species=Fe%20I&minNm=702.34&maxNm=702.35");
    expect(added.map((l) => l.note)).toEqual(["a new line"]);
  });

  it("refuses the same fingerprint once the draft has changed (409)", async () => {
    const reply = await lead.post(`/api/releases/${draft.id}/import/apply`, {
      csv,
      fingerprint: preview.fingerprint,
      skipRejected: true,
    });
    expect(reply.status).toBe(409);
  });

  it("leaves the draft as it was when writing fails halfway", async () => {
    const [line] = await draftLines("&species=Li%20I");
    const table = new ExportedTable((await exportText(draft.id)).text);
    // The change is written first, then the add fails in the database: g_upper passes the file's
    // checks (a positive integer) but does not fit the integer column.
    const failing = table.csv([
      table.row(line.lineKey, { note: "changed before the failure" }),
      table.blank({
        species: "Fe I",
        air_nm: "703.4567",
        g_upper: "3000000000",
        source: "test source",
      }),
    ]);
    const previewed = await lead.post<Preview>(`/api/releases/${draft.id}/import/preview`, {
      csv: failing,
    });
    expect(previewed.status).toBe(200);
    expect(previewed.body.errors).toEqual([]);
    expect(previewed.body.changes).toHaveLength(1);
    expect(previewed.body.adds).toHaveLength(1);
    const before = await snapshot(draft.id);
    const reply = await lead.post<ErrorBody>(`/api/releases/${draft.id}/import/apply`, {
      csv: failing,
      fingerprint: previewed.body.fingerprint,
    });
    expect(reply.status).toBe(422);
    expect(reply.body.error.message).toMatch(/nothing was applied/);
    expect(await snapshot(draft.id)).toEqual(before);
  });

  it("previews an exported draft, re-imported as it is, as all unchanged", async () => {
    const exported = await exportText(draft.id);
    expect(exported.status).toBe(200);
    expect(exported.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(exported.headers.get("content-disposition")).toMatch(
      /attachment; filename="line-table-draft\.csv"/,
    );
    const text = exported.text;
    expect(text.split("\n").find((l) => !l.startsWith("#"))).toMatch(/^line_key,species,/);
    const reply = await lead.post<Preview>(`/api/releases/${draft.id}/import/preview`, {
      csv: text,
    });
    expect(reply.status).toBe(200);
    expect(reply.body.errors).toEqual([]);
    expect(reply.body.adds).toEqual([]);
    expect(reply.body.changes).toEqual([]);
    expect(reply.body.unchangedCount).toBe(
      (await releases()).find((r) => r.id === draft.id)!.lineCount,
    );
  });
});

describe("publishing and comparing", () => {
  let retired: Line;
  let release2: Release;

  it("publishes the draft as release 2 without its retired lines and e-mails the team", async () => {
    const [line] = await draftLines("&species=Ba%20II");
    const retiredReply = await lead.post<Line>(`/api/lines/${line.id}/retire`, {
      version: line.version,
      reason: "test retire",
    });
    expect(retiredReply.status).toBe(200);
    retired = retiredReply.body;
    expect(retired.retired).toBe(true);
    const mailsBefore = mailTo(DEMO.chemist.email).filter((m) =>
      /Line table release 2/.test(m.subject),
    ).length;
    const reply = await lead.post<Release>(`/api/releases/${draft.id}/publish`, {
      notes: "Second release: test edits",
    });
    expect(reply.status, JSON.stringify(reply.body)).toBe(200);
    release2 = reply.body;
    expect(release2).toMatchObject({
      number: 2,
      status: "published",
      lineCount: release1.lineCount,
    });
    for (const person of [DEMO.chemist, DEMO.supervisor, DEMO.labLead]) {
      const mail = await waitForMail({
        to: person.email,
        subject: /Line table release 2 of Flame Screening/,
        skip: person === DEMO.chemist ? mailsBefore : 0,
      });
      expect(mail.text).toMatch(/Second release: test edits/);
    }
    const frozen = await patch(lead, `/api/lines/${line.id}`, {
      version: retired.version,
      line: { note: "x" },
      reason: "a test edit",
    });
    expect(frozen.status).toBe(404); // the retired row is gone from release 2
    const [kept] = (
      await chemist.get<LinePage>(`/api/lines?teamId=${teamId}&release=2&species=K%20I`)
    ).body.lines;
    const refused = await patch(lead, `/api/lines/${kept.id}`, {
      version: kept.version,
      line: { note: "x" },
      reason: "a test edit",
    });
    expect(refused.status).toBe(409);
    const page = await chemist.get<LinePage>(`/api/lines?teamId=${teamId}`);
    expect(page.body.release.number).toBe(2);
  });

  it("compares release 1 and 2 by line key: added, removed, changed", async () => {
    const reply = await chemist.get<{
      added: Line[];
      removed: Line[];
      changed: { before: Line; after: Line; fields: string[] }[];
    }>(`/api/releases/diff?from=${release1.id}&to=${release2.id}`);
    expect(reply.status).toBe(200);
    expect(reply.body.added.map((l) => [l.species, l.airNm])).toEqual([["Fe I", 702.3456]]);
    expect(reply.body.removed.map((l) => l.lineKey)).toEqual([retired.lineKey]);
    const fields = new Map(reply.body.changed.map((c) => [c.after.note, c.fields]));
    expect(fields.get("corrected note")).toEqual(["note"]);
    expect(fields.get("checked by the first lead")).toEqual(["note"]);
    expect(reply.body.changed).toHaveLength(3);
    expect(
      (await outsider.get(`/api/releases/diff?from=${release1.id}&to=${release2.id}`)).status,
    ).toBe(404);
  });
});

describe("the audit trail", () => {
  interface Case {
    route: string;
    perform(): Promise<{
      status: number;
      expectedStatus: number;
      actions: string[];
      entityId?: string;
    }>;
  }
  let next: Release;
  let line: Line;
  const lineState = async (verb: string) => {
    const current = (await lead.get<Line>(`/api/lines/${line.id}`)).body;
    const reply = await lead.post(`/api/lines/${line.id}/${verb}`, {
      version: current.version,
      reason: `audit ${verb}`,
    });
    return {
      status: reply.status,
      expectedStatus: 200,
      actions: [`line.${verb}`],
      entityId: line.lineKey,
    };
  };
  const CASES: Case[] = [
    {
      route: "POST /api/releases/draft",
      perform: async () => {
        const reply = await lead.post<Release>("/api/releases/draft", { teamId });
        next = reply.body;
        return {
          status: reply.status,
          expectedStatus: 200,
          actions: ["line_release.open_draft"],
          entityId: next.id,
        };
      },
    },
    {
      route: "POST /api/releases/:id/lines",
      perform: async () => {
        const reply = await lead.post<Line>(`/api/releases/${next.id}/lines`, {
          line: {
            species: "Sr I",
            airNm: 704.5678,
            intensities: { flame: 5 },
            source: "test, from memory",
          },
          reason: "audit add",
        });
        line = reply.body;
        return {
          status: reply.status,
          expectedStatus: 201,
          actions: ["line.add"],
          entityId: line.lineKey,
        };
      },
    },
    {
      route: "PATCH /api/lines/:id",
      perform: async () => {
        const reply = await patch(lead, `/api/lines/${line.id}`, {
          version: line.version,
          line: { note: "audited" },
          reason: "audit update",
        });
        return {
          status: reply.status,
          expectedStatus: 200,
          actions: ["line.update"],
          entityId: line.lineKey,
        };
      },
    },
    { route: "POST /api/lines/:id/verify", perform: () => lineState("verify") },
    { route: "POST /api/lines/:id/retire", perform: () => lineState("retire") },
    { route: "POST /api/lines/:id/restore", perform: () => lineState("restore") },
    {
      route: "POST /api/releases/:id/import/apply",
      perform: async () => {
        const csv = "species,air_nm,source\nSr I,705.6789,test source\n";
        const previewed = await lead.post<Preview>(`/api/releases/${next.id}/import/preview`, {
          csv,
        });
        const reply = await lead.post(`/api/releases/${next.id}/import/apply`, {
          csv,
          fingerprint: previewed.body.fingerprint,
        });
        return {
          status: reply.status,
          expectedStatus: 200,
          actions: ["line.add", "line_release.import"],
        };
      },
    },
    {
      route: "POST /api/releases/:id/publish",
      perform: async () => {
        const reply = await lead.post(`/api/releases/${next.id}/publish`, {
          notes: "Third release",
        });
        return {
          status: reply.status,
          expectedStatus: 200,
          actions: ["line_release.publish"],
          entityId: next.id,
        };
      },
    },
  ];

  it.each(CASES.map((c) => [c.route, c] as const))(
    "%s writes its audit event",
    async (_route, testCase) => {
      const mark = await auditMark();
      const result = await testCase.perform();
      expect(result.status).toBe(result.expectedStatus);
      const events = await auditEventsSince(mark, { actorId: await leadId() });
      expect(events.map((e) => e.action).sort()).toEqual([...result.actions].sort());
      if (result.entityId) expect(events.map((e) => e.entity_id)).toContain(result.entityId);
      expect(events.every((e) => e.team_id === teamId)).toBe(true);
    },
  );

  it("shows a line's history across releases", async () => {
    const reply = await chemist.get<
      { action: string; releaseNumber: number | null; reason: string | null }[]
    >(`/api/lines/${line.id}/history`);
    expect(reply.status).toBe(200);
    expect(reply.body.map((e) => e.action)).toEqual([
      "line.add",
      "line.update",
      "line.verify",
      "line.retire",
      "line.restore",
    ]);
    expect(reply.body.every((e) => e.releaseNumber === 3)).toBe(true);
  });
});

let cachedLeadId: string | undefined;
async function leadId(): Promise<string> {
  cachedLeadId ??= (await lead.get<{ id: string }>("/api/me")).body.id;
  return cachedLeadId;
}
