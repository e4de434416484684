// Every mutation writes its audit event, failed ones write none, and the database itself keeps
// audit_events append-only. Events are looked up by actor, so other files running at the same
// time cannot disturb the counts.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient } from "./support/http-client";
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
import { extractLinkToken, waitForMail } from "./support/mailbox";
import {
  auditEventsSince,
  auditMark,
  closeDb,
  db,
  userIdByEmail,
  type AuditRow,
} from "./support/database";

let lead: ApiClient;
let leadId: string;
let flameTeamId: string;

beforeAll(async () => {
  lead = await signInDemo("labLead");
  leadId = (await lead.get<{ id: string }>("/api/me")).body.id;
  flameTeamId = await teamIdOf(lead, FLAME_SCREENING);
});

afterAll(closeDb);

interface Expected {
  action: string;
  entity: string;
  /** The entity id the event must name, when the test knows it. */
  entityId?: string;
  teamId?: string | null;
}

interface MutationCase {
  mutation: string;
  /** Performs the mutation; returns who acted and the events that must follow. */
  perform(): Promise<{ actorId: string; events: Expected[] }>;
}

async function freshPerson(label: string): Promise<FreshAccount> {
  return createAccountThroughInvitation(lead, { label });
}

const MUTATIONS: MutationCase[] = [
  {
    mutation: "POST /api/session (sign-in)",
    perform: async () => {
      const person = await freshPerson("audit-signin");
      await signedIn(person.email, person.password);
      return {
        actorId: person.userId,
        events: [{ action: "session.create", entity: "user", entityId: person.userId }],
      };
    },
  },
  {
    mutation: "DELETE /api/session (sign-out)",
    perform: async () => {
      const person = await freshPerson("audit-signout");
      const client = await signedIn(person.email, person.password);
      const mark = await auditMark();
      expect((await client.delete("/api/session")).status).toBe(204);
      const events = await auditEventsSince(mark, { actorId: person.userId });
      expect(events.map((e) => e.action)).toEqual(["session.delete"]);
      return {
        actorId: person.userId,
        events: [{ action: "session.delete", entity: "user", entityId: person.userId }],
      };
    },
  },
  {
    mutation: "POST /api/tokens",
    perform: async () => {
      const person = await freshPerson("audit-token");
      const client = await signedIn(person.email, person.password);
      const created = await client.post<{ id: string }>("/api/tokens", { name: "audited" });
      expect(created.status).toBe(201);
      return {
        actorId: person.userId,
        events: [{ action: "token.create", entity: "access_token", entityId: created.body.id }],
      };
    },
  },
  {
    mutation: "DELETE /api/tokens/:id",
    perform: async () => {
      const person = await freshPerson("audit-revoke");
      const client = await signedIn(person.email, person.password);
      const created = await client.post<{ id: string }>("/api/tokens", { name: "to revoke" });
      const mark = await auditMark();
      expect((await client.delete(`/api/tokens/${created.body.id}`)).status).toBe(204);
      const events = await auditEventsSince(mark, { actorId: person.userId });
      expect(events.map((e) => e.action)).toEqual(["token.revoke"]);
      return {
        actorId: person.userId,
        events: [{ action: "token.revoke", entity: "access_token", entityId: created.body.id }],
      };
    },
  },
  {
    mutation: "POST /api/invitations",
    perform: async () => {
      const invited = await lead.post<{ id: string }>("/api/invitations", {
        teamId: flameTeamId,
        email: uniqueEmail("audit-invite"),
        role: "chemist",
      });
      expect(invited.status).toBe(201);
      return {
        actorId: leadId,
        events: [
          {
            action: "invitation.create",
            entity: "invitation",
            entityId: invited.body.id,
            teamId: flameTeamId,
          },
        ],
      };
    },
  },
  {
    mutation: "POST /api/invitations/accept (new person)",
    perform: async () => {
      const email = uniqueEmail("audit-accept");
      await lead.post("/api/invitations", { teamId: flameTeamId, email, role: "supervisor" });
      const token = extractLinkToken(
        (await waitForMail({ to: email, subject: /invited/ })).text,
        "/invitations/",
      );
      const accepted = await new ApiClient().post<{ userId: string }>("/api/invitations/accept", {
        token,
        name: "Audit Newcomer",
        password: strongPassword(),
      });
      expect(accepted.status).toBe(201);
      const userId = accepted.body.userId;
      return {
        actorId: userId,
        events: [
          { action: "user.create", entity: "user", entityId: userId, teamId: flameTeamId },
          { action: "membership.create", entity: "membership", teamId: flameTeamId },
        ],
      };
    },
  },
  {
    mutation: "POST /api/password-reset",
    perform: async () => {
      const person = await freshPerson("audit-reset-request");
      expect(
        (await new ApiClient().post("/api/password-reset", { email: person.email })).status,
      ).toBe(202);
      // The reset mail (and its audit event) is made in the background after the answer.
      await waitForMail({ to: person.email, subject: /Reset your Emberline password/ });
      return {
        actorId: person.userId,
        events: [{ action: "password.resetRequest", entity: "user", entityId: person.userId }],
      };
    },
  },
  {
    mutation: "POST /api/password-reset/confirm",
    perform: async () => {
      const person = await freshPerson("audit-reset");
      await new ApiClient().post("/api/password-reset", { email: person.email });
      const mail = await waitForMail({
        to: person.email,
        subject: /Reset your Emberline password/,
      });
      const token = extractLinkToken(mail.text, "/reset-password/");
      const mark = await auditMark();
      const reply = await new ApiClient().post("/api/password-reset/confirm", {
        token,
        password: strongPassword(),
      });
      expect(reply.status).toBe(200);
      expect(
        (await auditEventsSince(mark, { actorId: person.userId })).map((e) => e.action),
      ).toEqual(["password.reset"]);
      return {
        actorId: person.userId,
        events: [{ action: "password.reset", entity: "user", entityId: person.userId }],
      };
    },
  },
  {
    mutation: "POST /api/password",
    perform: async () => {
      const person = await freshPerson("audit-change");
      const client = await signedIn(person.email, person.password);
      const reply = await client.post("/api/password", {
        currentPassword: person.password,
        newPassword: strongPassword(),
      });
      expect(reply.status).toBe(200);
      return {
        actorId: person.userId,
        events: [{ action: "password.change", entity: "user", entityId: person.userId }],
      };
    },
  },
];

