// Fuzzing every JSON route and every query string of the API with hostile input (fixed seed,
// tests/support/fast-check-seed.ts), as an anonymous visitor, a demo chemist and a demo lab lead:
// no answer is a 5xx, and a refused request leaves the row count of every table unchanged.
// Mutations only ever name ids that do not exist (odd ids and random UUIDs), so nothing of the demo
// teams can change; reads also get the demo team's real ids. Requests go to the loopback test server.
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  passwordChangeSchema,
  passwordResetRequestSchema,
  signInSchema,
  tokenCreateSchema,
} from "@/lib/validation/account-schemas";
import { FLAME_SCREENING, teamIdOf } from "./support/accounts";
import { closeDb } from "./support/database";
import type { ApiClient } from "./support/http-client";
import {
  escapable,
  expectNoServerError,
  hostileBody,
  hostileString,
  identities,
  IDENTITIES,
  type Identity,
  oddId,
  rowCounts,
} from "./support/fuzz";

interface JsonRoute {
  method: "POST" | "PATCH" | "DELETE";
  /** ":id" is replaced by an odd id. */
  path: string;
  fields: readonly string[];
  /**
   * Routes where a well-formed body would count a failed password or send mail: only bodies their
   * schema refuses are sent, so the fuzz never throttles or locks the demo accounts.
   */
  onlyInvalid?: { safeParse(value: unknown): { success: boolean } };
}

const JSON_ROUTES: JsonRoute[] = [
  {
    method: "POST",
    path: "/api/session",
    fields: ["email", "password"],
    onlyInvalid: signInSchema,
  },
  {
    method: "POST",
    path: "/api/password",
    fields: ["currentPassword", "newPassword"],
    onlyInvalid: passwordChangeSchema,
  },
  {
    method: "POST",
    path: "/api/password-reset",
    fields: ["email"],
    onlyInvalid: passwordResetRequestSchema,
  },
  { method: "POST", path: "/api/password-reset/confirm", fields: ["token", "password"] },
  { method: "POST", path: "/api/invitations", fields: ["teamId", "email", "role"] },
  { method: "POST", path: "/api/invitations/accept", fields: ["token", "name", "password"] },
  // Mutations of members and invitations only ever name odd ids (every ":id" is replaced).
  { method: "PATCH", path: "/api/teams/:id/members/:id", fields: ["role"] },
  { method: "DELETE", path: "/api/teams/:id/members/:id", fields: [] },
  { method: "POST", path: "/api/invitations/:id/resend", fields: [] },
  { method: "DELETE", path: "/api/invitations/:id", fields: [] },
  { method: "POST", path: "/api/tokens", fields: ["name"], onlyInvalid: tokenCreateSchema },
  { method: "DELETE", path: "/api/tokens/:id", fields: [] },
  { method: "POST", path: "/api/notebooks", fields: ["teamId", "title"] },
  { method: "PATCH", path: "/api/notebooks/:id", fields: ["title", "version"] },
  {
    method: "POST",
    path: "/api/instruments",
    fields: [
      "teamId",
      "name",
      "dispersion",
      "pixels",
      "nominalMinNm",
      "nominalMaxNm",
      "resolutionNm",
      "detectorMax",
      "glass",
      "apexDeg",
      "exportXUnit",
      "exportMedium",
    ],
  },
  {
    method: "PATCH",
    path: "/api/instruments/:id",
    fields: [
      "name",
      "dispersion",
      "pixels",
      "nominalMinNm",
      "nominalMaxNm",
      "version",
      "glass",
      "exportXUnit",
      "exportMedium",
    ],
  },
  {
    method: "POST",
    path: "/api/calibrations",
    fields: ["instrumentId", "spectrumId", "lamps", "model", "excluded", "added", "notes"],
  },
  {
    method: "POST",
    path: "/api/calibrations/preview",
    fields: ["instrumentId", "spectrumId", "lamps", "model", "excluded", "added"],
  },
  { method: "POST", path: "/api/calibrations/:id/evaluate", fields: ["pixels"] },
  {
    method: "POST",
    path: "/api/runs",
    fields: ["notebookId", "spectrumId", "calibrationId", "source", "settings", "notes"],
  },
  { method: "PATCH", path: "/api/runs/:id", fields: ["notes", "lockVersion"] },
  { method: "POST", path: "/api/runs/:id/overrides", fields: ["species", "verdict", "reason"] },
  {
    method: "POST",
    path: "/api/runs/:id/marks",
    fields: ["species", "lineId", "mark", "comment", "kind"],
  },
  { method: "POST", path: "/api/runs/:id/submit", fields: ["reviewerId"] },
  { method: "POST", path: "/api/runs/:id/review", fields: ["decision", "comment", "password"] },
  { method: "POST", path: "/api/runs/:id/amend", fields: [] },
  { method: "POST", path: "/api/runs/:id/rerun", fields: [] },
  { method: "POST", path: "/api/releases/draft", fields: ["teamId"] },
  { method: "POST", path: "/api/releases/:id/lines", fields: ["line", "reason"] },
  { method: "POST", path: "/api/releases/:id/publish", fields: ["notes"] },
  { method: "POST", path: "/api/releases/:id/import/preview", fields: ["csv"] },
  {
    method: "POST",
    path: "/api/releases/:id/import/apply",
    fields: ["csv", "fingerprint", "skipRejected", "reason"],
  },
  { method: "POST", path: "/api/releases/:id/reference-check/preview", fields: ["csv", "medium"] },
  {
    method: "POST",
    path: "/api/releases/:id/reference-check/apply",
    fields: ["csv", "medium", "fingerprint", "decisions", "reason"],
  },
  { method: "PATCH", path: "/api/lines/:id", fields: ["version", "line", "reason"] },
  { method: "POST", path: "/api/lines/:id/retire", fields: ["version", "reason"] },
  { method: "POST", path: "/api/lines/:id/restore", fields: ["version", "reason"] },
  { method: "POST", path: "/api/lines/:id/verify", fields: ["version", "reason"] },
];

