// Reading the audit trail through GET /api/audit: each filter narrows to the events it names, whole
// UTC days are inclusive at both ends, the cursor hands out every event exactly once, other teams
// answer 404, a chemist (cookie or Bearer token) reads their team's trail, an edit carries its before
// and after, a record's trail includes the events that belong to it, and the CSV parses back with
// RFC 4180 quoting and the formula guard. Events are made through the API by a fresh lab lead (so
// nothing else in the suite can be counted by mistake); line edits happen in the outsider's own team,
// away from the demo team's draft that other tests publish.
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, type ErrorBody } from "./support/http-client";
import {
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  teamIdOf,
  type FreshAccount,
} from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { closeDb, db } from "./support/database";
import type { AuditEventRecord } from "@/lib/services/audit";

type AuditEvent = AuditEventRecord;
interface AuditPage {
  events: AuditEvent[];
  nextCursor: string | null;
}
interface Line {
  id: string;
  lineKey: string;
  version: number;
}

const suffix = Date.now().toString(36);
/** A reason a spreadsheet would run as a formula, with a comma, quotes and a line break in it. */
const TRICKY_REASON = `=1+2 corrected, "as read"\nfrom the lamp sheet ${suffix}`;
const TRICKY_NAME = `Bench "Q", left ${suffix}`;

let lead: ApiClient;
let fresh: FreshAccount;
let freshLead: ApiClient;
let chemist: ApiClient;
let outsider: ApiClient;
let teamId: string;
let outsiderTeamId: string;
const instrumentIds: string[] = [];
const notebookIds: string[] = [];
let draftId: string;
let line: Line;

async function trail(client: ApiClient, query: Record<string, string>): Promise<AuditPage> {
  const reply = await client.get<AuditPage>(`/api/audit?${new URLSearchParams(query)}`);
  expect(reply.status, JSON.stringify(reply.body)).toBe(200);
  return reply.body;
}

/** Every page of a query, following nextCursor. */
async function allPages(
  client: ApiClient,
  query: Record<string, string>,
): Promise<{ events: AuditEvent[]; pages: number }> {
  const events: AuditEvent[] = [];
  let cursor: string | null = null;
  let pages = 0;
  do {
    const page: AuditPage = await trail(client, cursor ? { ...query, cursor } : query);
    events.push(...page.events);
    cursor = page.nextCursor;
    pages++;
  } while (cursor && pages < 1000);
  return { events, pages };
}

