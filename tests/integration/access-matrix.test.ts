// Every API route so far × {anonymous, chemist, supervisor, lab lead, member of another team}
// with the status each must get. Outsiders get 404 for another team's resources, never 403.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  ApiClient,
  type ApiReply,
  type ErrorBody,
  type RequestOptions,
} from "./support/http-client";
import {
  ARC_AND_SPARK,
  DEMO,
  FLAME_SCREENING,
  createAccountThroughInvitation,
  signInDemo,
  signedIn,
  strongPassword,
  teamIdOf,
  uniqueEmail,
} from "./support/accounts";
import { OUTSIDER, ensureOutsider } from "./support/outsider";
import { closeDb, userIdByEmail } from "./support/database";

const PRINCIPALS = ["anonymous", "chemist", "supervisor", "labLead", "outsider"] as const;
type Principal = (typeof PRINCIPALS)[number];

interface Context {
  flameTeamId: string;
  arcTeamId: string;
  outsiderTeamId: string;
  /** A client for the principal: a shared signed-in one, or a fresh one when the route signs out. */
  client(principal: Principal, fresh?: boolean): Promise<ApiClient>;
}

interface RouteCase {
  route: string;
  method: "GET" | "POST" | "PATCH" | "DELETE";
  /** The path, and the body for POST and PATCH; may prepare data first (e.g. a token to revoke). */
  request(ctx: Context): Promise<{ path: string; json?: unknown }>;
  expected: Record<Principal, number>;
  /** Routes that sign the client out get a fresh client per row. */
  fresh?: boolean;
  /** Undo what a successful call created, so rows do not pile up. */
  cleanup?(client: ApiClient, reply: ApiReply): Promise<void>;
}

const all = (status: number): Record<Principal, number> => ({
  anonymous: status,
  chemist: status,
  supervisor: status,
  labLead: status,
  outsider: status,
});
const signedInOnly = (status: number): Record<Principal, number> => ({
  ...all(status),
  anonymous: 401,
});