interface QueryRoute {
  path: string;
  keys: readonly string[];
  /** The kind of real id that may stand for ":id" (reads only). */
  realId?: keyof RealIds;
}

const QUERY_ROUTES: QueryRoute[] = [
  {
    path: "/api/audit",
    keys: [
      "teamId",
      "actorId",
      "entity",
      "entityId",
      "action",
      "from",
      "to",
      "cursor",
      "limit",
      "format",
    ],
  },
  {
    path: "/api/lines",
    keys: [
      "teamId",
      "release",
      "minNm",
      "maxNm",
      "vacuum",
      "species",
      "element",
      "source",
      "flag",
      "verified",
      "sort",
      "page",
      "pageSize",
    ],
  },
  { path: "/api/notebooks", keys: ["teamId", "q"] },
  {
    path: "/api/notebooks/:id/runs",
    keys: ["status", "species", "instrumentId", "q"],
    realId: "notebook",
  },
  { path: "/api/notebooks/:id", keys: [], realId: "notebook" },
  { path: "/api/notebooks/:id/calls.csv", keys: [], realId: "notebook" },
  { path: "/api/spectra", keys: ["teamId", "instrumentId", "kind"] },
  { path: "/api/spectra/:id", keys: [], realId: "spectrum" },
  { path: "/api/instruments", keys: ["teamId"] },
  { path: "/api/instruments/:id", keys: [], realId: "instrument" },
  { path: "/api/calibrations", keys: ["instrumentId", "teamId"] },
  { path: "/api/calibrations/:id", keys: [], realId: "calibration" },
  { path: "/api/runs/:id", keys: [], realId: "run" },
  { path: "/api/runs/:id/history", keys: [], realId: "run" },
  { path: "/api/runs/:id/peaks.csv", keys: [], realId: "run" },
  { path: "/api/runs/:id/spectrum.jdx", keys: [], realId: "run" },
  { path: "/api/runs/:id/spectrum-even.jdx", keys: [], realId: "run" },
  // The PDF takes seconds of CPU: only odd ids here (the report tests render real ones).
  { path: "/api/runs/:id/report.pdf", keys: [] },
  { path: "/api/releases", keys: ["teamId"] },
  { path: "/api/releases/:id", keys: [], realId: "release" },
  { path: "/api/releases/:id/export", keys: [], realId: "release" },
  { path: "/api/releases/diff", keys: ["teamId", "from", "to"] },
  { path: "/api/lines/:id", keys: [] },
  { path: "/api/lines/:id/history", keys: [] },
  { path: "/api/review-queue", keys: ["teamId"] },
  { path: "/api/teams", keys: ["teamId"] },
  { path: "/api/teams/:id/members", keys: [], realId: "team" },
  { path: "/api/teams/:id/invitations", keys: [], realId: "team" },
  { path: "/api/me", keys: [] },
  { path: "/api/mail", keys: ["to", "limit"] },
  { path: "/api/tokens", keys: [] },
  { path: "/api/health", keys: [] },
];

interface RealIds {
  team: string;
  notebook: string;
  run: string;
  instrument: string;
  spectrum: string;
  calibration: string;
  release: string;
}

let clients: Record<Identity, ApiClient>;
let real: RealIds;
let cases = 0;
/** How often each status was answered, to show the cases reached validation, not only the sign-in wall. */
const statuses = new Map<number, number>();
const count = (status: number) => statuses.set(status, (statuses.get(status) ?? 0) + 1);

