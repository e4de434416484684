// Bad request bodies get 400 with a message per field; cookie mutations from a foreign Origin get 403.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { APP_URL, ApiClient, type ErrorBody } from "./support/http-client";
import {
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  strongPassword,
  teamIdOf,
  uniqueEmail,
  type FreshAccount,
} from "./support/accounts";
import { auditMark, auditEventsSince, closeDb, db } from "./support/database";

let lead: ApiClient;
let flameTeamId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  flameTeamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(closeDb);

interface BadBody {
  route: string;
  path: string;
  /** Signed in as the lab lead (routes that need a person) or anonymous. */
  signedIn: boolean;
  body: unknown;
  fieldErrors: Record<string, string[]>;
}

const BAD_BODIES: BadBody[] = [
  {
    route: "POST /api/session, empty object",
    path: "/api/session",
    signedIn: false,
    body: {},
    fieldErrors: { email: ["Enter an e-mail address."], password: ["Enter a password."] },
  },
  {
    route: "POST /api/session, not an address and an empty password",
    path: "/api/session",
    signedIn: false,
    body: { email: "chem at demo", password: "" },
    fieldErrors: { email: ["Enter a valid e-mail address."], password: ["Enter a password."] },
  },
  {
    route: "POST /api/tokens, blank name",
    path: "/api/tokens",
    signedIn: true,
    body: { name: "   " },
    fieldErrors: { name: ["Name the token."] },
  },
  {
    route: "POST /api/tokens, name too long",
    path: "/api/tokens",
    signedIn: true,
    body: { name: "x".repeat(81) },
    fieldErrors: { name: ["Use at most 80 characters."] },
  },
  {
    route: "POST /api/invitations, every field wrong",
    path: "/api/invitations",
    signedIn: true,
    body: { teamId: "flame", email: "nobody", role: "boss" },
    fieldErrors: {
      teamId: ["Choose a team."],
      email: ["Enter a valid e-mail address."],
      role: ["Choose a role."],
    },
  },
  {
    route: "POST /api/password-reset, not an address",
    path: "/api/password-reset",
    signedIn: false,
    body: { email: "reset-me" },
    fieldErrors: { email: ["Enter a valid e-mail address."] },
  },
  {
    route: "POST /api/password, both missing",
    path: "/api/password",
    signedIn: true,
    body: {},
    fieldErrors: { currentPassword: ["Enter a password."], newPassword: ["Enter a password."] },
  },
];

describe("bad bodies", () => {
  it.each(BAD_BODIES)("$route → 400 with per-field messages", async (bad) => {
    const client = bad.signedIn ? lead : new ApiClient();
    const reply = await client.post<ErrorBody>(bad.path, bad.body);
    expect(reply.status).toBe(400);
    expect(reply.body.error.code).toBe("validation");
    expect(reply.body.error.message).toBe("Some fields are not right.");
    expect(reply.body.error.fieldErrors).toEqual(bad.fieldErrors);
  });

  it.each([
    "/api/session",
    "/api/tokens",
    "/api/invitations",
    "/api/password-reset",
    "/api/password",
  ])("POST %s with a body that is not JSON → 400 that says so", async (path) => {
    const reply = await lead.request<ErrorBody>("POST", path, { rawBody: "{not json" });
    expect(reply.status).toBe(400);
    expect(reply.body.error).toMatchObject({
      code: "validation",
      message: "The request body must be JSON.",
    });
  });

  it("POST /api/invitations/accept and /api/password-reset/confirm name the token and password fields", async () => {
    for (const path of ["/api/invitations/accept", "/api/password-reset/confirm"]) {
      const reply = await new ApiClient().post<ErrorBody>(path, { token: "short", password: "" });
      expect(reply.status, path).toBe(400);
      expect(Object.keys(reply.body.error.fieldErrors ?? {}).sort(), path).toEqual([
        "password",
        "token",
      ]);
    }
  });

  it("never leaks a database error: a body of the wrong shape is a 400, not a 500", async () => {
    const reply = await lead.post<ErrorBody>("/api/invitations", [
      flameTeamId,
      "x@y.example",
      "chemist",
    ]);
    expect(reply.status).toBe(400);
    expect(JSON.stringify(reply.body)).not.toMatch(/sequelize|postgres|SELECT|stack/i);
  });
});