const CASES: RouteCase[] = [
  {
    route: "GET /api/me",
    method: "GET",
    request: async () => ({ path: "/api/me" }),
    expected: signedInOnly(200),
  },
  {
    route: "GET /api/teams",
    method: "GET",
    request: async () => ({ path: "/api/teams" }),
    expected: signedInOnly(200),
  },
  {
    route: "GET /api/tokens",
    method: "GET",
    request: async () => ({ path: "/api/tokens" }),
    expected: signedInOnly(200),
  },
  {
    route: "GET /api/audit/verify",
    method: "GET",
    request: async (ctx) => ({ path: `/api/audit/verify?teamId=${ctx.flameTeamId}` }),
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 200, outsider: 404 },
  },
  {
    route: "POST /api/tokens",
    method: "POST",
    request: async () => ({ path: "/api/tokens", json: { name: "matrix" } }),
    expected: signedInOnly(201),
    cleanup: async (client, reply) => {
      const { id } = reply.body as { id: string };
      expect((await client.delete(`/api/tokens/${id}`)).status).toBe(204);
    },
  },
  {
    route: "DELETE /api/tokens/:id (the chemist's token)",
    method: "DELETE",
    request: async (ctx) => {
      const owner = await ctx.client("chemist");
      const created = await owner.post<{ id: string }>("/api/tokens", { name: "to revoke" });
      return { path: `/api/tokens/${created.body.id}` };
    },
    expected: { anonymous: 401, chemist: 204, supervisor: 404, labLead: 404, outsider: 404 },
  },
  {
    route: "POST /api/invitations into Flame Screening",
    method: "POST",
    request: async (ctx) => ({
      path: "/api/invitations",
      json: { teamId: ctx.flameTeamId, email: uniqueEmail("matrix"), role: "chemist" },
    }),
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 201, outsider: 404 },
  },
  {
    route: "POST /api/invitations into Arc and Spark Bench (the lead is a supervisor there)",
    method: "POST",
    request: async (ctx) => ({
      path: "/api/invitations",
      json: { teamId: ctx.arcTeamId, email: uniqueEmail("matrix"), role: "chemist" },
    }),
    expected: { anonymous: 401, chemist: 404, supervisor: 404, labLead: 403, outsider: 404 },
  },
  {
    route: "POST /api/invitations into the outsider's team",
    method: "POST",
    request: async (ctx) => ({
      path: "/api/invitations",
      json: { teamId: ctx.outsiderTeamId, email: uniqueEmail("matrix"), role: "chemist" },
    }),
    expected: { anonymous: 401, chemist: 404, supervisor: 404, labLead: 404, outsider: 201 },
  },
  {
    route: "GET /api/teams/:id/members (Flame Screening)",
    method: "GET",
    request: async (ctx) => ({ path: `/api/teams/${ctx.flameTeamId}/members` }),
    expected: { anonymous: 401, chemist: 200, supervisor: 200, labLead: 200, outsider: 404 },
  },
  {
    route: "GET /api/teams/:id/invitations (Flame Screening)",
    method: "GET",
    request: async (ctx) => ({ path: `/api/teams/${ctx.flameTeamId}/invitations` }),
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 200, outsider: 404 },
  },
  {
    route: "PATCH /api/teams/:id/members/:userId (the demo chemist, to the role they have)",
    method: "PATCH",
    request: async (ctx) => ({
      path: `/api/teams/${ctx.flameTeamId}/members/${await userIdByEmail(DEMO.chemist.email)}`,
      json: { role: "chemist" },
    }),
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 200, outsider: 404 },
  },
  {
    route: "DELETE /api/teams/:id/members/:userId (a new member of Flame Screening)",
    method: "DELETE",
    request: async (ctx) => {
      const person = await createAccountThroughInvitation(await ctx.client("labLead"), {
        label: "matrix-remove",
      });
      return { path: `/api/teams/${ctx.flameTeamId}/members/${person.userId}` };
    },
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 204, outsider: 404 },
  },
  {
    route: "POST /api/invitations/:id/resend (an invitation into Flame Screening)",
    method: "POST",
    request: async (ctx) => ({
      path: `/api/invitations/${await matrixInvitationId(ctx)}/resend`,
    }),
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 200, outsider: 404 },
  },
  {
    route: "DELETE /api/invitations/:id (an invitation into Flame Screening)",
    method: "DELETE",
    request: async (ctx) => ({ path: `/api/invitations/${await matrixInvitationId(ctx)}` }),
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 204, outsider: 404 },
  },
  {
    route: "POST /api/invitations/accept with an unknown token",
    method: "POST",
    request: async () => ({
      path: "/api/invitations/accept",
      json: { token: "no-such-invitation-token", name: "X", password: strongPassword() },
    }),
    expected: all(400),
  },
  {
    route: "POST /api/password-reset",
    method: "POST",
    request: async () => ({
      path: "/api/password-reset",
      json: { email: uniqueEmail("matrix-reset") },
    }),
    expected: all(202),
  },
  {
    route: "POST /api/password-reset/confirm with an unknown token",
    method: "POST",
    request: async () => ({
      path: "/api/password-reset/confirm",
      json: { token: "no-such-reset-token", password: strongPassword() },
    }),
    expected: all(400),
  },
  {
    route: "POST /api/password with a wrong current password",
    method: "POST",
    request: async () => ({
      path: "/api/password",
      json: { currentPassword: "not the current one", newPassword: strongPassword() },
    }),
    expected: signedInOnly(400),
  },
  {
    route: "PATCH /api/instruments/:id (a Flame Screening instrument, at its current version)",
    method: "PATCH",
    request: async (ctx) => {
      const lead = await ctx.client("labLead");
      const id = await matrixInstrumentId(lead, ctx.flameTeamId);
      const current = await lead.get<Record<string, unknown>>(`/api/instruments/${id}`);
      const { name, dispersion, pixels, nominalMinNm, nominalMaxNm, resolutionNm, version } =
        current.body;
      const json = {
        name,
        dispersion,
        pixels,
        nominalMinNm,
        nominalMaxNm,
        resolutionNm: Number(resolutionNm) + 0.1,
        version,
      };
      return { path: `/api/instruments/${id}`, json };
    },
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 200, outsider: 404 },
  },
  {
    route: "GET /api/mail",
    method: "GET",
    request: async () => ({ path: "/api/mail" }),
    // The outsider is a lab lead (of their own team), and lab leads read the fake mailbox.
    expected: { anonymous: 401, chemist: 403, supervisor: 403, labLead: 200, outsider: 200 },
  },
  {
    route: "DELETE /api/session",
    method: "DELETE",
    request: async () => ({ path: "/api/session" }),
    expected: all(204),
    fresh: true,
  },
];