async function createInstrument(name: string): Promise<string> {
  const reply = await freshLead.post<{ id: string }>("/api/instruments", {
    teamId,
    name,
    dispersion: "grating",
    pixels: 2048,
    nominalMinNm: 350,
    nominalMaxNm: 900,
    resolutionNm: 1,
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body.id;
}

async function createNotebook(title: string): Promise<string> {
  const reply = await freshLead.post<{ id: string }>("/api/notebooks", { teamId, title });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body.id;
}

beforeAll(async () => {
  lead = await signInDemo("labLead");
  chemist = await signInDemo("chemist");
  teamId = await teamIdOf(lead, FLAME_SCREENING);
  outsiderTeamId = (await ensureOutsider()).teamId;
  outsider = await signedIn(OUTSIDER.email, OUTSIDER.password);
  fresh = await createAccountThroughInvitation(lead, { label: "audit-trail", role: "lab_lead" });
  freshLead = await signedIn(fresh.email, fresh.password);
  instrumentIds.push(
    await createInstrument(TRICKY_NAME),
    await createInstrument(`Bench R ${suffix}`),
  );
  notebookIds.push(
    await createNotebook(`Audit notebook one ${suffix}`),
    await createNotebook(`Audit notebook two ${suffix}`),
  );

  // A line added and then corrected, in the outsider's own draft.
  const draft = await outsider.post<{ id: string }>("/api/releases/draft", {
    teamId: outsiderTeamId,
  });
  expect(draft.status, JSON.stringify(draft.body)).toBe(200);
  draftId = draft.body.id;
  const added = await outsider.post<Line>(`/api/releases/${draftId}/lines`, {
    line: {
      species: "Na I",
      airNm: 589.1 + (Date.now() % 1000) / 10_000,
      uncertaintyNm: 0.002,
      intensities: { flame: 100 },
      source: "Audit trail test row (from memory)",
    },
    reason: `Audit trail test ${suffix}`,
  });
  expect(added.status, JSON.stringify(added.body)).toBe(201);
  const edited = await outsider.request<Line>("PATCH", `/api/lines/${added.body.id}`, {
    json: {
      version: added.body.version,
      line: { uncertaintyNm: 0.005, intensities: { flame: 80, arc: 40 } },
      reason: TRICKY_REASON,
    },
  });
  expect(edited.status, JSON.stringify(edited.body)).toBe(200);
  line = edited.body;
});

afterAll(closeDb);

describe("filters", () => {
  it("by person: only that person's events in the team, all of them", async () => {
    const { events } = await trail(lead, { teamId, actorId: fresh.userId, limit: "200" });
    expect(events.every((e) => e.actorId === fresh.userId && e.teamId === teamId)).toBe(true);
    expect(events.map((e) => e.action).sort()).toEqual(
      [
        "instrument.create",
        "instrument.create",
        "membership.create",
        "notebook.create",
        "notebook.create",
        "user.create",
      ].sort(),
    );
    expect(events[0].actorName).toBe(fresh.name);
    expect(events[0].actorEmail).toBe(fresh.email);
  });

  it("by entity, and by entity and id", async () => {
    const instruments = await trail(lead, { teamId, actorId: fresh.userId, entity: "instrument" });
    expect(instruments.events.map((e) => e.entityId).sort()).toEqual([...instrumentIds].sort());
    const one = await trail(lead, { teamId, entity: "notebook", entityId: notebookIds[1] });
    expect(one.events).toHaveLength(1);
    expect(one.events[0]).toMatchObject({
      action: "notebook.create",
      entityId: notebookIds[1],
      actorId: fresh.userId,
    });
    expect((one.events[0].after as { title: string }).title).toBe(`Audit notebook two ${suffix}`);
  });

  it("by action: exact, or every action of a kind with a trailing dot", async () => {
    const exact = await trail(lead, { teamId, actorId: fresh.userId, action: "notebook.create" });
    expect(exact.events.map((e) => e.entityId).sort()).toEqual([...notebookIds].sort());
    const family = await trail(lead, { teamId, actorId: fresh.userId, action: "instrument." });
    expect(family.events.map((e) => e.action)).toEqual(["instrument.create", "instrument.create"]);
    // Without the dot it is an exact action, which no event has.
    expect(
      (await trail(lead, { teamId, actorId: fresh.userId, action: "instrument" })).events,
    ).toEqual([]);
    // LIKE wildcards in the filter are taken literally.
    expect(
      (await trail(lead, { teamId, actorId: fresh.userId, action: "instrument_create." })).events,
    ).toEqual([]);
  });

  it("by days: today's events are in from=today&to=today and not in the days around it", async () => {
    const query = { teamId, actorId: fresh.userId };
    const all = (await trail(lead, query)).events.length;
    // The server stamps the time; a test started just before midnight UTC could see two days.
    const days = [...new Set((await trail(lead, query)).events.map((e) => e.at.slice(0, 10)))];
    expect(days).toHaveLength(1);
    const [day] = days;
    expect((await trail(lead, { ...query, from: day, to: day })).events).toHaveLength(all);
    const dayBefore = new Date(Date.parse(`${day}T00:00:00Z`) - 86_400_000)
      .toISOString()
      .slice(0, 10);
    const dayAfter = new Date(Date.parse(`${day}T00:00:00Z`) + 86_400_000)
      .toISOString()
      .slice(0, 10);
    expect((await trail(lead, { ...query, to: dayBefore })).events).toEqual([]);
    expect((await trail(lead, { ...query, from: dayAfter })).events).toEqual([]);
  });

  it("by days: both ends are whole UTC days, inclusive, to the millisecond", async () => {
    // No API places an event at a chosen time, so these four are appended directly (INSERT is the
    // one thing the table allows), in the outsider's team under an action of their own.
    const action = `test.daybound_${suffix}`;
    const times = [
      "2020-02-29T23:59:59.999Z",
      "2020-03-01T00:00:00.000Z",
      "2020-03-01T23:59:59.999Z",
      "2020-03-02T00:00:00.000Z",
    ];
    for (const time of times) {
      await db().query(
        "INSERT INTO audit_events (team_id, action, entity, reason, created_at) VALUES ($1, $2, 'test', $3, $4::timestamptz)",
        [outsiderTeamId, action, time, time],
      );
    }
    const inDay = await trail(outsider, {
      teamId: outsiderTeamId,
      action,
      from: "2020-03-01",
      to: "2020-03-01",
    });
    expect(inDay.events.map((e) => e.at)).toEqual([
      "2020-03-01T23:59:59.999Z",
      "2020-03-01T00:00:00.000Z",
    ]);
    const fromOnly = await trail(outsider, { teamId: outsiderTeamId, action, from: "2020-03-02" });
    expect(fromOnly.events.map((e) => e.at)).toEqual(["2020-03-02T00:00:00.000Z"]);
    const toOnly = await trail(outsider, { teamId: outsiderTeamId, action, to: "2020-02-29" });
    expect(toOnly.events.map((e) => e.at)).toEqual(["2020-02-29T23:59:59.999Z"]);
  });

  it("answers bad filters with 400 and a message per field", async () => {
    const reply = await lead.get<ErrorBody>(
      `/api/audit?teamId=${teamId}&from=2024-02-30&limit=500&action=run%20create&cursor=abc&actorId=nobody`,
    );
    expect(reply.status).toBe(400);
    const fields = reply.body.error.fieldErrors ?? {};
    expect(Object.keys(fields).sort()).toEqual(["action", "actorId", "cursor", "from", "limit"]);
    expect(fields.from[0]).toMatch(/not a day/);
    expect(fields.limit[0]).toMatch(/at most 200/);
    const reversed = await lead.get<ErrorBody>(
      `/api/audit?teamId=${teamId}&from=2024-03-02&to=2024-03-01`,
    );
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fieldErrors?.to?.[0]).toMatch(/before the first/);
    const idAlone = await lead.get<ErrorBody>(
      `/api/audit?teamId=${teamId}&entityId=${notebookIds[0]}`,
    );
    expect(idAlone.status).toBe(400);
    expect(Object.keys(idAlone.body.error.fieldErrors ?? {})).toEqual(["entity"]);
  });
});

describe("paging", () => {
  it("hands out every event once, newest first, even when events are written between pages", async () => {
    const query = { teamId, actorId: fresh.userId, limit: "2" };
    const first = await trail(lead, query);
    expect(first.events).toHaveLength(2);
    expect(first.nextCursor).not.toBeNull();
    // A new event after the first page must not push an old one onto the next page twice.
    notebookIds.push(await createNotebook(`Audit notebook three ${suffix}`));
    const seen = [...first.events];
    let cursor = first.nextCursor;
    while (cursor) {
      const page = await trail(lead, { ...query, cursor });
      expect(page.events.length).toBeLessThanOrEqual(2);
      seen.push(...page.events);
      cursor = page.nextCursor;
    }
    const ids = seen.map((e) => BigInt(e.id));
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids.every((id, i) => i === 0 || id < ids[i - 1])).toBe(true);
    expect(seen).toHaveLength(6);
    const everything = await trail(lead, { teamId, actorId: fresh.userId, limit: "200" });
    expect(everything.nextCursor).toBeNull();
    // The whole trail now has the new notebook on top and, below it, exactly what the pages gave.
    expect(everything.events[0].entityId).toBe(notebookIds[2]);
    expect(everything.events.slice(1).map((e) => e.id)).toEqual(seen.map((e) => e.id));
  });
});