beforeAll(async () => {
  clients = await identities();
  const { chemist } = clients;
  const team = await teamIdOf(chemist, FLAME_SCREENING);
  const first = async <T extends { id: string }>(
    path: string,
    where: (row: T) => boolean = () => true,
  ) => (await chemist.get<T[]>(path)).body.find(where)?.id ?? "";
  const notebook = await first<{ id: string; runCount: number }>(
    `/api/notebooks?teamId=${team}`,
    (n) => n.runCount > 0,
  );
  const instruments = (await chemist.get<{ id: string }[]>(`/api/instruments?teamId=${team}`)).body;
  let calibration = "";
  for (const instrument of instruments) {
    calibration ||= await first(`/api/calibrations?instrumentId=${instrument.id}`);
  }
  real = {
    team,
    notebook,
    run: notebook ? await first(`/api/notebooks/${notebook}/runs`) : "",
    instrument: instruments[0]?.id ?? "",
    spectrum: await first(`/api/spectra?teamId=${team}`),
    calibration,
    release: await first(`/api/releases?teamId=${team}`),
  };
  expect(Object.values(real).every(Boolean), JSON.stringify(real)).toBe(true);
});

afterAll(async () => {
  await closeDb();
});

/** One query value: escaped hostile text, a raw odd escape, a real id of the demo team, or a huge number. */
const queryValue = fc.oneof(
  { arbitrary: hostileString.map((s) => encodeURIComponent(escapable(s))), weight: 4 },
  {
    arbitrary: fc.constantFrom(
      "%C0%AF",
      "%00",
      "%",
      "%ZZ",
      "%E0%A4%A",
      "9999-12-31",
      "0001-01-01",
      "1e999",
      "-1",
      "99999999999999999999",
    ),
    weight: 3,
  },
  {
    arbitrary: fc
      .constantFrom("team", "notebook", "instrument", "release")
      .map((k) => `@real:${k}`),
    weight: 1,
  },
);

function fillQuery(template: string): string {
  return template.replace(/@real:(\w+)/g, (_, key: keyof RealIds) => real[key]);
}

describe("fuzz: JSON routes", () => {
  it("1,300 hostile bodies: no 5xx, and no rows written by a refused request", async () => {
    const routeCase = fc
      .constantFrom(...JSON_ROUTES)
      .chain((route) =>
        fc.record({
          route: fc.constant(route),
          id: oddId,
          who: fc.constantFrom(...IDENTITIES),
          body: hostileBody(route.fields),
          contentType: fc.constantFrom(
            "application/json",
            "application/json",
            "application/json",
            "text/plain",
            "application/x-www-form-urlencoded",
          ),
        }),
      )
      .filter(
        ({ route, body }) =>
          !route.onlyInvalid || "raw" in body || !route.onlyInvalid.safeParse(body.json).success,
      );
    let before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(routeCase, async ({ route, id, who, body, contentType }) => {
        cases++;
        const path = route.path.replaceAll(":id", id);
        const rawBody = "raw" in body ? body.raw : JSON.stringify(body.json);
        const reply = await clients[who].request(route.method, path, {
          rawBody,
          headers: { "content-type": contentType },
        });
        count(reply.status);
        const what = `${who} ${route.method} ${path} ${rawBody.slice(0, 200)}`;
        expectNoServerError(reply.status, what);
        const after = await rowCounts();
        if (reply.status >= 400)
          expect(after, `${what} was refused (${reply.status}) but wrote rows`).toEqual(before);
        before = after;
      }),
      { numRuns: 1300, endOnFailure: true },
    );
  }, 240_000);
});

describe("fuzz: query strings and ids of every GET route", () => {
  it("600 hostile query strings and ids: no 5xx, and reads write nothing", async () => {
    const queryCase = fc.constantFrom(...QUERY_ROUTES).chain((route) =>
      fc.record({
        route: fc.constant(route),
        id: route.realId ? fc.oneof(oddId, fc.constant(`@real:${route.realId}`)) : oddId,
        who: fc.constantFrom(...IDENTITIES),
        pairs: fc.array(
          fc.tuple(
            fc.oneof(
              fc.constantFrom(...route.keys, "teamId"),
              hostileString.map((s) => encodeURIComponent(escapable(s))),
            ),
            queryValue,
          ),
          {
            maxLength: 5,
          },
        ),
      }),
    );
    const before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(queryCase, async ({ route, id, who, pairs }) => {
        cases++;
        const query = pairs.map(([key, value]) => `${key}=${fillQuery(value)}`).join("&");
        const path = `${route.path.replace(":id", fillQuery(id))}${query ? `?${query}` : ""}`;
        const reply = await clients[who].get(path);
        count(reply.status);
        expectNoServerError(reply.status, `${who} GET ${path}`);
      }),
      { numRuns: 600, endOnFailure: true },
    );
    const after = await rowCounts();
    // Reads write nothing (sign-ins were made before the first count).
    expect(after).toEqual(before);
  }, 240_000);

  it("ran at least 1,900 cases over the JSON routes and query strings together, most of them past sign-in", () => {
    expect(cases).toBeGreaterThanOrEqual(1900);
    // Every kind of answer was reached: success, bad input, anonymous, missing records.
    for (const status of [200, 400, 401, 404])
      expect(statuses.get(status) ?? 0, `answers ${status}`).toBeGreaterThan(0);
    expect(statuses.get(401) ?? 0).toBeLessThan(cases / 2);
  });
});