/** A fresh invitation into Flame Screening by the demo lab lead, for one row. */
async function matrixInvitationId(ctx: Context): Promise<string> {
  const lead = await ctx.client("labLead");
  const reply = await lead.post<{ id: string }>("/api/invitations", {
    teamId: ctx.flameTeamId,
    email: uniqueEmail("matrix-invitation"),
    role: "chemist",
  });
  expect(reply.status, JSON.stringify(reply.body)).toBe(201);
  return reply.body.id;
}

let matrixInstrument: Promise<string> | undefined;

/** One instrument for the matrix's edit rows, made by the lab lead on first use (instruments are never deleted). */
function matrixInstrumentId(lead: ApiClient, teamId: string): Promise<string> {
  matrixInstrument ??= lead
    .post<{ id: string }>("/api/instruments", {
      teamId,
      name: `matrix bench ${Date.now().toString(36)}`,
      dispersion: "grating",
      pixels: 2048,
      nominalMinNm: 350,
      nominalMaxNm: 900,
      resolutionNm: 1,
    })
    .then((reply) => {
      expect(reply.status, JSON.stringify(reply.body)).toBe(201);
      return reply.body.id;
    });
  return matrixInstrument;
}

const CODE_FOR: Record<number, string> = {
  401: "unauthenticated",
  403: "forbidden",
  404: "not_found",
  400: "validation",
};

const shared = new Map<Principal, ApiClient>();
let ctx: Context;

async function signInAs(principal: Principal): Promise<ApiClient> {
  if (principal === "anonymous") return new ApiClient();
  if (principal === "outsider") return signedIn(OUTSIDER.email, OUTSIDER.password);
  return signInDemo(principal);
}

beforeAll(async () => {
  const outsider = await ensureOutsider();
  for (const principal of PRINCIPALS) shared.set(principal, await signInAs(principal));
  const lead = shared.get("labLead")!;
  ctx = {
    flameTeamId: await teamIdOf(lead, FLAME_SCREENING),
    arcTeamId: await teamIdOf(lead, ARC_AND_SPARK),
    outsiderTeamId: outsider.teamId,
    client: async (principal, fresh) => (fresh ? signInAs(principal) : shared.get(principal)!),
  };
});

afterAll(closeDb);

const ROWS = CASES.flatMap((c) =>
  PRINCIPALS.map((principal) => ({ ...c, principal, status: c.expected[principal] })),
);

describe("API access matrix", () => {
  it.each(ROWS)("$route as $principal → $status", async (row) => {
    const client = await ctx.client(row.principal, row.fresh);
    const { path, json } = await row.request(ctx);
    const options: RequestOptions = json === undefined ? {} : { json };
    const reply = await client.request<ErrorBody>(row.method, path, options);
    expect(reply.status, JSON.stringify(reply.body)).toBe(row.status);
    if (CODE_FOR[row.status]) expect(reply.body.error.code).toBe(CODE_FOR[row.status]);
    if (reply.status < 300) await row.cleanup?.(client, reply);
  });

  it("still has every shared client signed in after the matrix (no row signed one out by accident)", async () => {
    for (const principal of PRINCIPALS.filter((p) => p !== "anonymous")) {
      expect((await shared.get(principal)!.get("/api/me")).status, principal).toBe(200);
    }
  });
});