describe("who may read", () => {
  it("lets a chemist read their team's trail, with the cookie or a Bearer token", async () => {
    const asLead = await trail(lead, { teamId, actorId: fresh.userId });
    const asChemist = await trail(chemist, { teamId, actorId: fresh.userId });
    expect(asChemist.events.map((e) => e.id)).toEqual(asLead.events.map((e) => e.id));
    const token = await chemist.post<{ token: string }>("/api/tokens", {
      name: `audit reader ${suffix}`,
    });
    expect(token.status).toBe(201);
    const viaToken = await new ApiClient().get<AuditPage>(
      `/api/audit?teamId=${teamId}&actorId=${fresh.userId}`,
      {
        bearer: token.body.token,
      },
    );
    expect(viaToken.status).toBe(200);
    expect(viaToken.body.events.map((e) => e.id)).toEqual(asLead.events.map((e) => e.id));
  });

  it("answers 404 for another team's trail, its CSV and an unknown team, and 401 without sign-in", async () => {
    for (const path of [
      `/api/audit?teamId=${outsiderTeamId}`,
      `/api/audit?teamId=${outsiderTeamId}&format=csv`,
      `/api/audit?teamId=00000000-0000-4000-8000-000000000000`,
    ]) {
      expect((await lead.get(path)).status, path).toBe(404);
    }
    expect((await outsider.get(`/api/audit?teamId=${teamId}`)).status).toBe(404);
    expect(
      (await outsider.get(`/api/audit?teamId=${teamId}&entity=notebook&entityId=${notebookIds[0]}`))
        .status,
    ).toBe(404);
    expect((await new ApiClient().get(`/api/audit?teamId=${teamId}`)).status).toBe(401);
    const supervisor = await signInDemo("supervisor");
    expect((await supervisor.get(`/api/audit?teamId=${teamId}`)).status).toBe(200);
  });
});