describe("cookie-authenticated mutations from a foreign Origin", () => {
  const FOREIGN = { origin: "https://evil.example" };
  // A lab lead of its own, so that the audit check below sees only this person's events even
  // when other test files sign the demo accounts in at the same time.
  let member: FreshAccount;
  let client: ApiClient;

  beforeAll(async () => {
    member = await createAccountThroughInvitation(lead, { label: "origin", role: "lab_lead" });
    client = await signedIn(member.email, member.password);
  });

  const CROSS_SITE: [string, string, () => unknown][] = [
    ["POST", "/api/session", () => ({ email: member.email, password: member.password })],
    ["POST", "/api/tokens", () => ({ name: "from elsewhere" })],
    [
      "POST",
      "/api/invitations",
      () => ({ teamId: flameTeamId, email: uniqueEmail("csrf"), role: "lab_lead" }),
    ],
    [
      "POST",
      "/api/password",
      () => ({ currentPassword: member.password, newPassword: strongPassword() }),
    ],
    ["POST", "/api/password-reset", () => ({ email: member.email })],
    ["DELETE", "/api/session", () => undefined],
    ["DELETE", "/api/tokens/00000000-0000-4000-8000-000000000000", () => undefined],
  ];

  it.each(CROSS_SITE)("%s %s → 403 and nothing happens", async (method, path, body) => {
    const mark = await auditMark();
    const reply = await client.request<ErrorBody>(method, path, { json: body(), headers: FOREIGN });
    expect(reply.status).toBe(403);
    expect(reply.body.error).toMatchObject({
      code: "forbidden",
      message: "Cross-site requests are not accepted.",
    });
    expect(reply.setCookies).toEqual([]);
    expect(await auditEventsSince(mark, { actorId: member.userId })).toEqual([]);
  });

  it("left the password, the tokens and the invitations as they were", async () => {
    await signedIn(member.email, member.password);
    const { rows } = await db().query(
      `SELECT (SELECT count(*)::int FROM access_tokens WHERE user_id = $1) AS tokens,
              (SELECT count(*)::int FROM invitations WHERE invited_by_id = $1) AS invitations`,
      [member.userId],
    );
    expect(rows[0]).toEqual({ tokens: 0, invitations: 0 });
  });

  it("keeps the person signed in after a refused cross-site sign-out", async () => {
    await client.request("DELETE", "/api/session", { headers: FOREIGN });
    expect((await client.get("/api/me")).status).toBe(200);
  });

  it("refuses an Origin that is not a URL (e.g. `null` from a sandboxed frame)", async () => {
    const reply = await client.post<ErrorBody>(
      "/api/tokens",
      { name: "sandboxed" },
      { headers: { origin: "null" } },
    );
    expect(reply.status).toBe(403);
    expect(reply.body.error.message).toBe("The request's Origin header is not valid.");
    const { rows } = await db().query(
      "SELECT count(*)::int AS n FROM access_tokens WHERE user_id = $1",
      [member.userId],
    );
    expect(rows[0].n).toBe(0);
  });

  it("accepts the app's own Origin", async () => {
    const reply = await client.post<{ id: string }>(
      "/api/tokens",
      { name: "same origin" },
      { headers: { origin: APP_URL } },
    );
    expect(reply.status).toBe(201);
    expect(
      (await client.delete(`/api/tokens/${reply.body.id}`, { headers: { origin: APP_URL } }))
        .status,
    ).toBe(204);
  });

  it("lets a GET through whatever the Origin (reads change nothing)", async () => {
    expect((await client.get("/api/me", { headers: FOREIGN })).status).toBe(200);
  });
});