describe("audit events for every mutation", () => {
  it.each(MUTATIONS)("$mutation writes its event", async ({ perform }) => {
    const mark = await auditMark();
    const started = new Date();
    const { actorId, events: expected } = await perform();
    for (const want of expected) {
      const rows: AuditRow[] = await auditEventsSince(mark, { action: want.action, actorId });
      expect(rows, `${want.action} by ${actorId}`).toHaveLength(1);
      const [row] = rows;
      expect(row.entity).toBe(want.entity);
      if (want.entityId) expect(row.entity_id).toBe(want.entityId);
      if (want.teamId !== undefined) expect(row.team_id).toBe(want.teamId);
      // The database stamps the time; allow for the two clocks being a few seconds apart.
      expect(Math.abs(row.created_at.getTime() - started.getTime())).toBeLessThan(60_000);
    }
  });

  it("keeps passwords and token secrets out of the trail", async () => {
    const { rows } = await db().query<{ blob: string }>(
      "SELECT coalesce(before::text, '') || coalesce(after::text, '') AS blob FROM audit_events",
    );
    for (const { blob } of rows)
      expect(blob).not.toMatch(/password|token_hash|emb_[A-Za-z0-9_-]{20}/i);
  });

  it("writes nothing for refused or failed attempts", async () => {
    const person = await freshPerson("audit-failures");
    const chemist = await signInDemo("chemist");
    const chemistId = await userIdByEmail("chem@demo.emberline.example");
    const mark = await auditMark();
    expect(
      (await new ApiClient().post("/api/session", { email: person.email, password: "wrong wrong" }))
        .status,
    ).toBe(401);
    const client = await signedIn(person.email, person.password);
    expect(
      (
        await client.post("/api/password", {
          currentPassword: "wrong wrong",
          newPassword: strongPassword(),
        })
      ).status,
    ).toBe(400);
    expect((await client.post("/api/tokens", { name: "" })).status).toBe(400);
    expect(
      (
        await chemist.post("/api/invitations", {
          teamId: flameTeamId,
          email: uniqueEmail("nope"),
          role: "chemist",
        })
      ).status,
    ).toBe(403);
    const personEvents = await auditEventsSince(mark, { actorId: person.userId });
    // Only the one successful sign-in in between.
    expect(personEvents.map((e) => e.action)).toEqual(["session.create"]);
    expect(
      await auditEventsSince(mark, { action: "invitation.create", actorId: chemistId }),
    ).toEqual([]);
  });
});

describe("audit_events is append-only in the database", () => {
  it.each([
    [
      "UPDATE",
      "UPDATE audit_events SET reason = 'rewritten' WHERE id = (SELECT max(id) FROM audit_events)",
    ],
    ["DELETE", "DELETE FROM audit_events WHERE id = (SELECT max(id) FROM audit_events)"],
    ["TRUNCATE", "TRUNCATE audit_events"],
  ])("refuses %s", async (operation, sql) => {
    const before = await db().query<{ n: number; newest: string }>(
      "SELECT count(*)::int AS n, max(id)::text AS newest FROM audit_events",
    );
    expect(before.rows[0].n).toBeGreaterThan(0);
    await expect(db().query(sql)).rejects.toThrow(
      `audit_events is append-only: ${operation} is not allowed`,
    );
    const newest = await db().query<{ reason: string | null }>(
      "SELECT reason FROM audit_events WHERE id = $1",
      [before.rows[0].newest],
    );
    expect(newest.rows).toHaveLength(1);
    expect(newest.rows[0].reason).not.toBe("rewritten");
  });
});