describe("before and after", () => {
  it("shows an edit's before and after and the fields it changed", async () => {
    const { events } = await trail(outsider, {
      teamId: outsiderTeamId,
      entity: "line",
      entityId: line.lineKey,
    });
    expect(events.map((e) => e.action)).toEqual(["line.update", "line.add"]);
    const [update, add] = events;
    expect(update.reason).toBe(TRICKY_REASON);
    expect(update.before).toMatchObject({ releaseId: draftId, uncertaintyNm: 0.002 });
    expect(update.after).toMatchObject({ releaseId: draftId, uncertaintyNm: 0.005 });
    const changed = Object.fromEntries(update.changes.map((c) => [c.path, c]));
    expect(changed.uncertaintyNm).toMatchObject({ kind: "changed", before: 0.002, after: 0.005 });
    // A nested change: the flame intensity changed and an arc intensity appeared.
    expect(changed["intensities.flame"]).toMatchObject({ kind: "changed", before: 100, after: 80 });
    expect(changed["intensities.arc"]).toMatchObject({ kind: "added", after: 40 });
    expect(changed.releaseId).toBeUndefined();
    // A creation has only its after, so nothing to compare.
    expect(add.before).toBeNull();
    expect(add.changes).toEqual([]);
  });

  it("gives a line-table release's trail its own events and the line edits made in it", async () => {
    const { events } = await trail(outsider, {
      teamId: outsiderTeamId,
      entity: "line_release",
      entityId: draftId,
    });
    const actions = events.map((e) => e.action);
    expect(actions).toContain("line_release.open_draft");
    expect(
      events.filter((e) => e.entity === "line" && e.entityId === line.lineKey).map((e) => e.action),
    ).toEqual(["line.update", "line.add"]);
    expect(
      events.every(
        (e) => e.entityId === draftId || (e.entity === "line" && e.teamId === outsiderTeamId),
      ),
    ).toBe(true);
  });
});

describe("CSV export", () => {
  it("downloads every matching event, quoted per RFC 4180 and guarded against formulas", async () => {
    const reply = await fetch(
      `${process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100"}/api/audit?${new URLSearchParams(
        {
          teamId: outsiderTeamId,
          entity: "line",
          entityId: line.lineKey,
          format: "csv",
        },
      )}`,
      {
        headers: {
          cookie: `emberline_session=${outsider.cookie("emberline_session")}`,
          "x-forwarded-for": outsider.address,
        },
      },
    );
    expect(reply.status).toBe(200);
    expect(reply.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(reply.headers.get("content-disposition")).toMatch(
      new RegExp(
        `^attachment; filename="emberline-audit-outsider-test-bench-\\d{4}-\\d{2}-\\d{2}-filtered\\.csv"$`,
      ),
    );
    const text = await reply.text();
    // Comment lines first: whose trail, which cut, and that a copy proves nothing by itself.
    const [first, second, header] = text.split("\r\n");
    expect(first).toMatch(
      new RegExp(
        `^# Emberline audit trail of team ${outsiderTeamId}: events up to id \\d+ - newest first \\(filtered\\)$`,
      ),
    );
    expect(second).toContain(`GET /api/audit/verify?teamId=${outsiderTeamId} checks it`);
    expect(header).toBe(
      "time_utc,actor_name,actor_email,action,entity,entity_id,reason,changed_fields,before_json,after_json",
    );
    // The reason's quotes are doubled inside a quoted field, behind the apostrophe of the formula guard.
    expect(text).toContain(`"'=1+2 corrected, ""as read""\nfrom the lamp sheet ${suffix}"`);
    const parsed = Papa.parse<Record<string, string>>(text, {
      header: true,
      skipEmptyLines: true,
      comments: "#",
    });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data.map((r) => r.action)).toEqual(["line.update", "line.add"]);
    const [update] = parsed.data;
    expect(update.reason).toBe(`'${TRICKY_REASON}`);
    expect(update.actor_email).toBe(OUTSIDER.email);
    expect(update.entity_id).toBe(line.lineKey);
    expect(update.time_utc).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
    expect(update.changed_fields.split("; ")).toEqual(
      expect.arrayContaining(["uncertaintyNm", "intensities.flame", "intensities.arc"]),
    );
    expect(JSON.parse(update.before_json)).toMatchObject({
      releaseId: draftId,
      uncertaintyNm: 0.002,
    });
    expect(JSON.parse(update.after_json)).toMatchObject({
      releaseId: draftId,
      uncertaintyNm: 0.005,
    });
  });

  it("holds the same events as the JSON pages, and keeps a name with quotes and commas in one cell", async () => {
    const query = { teamId, actorId: fresh.userId };
    const { events } = await allPages(lead, { ...query, limit: "1" });
    const reply = await fetch(
      `${process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100"}/api/audit?${new URLSearchParams({ ...query, format: "csv" })}`,
      {
        headers: {
          cookie: `emberline_session=${lead.cookie("emberline_session")}`,
          "x-forwarded-for": lead.address,
        },
      },
    );
    expect(reply.status).toBe(200);
    const parsed = Papa.parse<Record<string, string>>(await reply.text(), {
      header: true,
      skipEmptyLines: true,
      comments: "#",
    });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data.map((r) => `${r.action} ${r.entity_id}`)).toEqual(
      events.map((e) => `${e.action} ${e.entityId}`),
    );
    const tricky = parsed.data.find((r) => r.entity_id === instrumentIds[0]);
    expect(JSON.parse(tricky!.after_json).name).toBe(TRICKY_NAME);
  });

  it("writes just the comments and the header when nothing matches", async () => {
    const reply = await fetch(
      `${process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100"}/api/audit?teamId=${teamId}&from=2001-01-01&to=2001-01-02&format=csv`,
      {
        headers: {
          cookie: `emberline_session=${lead.cookie("emberline_session")}`,
          "x-forwarded-for": lead.address,
        },
      },
    );
    expect(reply.status).toBe(200);
    expect((await reply.text()).replace(/^#.*\r\n/gm, "")).toBe(
      "time_utc,actor_name,actor_email,action,entity,entity_id,reason,changed_fields,before_json,after_json\r\n",
    );
  });
});

describe("nothing edits or deletes an event", () => {
  it.each([
    [
      "UPDATE",
      "UPDATE audit_events SET reason = 'rewritten' WHERE team_id = $1 AND action = 'line.update'",
    ],
    ["DELETE", "DELETE FROM audit_events WHERE team_id = $1 AND action = 'line.update'"],
  ])("the database refuses %s of the edit's event", async (operation, sql) => {
    await expect(db().query(sql, [outsiderTeamId])).rejects.toThrow(
      `audit_events is append-only: ${operation} is not allowed`,
    );
    const { events } = await trail(outsider, {
      teamId: outsiderTeamId,
      entity: "line",
      entityId: line.lineKey,
    });
    expect(events[0].reason).toBe(TRICKY_REASON);
  });

  it("offers no way to change or remove an event over HTTP", async () => {
    for (const method of ["PUT", "PATCH", "DELETE", "POST"]) {
      const reply = await lead.request(method, `/api/audit?teamId=${teamId}`, { json: {} });
      expect(reply.status, method).toBe(405);
    }
  });
});
